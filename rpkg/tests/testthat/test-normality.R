# Normality statistics as screen_skew() reports them: Shapiro-Wilk and the sample moments.

# The screen's row for one numeric vector.
screen_row <- function(x) screen_skew(data.frame(x = x))$table

# |actual - expected| <= tol (an absolute tolerance; expect_equal's is relative).
expect_near <- function(actual, expected, tol) expect_lte(abs(actual - expected), tol)

test_that("Shapiro-Wilk equals stats::shapiro.test on varied samples", {
  # Source: base R stats::shapiro.test, computed here at test time. Tolerance 1e-6 absolute on
  # W and p (the brief's figure); both implement the same published approximation.
  set.seed(11)
  samples <- list(c(2.1, 3.4, 7.9), c(5, 5, 6), c(1.2, 1.9, 2.2, 6.5), rexp(5), rnorm(6),
                  round(rnorm(9, 0, 2)), rgamma(11, 2), rgamma(12, 2), rnorm(20),
                  rlnorm(20), rpois(30, 2), runif(77), rt(350, 3), rnorm(5000),
                  rchisq(5000, 3))
  for (x in samples) {
    got <- screen_row(x)
    want <- stats::shapiro.test(x)
    expect_equal(got$n, length(x))
    expect_near(got$sw_w, unname(want$statistic), 1e-6)
    expect_near(got$sw_p, want$p.value, 1e-6)
  }
})

test_that("Shapiro-Wilk matches the stored shapiro.test fixture used by the C++ tests", {
  # Source: stats::shapiro.test, stored by tests/fixtures/make_r_shapiro.R (r_shapiro.csv).
  # Tolerance 1e-9 on W and p: the same arithmetic as the C++ test.
  ref <- utils::read.csv(fixture_path("r_shapiro.csv"), stringsAsFactors = FALSE)
  expect_equal(nrow(ref), 17L)
  for (i in seq_len(nrow(ref))) {
    x <- as.numeric(strsplit(ref$values[i], " ", fixed = TRUE)[[1]])
    got <- screen_row(x)
    expect_near(got$sw_w, ref$w[i], 1e-9)
    expect_near(got$sw_p, ref$p[i], 1e-9)
  }
})

test_that("Shapiro-Wilk outside 3..5000 values or on constant data is skipped, not faked", {
  # shapiro.test itself refuses these samples (its error text is from base R).
  expect_error(stats::shapiro.test(c(1, 2)), "sample size")
  two <- screen_row(c(1, 2))
  expect_true(is.na(two$sw_w) && is.na(two$sw_p))
  expect_match(two$note, "fewer than 3")
  big <- screen_row(sin(seq_len(5001)))
  expect_true(is.na(big$sw_p))
  expect_match(big$note, "5000")
  flat <- screen_row(rep(3, 8))
  expect_true(is.na(flat$sw_p))
  expect_match(flat$note, "identical")
})

test_that("moments equal scipy.stats skew and kurtosis with bias=False", {
  # Source: scipy.stats.skew(bias=False) / scipy.stats.kurtosis(bias=False), stored by
  # tests/fixtures/make_scipy_moments.py (scipy_moments.csv). Tolerance 1e-6 relative: scipy's
  # own rounding of the mean costs about 4e-7 on the offset sample (see the C++ test).
  ref <- utils::read.csv(fixture_path("scipy_moments.csv"), stringsAsFactors = FALSE)
  expect_equal(nrow(ref), 9L)
  for (i in seq_len(nrow(ref))) {
    x <- as.numeric(strsplit(ref$values[i], " ", fixed = TRUE)[[1]])
    m <- screen_row(x)
    expect_equal(m$skewness, ref$skew[i], tolerance = 1e-6)
    expect_equal(m$kurtosis, ref$kurtosis[i], tolerance = 1e-6)
  }
})

test_that("moment standard errors and z follow their formulas", {
  # SE formulas of Joanes & Gill (1998). Tolerance 1e-12: arithmetic only.
  x <- c(1, 2, 2, 3, 3, 3, 4, 4, 5, 9, 14)
  n <- length(x)
  m <- screen_row(x)
  expect_equal(m$skewness_se, sqrt(6 * n * (n - 1) / ((n - 2) * (n + 1) * (n + 3))),
               tolerance = 1e-12)
  expect_equal(m$kurtosis_se,
               sqrt(24 * n * (n - 1)^2 / ((n - 3) * (n - 2) * (n + 3) * (n + 5))),
               tolerance = 1e-12)
  expect_equal(m$skewness_z, m$skewness / m$skewness_se, tolerance = 1e-12)
  expect_true(is.na(screen_row(c(1, 2, 4))$kurtosis))  # G2 needs 4 values
})

test_that("the screen leaves out missing values, counts them, and names infinite rows", {
  x <- c(3.2, NA, 1.1, 4.8, 2.2, NA, 9.9)
  sw <- screen_row(x)
  expect_equal(sw$n_missing, 2L)
  expect_equal(sw$n, 5L)
  expect_near(sw$sw_w, unname(stats::shapiro.test(x)$statistic), 1e-6)
  inf <- screen_skew(data.frame(income = c(1, Inf, 2, -Inf)))$table
  expect_match(inf$note, "2 infinite values at rows 2, 4")
})
