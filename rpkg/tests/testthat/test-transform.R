test_that("Box-Cox and Yeo-Johnson equal scipy.stats at fixed lambda", {
  # Source: scipy.stats.boxcox / scipy.stats.yeojohnson with lmbda given (Debian python3-scipy),
  # stored by tests/fixtures/make_scipy_families.py. Tolerance as in the C++ test: 1e-12
  # relative, plus the rounding of scipy's own (p - 1) / m form for Yeo-Johnson near x = 0.
  ref <- utils::read.csv(fixture_path("scipy_families.csv"))
  expect_gt(nrow(ref), 250)
  eps <- .Machine$double.eps
  for (i in seq_len(nrow(ref))) {
    tr <- new_transform(ref$family[i], lambda = ref$lambda[i])
    got <- apply_transform(tr, ref$x[i])
    m <- if (ref$x[i] >= 0) ref$lambda[i] else 2 - ref$lambda[i]
    allowed <- 1e-12 * abs(ref$z[i])
    if (ref$family[i] == "yeo-johnson" && abs(m) > eps)
      allowed <- allowed + 2 * eps * abs(1 + m * ref$z[i]) / abs(m)
    expect_lte(abs(got - ref$z[i]), allowed)
  }
})

test_that("every family round-trips to 1e-12 relative", {
  x_pos <- 10^seq(-6, 6, length.out = 61)
  cases <- list(
    list("identity", NULL, c(-x_pos, x_pos)), list("log", NULL, x_pos),
    list("log10", NULL, x_pos), list("sqrt", NULL, x_pos), list("reciprocal", NULL, x_pos),
    list("power", 0.3, c(-x_pos, x_pos)), list("power", -1.5, x_pos),
    list("asinh", NULL, c(-x_pos, x_pos)), list("logit", NULL, seq(0.001, 0.999, by = 0.01)),
    list("box-cox", 0.5, x_pos), list("box-cox", 0, x_pos), list("box-cox", -1, x_pos[x_pos < 1e3]),
    list("yeo-johnson", 1.3, c(-x_pos[x_pos < 1e3], x_pos)),
    list("yeo-johnson", -0.4, c(-x_pos, x_pos[x_pos < 1e6]))
  )
  for (cs in cases) {
    tr <- new_transform(cs[[1]], lambda = cs[[2]])
    x <- cs[[3]]
    back <- invert_transform(tr, apply_transform(tr, x))
    expect_lt(max(abs(back - x) / abs(x)), 1e-12, label = format(tr))
  }
})

test_that("reflect then shift then family, with stored constants", {
  tr <- new_transform("box-cox", lambda = 0.5, shift = 1, reflect = TRUE, pivot = 10)
  expect_equal(apply_transform(tr, 3), (sqrt(8) - 1) / 0.5, tolerance = 1e-15)
  x <- c(-50, 0, 3, 10.5)
  expect_equal(invert_transform(tr, apply_transform(tr, x)), x, tolerance = 1e-13)
  z <- apply_transform(tr, c(1, 2))
  expect_gt(z[1], z[2])  # reflection reverses order
  expect_identical(unclass(tr)[c("shift", "reflect", "pivot")],
                   list(shift = 1, reflect = TRUE, pivot = 10))
})

test_that("Yeo-Johnson symmetry psi(lambda, -y) = -psi(2 - lambda, y)", {
  # Identity stated by Yeo & Johnson (2000), Biometrika 87, 954-959, section 2.
  y <- c(1e-6, 0.3, 1, 7, 900)
  for (lam in c(-2, -0.5, 0, 0.7, 1, 2, 2.5)) {
    a <- apply_transform(new_transform("yeo-johnson", lambda = lam), -y)
    b <- -apply_transform(new_transform("yeo-johnson", lambda = 2 - lam), y)
    expect_equal(a, b, tolerance = 1e-13)
  }
})

test_that("Box-Cox is continuous at lambda = 0", {
  # Taylor expansion: psi(v; lambda) - log v = lambda (log v)^2 / 2 + O(lambda^2).
  v <- c(1e-6, 0.2, 3, 5e4)
  for (lam in c(1e-10, -1e-10, 1e-7)) {
    gap <- apply_transform(new_transform("box-cox", lambda = lam), v) - log(v)
    expect_equal(gap, lam * log(v)^2 / 2, tolerance = 1e-5)
  }
})

test_that("missing values stay missing and names are kept", {
  tr <- new_transform("log")
  out <- apply_transform(tr, c(a = 1, b = NA, c = exp(2)))
  expect_identical(names(out), c("a", "b", "c"))
  expect_true(is.na(out[["b"]]))
  expect_equal(out[["c"]], 2)
})
