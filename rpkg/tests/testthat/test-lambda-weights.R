# Weighted response lambda: the profile and the estimate against by-hand weighted lm refits.

# Reference for every test here: base R lm(z ~ ..., weights = w) refitted at each fixed lambda,
# its stats::logLik (which for a weighted fit is 0.5 sum(log w) - n/2 (log(2 pi) + 1 - log n +
# log(sum(w e^2))), zero weights dropped) plus the Box-Cox Jacobian (lambda - 1) sum(log y) over
# the rows of positive weight, computed by hand.
by_hand_profile <- function(lam, formula, d, w) {
  y <- stats::model.response(stats::model.frame(formula, d))
  z <- if (lam == 0) log(y) else (y^lam - 1) / lam
  dz <- d
  dz$.z <- z
  dz$.w <- w
  f <- stats::update(formula, .z ~ .)
  ll <- as.numeric(stats::logLik(stats::lm(f, data = dz, weights = .w)))
  ll + (lam - 1) * sum(log(y[w > 0]))
}

# lambda-hat by base R optimize() over the by-hand profile, and the interval ends by uniroot()
# on profile - (max - qchisq(level, 1) / 2).
by_hand_estimate <- function(formula, d, w, range = c(-3, 3), level = 0.95) {
  prof <- function(l) by_hand_profile(l, formula, d, w)
  o <- stats::optimize(prof, range, maximum = TRUE, tol = 1e-10)
  cut <- o$objective - stats::qchisq(level, 1) / 2
  g <- function(l) prof(l) - cut
  lo <- stats::uniroot(g, c(range[1], o$maximum), tol = 1e-12)$root
  hi <- stats::uniroot(g, c(o$maximum, range[2]), tol = 1e-12)$root
  c(lambda = o$maximum, low = lo, high = hi)
}

test_that("weighted profile equals logLik of weighted lm refits plus the Jacobian (airquality)", {
  # Data: datasets::airquality, complete cases of Ozone ~ Solar.R + Wind + Temp; weights of our
  # choosing: 1 / Month (later months treated as noisier), and a version with zero weights.
  aq <- stats::na.omit(datasets::airquality[, c("Ozone", "Solar.R", "Wind", "Temp", "Month")])
  aq$w <- 1 / aq$Month
  f <- Ozone ~ Solar.R + Wind + Temp
  X <- stats::model.matrix(f, aq)[, -1]
  for (lam in c(-0.5, 0, 0.25, 0.5, 1)) {
    got <- powerback:::rpwb_lambda_profile(aq$Ozone, X, "box-cox", lam, aq$w)
    # 1e-8 relative: two least-squares solutions of one problem, rounding only
    expect_equal(got, by_hand_profile(lam, f, aq, aq$w), tolerance = 1e-8)
  }
  w0 <- aq$w
  w0[c(3, 10, 50)] <- 0
  for (lam in c(-0.3, 0.4)) {
    got <- powerback:::rpwb_lambda_profile(aq$Ozone, X, "box-cox", lam, w0)
    expect_equal(got, by_hand_profile(lam, f, aq, w0), tolerance = 1e-8)
  }
})

test_that("weighted lambda-hat and interval equal optimize + uniroot over weighted refits", {
  aq <- stats::na.omit(datasets::airquality[, c("Ozone", "Solar.R", "Wind", "Temp", "Month")])
  aq$w <- 1 / aq$Month
  f <- Ozone ~ Solar.R + Wind + Temp
  fit <- estimate_response_lambda(f, data = aq, weights = w)
  ref <- by_hand_estimate(f, aq, aq$w)
  # 1e-6: optimize() at tol 1e-10 and our Brent at half the mantissa both locate a flat maximum
  # to about 1e-8; the interval ends are simple roots solved tighter still
  expect_equal(fit$lambda, ref[["lambda"]], tolerance = 1e-6)
  expect_equal(fit$conf_int, unname(ref[c("low", "high")]), tolerance = 1e-6)
  expect_identical(fit$n, nrow(aq))
  expect_true(fit$weighted)
  # The same weights given as a vector, and from a weighted lm fit.
  wv <- aq$w
  expect_equal(estimate_response_lambda(f, data = aq, weights = wv)$lambda, fit$lambda)
  expect_equal(estimate_response_lambda(stats::lm(f, data = aq, weights = w))$lambda, fit$lambda)
})

test_that("weighted estimate recovers a known lambda in simulated data", {
  # Simulated: y^0.5 linear in x with error variance 0.04 / w; true lambda 0.5.
  set.seed(71)
  n <- 400
  d <- data.frame(x = runif(n, 0, 3), w = sample(c(0.5, 1, 4), n, TRUE))
  z <- 2 + 0.8 * d$x + rnorm(n, sd = 0.2 / sqrt(d$w))
  d$y <- z^2
  fit <- estimate_response_lambda(y ~ x, data = d, weights = w)
  ref <- by_hand_estimate(y ~ x, d, d$w)
  expect_equal(fit$lambda, ref[["lambda"]], tolerance = 1e-6)  # as above
  expect_equal(fit$conf_int, unname(ref[c("low", "high")]), tolerance = 1e-6)
  expect_lt(fit$conf_int[1], 0.5)  # the true power lies inside the 95% interval
  expect_gt(fit$conf_int[2], 0.5)
  # Binned sums (n above the binned path's minimum) with weights give the same as the by-hand
  # profile too.
  set.seed(72)
  n <- 20000
  b <- data.frame(x = runif(n, 0, 3), w = sample(c(0, 0.5, 1, 4), n, TRUE))
  b$y <- (2 + 0.8 * b$x + rnorm(n, sd = 0.2 / sqrt(pmax(b$w, 0.5))))^2
  X <- matrix(b$x)
  for (lam in c(0.2, 0.5)) {
    expect_equal(powerback:::rpwb_lambda_profile(b$y, X, "box-cox", lam, b$w),
                 by_hand_profile(lam, y ~ x, b, b$w), tolerance = 1e-8)
  }
})

test_that("zero weights drop rows, subset chooses rows, bad weights name rows", {
  set.seed(73)
  d <- data.frame(x = runif(40), w = runif(40, 0.5, 2))
  d$y <- exp(1 + d$x + rnorm(40, sd = 0.3))
  d$w[c(4, 9)] <- 0
  d$y[4] <- -1  # a zero-weight row is never checked
  fit <- estimate_response_lambda(y ~ x, data = d, weights = w)
  ref <- estimate_response_lambda(y ~ x, data = d[-c(4, 9), ], weights = w)
  expect_identical(fit$n, 38L)
  expect_equal(fit$lambda, ref$lambda, tolerance = 1e-12)
  sub <- estimate_response_lambda(y ~ x, data = d, subset = x > 0.2 & w > 0)
  expect_equal(sub$lambda, estimate_response_lambda(y ~ x, data = d[d$x > 0.2 & d$w > 0, ])$lambda)
  d$w[c(4, 9)] <- c(-1, -2)
  expect_error(estimate_response_lambda(y ~ x, data = d, weights = w),
               "`weights` must be >= 0; 2 negative at rows 4, 9", fixed = TRUE)
  d$w[c(4, 9)] <- 1
  d$w[12] <- Inf
  expect_error(estimate_response_lambda(y ~ x, data = d, weights = w),
               "`weights` have 1 infinite value at row 12", fixed = TRUE)
  # With a subset, rows are still the data's rows.
  d$w[12] <- 1
  d$y[c(4, 30)] <- c(-1, 0)
  expect_error(estimate_response_lambda(y ~ x, data = d, subset = x > -1 & seq_len(40) > 2),
               "Box-Cox needs y > 0; 2 values <= 0 at rows 4, 30", fixed = TRUE)
})

test_that("weights in estimate_lambda follow the same rule", {
  # Reference: the weighted mean model, lm(z ~ 1, weights = w) by hand, at fixed lambda.
  set.seed(74)
  x <- rgamma(80, 3)
  w <- runif(80, 0.3, 3)
  fit <- estimate_lambda(x, weights = w)
  prof <- function(l) {
    z <- if (l == 0) log(x) else (x^l - 1) / l
    as.numeric(stats::logLik(stats::lm(z ~ 1, weights = w))) + (l - 1) * sum(log(x))
  }
  o <- stats::optimize(prof, c(-3, 3), maximum = TRUE, tol = 1e-10)
  expect_equal(fit$lambda, o$maximum, tolerance = 1e-6)  # both locate a flat maximum to ~1e-8
  expect_equal(fit$loglik, o$objective, tolerance = 1e-10)
})
