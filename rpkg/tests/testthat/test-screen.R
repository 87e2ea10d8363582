# screen_skew(): one row per numeric variable, the ladder and ML transforms with the statistics
# after each, and honest rows for columns that cannot be screened.

# |actual - expected| <= tol (an absolute tolerance; expect_equal's is relative).
expect_near <- function(actual, expected, tol) expect_lte(abs(actual - expected), tol)

screen_data <- function() {
  set.seed(2026)
  n <- 150
  data.frame(
    right = rlnorm(n, 2, 0.45),              # substantial right skew (G1 about 1.5)
    left = 50 - rexp(n, 0.25),               # left skew
    symmetric = rnorm(n, 10, 2),             # no skew to speak of
    counts = rpois(n, 1.2),                  # right skew with zeros: needs a shift
    label = sample(c("a", "b"), n, TRUE),    # not numeric
    stringsAsFactors = FALSE)
}

test_that("the screen's statistics equal base R on each column and after each transform", {
  # Sources: stats::shapiro.test for W and p (tolerance 1e-6 absolute, the same published
  # approximation); base R sqrt/log10 and -1/v for the ladder's transforms (1e-12: arithmetic).
  d <- screen_data()
  s <- screen_skew(d)
  expect_s3_class(s, "pwb_screen")
  expect_equal(s$table$variable, c("right", "left", "symmetric", "counts"))
  expect_equal(s$skipped, "label")
  for (v in s$table$variable) {
    r <- s$table[s$table$variable == v, ]
    x <- d[[v]]
    expect_near(r$sw_w, unname(stats::shapiro.test(x)$statistic), 1e-6)
    expect_near(r$sw_p, stats::shapiro.test(x)$p.value, 1e-6)
    z <- apply_transform(s$ladder[[v]], x)
    expect_near(r$ladder_sw_p, stats::shapiro.test(z)$p.value, 1e-6)
    zm <- apply_transform(s$ml[[v]], x)
    expect_near(r$ml_sw_w, unname(stats::shapiro.test(zm)$statistic), 1e-6)
    # the skewness after equals the moments of the transformed values
    expect_equal(r$ladder_skewness, screen_skew(data.frame(z = z))$table$skewness,
                 tolerance = 1e-12)
  }
})

test_that("the ladder picks its step by the documented thresholds and stores its constants", {
  d <- screen_data()
  s <- screen_skew(d)
  t <- s$table
  g1 <- stats::setNames(t$skewness, t$variable)
  z <- stats::setNames(t$skewness_z, t$variable)
  # n = 150 < 300: skewed when |z| > 3.29; then sqrt / log10 / reciprocal by |G1| <= 1, <= 2, > 2.
  expected <- function(v) {
    if (abs(z[[v]]) <= 3.29) return("none")
    if (abs(g1[[v]]) <= 1) "sqrt" else if (abs(g1[[v]]) <= 2) "log10" else "reciprocal"
  }
  for (v in t$variable) expect_equal(t$ladder[t$variable == v], expected(v))
  expect_equal(t$ladder[t$variable == "symmetric"], "none")
  expect_identical(s$ladder$symmetric$family, "identity")
  expect_equal(t$ladder_skewness[3], t$skewness[3])
  # Right skew, positive values: no shift, no reflection.
  expect_false(s$ladder$right$reflect)
  expect_equal(s$ladder$right$shift, 0)
  # Left skew: reflected about max + 1, so the reflected values start at 1.
  expect_true(t$skewness[t$variable == "left"] < 0)
  expect_true(s$ladder$left$reflect)
  expect_equal(s$ladder$left$pivot, max(d$left) + 1)
  step <- t$ladder[t$variable == "left"]
  ref <- switch(step, sqrt = sqrt(max(d$left) + 1 - d$left),
                log10 = log10(max(d$left) + 1 - d$left),
                reciprocal = -1 / (max(d$left) + 1 - d$left))
  expect_equal(apply_transform(s$ladder$left, d$left), ref, tolerance = 1e-12)
  # Counts with zeros: shifted so the minimum becomes 1.
  expect_equal(s$ladder$counts$shift, 1 - min(d$counts))
  expect_equal(min(d$counts + s$ladder$counts$shift), 1)
})

test_that("from 300 values on the ladder judges by |G1|, not by z", {
  # A mild skew (G1 about 0.3) is highly 'significant' at n = 4000 but below the 0.5 size cut.
  set.seed(5)
  mild <- rgamma(4000, shape = 45)
  strong <- rgamma(4000, shape = 6)          # G1 about 2 / sqrt(6) = 0.82
  s <- screen_skew(data.frame(mild = mild, strong = strong))
  t <- s$table
  expect_true(t$skewness_z[1] > 3.29 && abs(t$skewness[1]) <= 0.5)
  expect_equal(t$ladder[1], "none")
  expect_true(abs(t$skewness[2]) > 0.5 && abs(t$skewness[2]) <= 1)
  expect_equal(t$ladder[2], "sqrt")
})

test_that("the ML alternative is Box-Cox for positive data, Yeo-Johnson otherwise", {
  # Source of the check: the Box-Cox profile log-likelihood of Box & Cox (1964), maximised with
  # base R stats::optimize over (-3, 3). Tolerance 1e-3: optimize's default tolerance is about
  # 1e-4 in lambda on a flat-topped profile.
  d <- screen_data()
  s <- screen_skew(d, vars = c("right", "counts"))
  t <- s$table
  expect_equal(t$ml_family, c("box-cox", "yeo-johnson"))
  x <- d$right
  prof <- function(l) {
    z <- if (abs(l) < 1e-12) log(x) else (x^l - 1) / l
    -length(x) / 2 * log(mean((z - mean(z))^2)) + (l - 1) * sum(log(x))
  }
  lam <- stats::optimize(prof, c(-3, 3), maximum = TRUE)$maximum
  expect_near(t$ml_lambda[1], lam, 1e-3)
  expect_true(t$ml_conf_low[1] < t$ml_lambda[1] && t$ml_lambda[1] < t$ml_conf_high[1])
  expect_true(t$ml_convenient[1] >= t$ml_conf_low[1] && t$ml_convenient[1] <= t$ml_conf_high[1])
  expect_equal(s$ml$right$lambda, t$ml_convenient[1])
  expect_identical(s$ml$counts$family, "yeo-johnson")
  expect_true(t$ml_converged[1])
  expect_false(t$ml_at_bound[1])
})

test_that("missing values are left out per column and counted, never silently", {
  d <- screen_data()
  d$right[c(4, 9, 30)] <- NA
  s <- screen_skew(d, vars = c("right", "symmetric"))
  expect_equal(s$table$n, c(147L, 150L))
  expect_equal(s$table$n_missing, c(3L, 0L))
  keep <- !is.na(d$right)
  expect_near(s$table$sw_w[1], unname(stats::shapiro.test(d$right[keep])$statistic), 1e-6)
  expect_output(print(s), "147 \\(3 NA\\)")
})

test_that("unusable columns get a row that says why; the rest are still screened", {
  d <- data.frame(ok = c(1.5, 2.2, 2.9, 3.1, 4.8, 6.0, 9.7, 15.2),
                  short = c(1, 2, NA, NA, NA, NA, NA, NA),
                  flat = rep(4, 8),
                  inf = c(1, 2, Inf, 4, 5, -Inf, 7, 8),
                  when = as.Date("2026-01-01") + 0:7)
  s <- screen_skew(d)
  t <- s$table
  expect_equal(t$variable, c("ok", "short", "flat", "inf"))
  expect_false(is.na(t$sw_w[1]))
  expect_match(t$note[2], "fewer than 3 values")
  expect_equal(t$n[2], 2L)
  expect_equal(t$n_missing[2], 6L)
  expect_match(t$note[3], "identical")
  expect_match(t$note[4], "2 infinite values at rows 3, 6")
  expect_true(all(is.na(t$sw_w[2:4])))
  expect_null(s$ladder$flat)
  expect_equal(s$skipped, "when")
  out <- capture.output(print(s))
  expect_true(any(grepl("Skipped \\(not numeric\\): when", out)))
  expect_true(any(grepl("flat: all values are identical", out)))
})

test_that("columns beyond 5000 values are screened but Shapiro-Wilk is skipped with a note", {
  set.seed(8)
  s <- screen_skew(data.frame(big = rexp(6000)))
  expect_true(is.na(s$table$sw_p))
  expect_true(is.na(s$table$ladder_sw_p))
  expect_match(s$table$note, "5000")
  expect_false(is.na(s$table$skewness))
  expect_equal(s$table$ladder, "log10")  # G1 of an exponential is 2; the sample's is near it
})

test_that("print and summary show the figures and the cautions", {
  s <- screen_skew(screen_data())
  expect_output(print(s), "skewness screen of 4 variables")
  expect_output(print(s), "\\|z\\| > 3.29 \\(n < 300\\)")
  expect_output(print(s), "back-transformed means need a\\s+correction")
  expect_output(print(summary(s)), "excess kurtosis G2")
  expect_output(print(summary(s)), "ML box-cox: lambda = ")
  expect_equal(as.data.frame(s), s$table)
  v <- screen_skew(c(3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8, 9, 7, 9))
  expect_equal(nrow(v$table), 1L)
})

test_that("bad arguments are clear errors", {
  d <- screen_data()
  expect_error(screen_skew(d, level = 1.2), "`level` must be a single number")
  expect_error(screen_skew(d, vars = c("right", "nope")), "not in `data`: nope")
  expect_error(screen_skew("text"), "`data` must be a data frame")
})

test_that("an estimate at the search bound is flagged in the table and the print", {
  # Left-skewed positive data push the Box-Cox lambda-hat up to the range edge 3.
  set.seed(3)
  s <- screen_skew(data.frame(score = 100 - rexp(200, 0.2)))
  expect_true(s$table$ml_at_bound)
  expect_true(s$table$ml_high_open)
  expect_equal(s$table$ml_conf_high, 3)
  expect_output(print(s), "lambda-hat at the edge of the search range")
  expect_output(print(summary(s)), "at the search bound, interval open\\s+at the range edge")
})

test_that("the ML columns are estimate_lambda()'s own figures", {
  # The screen and estimate_lambda() run the same estimator: identical to 1e-12.
  d <- screen_data()
  s <- screen_skew(d, vars = c("right", "counts"), level = 0.9)
  a <- estimate_lambda(d$right, family = "box-cox", level = 0.9)
  expect_equal(s$table$ml_lambda[1], a$lambda, tolerance = 1e-12)
  expect_equal(c(s$table$ml_conf_low[1], s$table$ml_conf_high[1]), unname(a$conf_int),
               tolerance = 1e-12)
  expect_equal(s$table$ml_convenient[1], a$convenient)
  b <- estimate_lambda(d$counts, family = "yeo-johnson", level = 0.9)
  expect_equal(s$table$ml_lambda[2], b$lambda, tolerance = 1e-12)
  expect_equal(s$level, 0.9)
})

test_that("a data set without numeric columns gives an empty screen that says so", {
  s <- screen_skew(data.frame(a = letters[1:5], b = factor(1:5)))
  expect_equal(nrow(s$table), 0L)
  expect_true("ml_sw_p" %in% names(s$table))
  expect_equal(s$skipped, c("a", "b"))
  expect_output(print(s), "skewness screen of 0 variables")
  expect_output(print(s), "Skipped \\(not numeric\\): a, b")
})

test_that("a vector is labelled by its expression, as estimate_lambda() labels it", {
  tb <- airquality  # datasets package
  s <- screen_skew(tb$Ozone)
  expect_equal(s$table$variable, "tb$Ozone")
  expect_equal(estimate_lambda(tb$Ozone)$variable, s$table$variable)
  expect_output(print(s), "tb\\$Ozone")
})
