# The design of lm_transformed(): the core model reads R's model matrix in place (one copy of
# the design in all), the handle keeps that matrix alive, a saved model does not carry it, and
# a reloaded model is rebuilt the same way.

pwb_sim_design <- function(n = 2000, seed = 3) {
  set.seed(seed)
  d <- data.frame(a = rlnorm(n), b = rlnorm(n),
                  g = factor(sample(c("x", "y", "z"), n, replace = TRUE)))
  d$v <- exp(0.5 + 0.3 * log(d$a) - 0.2 * d$b + 0.1 * (d$g == "y") + rnorm(n, sd = 0.4))
  d
}

test_that("the model reads a design that outlives the fitting call", {
  d <- pwb_sim_design()
  m <- lm_transformed(v ~ log(a) + b + g, d, response = new_transform("log"))
  # Reference: base R lm() and hatvalues() on the hand-transformed response. Tolerance 1e-10:
  # two QR factorisations of the same well-conditioned 2000 x 5 design agree to ~1e-14.
  ref <- lm(log(v) ~ log(a) + b + g, d)
  invisible(gc())
  invisible(gc())
  expect_equal(unname(m$leverages), unname(hatvalues(ref)), tolerance = 1e-10)
  expect_equal(unname(predict(m, interval = "confidence", type = "transformed")[, "lwr"]),
               unname(predict(ref, interval = "confidence")[, "lwr"]), tolerance = 1e-10)
  # A changed copy of the object shares the live model; dropping the original changes nothing.
  m2 <- m
  m2$call <- NULL
  lev <- m$leverages
  rm(m)
  invisible(gc())
  expect_identical(m2$leverages, lev)
})

test_that("the live handle does not serialise the design", {
  d <- pwb_sim_design()
  m <- lm_transformed(v ~ log(a) + b + g, d)
  ptr <- .subset2(m, "handle")$ptr
  expect_true(powerback:::rpwb_model_is_live(ptr))
  # The design alone is 2000 x 5 doubles (80,000 bytes); the pointer must travel without it.
  expect_lt(length(serialize(ptr, NULL)), 1000)
  # The saved model is the model without its handle plus the small handle environment.
  bare <- unclass(m)
  bare$handle <- NULL
  expect_lt(length(serialize(m, NULL)) - length(serialize(bare, NULL)), 1000)
})

test_that("a reloaded model rebuilds the same core model", {
  d <- pwb_sim_design(500, 4)
  m <- lm_transformed(v ~ log(a) + b * g, d, predictors = list(b = new_transform("sqrt")))
  f <- tempfile(fileext = ".rds")
  on.exit(unlink(f))
  saveRDS(m, f)
  r <- readRDS(f)
  expect_false(powerback:::rpwb_model_is_live(.subset2(r, "handle")$ptr))
  # The rebuilt model is the same fit bit for bit (same design, same factorisation).
  expect_identical(r$leverages, m$leverages)
  expect_identical(r$residuals, m$residuals)
  new <- d[1:5, ]
  expect_identical(predict(r, new, interval = "prediction"),
                   predict(m, new, interval = "prediction"))
  invisible(gc())
  expect_identical(residual_checks(r)$table, residual_checks(m)$table)
})

test_that("a borrowed design must hold its intercept column", {
  X <- cbind(1, x = c(1, 3, 2, 5, 4, 6))
  y <- c(1.2, 2.9, 2.1, 5.2, 3.9, 6.3)
  h <- powerback:::rpwb_model_new(y, X, TRUE, NULL, 0L, NULL, TRUE)
  # Reference: base R lm() of y on x. Tolerance 1e-12 for a 6-row fit.
  expect_equal(powerback:::rpwb_model_summary(h)$coefficients, unname(coef(lm(y ~ X[, 2]))),
               tolerance = 1e-12)
  lev <- powerback:::rpwb_model_vector(h, 2L)
  # Changing R's matrix afterwards makes R copy it first: the model still reads the original.
  X[2, 1] <- 0
  invisible(gc())
  expect_identical(powerback:::rpwb_model_vector(h, 2L), lev)
  expect_error(powerback:::rpwb_model_new(y, X, TRUE, NULL, 0L, NULL, TRUE),
               "first column of the design must be all ones")
})
