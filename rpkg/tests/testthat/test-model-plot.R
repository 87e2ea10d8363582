# plot() of a pwb_model draws its panels (to a file in tempdir()).

test_that("plot draws the residual panels and the before/after comparison", {
  set.seed(8)
  d <- data.frame(x = runif(60, 1, 5), w = rnorm(60), g = factor(rep(c("a", "b"), 30)))
  d$y <- exp(1 + 0.4 * d$x + rnorm(60, sd = 0.4))
  m <- lm_transformed(y ~ x + w + g, d, response = new_transform("log"),
                      predictors = list(x = new_transform("log")))
  f <- file.path(tempdir(), "pwb_test_plot.png")
  grDevices::png(f)
  on.exit(grDevices::dev.off())
  expect_identical(plot(m), m)
  expect_identical(plot(m, compare = TRUE), m)
  expect_error(plot(m, compare = NA), "TRUE or FALSE")
  expect_equal(pwb_numeric_model_predictors(m), c("x", "w"))
})
