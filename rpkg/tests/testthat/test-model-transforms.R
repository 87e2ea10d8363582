# lm_transformed(): estimated response power, "ladder" and "ml" predictor transforms, and the
# stored constants reused on new data.

pwb_sim_skewed <- function(n = 120, seed = 11) {
  set.seed(seed)
  d <- data.frame(size = rlnorm(n, 3, 0.8), temp = rnorm(n, 15, 4))
  d$y <- exp(1 + 0.5 * log(d$size) + 0.03 * d$temp + rnorm(n, sd = 0.3))
  d
}

test_that("response = \"estimate\" uses the convenient power given the predictors", {
  d <- pwb_sim_skewed()
  m <- lm_transformed(y ~ size + temp, d)
  lam <- estimate_response_lambda(y ~ size + temp, data = d, family = "box-cox")
  expect_s3_class(m$response_lambda, "pwb_lambda")
  expect_equal(m$response_lambda$lambda, lam$lambda, tolerance = 1e-10)
  expect_identical(unclass(m$response), unclass(as_transform(lam, "convenient")))
  # df: 3 coefficients + sigma + the estimated power (the documented choice).
  expect_equal(attr(logLik(m), "df"), 5)
  # A pwb_lambda given as the response gives the same model.
  m2 <- lm_transformed(y ~ size + temp, d, response = lam)
  expect_equal(coef(m2), coef(m), tolerance = 1e-12)
  expect_equal(attr(logLik(m2), "df"), 5)
})

test_that("predictors = \"marginal\" and \"ladder\" transform only the skewed predictors", {
  d <- pwb_sim_skewed()
  s <- screen_skew(d[, c("size", "temp")])
  m <- lm_transformed(y ~ size + temp, d, response = new_transform("log"),
                      predictors = "marginal")
  # size is lognormal (skewed), temp is normal: only size is transformed, with the screen's
  # maximum-likelihood transform (Box-Cox, every value positive).
  expect_named(m$predictors, "size")
  expect_identical(unclass(m$predictors$size), unclass(s$ml$size))
  expect_identical(m$predictors$size$family, "box-cox")
  ml <- lm_transformed(y ~ size + temp, d, response = new_transform("log"), predictors = "ladder")
  expect_named(ml$predictors, "size")
  expect_identical(unclass(ml$predictors$size), unclass(s$ladder$size))
  # Reference: base R lm() and predict.lm() on hand-transformed data (tolerance 1e-10).
  d2 <- d
  d2$size <- apply_transform(s$ml$size, d$size)
  ref <- lm(log(y) ~ size + temp, d2)
  expect_equal(coef(m), coef(ref), tolerance = 1e-10)
  nd <- data.frame(size = c(5, 40), temp = c(10, 20))
  nd2 <- nd
  nd2$size <- apply_transform(s$ml$size, nd$size)
  expect_equal(predict(m, nd, interval = "prediction")$upr,
               unname(exp(predict(ref, nd2, interval = "prediction")[, "upr"])), tolerance = 1e-10)
})

test_that("predictors = \"ml\" are Box-Tidwell powers for linearity", {
  d <- pwb_sim_skewed()
  d2 <- d
  d2$y <- log(d$y)
  pos <- c("size", "temp")[vapply(d[c("size", "temp")], function(v) all(v > 0), logical(1))]
  bt <- box_tidwell(y ~ size + temp, d2, vars = pos)
  m <- lm_transformed(y ~ size + temp, d, response = new_transform("log"), predictors = "ml")
  keep <- names(bt$transforms)[vapply(bt$transforms, function(t)
    !(t$family == "identity" || t$family == "power" && isTRUE(all.equal(t$lambda, 1))),
    logical(1))]
  expect_identical(names(m$predictors), keep)
  for (v in keep) expect_identical(unclass(m$predictors[[v]]), unclass(bt$transforms[[v]]))
  expect_true("size" %in% names(m$predictors))  # the true relation is linear in log(size)
})

test_that("a response power at the edge of its range warns and says how to widen it", {
  set.seed(11)
  d <- data.frame(x = runif(60, 1, 3))
  d$y <- (1 + 2.5 * d$x + rnorm(60, sd = 0.05))^4  # y^(1/4) is linear: power 0.25
  expect_warning(lm_transformed(y ~ x, d, range = c(0.5, 2)), "range =")
})
