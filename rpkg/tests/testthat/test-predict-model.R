# predict() of a pwb_model: transformed-scale equality with predict.lm, back-transforms,
# mean corrections, range limits, bad new data.

pwb_sim_lognormal <- function(n, seed) {
  set.seed(seed)
  d <- data.frame(x = runif(n, 0, 4), g = factor(sample(c("a", "b"), n, replace = TRUE)))
  d$y <- exp(1 + 0.5 * d$x + 0.3 * (d$g == "b") + rnorm(n, sd = 0.4))
  d
}

test_that("transformed-scale fits and intervals equal predict.lm", {
  d <- pwb_sim_lognormal(50, 1)
  m <- lm_transformed(y ~ x + g, d, response = new_transform("log"))
  nd <- data.frame(x = c(0.5, 2, 3.7), g = c("a", "b", "a"))
  # Reference: stats::predict.lm on the lm of log(y). Tolerance 1e-10 as the issue asks.
  ref <- lm(log(y) ~ x + g, d)
  for (iv in c("confidence", "prediction")) {
    p <- predict(m, nd, interval = iv, level = 0.9, scale = "transformed")
    r <- predict(ref, nd, interval = iv, level = 0.9)
    expect_equal(unname(as.matrix(p[, c("fit", "lwr", "upr")])), unname(r), tolerance = 1e-10)
    # Original scale: the endpoints and the median map through exp().
    po <- predict(m, nd, interval = iv, level = 0.9)
    expect_equal(unname(as.matrix(po[, c("fit", "lwr", "upr")])), unname(exp(r)), tolerance = 1e-10)
  }
  expect_named(predict(m, nd), c("fit", "lwr", "upr", "bounded", "invalid"))
})

test_that("mean corrections: lognormal mean and Duan's smearing", {
  d <- pwb_sim_lognormal(60, 2)
  m <- lm_transformed(y ~ x, d, response = new_transform("log"))
  ref <- lm(log(y) ~ x, d)
  nd <- data.frame(x = c(1, 3))
  mu <- predict(ref, nd)
  s <- summary(ref)$sigma
  # Lognormal mean exp(mu + sigma^2 / 2) (normal-theory mean of a log model).
  expect_equal(predict(m, nd, center = "mean", mean_method = "normal")$fit,
               unname(exp(mu + s^2 / 2)), tolerance = 1e-10)
  # Duan (1983): exp(mu) times the mean of exp(residuals), from base R's residuals().
  expect_equal(predict(m, nd, center = "mean")$fit,
               unname(exp(mu) * mean(exp(residuals(ref)))), tolerance = 1e-10)
  # Square-root response, normal theory: E[z^2] = mu^2 + sigma^2 (normal second moment),
  # computed by Gauss-Hermite quadrature inside; the limit z = 0 is many sigma away.
  d$y2 <- (3 + d$x + rnorm(60, sd = 0.3))^2
  m2 <- lm_transformed(y2 ~ x, d, response = new_transform("sqrt"))
  r2 <- lm(sqrt(y2) ~ x, d)
  mu2 <- predict(r2, nd)
  expect_equal(predict(m2, nd, center = "mean", mean_method = "normal")$fit,
               unname(mu2^2 + summary(r2)$sigma^2), tolerance = 1e-10)
})

test_that("reflected responses swap interval endpoints", {
  set.seed(3)
  d <- data.frame(x = runif(40))
  d$y <- 100 - exp(2 + d$x + rnorm(40, sd = 0.2))
  tr <- new_transform("log", reflect = TRUE, pivot = 101)
  m <- lm_transformed(y ~ x, d, response = tr)
  p <- predict(m, data.frame(x = 0.5), interval = "prediction")
  ref <- predict(lm(log(101 - y) ~ x, d), data.frame(x = 0.5), interval = "prediction")
  expect_lt(p$lwr, p$upr)
  # Reflection: y = 101 - exp(z), so the upper z endpoint gives the lower y endpoint.
  expect_equal(p$lwr, 101 - exp(ref[, "upr"]), tolerance = 1e-10)
  expect_equal(p$upr, 101 - exp(ref[, "lwr"]), tolerance = 1e-10)
})

test_that("endpoints beyond the inverse's range are set to the limit and flagged", {
  set.seed(4)
  d <- data.frame(x = 0:29)
  d$y <- 0.2 + 0.05 * d$x + rnorm(30, sd = 0.15)
  d$y <- pmax(d$y, 0.01)
  m <- lm_transformed(y ~ x, d, response = new_transform("box-cox", lambda = 2))
  p <- predict(m, data.frame(x = c(0, 29)), interval = "prediction")
  # Box-Cox 2: z below -1/2 has no inverse; y's limit there is 0.
  expect_true(p$bounded[1])
  expect_identical(p$lwr[1], 0)
  expect_false(anyNA(p[, c("fit", "lwr", "upr")]))
})

test_that("bad new data is named: variables, levels, rows, level", {
  d <- pwb_sim_lognormal(40, 5)
  m <- lm_transformed(y ~ x + g, d, response = new_transform("log"),
                      predictors = list(x = new_transform("log", shift = 1)))
  expect_error(predict(m, data.frame(g = "a")), "lacks the variable `x`")
  expect_error(predict(m, data.frame(x = c(1, 2, 3), g = c("a", "z", "z"))),
               "`g`.*\"z\".*rows 2, 3")
  bad <- data.frame(x = c(1, -3, 2), g = "a")
  expect_error(predict(m, bad), "`x`.*row 2")
  p <- predict(m, bad, invalid = "na", interval = "confidence")
  expect_identical(p$invalid, c(FALSE, TRUE, FALSE))
  expect_true(is.na(p$fit[2]) && is.na(p$lwr[2]))
  expect_false(is.na(p$fit[3]))
  expect_error(predict(m, d, level = 1.2), "strictly between 0 and 1")
  # NA predictors: NA rows in place, the others unchanged.
  nd <- data.frame(x = c(1, NA, 2), g = c("a", "b", NA))
  p2 <- predict(m, nd)
  expect_equal(nrow(p2), 3)
  expect_false(is.na(p2$fit[1]))
  expect_true(all(is.na(p2$fit[2:3])))
  expect_equal(p2$fit[1], predict(m, nd[1, ])$fit)
})

test_that("simulation: 95% prediction intervals cover 95% of fresh draws", {
  # Known truths (lognormal; square-root normal), seeded. 10 training sets of 400 rows, each
  # followed by 400 fresh draws (4000 in all): averaging over training sets keeps the spread of
  # sigma-hat from dominating, so the coverage has SD about 0.5% and +-1.5% is 3 SD.
  set.seed(20261202)
  fresh <- function(n, f) { x <- runif(n, 0, 4); data.frame(x = x, y = f(x)) }
  logn <- function(x) exp(1 + 0.5 * x + rnorm(length(x), sd = 0.5))
  sqrtn <- function(x) (3 + 0.5 * x + rnorm(length(x), sd = 0.4))^2
  for (case in list(list(logn, "log"), list(sqrtn, "sqrt"))) {
    hits <- unlist(lapply(1:10, function(k) {
      m <- lm_transformed(y ~ x, fresh(400, case[[1]]), response = new_transform(case[[2]]))
      nd <- fresh(400, case[[1]])
      p <- predict(m, nd, interval = "prediction")
      nd$y >= p$lwr & nd$y <= p$upr
    }))
    expect_length(hits, 4000)
    expect_lt(abs(mean(hits) - 0.95), 0.015)
  }
})

test_that("predictions carry the caller's row names, as predict.lm's do", {
  # datasets::trees; base R predict.lm names its predictions by newdata's row names.
  m <- lm_transformed(Volume ~ log(Girth) + log(Height), trees, response = new_transform("log"))
  l <- lm(log(Volume) ~ log(Girth) + log(Height), trees)
  nd <- trees[c(5, 2, 30), ]
  p <- predict(m, nd, interval = "prediction")
  expect_identical(row.names(p), c("5", "2", "30"))
  expect_identical(row.names(p), names(predict(l, nd)))
  row.names(nd) <- c("oak", "elm", "ash")
  expect_identical(row.names(predict(m, nd)), c("oak", "elm", "ash"))
  # Automatic row names stay automatic (.row_names_info() negative: compact 1..n).
  nd2 <- data.frame(Girth = c(10, 12), Height = c(70, 80))
  expect_identical(.row_names_info(predict(m, nd2)), -2L)
  expect_identical(row.names(predict(m, nd2)), c("1", "2"))
  # Training rows: the frame's names.
  expect_identical(row.names(predict(m)), row.names(trees))
})
