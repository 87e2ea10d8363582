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

test_that("labels name the variable and call a Box-Cox power of 0 a log", {
  expect_equal(format(new_transform("box-cox", lambda = 0), name = "Volume"), "log of Volume")
  expect_equal(format(new_transform("log", shift = 1), name = "rain"), "log of (rain + 1)")
  expect_equal(format(new_transform("sqrt", reflect = TRUE, pivot = 101), name = "x_1"),
               "sqrt of (101 - x_1)")
  expect_equal(format(new_transform("identity"), name = "Wind"), "untransformed Wind")
  expect_equal(format(new_transform("box-cox", lambda = 0.5)), "box-cox(lambda = 0.5) of x")
  # compare_transforms() names each variable it transformed the same way
  cmp <- compare_transforms(Volume ~ Girth, trees, folds = 2, seed = 1, progress = FALSE,
                            candidates = list(logs = list(Volume = new_transform("box-cox", lambda = 0))))
  expect_equal(cmp$full$logs$lambdas$transform[1], "log of Volume")
})

test_that("apply_transform keeps a matrix's dimensions and names", {
  x <- matrix(c(1, 10, 100, 1000), 2, dimnames = list(c("a", "b"), c("u", "v")))
  z <- apply_transform(new_transform("log10"), x)
  expect_equal(dim(z), c(2L, 2L))
  expect_equal(dimnames(z), dimnames(x))
  expect_equal(as.vector(z), c(0, 1, 2, 3))
  back <- invert_transform(new_transform("log10"), z)
  expect_equal(back, x)
  expect_equal(names(apply_transform(new_transform("sqrt"), c(p = 4, q = 9))), c("p", "q"))
})

test_that("sqrt takes 0 (its domain is x >= 0); log and reciprocal need x > 0", {
  expect_equal(apply_transform(new_transform("sqrt"), c(0, 4)), c(0, 2))
  expect_equal(invert_transform(new_transform("sqrt"), 0), 0)
  expect_error(apply_transform(new_transform("sqrt"), c(1, -1)), "v >= 0")
  expect_error(apply_transform(new_transform("log"), 0), "v > 0")
  expect_error(apply_transform(new_transform("reciprocal"), 0), "v > 0")
  # a sqrt candidate scores every fold on counts with zeros (InsectSprays, datasets package)
  cmp <- compare_transforms(count ~ spray, InsectSprays, folds = 3, seed = 2, progress = FALSE,
                            candidates = list(root = list(count = new_transform("sqrt"))))
  expect_equal(nrow(cmp$failures), 0L)
  expect_equal(cmp$summary$folds_scored, 3L)
})
