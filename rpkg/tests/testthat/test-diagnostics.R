# residual_checks(): Koenker's Breusch-Pagan, RESET, Shapiro-Wilk and skewness of residuals,
# for a pwb_model and a plain lm, and the before/after table.

pwb_sim_checks <- function(n = 150, seed = 7) {
  set.seed(seed)
  d <- data.frame(x1 = runif(n, 0, 3), x2 = rnorm(n))
  d$y <- exp(0.5 + 0.7 * d$x1 + 0.2 * d$x2 + rnorm(n, sd = 0.6))
  d
}

test_that("Breusch-Pagan equals n R^2 of the auxiliary regression", {
  d <- pwb_sim_checks()
  fit <- lm(y ~ x1 + x2, d)
  ch <- residual_checks(fit)
  # Koenker (1981) studentized form of Breusch & Pagan (1979), computed with base R lm():
  # regress the squared residuals on the regressors, statistic n R^2, chi-square(2) p-value.
  aux <- lm(residuals(fit)^2 ~ x1 + x2, d)
  stat <- nrow(d) * summary(aux)$r.squared
  expect_equal(ch$breusch_pagan$statistic, stat, tolerance = 1e-10)
  expect_equal(ch$breusch_pagan$df, 2)
  expect_equal(ch$breusch_pagan$p_value, pchisq(stat, 2, lower.tail = FALSE), tolerance = 1e-10)
})

test_that("RESET equals anova() of the nested fits", {
  d <- pwb_sim_checks()
  m <- lm_transformed(y ~ x1 + x2, d, response = new_transform("log"))
  ch <- residual_checks(m)
  # Ramsey (1969): F test of adding fitted^2 and fitted^3, by base R anova() of nested lm fits.
  d$z <- log(d$y)
  base <- lm(z ~ x1 + x2, d)
  d$f <- fitted(base)
  big <- lm(z ~ x1 + x2 + I(f^2) + I(f^3), d)
  a <- anova(base, big)
  expect_equal(ch$reset$statistic, a$F[2], tolerance = 1e-8)  # raw powers: worse conditioned
  expect_equal(ch$reset$p_value, a[["Pr(>F)"]][2], tolerance = 1e-8)
  expect_equal(c(ch$reset$df1, ch$reset$df2), c(2, nrow(d) - 5))
})

test_that("Shapiro-Wilk and skewness of the transformed-scale residuals", {
  d <- pwb_sim_checks()
  m <- lm_transformed(y ~ x1 + x2, d, response = new_transform("log"))
  ch <- residual_checks(m)
  r <- residuals(lm(log(y) ~ x1 + x2, d))
  # Reference: base R shapiro.test() (same algorithm family; 1e-6 allows its float constants).
  sw <- shapiro.test(r)
  expect_equal(ch$shapiro_wilk$statistic, unname(sw$statistic), tolerance = 1e-6)
  expect_equal(ch$shapiro_wilk$p_value, sw$p.value, tolerance = 1e-6)
  # Adjusted Fisher-Pearson skewness G1 = sqrt(n(n-1))/(n-2) * m3 / m2^1.5 (Joanes & Gill 1998).
  n <- length(r)
  m2 <- mean((r - mean(r))^2)
  m3 <- mean((r - mean(r))^3)
  expect_equal(ch$skewness, sqrt(n * (n - 1)) / (n - 2) * m3 / m2^1.5, tolerance = 1e-10)
})

test_that("before/after table uses the untransformed twin", {
  d <- pwb_sim_checks()
  m <- lm_transformed(y ~ x1 + x2, d, response = new_transform("log"))
  ch <- residual_checks(m, compare = TRUE)
  twin <- residual_checks(lm(y ~ x1 + x2, d))
  expect_equal(ch$comparison$untransformed, twin$table$statistic, tolerance = 1e-12)
  expect_equal(ch$comparison$transformed, ch$table$statistic)
  # A lognormal truth: the raw fit's residuals are heteroscedastic and skewed, the log fit's not.
  expect_lt(twin$breusch_pagan$p_value, 0.01)
  expect_gt(twin$skewness, ch$skewness)
  expect_output(print(ch), "Before \\(untransformed\\)")
})

test_that("bad objects are refused", {
  d <- pwb_sim_checks(30)
  expect_error(residual_checks(lm(y ~ x1, d), compare = TRUE), "needs a pwb_model")
  expect_error(residual_checks(list()), "pwb_model")
})

test_that("Breusch-Pagan of a model without an intercept keeps one in the auxiliary fit", {
  d <- pwb_sim_checks(80, 9)
  fit <- lm(y ~ 0 + x1 + x2, d)
  ch <- residual_checks(fit)
  # Koenker (1981): the auxiliary regression has an intercept; base R lm() and summary().
  aux <- lm(residuals(fit)^2 ~ x1 + x2, d)
  expect_equal(ch$breusch_pagan$statistic, 80 * summary(aux)$r.squared, tolerance = 1e-10)
  expect_equal(ch$breusch_pagan$df, 2)
  expect_true(is.finite(ch$reset$statistic))
})

test_that("a weighted lm is checked through its weighted regression", {
  d <- pwb_sim_checks(60)
  d$w <- rep(c(0.5, 1, 2), 20)
  ch <- residual_checks(lm(y ~ x1 + x2, d, weights = w))
  # Reference: the unweighted regression of sqrt(w) y on sqrt(w) [1 x1 x2] by base R lm(), and
  # Koenker's statistic n R^2 of its squared residuals on [1, sqrt(w), sqrt(w) x1, sqrt(w) x2]
  # (summary.lm r.squared); tolerance 1e-9 for two different QR routes.
  sw <- sqrt(d$w)
  by_hand <- lm(I(sw * y) ~ 0 + sw + I(sw * x1) + I(sw * x2), d)
  u <- residuals(by_hand)^2
  bp <- 60 * summary(lm(u ~ sw + I(sw * d$x1) + I(sw * d$x2)))$r.squared
  expect_equal(ch$breusch_pagan$statistic, bp, tolerance = 1e-9)
  expect_equal(ch$breusch_pagan$df, 3)
  # Shapiro-Wilk of the weighted residuals: base R shapiro.test().
  expect_equal(ch$shapiro_wilk$statistic,
               unname(stats::shapiro.test(residuals(by_hand))$statistic), tolerance = 1e-6)
  m <- lm_transformed(y ~ x1 + x2, d, weights = w, response = "none")
  expect_equal(residual_checks(m)$table$statistic, ch$table$statistic, tolerance = 1e-10)
})

test_that("a formula is fitted with data, weights and subset first", {
  d <- pwb_sim_checks(60)
  d$w <- rep(c(0.5, 1, 2), 20)
  # Reference: the same checks of base R lm(weights =, subset =) fitted by hand.
  ref <- residual_checks(lm(y ~ x1 + x2, d, weights = w, subset = x2 > -1))
  got <- residual_checks(y ~ x1 + x2, data = d, weights = w, subset = x2 > -1)
  expect_identical(got$table, ref$table)
  expect_error(residual_checks(lm(y ~ x1, d), weights = w), "go with a formula")
})
