# Many responses against one design. The reference for every figure is the package's own
# single-response call on the same rows (estimate_response_lambda() / lm_transformed() of that
# one response), itself checked against base R lm() refits of the transformed response in
# test-lambda-response.R and test-model-fit.R. Tolerance 1e-10: both paths run the same
# operations on the same blocks of rows, so only rounding could separate them (values of order
# 1 to 1e3).

close_to <- function(a, b, tol = 1e-10) {
  expect_true(all(abs(a - b) <= tol * pmax(1, abs(b))), info = paste(format(a - b), collapse = " "))
}

# Every number of a pwb_lambda: estimate, interval, convenient value, log-likelihood, flags,
# profile.
same_lambda <- function(got, want) {
  close_to(got$lambda, want$lambda)
  close_to(got$conf_int, want$conf_int)
  close_to(got$loglik, want$loglik)
  expect_identical(got$convenient, want$convenient)
  for (f in c("at_bound", "converged", "low_open", "high_open", "n", "rank", "aliased",
              "variable", "predictors"))
    expect_identical(got[[f]], want[[f]], info = f)
  close_to(got$profile$lambda, want$profile$lambda)
  close_to(got$profile$loglik, want$profile$loglik)
}

# Five responses with known Box-Cox powers (the inverse transform of a linear predictor plus
# normal noise) over two predictors.
simulate_five <- function(n = 2000, seed = 17) {
  set.seed(seed)
  d <- data.frame(x1 = rnorm(n), x2 = runif(n))
  lams <- c(y1 = 0, y2 = 0.5, y3 = -0.5, y4 = 1, y5 = 1 / 3)
  for (v in names(lams)) {
    z <- 0.8 * d$x1 - 0.6 * d$x2 + rnorm(n, sd = 0.15)
    lam <- lams[[v]]
    centre <- if (lam > 0) 4 else if (lam < 0) -1 else 0  # keeps 1 + lam * (centre + z) > 0
    d[[v]] <- if (lam == 0) exp(z) else (1 + lam * (centre + z))^(1 / lam)
  }
  list(data = d, lambdas = lams)
}

test_that("each response's lambda equals a separate single-response call", {
  s <- simulate_five()
  set <- estimate_response_lambda(cbind(y1, y2, y3, y4, y5) ~ x1 + x2, s$data)
  expect_s3_class(set, "pwb_lambda_set")
  expect_s3_class(set, "data.frame")
  expect_identical(set$response, names(s$lambdas))
  expect_identical(names(set), c("response", "lambda", "conf_low", "conf_high", "convenient",
                                 "at_bound", "converged", "n"))
  fits <- response_fits(set)
  for (j in seq_along(s$lambdas)) {
    v <- names(s$lambdas)[j]
    one <- estimate_response_lambda(stats::as.formula(paste(v, "~ x1 + x2")), s$data)
    same_lambda(fits[[v]], one)
    close_to(set$lambda[j], one$lambda)
    close_to(c(set$conf_low[j], set$conf_high[j]), one$conf_int)
    # the simulated power: the 95% intervals here are 0.02 to 0.06 wide on each side (standard
    # errors of lambda-hat at most 0.03), so 0.15 is at least five standard errors
    expect_lt(abs(set$lambda[j] - s$lambdas[[j]]), 0.15)
  }
  expect_identical(response_fits(set, "y3"), fits$y3)
  expect_error(response_fits(set, "nope"), "no response `nope`")
  # Yeo-Johnson, and an mlm fit as the object
  yj <- estimate_response_lambda(cbind(y2, y4) ~ x1, s$data, family = "yeo-johnson")
  same_lambda(response_fits(yj, "y4"),
              estimate_response_lambda(y4 ~ x1, s$data, family = "yeo-johnson"))
  from_lm <- estimate_response_lambda(stats::lm(cbind(y1, y5) ~ x1 + x2, s$data))
  same_lambda(response_fits(from_lm, "y5"), response_fits(set, "y5"))
  # a numeric matrix variable on the left: its column names name the responses
  resp <- as.matrix(s$data[, c("y2", "y3")])
  x1 <- s$data$x1
  x2 <- s$data$x2
  mat <- estimate_response_lambda(resp ~ x1 + x2)
  expect_identical(mat$response, c("y2", "y3"))
  close_to(mat$lambda, set$lambda[2:3])
  expect_identical(response_fits(set, 2:3), fits[2:3])
})

test_that("the results do not depend on the number of threads", {
  s <- simulate_five(6000, 37)  # 6000 rows: the binned sums, over two blocks of the design
  f <- cbind(y1, y2, y3, y4, y5) ~ x1 + x2
  old <- options(powerback.threads = 1)
  on.exit(options(old))
  one <- estimate_response_lambda(f, s$data)
  fits1 <- response_fits(one)
  for (k in 2:3) {
    options(powerback.threads = k)
    got <- estimate_response_lambda(f, s$data)
    expect_identical(as.data.frame(got), as.data.frame(one))
    # a fit asked for alone, before the others, is the one built with all of them
    expect_identical(response_fits(got, "y4"), fits1$y4)
    expect_identical(response_fits(got), fits1)
  }
  # a failing response keeps its own name and rows on several threads
  d <- s$data
  d$y4[c(3, 8)] <- c(-1, 0)
  options(powerback.threads = 3)
  expect_error(estimate_response_lambda(f, d),
               "response `y4` \\(column 4 of cbind.*y4 > 0.*rows 3, 8")
})

test_that("complete data: the frame and response kept without a copy are model.frame's", {
  # Reference: stats::model.frame with the standard na.action (base R).
  mk <- get("pwb_model_frame", envir = asNamespace("powerback"))
  d <- datasets::mtcars
  args <- list(formula = cbind(mpg, qsec) ~ wt + factor(cyl), data = d, drop.unused.levels = TRUE)
  for (act in list(NULL, "na.omit", stats::na.exclude, "na.fail")) {
    a <- args
    a$na.action <- act
    got <- mk(a)
    want <- do.call(stats::model.frame, a)
    expect_identical(unclass(got), unclass(want))
    expect_identical(rownames(got), rownames(want))
    expect_identical(attr(got, "terms"), attr(want, "terms"))
    expect_null(attr(got, "na.action"))
  }
  # the response as stored: model.response()'s values (base R), without its row names
  resp <- get("pwb_frame_response", envir = asNamespace("powerback"))
  mf <- mk(args)
  want <- stats::model.response(mf)
  dimnames(want) <- list(NULL, colnames(want))
  expect_identical(resp(mf), want)
  one <- stats::model.frame(cbind(mpg) ~ wt, d)
  expect_identical(resp(one), unname(stats::model.response(one)))
  expect_null(resp(stats::model.frame(~ wt, d)))
  # with a missing value the standard action runs as usual
  d$qsec[5] <- NA
  args$data <- d
  got <- mk(args)
  expect_identical(nrow(got), 31L)
  expect_identical(unname(unclass(attr(got, "na.action"))), 5L)
})

test_that("airquality: rows missing in any response leave every response (na.action)", {
  # Data: datasets::airquality (Ozone has 37 missing values, Solar.R 7, Wind none).
  aq <- datasets::airquality
  set <- estimate_response_lambda(cbind(Ozone, Wind) ~ Temp + Month, aq)
  expect_identical(set$n, c(116L, 116L))
  same_lambda(response_fits(set, "Ozone"), estimate_response_lambda(Ozone ~ Temp + Month, aq))
  same_lambda(response_fits(set, "Wind"),
              estimate_response_lambda(Wind ~ Temp + Month, aq, subset = !is.na(Ozone)))
  expect_length(response_fits(set, "Wind")$na_action, 37L)
  # Two responses with different gaps: the rows complete in both (111), as lm drops them.
  both <- estimate_response_lambda(cbind(Ozone, Solar.R) ~ Temp, aq)
  ref <- stats::lm(cbind(Ozone, Solar.R) ~ Temp, aq)
  expect_identical(both$n, rep(nrow(stats::model.frame(ref)), 2L))
  cc <- aq[stats::complete.cases(aq$Ozone, aq$Solar.R), ]
  same_lambda(response_fits(both, "Solar.R"), estimate_response_lambda(Solar.R ~ Temp, cc))
  # na.fail refuses them, as lm does
  expect_error(estimate_response_lambda(cbind(Ozone, Wind) ~ Temp, aq, na.action = stats::na.fail),
               "missing values")
})

test_that("weights and subset apply to every response", {
  s <- simulate_five(600, 23)
  d <- s$data
  d$w <- rep(c(0.5, 1, 2, 0), length.out = nrow(d))
  set <- estimate_response_lambda(cbind(y2, y3) ~ x1 + x2, d, weights = w, subset = x1 > -1)
  for (v in c("y2", "y3")) {
    one <- estimate_response_lambda(stats::as.formula(paste(v, "~ x1 + x2")), d, weights = w,
                                    subset = x1 > -1)
    same_lambda(response_fits(set, v), one)
    expect_true(response_fits(set, v)$weighted)
  }
  expect_identical(set$n[1], sum(d$x1 > -1 & d$w > 0))
})

test_that("a column Box-Cox cannot take is named, with its rows and the remedy", {
  s <- simulate_five(100, 29)
  d <- s$data
  d$y3[c(4, 9)] <- c(0, -1)
  expect_error(estimate_response_lambda(cbind(y1, y2, y3) ~ x1, d),
               "response `y3` \\(column 3 of cbind\\(y1, y2, y3\\)\\).*y3 > 0.*rows 4, 9.*Yeo-Johnson")
  d$y2 <- 5
  expect_error(estimate_response_lambda(cbind(y1, y2) ~ x1, d),
               "response `y2` \\(column 2.*y2 is constant")
  # Yeo-Johnson takes the non-positive column
  expect_s3_class(estimate_response_lambda(cbind(y1, y3) ~ x1, d, family = "yeo-johnson"),
                  "pwb_lambda_set")
  # shared inputs: predictors and weights still name their rows
  d$x1[7] <- Inf
  expect_error(estimate_response_lambda(cbind(y1, y4) ~ x1, d), "predictors.*row 7")
})

test_that("lm_transformed with several responses equals one call per response", {
  aq <- datasets::airquality
  ms <- lm_transformed(cbind(Ozone, Wind) ~ Temp + Month, aq)
  expect_s3_class(ms, "pwb_model_set")
  expect_identical(names(ms), c("Ozone", "Wind"))
  new <- data.frame(Temp = c(60, 75, 90), Month = c(5, 7, 9))
  for (v in c("Ozone", "Wind")) {
    one <- lm_transformed(stats::as.formula(paste(v, "~ Temp + Month")), aq,
                          subset = !is.na(Ozone))
    m <- ms[[v]]
    expect_s3_class(m, "pwb_model")
    close_to(coef(m), coef(one))
    close_to(m$sigma, one$sigma)
    expect_identical(m$response, one$response)
    close_to(as.matrix(predict(m, new, interval = "prediction")),
             as.matrix(predict(one, new, interval = "prediction")))
    expect_identical(m$nobs, one$nobs)
  }
  expect_identical(response_fits(ms, "Wind"), ms[["Wind"]])
  expect_length(ms[["Wind"]]$na.action, 37L)  # Ozone's gaps leave Wind's model too
  # a fixed response transform, weights and subset pass through to every model
  aq$w <- rep(c(1, 2), length.out = nrow(aq))
  fixed <- lm_transformed(cbind(Ozone, Temp) ~ Wind, aq, response = new_transform("log"),
                          weights = w, subset = Month > 5)
  one <- lm_transformed(Temp ~ Wind, aq, response = new_transform("log"), weights = w,
                        subset = Month > 5 & !is.na(Ozone))
  close_to(coef(fixed[["Temp"]]), coef(one))
  expect_error(lm_transformed(cbind(log(Ozone), Wind) ~ Temp, aq), "must be a variable name")
})

test_that("the prints fit 80 columns", {
  s <- simulate_five(300, 31)
  names(s$data)[3] <- "a_rather_long_response_name_for_printing"
  set <- estimate_response_lambda(cbind(a_rather_long_response_name_for_printing, y2, y3) ~ x1 + x2,
                                  s$data)
  out <- capture.output(print(set))
  expect_true(all(nchar(out) <= 80), info = paste(out, collapse = "\n"))
  expect_true(any(grepl("y2", out)))
  expect_true(any(grepl("response_fits", out)))
  ms <- lm_transformed(cbind(Ozone, Wind) ~ Temp, datasets::airquality)
  out <- capture.output(print(ms), print(summary(ms)))
  expect_true(all(nchar(out) <= 80), info = paste(out, collapse = "\n"))
  expect_true(any(grepl("== response Wind ==", out)))
  expect_s3_class(ms[2], "pwb_model_set")
  expect_identical(class(as.data.frame(set)), "data.frame")
})
