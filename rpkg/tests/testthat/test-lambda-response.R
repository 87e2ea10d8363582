test_that("poisons additive model reproduces Box and Cox's response lambda", {
  # Box & Cox (1964), JRSS B 26, sec. 6: for time ~ poison + treat, lambda-hat is about -0.75
  # and the interval holds -1 (the reciprocal adopted). Data: boot::poisons, read from the
  # shared fixture poisons.csv that tests/fixtures/make_poisons.R writes from the boot package
  # (the ctest fixture.poisons_reproduces checks it still equals boot::poisons).
  e <- list(poisons = utils::read.csv(fixture_path("poisons.csv"),
                                      colClasses = c("numeric", "factor", "factor")))
  expect_identical(dim(e$poisons), c(48L, 3L))
  fit <- estimate_response_lambda(time ~ poison + treat, data = e$poisons)
  expect_equal(fit$lambda, -0.75, tolerance = 0.03 / 0.75)  # the paper's value is read off a plot
  expect_lt(fit$conf_int[1], -1)
  expect_gt(fit$conf_int[2], -1)
  expect_identical(fit$convenient, -1)
  expect_identical(fit$rank, 6L)
  expect_identical(fit$variable, "time")
  # The same from the lm fit.
  fit_lm <- estimate_response_lambda(stats::lm(time ~ poison + treat, data = e$poisons))
  expect_equal(fit_lm$lambda, fit$lambda, tolerance = 1e-10)
})

test_that("the profile equals lm refits of the transformed response", {
  # Reference: base R lm() refitted at each fixed lambda; the log-likelihood of the transformed
  # fit (stats::logLik, MLE variance) plus the Box-Cox Jacobian (lambda - 1) sum(log y).
  set.seed(5)
  d <- data.frame(g = gl(4, 15), u = runif(60), w = rnorm(60))
  d$y <- exp(0.5 + as.integer(d$g) / 3 + d$u + rnorm(60, sd = 0.4))
  X <- stats::model.matrix(~ g + u + w, d)[, -1]
  for (lam in c(-1.2, -0.4, 0, 0.7, 1.5)) {
    z <- if (lam == 0) log(d$y) else (d$y^lam - 1) / lam
    ref <- as.numeric(stats::logLik(stats::lm(z ~ g + u + w, data = d))) + (lam - 1) * sum(log(d$y))
    got <- powerback:::rpwb_lambda_profile(d$y, X, "box-cox", lam)
    expect_equal(got, ref, tolerance = 1e-10)  # two QR solutions of the same problem
  }
  yj <- d$y - 2  # mixed signs
  for (lam in c(-0.5, 1, 2.5)) {
    z <- apply_transform(new_transform("yeo-johnson", lambda = lam), yj)
    jac <- (lam - 1) * sum(sign(yj) * log1p(abs(yj)))  # log-derivative of Yeo-Johnson
    ref <- as.numeric(stats::logLik(stats::lm(z ~ g + u + w, data = d))) + jac
    expect_equal(powerback:::rpwb_lambda_profile(yj, X, "yeo-johnson", lam), ref, tolerance = 1e-10)
  }
})

test_that("the profile equals lm refits on a large sample too (binned sums, blocked QR)", {
  # Same reference as above. At n = 50000 the profile is evaluated from binned sums gathered
  # while the design is factored block by block; it must still equal the refits.
  set.seed(6)
  n <- 50000
  d <- data.frame(g = gl(4, n / 4), u = runif(n), w = rnorm(n))
  d$y <- exp(0.5 + as.integer(d$g) / 3 + d$u + rnorm(n, sd = 0.4))
  X <- stats::model.matrix(~ g + u + w, d)[, -1]
  for (lam in c(-1.2, 0, 0.7)) {
    z <- if (lam == 0) log(d$y) else (d$y^lam - 1) / lam
    ref <- as.numeric(stats::logLik(stats::lm(z ~ g + u + w, data = d))) + (lam - 1) * sum(log(d$y))
    got <- powerback:::rpwb_lambda_profile(d$y, X, "box-cox", lam)
    expect_equal(got, ref, tolerance = 1e-10)
  }
  fit <- estimate_response_lambda(y ~ g + u + w, data = d)
  expect_equal(fit$lambda, 0, tolerance = 0.02)  # generated on the log scale
  expect_true(fit$converged)
})

test_that("factors, na.action and rows follow lm", {
  set.seed(8)
  d <- data.frame(g = factor(sample(c("a", "b", "c"), 40, TRUE)), u = runif(40))
  d$y <- exp(1 + d$u + rnorm(40, sd = 0.3))
  d$u[c(3, 9)] <- NA
  fit <- estimate_response_lambda(y ~ g + u, data = d)
  expect_identical(fit$n, 38L)
  expect_identical(sort(as.integer(fit$na_action)), c(3L, 9L))
  ex <- estimate_response_lambda(y ~ g + u, data = d, na.action = stats::na.exclude)
  expect_equal(ex$lambda, fit$lambda)
  expect_error(estimate_response_lambda(y ~ g + u, data = d, na.action = stats::na.fail),
               "missing values")
  d$y[c(5, 20)] <- c(-1, 0)
  expect_error(estimate_response_lambda(y ~ g + u, data = d),
               "Box-Cox needs y > 0; 2 values <= 0 at rows 5, 20: use Yeo-Johnson or a shift",
               fixed = TRUE)
  expect_s3_class(estimate_response_lambda(y ~ g + u, data = d, family = "yeo-johnson"),
                  "pwb_lambda")
})

test_that("aliased columns are dropped and named; unsupported fits are refused", {
  set.seed(9)
  d <- data.frame(u = runif(30), v = runif(30))
  d$u2 <- 2 * d$u
  d$y <- exp(d$u + d$v + rnorm(30, sd = 0.2))
  fit <- estimate_response_lambda(y ~ u + u2 + v, data = d)
  ref <- estimate_response_lambda(y ~ u + v, data = d)
  expect_identical(fit$aliased, "u2")
  expect_identical(fit$rank, 3L)
  expect_equal(fit$loglik, ref$loglik, tolerance = 1e-12)
  expect_output(print(fit), "aliased predictor columns dropped")
  # A weighted lm fit: its weights are reused (the formula with the same weights agrees).
  expect_equal(estimate_response_lambda(stats::lm(y ~ u, data = d, weights = v))$lambda,
               estimate_response_lambda(y ~ u, data = d, weights = v)$lambda, tolerance = 1e-12)
  expect_error(estimate_response_lambda(y ~ u + offset(v), data = d), "offset")
  expect_error(estimate_response_lambda(y ~ u - 1, data = d), "intercept")
  expect_error(estimate_response_lambda(y ~ u + v, data = d[1:3, ]), "n > rank \\+ 1")
  expect_error(estimate_response_lambda("y ~ u", data = d), "formula")
})
