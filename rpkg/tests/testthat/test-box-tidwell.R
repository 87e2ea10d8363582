sim_bt <- function(alpha, n, seed) {
  set.seed(seed)
  d <- data.frame(x = runif(n, 0.5, 6), z = rnorm(n))
  d$y <- 1 + 4 * d$x^alpha + 0.5 * d$z + rnorm(n, sd = 0.3)
  d
}

test_that("known powers 0.5 and -1 are recovered within 2 standard errors", {
  for (alpha in c(0.5, -1)) {
    # 20 simulated data sets: an asymptotically normal estimate (Box & Tidwell 1962) lies within
    # 2 SE about 95% of the time, so at least 16 of 20 must (binomial P(fewer) < 0.003)
    within <- vapply(1:20, function(s) {
      bt <- box_tidwell(y ~ x + z, sim_bt(alpha, 200, 100 * s + (alpha > 0)), vars = "x")
      expect_true(bt$converged)
      abs(bt$table$power - alpha) < 2 * bt$table$se
    }, logical(1))
    expect_gte(sum(within), 16)
    bt <- box_tidwell(y ~ x + z, sim_bt(alpha, 300, 5), vars = "x")
    expect_lt(bt$table$score_p, 1e-6)  # strong curvature: power 1 is rejected
    # rejected power 1: the advice is the convenient power inside the interval
    expect_equal(bt$table$advice, "power")
    expect_equal(bt$transforms$x$family, "power")
    expect_equal(bt$transforms$x$lambda, bt$table$suggested)
    expect_true(bt$table$suggested >= bt$table$conf_low && bt$table$suggested <= bt$table$conf_high)
    # the transforms feed lm_transformed(): the curved fit beats the straight line (base R AIC)
    m <- lm_transformed(y ~ x + z, sim_bt(alpha, 300, 5), response = "none",
                        predictors = bt$transforms)
    expect_lt(AIC(m), AIC(lm(y ~ x + z, sim_bt(alpha, 300, 5))) - 10)
  }
})

test_that("the first update equals the closed form computed with lm()", {
  d <- sim_bt(0.5, 150, 7)
  # Box & Tidwell (1962): alpha_1 = 1 + g / b, b from y ~ x + z, g the coefficient of x log x
  # in y ~ x + z + x log x; base R lm() computes both independently of the package
  b <- coef(lm(y ~ x + z, d))[["x"]]
  fit2 <- lm(y ~ x + z + I(x * log(x)), d)
  g <- coef(fit2)[[4]]
  bt1 <- box_tidwell(y ~ x + z, d, vars = "x", max_iter = 1)
  # two QR fits of the same data: agreement to rounding, 1e-10 allows for the conditioning
  expect_equal(bt1$history["x", 2], 1 + g / b, tolerance = 1e-10)
  expect_false(bt1$converged)
  # the score test of power 1 is the t value of x log x (base R summary.lm)
  t_ref <- summary(fit2)$coefficients[4, "t value"]
  expect_equal(bt1$table$score_t, t_ref, tolerance = 1e-10)
  expect_equal(bt1$score_df, fit2$df.residual)
})

test_that("an lm gives the same result as its formula, and vars defaults to numeric terms", {
  d <- sim_bt(-1, 120, 3)
  fit <- lm(y ~ x + z, data = d)
  a <- box_tidwell(fit, vars = "x")
  b <- box_tidwell(y ~ x + z, d, vars = "x")
  expect_equal(a$table, b$table)
  d$z <- d$z + 10  # positive, so the default takes both numeric predictors
  both <- box_tidwell(y ~ x + z, d)
  expect_equal(both$table$variable, c("x", "z"))
})

test_that("a log relationship suggests the log transform", {
  set.seed(11)
  d <- data.frame(x = runif(200, 0.5, 20))
  d$y <- 2 + 3 * log(d$x) + rnorm(200, sd = 0.2)
  bt <- box_tidwell(y ~ x, d)
  expect_lt(abs(bt$table$power), 2 * bt$table$se)
  expect_equal(bt$transforms$x$family, "log")
  expect_output(print(bt), "converged in")
  expect_output(print(bt), "x .* log\n")
})

test_that("non-positive values name the variable, count and rows", {
  d <- sim_bt(0.5, 30, 5)
  d$x[c(4, 9)] <- c(0, -1)
  d$z[2] <- NA  # row 2 is dropped by na.omit: rows stay those of the data
  expect_error(box_tidwell(y ~ x + z, d, vars = "x"),
               "`x` has 2 values <= 0, at rows 4, 9: shift it")
  expect_error(box_tidwell(y ~ x + z, d, vars = "w"), "plain terms; not: w")
  expect_error(box_tidwell(y ~ x, d[1:3, ], vars = "x"), "more rows")
  expect_error(box_tidwell(y ~ x, d, max_iter = 0), "max_iter")
  expect_error(box_tidwell(y ~ x * z, d[-c(4, 9), ], vars = "x"), "`x` also appears in another term")
  expect_error(box_tidwell(y ~ x, d[-c(4, 9), ], weights = -z), "weights must be finite and >= 0")
})

test_that("leave it linear when the score test does not reject", {
  # MASS::hills: time ~ climb has power 1.29 with interval [0.60, 1.99] and p = 0.34 (values from
  # a run of this function, checked against the score t of base R summary.lm below)
  skip_if_not_installed("MASS")
  bt <- box_tidwell(time ~ climb, MASS::hills)
  fit <- lm(time ~ climb + I(climb * log(climb)), MASS::hills)
  expect_equal(bt$table$score_t, summary(fit)$coefficients[3, "t value"], tolerance = 1e-10)
  expect_gt(bt$table$score_p, 0.05)
  expect_equal(bt$table$advice, "linear")
  expect_equal(bt$table$suggested, 1)
  expect_equal(bt$transforms$climb$family, "identity")
  expect_output(print(bt), "none \\(linear\\)")
  # datasets::airquality, Temp in log(Ozone) ~ Solar.R + Wind + Temp: p = 0.17, interval holds 1
  aq <- box_tidwell(log(Ozone) ~ Solar.R + Wind + Temp, airquality, vars = "Temp")
  expect_gt(aq$table$score_p, 0.05)
  expect_equal(aq$table$advice, "linear")
  # the Wald interval: power +- qnorm(0.975) se (base R qnorm)
  expect_equal(aq$table$conf_high - aq$table$power, qnorm(0.975) * aq$table$se, tolerance = 1e-12)
})

test_that("weights and subset follow lm: the first update and score test equal weighted lm fits", {
  d <- sim_bt(0.5, 150, 7)
  d$w <- rep(c(0.5, 1, 2), 50)
  # Box & Tidwell (1962) closed form with weighted least squares: base R lm(weights =)
  b <- coef(lm(y ~ x + z, d, weights = w))[["x"]]
  fit2 <- lm(y ~ x + z + I(x * log(x)), d, weights = w)
  bt1 <- box_tidwell(y ~ x + z, d, vars = "x", weights = w, max_iter = 1)
  # two QR fits of the same weighted data: rounding only, 1e-10 allows for the conditioning
  expect_equal(bt1$history["x", 2], 1 + coef(fit2)[[4]] / b, tolerance = 1e-10)
  expect_equal(bt1$table$score_t, summary(fit2)$coefficients[4, "t value"], tolerance = 1e-10)
  expect_true(bt1$weighted)
  # a weighted lm brings its weights
  full <- box_tidwell(y ~ x + z, d, vars = "x", weights = w)
  expect_equal(box_tidwell(lm(y ~ x + z, d, weights = w), vars = "x")$table, full$table)
  # zero weight = the row left out; subset = the rows kept
  d$w0 <- 1
  d$w0[c(3, 50)] <- 0
  a <- box_tidwell(y ~ x + z, d, vars = "x", weights = w0)
  ref <- box_tidwell(y ~ x + z, d[-c(3, 50), ], vars = "x")
  expect_equal(a$table$power, ref$table$power, tolerance = 1e-12)  # the same fits: rounding only
  expect_equal(a$table$se, ref$table$se, tolerance = 1e-12)
  expect_equal(a$n, 148L)
  s <- box_tidwell(y ~ x + z, d, vars = "x", subset = x > 1)
  expect_equal(s$table, box_tidwell(y ~ x + z, d[d$x > 1, ], vars = "x")$table)
  # errors name rows by the data's row names
  rownames(d) <- paste0("site", seq_len(nrow(d)))
  d$x[7] <- -1
  expect_error(box_tidwell(y ~ x + z, d, vars = "x"), "at row site7")
  d$w[9] <- -2
  expect_error(box_tidwell(y ~ x + z, d, vars = "x", weights = w), "at row site9")
  expect_error(box_tidwell(lm(y ~ x + z, d), vars = "x", weights = w), "when fitting the lm")
})
