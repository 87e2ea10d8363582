test_that("coef, confint and as_transform report the estimate", {
  set.seed(4)
  fit <- estimate_lambda(rgamma(80, shape = 3), level = 0.9)
  expect_identical(coef(fit), c(lambda = fit$lambda))
  ci <- confint(fit)
  expect_identical(dim(ci), c(1L, 2L))
  expect_identical(colnames(ci), c("5 %", "95 %"))
  expect_identical(as.vector(ci), fit$conf_int)
  expect_equal(colnames(confint(fit, level = 0.95)), c("2.5 %", "97.5 %"))
  tr <- as_transform(fit)
  expect_s3_class(tr, "pwb_transform")
  expect_identical(tr$family, "box-cox")
  expect_identical(tr$lambda, fit$convenient)
  expect_identical(as_transform(fit, "estimate")$lambda, fit$lambda)
  expect_identical(as_transform(tr), tr)
  expect_error(as_transform(1), "pwb_lambda")
})

test_that("the profile curve spans the interval and peaks at the estimate", {
  set.seed(6)
  x <- rlnorm(150, sdlog = 0.7)
  fit <- estimate_lambda(x)
  pr <- fit$profile
  expect_identical(names(pr), c("lambda", "loglik"))
  expect_identical(nrow(pr), 101L)
  expect_lte(min(pr$lambda), fit$conf_int[1] - 0.5)
  expect_gte(max(pr$lambda), fit$conf_int[2] + 0.5)
  expect_lte(max(pr$loglik), fit$loglik + 1e-9)  # nothing beats the maximum beyond rounding
  # The interval's endpoints sit on the chi-square cut (cut from stats::qchisq); 1e-8 is far
  # above the root search's precision in lambda times the profile's slope there.
  cut <- fit$loglik - stats::qchisq(0.95, 1) / 2
  ends <- powerback:::rpwb_lambda_profile(x, NULL, "box-cox", fit$conf_int)
  expect_equal(ends, c(cut, cut), tolerance = 1e-8)
})

test_that("print and plot run and say what they show", {
  set.seed(7)
  fit <- estimate_lambda(rgamma(60, shape = 2))
  expect_output(print(fit), "Box-Cox lambda for")
  expect_output(print(fit), "back-transformed means need a\\s+correction")
  f <- file.path(tempdir(), "pwb-lambda-test.png")
  grDevices::png(f)
  on.exit(grDevices::dev.off(), add = TRUE)
  expect_identical(plot(fit), fit)
  expect_identical(plot(fit, main = "a title of one's own"), fit)  # main is an argument, not in ...
  # A model formula wider than the figure: the title is drawn smaller, the plot still made.
  river <- river_data()
  long <- estimate_response_lambda(sediment_t_day ~ flow_m3s + rain72_mm + forest_pct + season +
                                     station, river)
  expect_identical(plot(long), long)
  expect_true(file.exists(f))
})

test_that("the profile plot draws the stored profile, the estimate and the convenient value", {
  fit <- estimate_lambda(trees$Volume)  # trees (datasets package)
  calls <- recorded_calls(plot(fit))
  xy <- recorded_xy(calls)
  expect_equal(xy[[1]]$x, fit$profile$lambda)
  expect_equal(xy[[1]]$y, fit$profile$loglik)
  expect_equal(xy[[2]]$x, fit$lambda)
  expect_equal(xy[[2]]$y, fit$loglik)
  expect_equal(xy[[3]]$x, fit$convenient)
  ab <- Filter(function(e) e$name == "C_abline", calls)
  # the cut that defines the interval, then the interval's ends
  expect_equal(ab[[1]]$args[[3]], fit$loglik - qchisq(fit$level, 1) / 2)
  expect_equal(ab[[2]]$args[[4]], fit$conf_int)
})

test_that("confint() at another level is recomputed from the stored profile", {
  # trees$Volume (datasets package); the reference is a fresh estimate at that level
  fit <- estimate_lambda(trees$Volume)
  for (lev in c(0.8, 0.9)) {
    ref <- estimate_lambda(trees$Volume, level = lev)$conf_int
    got <- confint(fit, level = lev)
    # a cubic spline through the 101 stored profile points: the ends agree to ~1e-4 of the
    # grid's span (interpolation error of a smooth, nearly quadratic curve)
    expect_equal(as.vector(got), ref, tolerance = 1e-4)
    expect_equal(colnames(got), paste(c((1 - lev) / 2, 1 - (1 - lev) / 2) * 100, "%"))
  }
  expect_equal(as.vector(confint(fit)), fit$conf_int)
  expect_error(confint(fit, level = 1.2), "strictly between 0 and 1")
})
