sim_cmp <- function(n, seed) {
  set.seed(seed)
  d <- data.frame(x = runif(n, 1, 10), z = rnorm(n))
  d$y <- exp(0.5 + 0.2 * d$x + 0.2 * d$z + rnorm(n, sd = 0.35))
  d
}

test_that("held-out scores equal a base-R computation on the same folds", {
  d <- sim_cmp(60, 1)
  cands <- list("none", logy = list(y = new_transform("log")))
  cmp <- compare_transforms(y ~ x + z, d, candidates = cands, folds = 4, repeats = 2, seed = 9,
                            progress = FALSE)
  expect_equal(dim(cmp$fold_ids), c(60L, 2L))
  for (r in 1:2) for (k in 1:4) {
    test <- cmp$fold_ids[, r] == k
    tr <- d[!test, ]
    te <- d[test, ]
    score <- function(pred) c(sqrt(mean((te$y - pred)^2)), mean(abs(te$y - pred)),
                              1 - sum((te$y - pred)^2) / sum((te$y - mean(te$y))^2))
    # "none": base R lm() and predict.lm() prediction intervals
    fit <- lm(y ~ x + z, tr)
    pi <- predict(fit, te, interval = "prediction", level = 0.95)
    row <- cmp$folds[cmp$folds$candidate == "none" & cmp$folds$repeat_no == r &
                       cmp$folds$fold == k, ]
    # the same least-squares fits by two QR codes: agreement to rounding
    expect_equal(c(row$rmse_median, row$mae_median, row$r2_median), score(pi[, "fit"]),
                 tolerance = 1e-10)
    expect_equal(row$coverage, mean(te$y >= pi[, "lwr"] & te$y <= pi[, "upr"]))
    expect_equal(row$width_median, median(pi[, "upr"] - pi[, "lwr"]), tolerance = 1e-10)
    expect_equal(row$unbounded, 0)
    # "logy": exp of the log-scale fit is the median; Duan's smearing mean is
    # exp(fit) * mean(exp(residuals)) (Duan 1983, eq. for the log case)
    lfit <- lm(log(y) ~ x + z, tr)
    lp <- predict(lfit, te)
    row <- cmp$folds[cmp$folds$candidate == "logy" & cmp$folds$repeat_no == r &
                       cmp$folds$fold == k, ]
    expect_equal(c(row$rmse_median, row$mae_median, row$r2_median), score(exp(lp)),
                 tolerance = 1e-10)
    smear <- exp(lp) * mean(exp(residuals(lfit)))
    expect_equal(c(row$rmse_mean, row$mae_mean, row$r2_mean), score(smear), tolerance = 1e-10)
  }
  # in-sample extras: adjusted R^2 on the own scale, AIC on the original scale
  s <- cmp$summary
  expect_equal(s$adj_r2_own_scale[s$candidate == "logy"],
               summary(lm(log(y) ~ x + z, d))$adj.r.squared, tolerance = 1e-10)
  # the log-normal log-likelihood is the normal one of log y minus sum(log y) (change of
  # variables); base R logLik.lm and AIC with 4 parameters (3 coefficients and sigma)
  ll <- as.numeric(logLik(lm(log(y) ~ x + z, d))) - sum(log(d$y))
  expect_equal(s$aic[s$candidate == "logy"], -2 * ll + 2 * 4, tolerance = 1e-10)
  expect_equal(s$aic[s$candidate == "none"], AIC(lm(y ~ x + z, d)), tolerance = 1e-10)
})

test_that("learning inside folds is not learning on all rows", {
  d <- sim_cmp(50, 2)
  lam_full <- estimate_response_lambda(y ~ x + z, d)$lambda
  inside <- function(train)
    list(y = new_transform("box-cox", lambda = estimate_response_lambda(y ~ x + z, train)$lambda))
  leaky <- list(y = new_transform("box-cox", lambda = lam_full))
  cmp <- compare_transforms(y ~ x + z, d, candidates = list(inside = inside, leaky = leaky),
                            folds = 5, seed = 4, progress = FALSE)
  lam <- cmp$lambdas[cmp$lambdas$candidate == "inside" & cmp$lambdas$role == "response", ]
  expect_equal(nrow(lam), 5L)
  # each training fold lacks a fifth of the rows, so its estimate moves off the full-data one
  expect_true(all(abs(lam$lambda - lam_full) > 1e-6))
  # ... and so do the held-out scores of the two candidates, fold by fold
  f <- cmp$folds
  expect_true(all(abs(f$rmse_median[f$candidate == "inside"] -
                      f$rmse_median[f$candidate == "leaky"]) > 1e-8))
  # the full-data fit of `inside` learns the full-data power
  expect_equal(cmp$full$inside$lambdas$lambda[1], lam_full)
})

test_that("folds are reproducible from the seed and R's random state is untouched", {
  d <- sim_cmp(30, 3)
  set.seed(77)
  before <- .Random.seed
  a <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, seed = 5, progress = FALSE)
  expect_identical(.Random.seed, before)
  b <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, seed = 5, progress = FALSE)
  expect_identical(a$fold_ids, b$fold_ids)
  expect_identical(a$folds, b$folds)
  c <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, progress = FALSE)
  again <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, seed = c$seed,
                              progress = FALSE)
  expect_identical(c$fold_ids, again$fold_ids)
  expect_equal(as.vector(table(a$fold_ids)), c(10L, 10L, 10L))
})

test_that("print, plot and the progress bar", {
  d <- sim_cmp(40, 5)
  cmp <- compare_transforms(y ~ x, d, candidates = list("none", logy = list(y = new_transform("log"))),
                            folds = 4, seed = 1, progress = FALSE)
  expect_output(print(cmp), "rank candidate")
  expect_output(print(cmp), "NOT")
  expect_output(compare_transforms(y ~ x, d, candidates = "none", folds = 2, seed = 1,
                                   progress = TRUE), "100%")
  f <- tempfile(fileext = ".png")
  grDevices::png(f)
  expect_silent(plot(cmp))
  expect_silent(plot(cmp, "coverage"))
  # Unscored folds (NA) are labelled; a score no fold has is an error.
  part <- cmp
  part$folds$rmse_median[part$folds$candidate == "logy"][1] <- NA
  part$folds$rmse_median[part$folds$candidate == "none"] <- NA
  expect_silent(plot(part))
  part$folds$rmse_median <- NA_real_
  expect_error(plot(part), "no fold has a finite rmse_median")
  grDevices::dev.off()
  unlink(f)
})

test_that("the built-in candidates learn their powers inside each fold", {
  set.seed(21)
  d <- data.frame(x = rlnorm(80, 1, 0.7), z = rnorm(80))
  d$y <- exp(1 + 0.4 * log(d$x) + 0.2 * d$z + rnorm(80, sd = 0.3))
  cmp <- compare_transforms(y ~ x + z, d, folds = 4, seed = 11, progress = FALSE)
  expect_setequal(cmp$summary$candidate, c("none", "ladder", "ml"))
  expect_equal(nrow(cmp$failures), 0L)
  ml <- cmp$lambdas[cmp$lambdas$candidate == "ml" & cmp$lambdas$role == "response", ]
  full <- cmp$full$ml$lambdas$lambda_estimate[1]
  # the full-data ML power, learned again on all rows by estimate_response_lambda() through the
  # model: the same number, so the folds' values differ from it because they saw fewer rows
  m <- lm_transformed(y ~ x + z, d, response = "estimate", predictors = "ml")
  expect_equal(full, m$response_lambda$lambda)
  expect_true(all(abs(ml$lambda_estimate - full) > 1e-6))
  # the skewed predictor x gets its own per-fold transform under "ml" and "ladder"
  expect_true(all(c("ml", "ladder") %in% cmp$lambdas$candidate[cmp$lambdas$variable == "x"]))
})

test_that("held-out predictions are kept and aligned to the rows of the data", {
  d <- sim_cmp(24, 8)
  d$x[5] <- NA  # omitted: no prediction for row 5, the other rows keep their numbers
  cmp <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, repeats = 2, seed = 1,
                            progress = FALSE)
  p <- cmp$predictions
  expect_equal(nrow(p), 2L * 23L)
  expect_false(5L %in% p$row)
  expect_equal(sort(p$row[p$repeat_no == 1]), setdiff(1:24, 5L))
  expect_equal(p$y, d$y[p$row])
  # each row's prediction comes from the fit without its fold (base R lm(), predict.lm())
  one <- p[p$repeat_no == 2 & p$row == 10, ]
  tr <- d[-5, ][cmp$fold_ids[, 2] != one$fold, ]
  expect_equal(one$fit_median, unname(predict(lm(y ~ x, tr), d[10, ])), tolerance = 1e-10)
})

test_that("an infinite interval end still covers and the candidate is ranked on its scores", {
  # boot::poisons (boot package): the ML power of survival time is near -0.8, where the
  # back-transformed upper end of a prediction interval can be unbounded
  cmp <- compare_transforms(time ~ poison * treat, boot::poisons, seed = 1, progress = FALSE)
  p <- cmp$predictions
  ml <- p[p$candidate == "ml", ]
  expect_true(any(is.infinite(ml$upr)))  # the case under test occurs with this seed
  expect_true(all(is.finite(ml$fit_median)))
  f <- cmp$folds[cmp$folds$candidate == "ml", ]
  expect_false(anyNA(f$rmse_median))
  expect_false(anyNA(f$coverage))
  # coverage by hand from the kept predictions (an infinite end covers its side)
  for (k in f$fold) {
    q <- ml[ml$fold == k, ]
    expect_equal(f$coverage[f$fold == k], mean(q$lwr <= q$y & q$y <= q$upr))
    expect_equal(f$unbounded[f$fold == k], mean(is.infinite(q$upr)))
    expect_equal(f$width_median[f$fold == k], median(q$upr - q$lwr))
  }
  s <- cmp$summary
  expect_true(all(s$ranked))
  expect_false(is.na(s$rank[s$candidate == "ml"]))
  expect_equal(s$rmse_median[s$candidate == "ml"], mean(f$rmse_median))
  expect_equal(s$rank, seq_len(3))
  expect_equal(s$candidate[order(s$rmse_median)], s$candidate)
})

test_that("a candidate with an unscored or failed fold is unranked and printed apart", {
  set.seed(6)
  d <- data.frame(x = runif(30, 1, 5))
  d$y <- exp(1 + 0.3 * d$x + rnorm(30, sd = 0.2))
  d$y[8] <- -0.5
  bc <- function(train)
    list(y = new_transform("box-cox", lambda = estimate_response_lambda(y ~ x, train)$lambda))
  cmp <- compare_transforms(y ~ x, d, candidates = list("none", bc = bc), folds = 3, seed = 2,
                            progress = FALSE)
  s <- cmp$summary
  expect_equal(s$candidate, c("none", "bc"))
  expect_equal(s$rank, c(1L, NA))
  expect_equal(s$ranked, c(TRUE, FALSE))
  out <- capture.output(print(cmp))
  unranked <- grep("^Unranked", out)
  expect_length(unranked, 1L)
  expect_true(any(grepl("^bc ", out[-seq_len(unranked)])))
  expect_false(any(grepl("^ *[0-9]+ bc ", out)))
})

test_that("the comparison plot draws each fold's score and each candidate's mean", {
  d <- sim_cmp(40, 5)
  cmp <- compare_transforms(y ~ x, d, candidates = list("none", logy = list(y = new_transform("log"))),
                            folds = 4, seed = 1, progress = FALSE)
  xy <- recorded_xy(recorded_calls(plot(cmp)))
  f <- cmp$folds
  pos <- match(f$candidate, cmp$summary$candidate)
  expect_equal(xy[[1]]$x, pos)
  expect_equal(xy[[1]]$y, f$rmse_median)
  expect_equal(xy[[2]]$x, 1:2)
  expect_equal(xy[[2]]$y, as.vector(tapply(f$rmse_median,
                                           factor(f$candidate, cmp$summary$candidate), mean)))
  cov <- recorded_calls(plot(cmp, "coverage"))
  expect_equal(recorded_xy(cov)[[1]]$y, f$coverage)
  ab <- Filter(function(e) e$name == "C_abline", cov)
  expect_equal(ab[[1]]$args[[3]], 0.95)  # the nominal level as the reference line (h)
})
