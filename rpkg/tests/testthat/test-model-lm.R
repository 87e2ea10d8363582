# The honest lm of a pwb_model and its saved copies.

test_that("transformed_lm() predicts from raw data what the model predicts, every family", {
  set.seed(3)
  d <- data.frame(x = runif(50, 1, 10), u = rnorm(50), v = runif(50, 0, 5))
  d$y <- exp(0.5 + 0.2 * d$x + 0.1 * d$u + rnorm(50, sd = 0.2))
  nd <- data.frame(x = c(2, 5.5, 9), u = c(-1, 0, 1), v = c(0.5, 2, 4.5))
  cases <- list(
    list(r = new_transform("log"), p = list(x = new_transform("log"))),
    list(r = new_transform("box-cox", lambda = 0.3),
         p = list(x = new_transform("box-cox", lambda = -0.5))),
    list(r = new_transform("yeo-johnson", lambda = 0.2),
         p = list(u = new_transform("yeo-johnson", lambda = 1.5))),
    list(r = new_transform("log", reflect = TRUE, pivot = 100),
         p = list(v = new_transform("sqrt", reflect = TRUE, pivot = 6))))
  for (cs in cases) {
    m <- lm_transformed(y ~ x + u + v, d, response = cs$r, predictors = cs$p)
    fit <- transformed_lm(m)
    expect_s3_class(fit, "lm")
    # the transforms show in the coefficient names
    for (v in names(cs$p)) expect_true(any(grepl(paste0("^pwb_.*\\(", v, "\\)$"), names(coef(fit)))))
    # 1e-12: the same fit by two QR routes, predicted at three rows
    expect_equal(unname(predict(fit, nd)), predict(m, nd, type = "transformed")$fit,
                 tolerance = 1e-12)
    expect_equal(unname(predict(m$lm, nd)), predict(m, nd, type = "transformed")$fit,
                 tolerance = 1e-12)
  }
})

test_that("a saved and reloaded model predicts identically", {
  m <- lm_transformed(Ozone ~ Solar.R + Wind + Temp, airquality, na.action = na.exclude,
                      predictors = list(Wind = new_transform("sqrt")))
  f <- tempfile(fileext = ".rds")
  saveRDS(m, f)
  m2 <- readRDS(f)
  nd <- airquality[1:20, ]
  expect_identical(predict(m2, nd, interval = "prediction"), predict(m, nd, interval = "prediction"))
  m3 <- unserialize(serialize(m, NULL))
  expect_identical(predict(m3, nd, center = "mean"), predict(m, nd, center = "mean"))
  expect_identical(residual_checks(m3)$table, residual_checks(m)$table)
})
