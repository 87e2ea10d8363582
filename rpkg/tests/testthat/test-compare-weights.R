# Weights, subsets and offsets in compare_transforms().

sim_w <- function(n, seed) {
  set.seed(seed)
  d <- data.frame(x = runif(n, 1, 10), w = rep(c(1, 2, 3), length.out = n))
  d$y <- exp(0.5 + 0.2 * d$x + rnorm(n, sd = 0.3))
  d
}

test_that("offsets are refused with the words estimate_response_lambda uses", {
  d <- sim_w(30, 1)
  expect_error(compare_transforms(y ~ x + offset(log(w)), d, progress = FALSE, seed = 1),
               "offsets are not supported: move the offset into the response first",
               fixed = TRUE)
})

test_that("subset chooses rows as lm does, before the folds", {
  d <- sim_w(60, 2)
  a <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, seed = 4,
                          subset = x > 3, progress = FALSE)
  b <- compare_transforms(y ~ x, d[d$x > 3, ], candidates = "none", folds = 3, seed = 4,
                          progress = FALSE)
  expect_equal(a$rows, which(d$x > 3))
  # the same rows, folds and fits: equal up to summation order (1e-12)
  expect_equal(a$summary$rmse_median, b$summary$rmse_median, tolerance = 1e-12)
  expect_equal(a$predictions$y, b$predictions$y)
  c2 <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, seed = 4,
                           subset = which(d$x > 3), progress = FALSE)
  expect_equal(c2$summary$rmse_median, b$summary$rmse_median, tolerance = 1e-12)
  expect_error(compare_transforms(y ~ x, d, subset = 100:101, progress = FALSE, seed = 1),
               "outside the rows")
})

test_that("negative or non-finite weights are errors naming the rows", {
  d <- sim_w(30, 3)
  d$w[c(4, 9)] <- -1
  expect_error(compare_transforms(y ~ x, d, weights = w, progress = FALSE, seed = 1),
               "`weights` is negative at rows 4, 9")
  d$w[c(4, 9)] <- 1
  d$w[7] <- Inf
  expect_error(compare_transforms(y ~ x, d, weights = "w", progress = FALSE, seed = 1),
               "`weights` is not finite at row 7")
  expect_error(compare_transforms(y ~ x, d, weights = 1:3, progress = FALSE, seed = 1),
               "one value per row of `data` \\(30\\), not 3")
})

test_that("GLM candidates are fitted with their training rows' weights; scores are weighted", {
  d <- sim_w(60, 4)
  cmp <- compare_transforms(y ~ x, d, candidates = list(gl = Gamma(link = "log")), folds = 3,
                            seed = 2, weights = w, progress = FALSE)
  for (k in 1:3) {
    test <- cmp$fold_ids[, 1] == k
    tr <- d[!test, ]
    te <- d[test, ]
    # base R glm() with prior weights and predict.glm(type = "response")
    fit <- glm(y ~ x, family = Gamma(link = "log"), data = tr, weights = w)
    p <- unname(predict(fit, te, type = "response"))
    got <- cmp$predictions$fit_mean[cmp$predictions$fold == k]
    # the same IRLS iterations from the same start (glm.fit): agreement to ~1e-14, so 1e-10
    expect_equal(got, p, tolerance = 1e-10)
    row <- cmp$folds[cmp$folds$fold == k, ]
    # weighted means of squared and absolute errors (base R weighted.mean); the predictions
    # agree to 1e-10 (above), so the scores agree to 1e-9
    expect_equal(row$rmse_median, sqrt(weighted.mean((te$y - p)^2, te$w)), tolerance = 1e-9)
    expect_equal(row$mae_median, weighted.mean(abs(te$y - p), te$w), tolerance = 1e-9)
    ybar <- weighted.mean(te$y, te$w)
    expect_equal(row$r2_median, 1 - sum(te$w * (te$y - p)^2) / sum(te$w * (te$y - ybar)^2),
                 tolerance = 1e-9)
  }
  expect_equal(cmp$weights, d$w)
  expect_true(any(grepl("weighted", capture.output(print(cmp)))))
})

test_that("transform candidates are fitted with weights (lm_transformed(weights =))", {
  skip_if_not("weights" %in% names(formals(lm_transformed)),
              "lm_transformed() has no weights argument in this build")
  d <- sim_w(60, 5)
  cmp <- compare_transforms(y ~ x, d, candidates = list("none", logy = list(y = new_transform("log"))),
                            folds = 3, seed = 2, weights = w, progress = FALSE)
  for (k in 1:3) {
    test <- cmp$fold_ids[, 1] == k
    tr <- d[!test, ]
    te <- d[test, ]
    # base R weighted lm() and predict.lm() on the training fold
    fit <- lm(y ~ x, tr, weights = w)
    p <- unname(predict(fit, te))
    got <- cmp$predictions$fit_median[cmp$predictions$candidate == "none" &
                                        cmp$predictions$fold == k]
    expect_equal(got, p, tolerance = 1e-10)
    row <- cmp$folds[cmp$folds$candidate == "none" & cmp$folds$fold == k, ]
    # two least-squares codes (our QR, base R's) agree to ~1e-13: 1e-9 for scores of them
    expect_equal(row$rmse_median, sqrt(weighted.mean((te$y - p)^2, te$w)), tolerance = 1e-9)
    lfit <- lm(log(y) ~ x, tr, weights = w)
    lp <- exp(unname(predict(lfit, te)))
    got <- cmp$predictions$fit_median[cmp$predictions$candidate == "logy" &
                                        cmp$predictions$fold == k]
    expect_equal(got, lp, tolerance = 1e-10)
  }
  # unit weights give the unweighted comparison
  one <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, seed = 2,
                            weights = rep(1, 60), progress = FALSE)
  none <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, seed = 2,
                             progress = FALSE)
  # unit weights: the same fits up to rounding in the weighted QR (1e-10)
  expect_equal(one$summary$rmse_median, none$summary$rmse_median, tolerance = 1e-10)
})

test_that("a missing weight drops its row by na.action; a zero weight counts for nothing", {
  d <- sim_w(45, 6)
  d$w[3] <- NA
  d$w[c(10, 20)] <- 0
  cmp <- compare_transforms(y ~ x, d, candidates = list(gl = Gamma(link = "log")), folds = 3,
                            seed = 8, weights = w, progress = FALSE)
  expect_equal(cmp$rows, setdiff(1:45, 3))
  expect_equal(cmp$weights, d$w[-3])
  used <- d[-3, ]
  for (k in 1:3) {
    test <- cmp$fold_ids[, 1] == k
    tr <- used[!test, ]
    te <- used[test, ]
    # base R glm() drops zero-weight rows from the fit (prior weight 0)
    fit <- glm(y ~ x, family = Gamma(link = "log"), data = tr[tr$w > 0, ], weights = w)
    p <- unname(predict(fit, te, type = "response"))
    # the same IRLS fit up to rounding in the zero-weight rows' handling: 1e-8
    expect_equal(cmp$predictions$fit_mean[cmp$predictions$fold == k], p, tolerance = 1e-8)
    keep <- te$w > 0
    row <- cmp$folds[cmp$folds$fold == k, ]
    # zero-weight held-out rows leave the weighted mean unchanged (base R weighted.mean)
    expect_equal(row$mae_median, weighted.mean(abs(te$y - p)[keep], te$w[keep]),
                 tolerance = 1e-8)
  }
})
