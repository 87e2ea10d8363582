# Weights and subsets in lm_transformed(): against base R lm(weights =, subset =) fitted by hand
# to the transformed columns. Tolerance 1e-10: two QR routes on well-conditioned designs.

test_that("a weighted fit equals lm(weights =) by hand, zero weights included", {
  d <- airquality[complete.cases(airquality), ]
  d$w <- rep(c(1, 2, 0.5, 0, 3), length.out = nrow(d))
  m <- lm_transformed(Ozone ~ Solar.R + Wind + Temp, d, weights = w,
                      response = new_transform("log"))
  d2 <- d
  d2$Ozone <- log(d$Ozone)
  ref <- lm(Ozone ~ Solar.R + Wind + Temp, d2, weights = w)   # base R lm with weights
  expect_equal(unname(coef(m)), unname(coef(ref)), tolerance = 1e-10)
  expect_equal(unname(vcov(m)), unname(vcov(ref)), tolerance = 1e-10)
  expect_equal(sigma(m), sigma(ref), tolerance = 1e-10)
  expect_equal(df.residual(m), df.residual(ref))
  expect_equal(nobs(m), nobs(ref))
  expect_equal(deviance(m), deviance(ref), tolerance = 1e-10)
  expect_equal(unname(residuals(m)), unname(residuals(ref)), tolerance = 1e-10)
  expect_equal(unname(hatvalues(m)), unname(hatvalues(ref)), tolerance = 1e-10)
  expect_equal(unname(rstandard(m)), unname(rstandard(ref)), tolerance = 1e-10)
  expect_equal(unname(cooks.distance(m)), unname(cooks.distance(ref)), tolerance = 1e-10)
  # logLik.lm of the weighted fit plus the Jacobian -sum(log y) over rows of positive weight.
  expect_equal(as.numeric(logLik(m)),
               as.numeric(logLik(ref)) - sum(log(d$Ozone[d$w > 0])), tolerance = 1e-10)
  nd <- d[1:5, ]
  p <- predict(m, nd, type = "transformed", interval = "prediction", se.fit = TRUE)
  r <- predict(ref, nd, interval = "prediction", se.fit = TRUE, weights = 1)  # predict.lm
  expect_equal(unname(p$se.fit), unname(r$se.fit), tolerance = 1e-10)
  expect_equal(p$fit$lwr, unname(r$fit[, "lwr"]), tolerance = 1e-10)
  a <- anova(m)
  expect_equal(as.matrix(a), as.matrix(anova(ref)), tolerance = 1e-10, ignore_attr = TRUE)
})

test_that("subset works as in lm", {
  m <- lm_transformed(Volume ~ Girth, trees, subset = Height > 70,
                      response = new_transform("log"))
  ref <- lm(log(Volume) ~ Girth, trees, subset = Height > 70)
  expect_equal(unname(coef(m)), unname(coef(ref)), tolerance = 1e-10)
  expect_equal(nobs(m), sum(trees$Height > 70))
})

test_that("bad weights name the rows", {
  d <- trees
  d$w <- 1
  d$w[c(3, 9)] <- c(-1, NA)
  expect_error(lm_transformed(Volume ~ Girth, d, weights = w, response = "none",
                              na.action = na.pass), "rows 3, 9")
})

test_that("weighted lm objects are accepted", {
  fit <- lm(mpg ~ wt, mtcars, weights = cyl)
  m <- lm_transformed(fit, response = "none")
  expect_equal(unname(coef(m)), unname(coef(fit)), tolerance = 1e-10)
  expect_equal(sigma(m), sigma(fit), tolerance = 1e-10)
})

test_that("weights reach the response power estimate", {
  skip_if_not("weights" %in% names(formals(estimate_response_lambda)),
              "estimate_response_lambda() has no weights argument in this build")
  d <- airquality[complete.cases(airquality), ]
  d$w <- rep(c(1, 2, 0.5), length.out = nrow(d))
  m <- lm_transformed(Ozone ~ Solar.R + Wind + Temp, d, weights = w)
  lam <- estimate_response_lambda(Ozone ~ Solar.R + Wind + Temp, d, weights = d$w)
  expect_equal(m$response_lambda$lambda, lam$lambda, tolerance = 1e-8)
})
