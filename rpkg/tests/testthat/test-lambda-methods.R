test_that("coef, confint and as_transform report the estimate", {
  set.seed(4)
  fit <- estimate_lambda(rgamma(80, shape = 3), level = 0.9)
  expect_identical(coef(fit), c(lambda = fit$lambda))
  ci <- confint(fit)
  expect_identical(dim(ci), c(1L, 2L))
  expect_identical(colnames(ci), c("5 %", "95 %"))
  expect_identical(as.vector(ci), fit$conf_int)
  expect_error(confint(fit, level = 0.95), "computed at level 0.9")
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
  expect_output(print(fit), "back-transformed means need a correction")
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
