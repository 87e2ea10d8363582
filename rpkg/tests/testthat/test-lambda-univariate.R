test_that("estimate_lambda equals scipy.stats boxcox and yeojohnson", {
  # Source: scipy.stats.boxcox(x, alpha = 0.05) and scipy.stats.yeojohnson(x) (Debian
  # python3-scipy) on samples stored by tests/fixtures/make_scipy_lambda.py.
  smp <- utils::read.csv(fixture_path("scipy_lambda_samples.csv"))
  ref <- utils::read.csv(fixture_path("scipy_lambda.csv"))
  for (s in unique(smp$sample)) {
    x <- smp$x[smp$sample == s]
    fam <- smp$family[smp$sample == s][1]
    fit <- estimate_lambda(x, family = fam)
    r <- ref[ref$sample == s, ]
    # 1e-6: both maximisers stop at about 1.5e-8 relative in a flat maximum.
    expect_lt(abs(fit$lambda - r$lambda[r$kind == "mle"]), 1e-6)
    if (fam == "box-cox") {
      # 1e-7: endpoints are simple roots, solved tightly by both.
      ci <- c(r$lambda[r$kind == "ci_low"], r$lambda[r$kind == "ci_high"])
      expect_lt(max(abs(fit$conf_int - ci)), 1e-7)
    }
    # scipy's llf omits -n/2 (log(2 pi) + 1); the profile curve's values must match it at
    # lambda = 1, evaluated exactly at a grid point of our own choosing.
    llf1 <- r$value[r$kind == "llf" & r$lambda == 1]
    n <- length(x)
    got <- powerback:::rpwb_lambda_profile(x, NULL, fam, 1)
    expect_equal(got, as.numeric(llf1) - n / 2 * (log(2 * pi) + 1), tolerance = 1e-9)
    expect_equal(fit$n, n)
    expect_true(fit$converged)
  }
})

test_that("Zea mays differences give Yeo and Johnson's lambda", {
  # Yeo & Johnson (2000), Biometrika 87:954-959, sec. 4: lambda-hat = 1.305 for Darwin's 15
  # height differences in inches. The values (eighths of an inch, as in Fisher's Design of
  # Experiments) are from memory. We get 1.302; 0.005 allows for the paper's own search.
  d <- c(49, -67, 8, 16, 6, 23, 28, 41, 14, 29, 56, 24, 75, 60, -48) / 8
  fit <- estimate_lambda(d, family = "yeo-johnson")
  expect_equal(fit$lambda, 1.305, tolerance = 0.005 / 1.305)
  expect_identical(fit$convenient, 1)
})

test_that("missing values follow na.action and rows keep the caller's positions", {
  x <- c(2.1, NA, 3.5, 0, 7.2, -1, 4.4)
  expect_error(estimate_lambda(x), "Box-Cox needs x > 0; 2 values <= 0 at rows 4, 6: use Yeo-Johnson or a shift",
               fixed = TRUE)
  y <- c(2.1, NA, 3.5, 1.2, 7.2, 9.9, 4.4)
  fit <- estimate_lambda(y)
  expect_identical(fit$n, 6L)
  expect_identical(as.integer(fit$na_action), 2L)
  expect_output(print(fit), "1 row with missing values omitted")
  withr_opt <- options(na.action = "na.fail")
  on.exit(options(withr_opt), add = TRUE)
  expect_error(estimate_lambda(y), "missing values")
})

test_that("bad input gives clear errors", {
  expect_error(estimate_lambda(c(1, Inf, 3, 4)), "`c(1, Inf, 3, 4)` has 1 infinite value at row 2",
               fixed = TRUE)
  expect_error(estimate_lambda(c(1, 2)), "at least 3")
  expect_error(estimate_lambda(c(5, 5, 5, 5)), "constant")
  expect_error(estimate_lambda(1:10, range = c(2, -2)), "lower < upper")
  expect_error(estimate_lambda(1:10, level = 1), "strictly between 0 and 1")
  expect_error(estimate_lambda(letters), "must be numeric")
  expect_error(estimate_lambda(1:10, family = "log"), "`family` must be one of")
})

test_that("estimates at a range edge and flat profiles are flagged, not errors", {
  set.seed(11)
  x <- rlnorm(300)
  fit <- estimate_lambda(x, range = c(0.5, 3))
  expect_true(fit$at_bound)
  expect_identical(fit$lambda, 0.5)
  expect_true(fit$low_open)
  expect_output(print(fit), "edge of the search range")
  flat <- estimate_lambda(c(1, 2, 3.5, 2.5), range = c(-1, 1))
  expect_true(flat$low_open && flat$high_open)
  expect_identical(flat$conf_int, c(-1, 1))
})
