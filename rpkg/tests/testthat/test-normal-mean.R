# The normal-theory mean: the normal truncated to the inverse's range, checked against
# stats::integrate (base R) of the integrand written here, with the cut-off mass per row.

# Box-Cox inverse on its range, 0 beyond (never evaluated there: the integral stops at the limit).
bc_inverse <- function(z, lambda) {
  if (lambda == 0) return(exp(z))
  w <- 1 + lambda * z
  ifelse(w > 0, exp(log(pmax(w, 1e-300)) / lambda), 0)
}

# Truncated-normal mean of the Box-Cox inverse by stats::integrate, and the mass cut off. The
# range side is cut at 40 sigma from mu (normal mass beyond: < 1e-300) and split at mu, so
# that integrate sees the bulk; next to the limit the piece ends exactly at it.
by_integrate <- function(mu, s, lambda) {
  f <- function(z) bc_inverse(z, lambda) * dnorm(z, mu, s)
  piece <- function(a, b)
    if (b > a) integrate(f, a, b, rel.tol = 1e-11, subdivisions = 1000L)$value else 0
  lim <- -1 / lambda
  lo <- mu - 40 * s
  hi <- mu + 40 * s
  if (lambda > 0) {
    cut <- pnorm(lim, mu, s)
    lo <- max(lo, lim)
  } else {
    cut <- pnorm(lim, mu, s, lower.tail = FALSE)
    hi <- min(hi, lim)
  }
  mid <- min(max(mu, lo), hi)
  if (lambda < 0) mid <- min(mid, lim - s)
  upper <- if (lambda < 0) {
    # z = lim - t^3 removes the integrable singularity (lim - z)^(1/lambda) at the limit;
    # there 1 + lambda z = |lambda| t^3 exactly.
    g <- function(t) abs(lambda)^(1 / lambda) * t^(3 / lambda + 2) * dnorm(lim - t^3, mu, s) * 3
    integrate(g, 0, (hi - mid)^(1 / 3), rel.tol = 1e-11, subdivisions = 1000L)$value
  } else piece(mid, hi)
  c(mean = (piece(lo, mid) + upper) / (1 - cut), cut = cut)
}

test_that("the normal-theory mean equals stats::integrate at several powers, near the limit too", {
  for (lambda in c(0.5, 0.25, 1.5, -1.5, -3)) {
    m <- lm_transformed(Volume ~ Girth, datasets::trees,
                        response = new_transform("box-cox", lambda = lambda))
    # sigma and the fit by hand: lm on the Box-Cox-transformed response (base R).
    z <- if (lambda == 0) log(trees$Volume) else (trees$Volume^lambda - 1) / lambda
    ref <- lm(z ~ Girth, data = datasets::trees)
    s <- summary(ref)$sigma
    b <- coef(ref)
    # Rows in the data and rows whose fit lies 0.5, 1, 2 and 4 sigma inside the limit, and one
    # 1 sigma beyond it (most of the normal cut off).
    lim <- -1 / lambda
    inside <- if (lambda > 0) 1 else -1
    targets <- c(predict(ref, data.frame(Girth = c(8, 14, 20))), lim + inside * s * c(0.5, 1, 2, 4, -1))
    nd <- data.frame(Girth = (targets - b[[1]]) / b[[2]])
    p <- predict(m, nd, center = "mean", mean_method = "normal")
    want <- t(vapply(targets, by_integrate, numeric(2), s = s, lambda = lambda))
    # rel.tol 1e-11 asked of integrate and 1e-13 of the library: 1e-8 leaves room for QUADPACK's
    # error estimate near the singular endpoint of lambda < -1.
    expect_equal(p$fit, unname(want[, "mean"]), tolerance = 1e-8, info = paste("lambda", lambda))
    expect_equal(p$cut_mass, unname(want[, "cut"]), tolerance = 1e-10, info = paste("lambda", lambda))
    expect_false(any(p$bounded))
  }
})

test_that("the mean is Inf wherever the inverse's integral diverges, with the cut mass given", {
  # Reciprocal-like Box-Cox powers in [-1, 0): y grows like distance^(1/lambda) at the limit.
  m <- lm_transformed(Volume ~ Girth, datasets::trees,
                      response = new_transform("box-cox", lambda = -0.5))
  p <- predict(m, datasets::trees[c(1, 16, 31), ], center = "mean", mean_method = "normal")
  expect_true(all(is.infinite(p$fit) & p$fit > 0))
  expect_true(all(p$bounded))
  z <- (trees$Volume^-0.5 - 1) / -0.5
  ref <- lm(z ~ Girth, data = datasets::trees)
  mu <- predict(ref, datasets::trees[c(1, 16, 31), ])
  # pnorm (base R) of the limit z = 2 under N(mu, sigma^2).
  expect_equal(p$cut_mass, unname(pnorm(2, mu, summary(ref)$sigma, lower.tail = FALSE)),
               tolerance = 1e-10)
  # Smearing and the median stay finite; they carry no cut_mass column.
  q <- predict(m, datasets::trees[c(1, 16, 31), ], center = "mean")
  expect_true(all(is.finite(q$fit)))
  expect_null(q$cut_mass)
})

test_that("the poisons model gives one definition on every row", {
  skip_if_not_installed("boot")
  poisons <- boot::poisons
  m <- suppressWarnings(lm_transformed(time ~ poison * treat, poisons))
  p <- predict(m, poisons[c(1, 9, 45), ], center = "mean", mean_method = "normal")
  lam <- m$response$lambda
  if (lam >= -1 && lam < 0) {
    # The inverse's integral diverges at the limit for powers in [-1, 0): Inf on every row,
    # however small the mass beyond.
    expect_true(all(is.infinite(p$fit)))
  } else {
    expect_true(all(is.finite(p$fit)))
  }
  expect_true(all(p$cut_mass >= 0 & p$cut_mass < 1e-3))
})
