# Confidence intervals for the original-scale mean: coverage of a known lognormal mean, the Cox
# interval, the delta gradient by finite differences, group means, the bootstrap seed, errors.

mean_ci <- function(m, newdata, ...)
  predict(m, newdata, interval = "confidence", center = "mean", ...)

test_that("delta intervals cover a known lognormal mean at the nominal rate", {
  skip_on_cran()
  # y = exp(1 + 0.5 x + 0.6 e), n = 60; the mean at x = 1 is exp(1.5 + 0.6^2 / 2). With 2000
  # replications the binomial SD of the coverage is 0.0049, so +-0.02 is four SDs.
  set.seed(20261203)
  truth <- exp(1.5 + 0.36 / 2)
  at <- data.frame(x = 1)
  reps <- 2000L
  hit <- matrix(FALSE, reps, 2L)
  for (r in seq_len(reps)) {
    d <- data.frame(x = runif(60, 0, 2))
    d$y <- exp(1 + 0.5 * d$x + rnorm(60, 0, 0.6))
    m <- lm_transformed(y ~ x, d, response = new_transform("log"))
    s <- mean_ci(m, at)
    g <- mean_ci(m, at, mean_method = "normal")
    hit[r, ] <- c(s$lwr <= truth && truth <= s$upr, g$lwr <= truth && truth <= g$upr)
  }
  expect_lt(max(abs(colMeans(hit) - 0.95)), 0.02)
})

test_that("bootstrap intervals cover a known lognormal mean within their stated band", {
  skip_on_cran()
  # 200 replications: binomial 3-SD band around 0.95 is +-3 sqrt(0.95 * 0.05 / 200) = +-0.046.
  set.seed(7)
  truth <- exp(1.5 + 0.36 / 2)
  at <- data.frame(x = 1)
  hit <- logical(200)
  for (r in seq_along(hit)) {
    d <- data.frame(x = runif(60, 0, 2))
    d$y <- exp(1 + 0.5 * d$x + rnorm(60, 0, 0.6))
    m <- lm_transformed(y ~ x, d, response = new_transform("log"))
    b <- mean_ci(m, at, mean_interval = "bootstrap", R = 499, seed = r)
    hit[r] <- b$lwr <= truth && truth <= b$upr
  }
  expect_lt(abs(mean(hit) - 0.95), 0.046)
})

test_that("normal-theory log mean on an intercept-only model is the Cox interval", {
  # Cox method for a lognormal mean (Zhou & Gao 1997, Statistics in Medicine;
  # formula from memory): mean(log y) + s^2/2 -+ qnorm(0.975) sqrt(s^2/n + s^4/(2(n-1))),
  # exponentiated. Same arithmetic both sides: 1e-12 relative.
  y <- datasets::trees$Volume
  m <- lm_transformed(Volume ~ 1, datasets::trees, response = new_transform("log"))
  n <- length(y)
  s2 <- var(log(y))
  est <- mean(log(y)) + s2 / 2
  half <- qnorm(0.975) * sqrt(s2 / n + s2^2 / (2 * (n - 1)))
  p <- mean_ci(m, datasets::trees[1, ], mean_method = "normal")
  expect_equal(unlist(p[1, c("fit", "lwr", "upr")], use.names = FALSE),
               exp(c(est, est - half, est + half)), tolerance = 1e-12)
})

test_that("the delta standard error equals a finite-difference computation", {
  lambda <- 0.3
  inv <- function(z) (1 + lambda * z)^(1 / lambda)
  tr <- datasets::trees
  m <- lm_transformed(Volume ~ Girth + Height, tr,
                      response = new_transform("box-cox", lambda = lambda))
  X <- cbind(1, tr$Girth, tr$Height)
  z <- ((tr$Volume)^lambda - 1) / lambda
  b <- unname(coef(m))
  x0 <- c(1, 13, 75)
  n <- nrow(tr)
  # Smearing mean as a function of the coefficients, residuals moving with them.
  M <- function(bb) mean(inv(sum(x0 * bb) + z - drop(X %*% bb)))
  h <- 1e-5  # central differences: truncation ~1e-10, rounding ~1e-11 relative
  g <- vapply(1:3, function(j) {
    e <- replace(numeric(3), j, h)
    (M(b + e) - M(b - e)) / (2 * h)
  }, 0)
  V <- vcov(lm(z ~ Girth + Height, tr))
  e <- z - drop(X %*% b)
  se <- sqrt(drop(t(g) %*% V %*% g) + var(inv(sum(x0 * b) + e)) / n)
  p <- mean_ci(m, data.frame(Girth = 13, Height = 75), se.fit = TRUE)
  expect_equal(p$fit$fit, M(b), tolerance = 1e-12)
  # Differences carry ~1e-9 relative error: 1e-7.
  expect_equal(unname(p$se.fit), se, tolerance = 1e-7)
  expect_equal(p$fit$lwr, M(b) * exp(-qnorm(0.975) * se / M(b)), tolerance = 1e-7)
})

test_that("group means are the average of the row means", {
  river <- river_data()
  m <- lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + season, river,
                      response = new_transform("log"),
                      predictors = list(flow_m3s = new_transform("log")))
  new <- river_data("new")
  rows <- mean_ci(m, new)
  for (meth in c("smearing", "normal")) {
    rows <- mean_ci(m, new, mean_method = meth)
    grp <- mean_ci(m, new, mean_method = meth, by = c("station", "season"))
    key <- paste(new$station, new$season)
    want <- tapply(rows$fit, key, mean)
    expect_equal(grp$fit, as.vector(want[paste(grp$station, grp$season)]), tolerance = 1e-13)
    expect_equal(grp$n, as.vector(table(key)[paste(grp$station, grp$season)]))
    expect_named(grp, c("station", "season", "fit", "lwr", "upr", "n", "bounded"))
    expect_true(all(grp$lwr < grp$fit & grp$fit < grp$upr))
  }
  # A factor given directly, and a list of them, group the same way.
  by_name <- mean_ci(m, new, by = "season")
  by_factor <- mean_ci(m, new, by = new$season)
  by_list <- mean_ci(m, new, by = list(season = new$season))
  expect_equal(by_factor$fit, by_name$fit)
  expect_equal(by_list$fit, by_name$fit)
  expect_named(by_factor, c("group", "fit", "lwr", "upr", "n", "bounded"))
})

test_that("a missing predictor leaves its row, and its group, NA in place", {
  river <- river_data()
  m <- lm_transformed(sediment_t_day ~ flow_m3s + season, river, response = new_transform("log"))
  new <- head(river_data("new"), 6)
  new$flow_m3s[2] <- NA
  p <- mean_ci(m, new)
  expect_equal(nrow(p), 6L)
  expect_true(is.na(p$fit[2]) && is.na(p$lwr[2]))
  expect_true(all(is.finite(p$fit[-2])))
  g <- mean_ci(m, new, by = factor(c(1, 1, 2, 2, 3, 3)))
  expect_true(is.na(g$fit[1]))
  expect_true(all(is.finite(g$fit[2:3])))
})

test_that("the bootstrap is reproducible with a seed", {
  m <- lm_transformed(Volume ~ Girth, datasets::trees, response = new_transform("log"))
  at <- data.frame(Girth = c(10, 16))
  a <- mean_ci(m, at, mean_interval = "bootstrap", R = 199, seed = 42)
  b <- mean_ci(m, at, mean_interval = "bootstrap", R = 199, seed = 42)
  c2 <- mean_ci(m, at, mean_interval = "bootstrap", R = 199, seed = 43)
  expect_identical(a, b)
  expect_false(identical(a$lwr, c2$lwr))
  expect_equal(a$fit, mean_ci(m, at)$fit)
  set.seed(1)
  d1 <- mean_ci(m, at, mean_interval = "bootstrap", R = 99)
  set.seed(1)
  d2 <- mean_ci(m, at, mean_interval = "bootstrap", R = 99)
  expect_identical(d1, d2)
})

test_that("other predictions keep their meaning", {
  m <- lm_transformed(Volume ~ Girth, datasets::trees, response = new_transform("log"))
  at <- data.frame(Girth = c(10, 16))
  pm <- predict(m, at, interval = "prediction", center = "mean")
  pd <- predict(m, at, interval = "prediction")
  # A prediction interval is for a new observation whatever the center; only fit changes.
  expect_equal(pm$lwr, pd$lwr)
  expect_equal(pm$fit, predict(m, at, center = "mean")$fit)
  # The confidence interval for the median stays the back-transformed one.
  pc <- predict(m, at, interval = "confidence")
  lc <- predict(lm(log(Volume) ~ Girth, datasets::trees), at, interval = "confidence")
  expect_equal(pc$lwr, exp(unname(lc[, "lwr"])), tolerance = 1e-12)
})

test_that("bad requests for mean intervals say what to do", {
  m <- lm_transformed(Volume ~ Girth, datasets::trees, response = new_transform("log"))
  at <- data.frame(Girth = c(10, 16), plot = c("a", "b"))
  expect_error(mean_ci(m, at, by = "stand"), "`by` names `stand` not in `newdata`")
  expect_error(mean_ci(m, at, mean_interval = "bootstrap", R = 5), "at least|from 10")
  expect_error(mean_ci(m, at, type = "transformed"), "needs type = \"response\"")
  expect_error(predict(m, at, by = "plot"), "`by` needs interval = \"confidence\"")
  expect_error(mean_ci(m, at, by = factor(1:3)), "`by` has 3 values but `newdata` has 2 rows")
  expect_error(mean_ci(m, at, mean_interval = "bootstrap", seed = -1), "`seed`")
})

test_that("bootstrap group means and the training rows work like the delta ones", {
  river <- river_data()
  m <- lm_transformed(sediment_t_day ~ flow_m3s + season, river, response = new_transform("log"),
                      predictors = list(flow_m3s = new_transform("log")))
  new <- river_data("new")
  d <- mean_ci(m, new, by = "season")
  b <- mean_ci(m, new, by = "season", mean_interval = "bootstrap", R = 199, seed = 3)
  expect_equal(b$fit, d$fit)
  expect_identical(b, mean_ci(m, new, by = "season", mean_interval = "bootstrap", R = 199,
                              seed = 3))
  # Bootstrap and delta estimate the same spread: 199 replicates put ~5% Monte Carlo error on a
  # bootstrap interval's width, and first-order methods differ a few percent more; 25%.
  expect_equal(b$upr - b$lwr, d$upr - d$lwr, tolerance = 0.25)
  # Without newdata: the training rows, one interval each, aligned with the fitted rows.
  tr <- mean_ci(m)
  expect_equal(nrow(tr), nrow(river))
  expect_equal(tr$fit, predict(m, center = "mean")$fit, tolerance = 1e-13)
})
