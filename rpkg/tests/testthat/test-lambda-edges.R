# The response lambda at the edges: units, exact fits, wide ranges, unclear input.

test_that("the estimate does not depend on the units of y", {
  # y of order 1e8 with lambda-hat near -2; the same data x1e-200, x1, x1e8, x1e200 (Box-Cox is
  # scale-equivariant: the log-likelihood shifts by exactly -n log(scale), the Jacobian of units).
  set.seed(81)
  d <- data.frame(u = rnorm(300), v = rnorm(300))
  d$y <- (2 + 0.3 * d$u - 0.2 * d$v + rnorm(300, sd = 0.15))^(-0.5)
  base <- estimate_response_lambda(y ~ u + v, data = d)
  expect_equal(base$lambda, -2, tolerance = 0.25)  # generated at -2
  for (s in c(1e-200, 1e8, 1e200)) {
    ds <- d
    ds$y <- d$y * s
    e <- estimate_response_lambda(y ~ u + v, data = ds)
    # 1e-6: Brent stops on a bracket about 4 * 2^-25 * |lambda| = 3e-7 wide, so rounding-level
    # differences may move it inside; the interval ends are roots solved to 40 bits
    expect_equal(e$lambda, base$lambda, tolerance = 1e-6)
    expect_equal(e$conf_int, base$conf_int, tolerance = 1e-8)
    expect_equal(e$loglik, base$loglik - 300 * log(s), tolerance = 1e-10)
  }
})

test_that("an exact fit is reported, not estimated", {
  d <- data.frame(x = 1:30)
  d$y <- 3 + 2 * d$x
  expect_error(estimate_response_lambda(y ~ x, data = d), "exactly")
})

test_that("at_bound is not set for an interior estimate in a wide range", {
  set.seed(82)
  x <- rlnorm(300, sdlog = 0.7)  # lambda-hat near 0
  wide <- estimate_lambda(x, range = c(-90, 90))
  expect_false(wide$at_bound)
  expect_equal(wide$lambda, estimate_lambda(x)$lambda, tolerance = 1e-6)
  expect_true(estimate_lambda(x, range = c(1, 2))$at_bound)
})

test_that("unclear input gets a message saying what to do", {
  set.seed(83)
  d <- data.frame(u = runif(20), y = rlnorm(20))
  expect_error(estimate_lambda(d$y, range = c(-1e300, 1e300)), "beyond \\+-100")
  expect_error(estimate_response_lambda(y ~ u + zz, data = d),
               "`zz` is not a column of `data`")
  d$s <- as.character(d$y)
  expect_error(estimate_response_lambda(s ~ u, data = d), "response `s` is character")
  d$y[c(3, 7)] <- Inf
  expect_error(estimate_response_lambda(y ~ u, data = d),
               "`y` has 2 infinite values at rows 3, 7", fixed = TRUE)
  d$y[c(3, 7)] <- 1
  d$u[5] <- Inf
  expect_error(estimate_response_lambda(y ~ u, data = d),
               "predictors have infinite values at row 5", fixed = TRUE)
})

test_that("airquality's Ozone interval gives the cube root", {
  # Data: datasets::airquality; Ozone ~ Solar.R + Wind + Temp has the interval [0.084, 0.365]
  # (this package's estimate, checked against lm refits in test-lambda-response.R), which holds
  # 1/3 and no other convenient power.
  fit <- estimate_response_lambda(Ozone ~ Solar.R + Wind + Temp, data = datasets::airquality)
  expect_equal(fit$conf_int, c(0.084, 0.365), tolerance = 0.005 / 0.084)  # printed to 3 digits
  expect_identical(fit$convenient, 1 / 3)
})
