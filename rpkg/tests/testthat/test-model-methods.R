# The lm method set of pwb_model against the stats methods of an lm fitted by hand to the
# transformed columns. Tolerance 1e-10: the two fits use different QR routines (LINPACK in lm,
# Householder in the core) on well-conditioned designs, which agree to ~1e-13 relative.

pwb_pair_trees <- function() {
  # datasets::trees; transforms by hand with base log().
  m <- lm_transformed(Volume ~ Girth + Height, trees, response = new_transform("log"),
                      predictors = list(Girth = new_transform("log")))
  d <- trees
  d$Volume <- log(d$Volume)
  d$Girth <- log(d$Girth)
  list(m = m, ref = lm(Volume ~ Girth + Height, d))
}

pwb_pair_air <- function() {
  # datasets::airquality, with its NAs, na.exclude; Box-Cox 0.5 of Ozone is 2 (sqrt(y) - 1).
  bc <- new_transform("box-cox", lambda = 0.5)
  m <- lm_transformed(Ozone ~ Solar.R + Wind + Temp + factor(Month), airquality,
                      response = bc, predictors = list(Wind = new_transform("sqrt")),
                      na.action = na.exclude)
  d <- airquality
  d$Ozone <- 2 * (sqrt(d$Ozone) - 1)
  d$Wind <- sqrt(d$Wind)
  list(m = m, ref = lm(Ozone ~ Solar.R + Wind + Temp + factor(Month), d, na.action = na.exclude),
       d = d)
}

test_that("coefficients, covariance, sigma, df, deviance, nobs equal the lm by hand", {
  for (pr in list(pwb_pair_trees(), pwb_pair_air())) {
    m <- pr$m
    ref <- pr$ref
    expect_equal(unname(coef(m)), unname(coef(ref)), tolerance = 1e-10)
    expect_equal(unname(vcov(m)), unname(vcov(ref)), tolerance = 1e-10)        # vcov.lm
    expect_equal(unname(confint(m, level = 0.9)), unname(confint(ref, level = 0.9)),
                 tolerance = 1e-10)                                             # confint.lm
    expect_equal(sigma(m), sigma(ref), tolerance = 1e-10)
    expect_equal(df.residual(m), df.residual(ref))
    expect_equal(deviance(m), deviance(ref), tolerance = 1e-10)
    expect_equal(nobs(m), nobs(ref))
    expect_equal(unname(summary(m)$coefficients), unname(summary(ref)$coefficients),
                 tolerance = 1e-10)                                             # summary.lm
  }
})

test_that("per-row methods equal the lm by hand, padded under na.exclude", {
  for (pr in list(pwb_pair_trees(), pwb_pair_air())) {
    m <- pr$m
    ref <- pr$ref
    expect_equal(residuals(m), residuals(ref), tolerance = 1e-10)
    expect_equal(fitted(m, type = "transformed"), fitted(ref), tolerance = 1e-10)
    expect_equal(hatvalues(m), hatvalues(ref), tolerance = 1e-10)              # hatvalues.lm
    expect_equal(cooks.distance(m), cooks.distance(ref), tolerance = 1e-10)    # cooks.distance.lm
    expect_equal(rstandard(m), rstandard(ref), tolerance = 1e-10)              # rstandard.lm
    expect_equal(rstudent(m), rstudent(ref), tolerance = 1e-10)                # rstudent.lm
    expect_equal(unname(model.matrix(m)), unname(model.matrix(ref)), tolerance = 1e-12)
    mf <- model.frame(m)
    mfr <- model.frame(ref)
    for (v in names(mfr)) expect_equal(unname(mf[[v]]), unname(mfr[[v]]), tolerance = 1e-12)
    expect_equal(formula(m), formula(ref), ignore_attr = TRUE)
    expect_equal(attr(terms(m), "term.labels"), attr(terms(ref), "term.labels"))
  }
  air <- pwb_pair_air()
  expect_length(residuals(air$m), nrow(airquality))
  expect_true(is.na(residuals(air$m)[5]))
})

test_that("logLik is the lm's plus the Jacobian of the response transform", {
  pr <- pwb_pair_trees()
  # logLik.lm on log(Volume) plus sum(log|d log(y)/dy|) = -sum(log(Volume)).
  expect_equal(as.numeric(logLik(pr$m)), as.numeric(logLik(pr$ref)) - sum(log(trees$Volume)),
               tolerance = 1e-10)
  expect_equal(AIC(pr$m), -2 * as.numeric(logLik(pr$m)) + 2 * 4, tolerance = 1e-10)
  expect_equal(BIC(pr$m), -2 * as.numeric(logLik(pr$m)) + log(31) * 4, tolerance = 1e-10)
})

test_that("anova equals anova.lm: one model, nested models, and refuses other responses", {
  pr <- pwb_pair_air()
  a <- anova(pr$m)
  r <- anova(pr$ref)
  expect_equal(rownames(a), rownames(r))
  expect_equal(as.matrix(a), as.matrix(r), tolerance = 1e-10, ignore_attr = TRUE)
  t0 <- pwb_pair_trees()
  small <- update(t0$m, . ~ . - Height)
  expect_identical(small$predictors, t0$m$predictors)  # transforms kept
  dt <- trees
  dt$Volume <- log(dt$Volume)
  dt$Girth <- log(dt$Girth)
  a2 <- anova(small, t0$m)
  r2 <- anova(lm(Volume ~ Girth, dt), lm(Volume ~ Girth + Height, dt))   # anova.lm, nested
  expect_equal(as.matrix(a2), as.matrix(r2), tolerance = 1e-10, ignore_attr = TRUE)
  other <- lm_transformed(Volume ~ Girth + Height, trees, response = "none")
  expect_error(anova(other, t0$m), "logLik")
})

test_that("update keeps or re-estimates the transforms", {
  m <- lm_transformed(Volume ~ Girth + Height, trees)
  kept <- update(m, . ~ . - Height)
  expect_identical(kept$response, m$response)
  expect_equal(attr(logLik(kept), "df"), 4)  # the estimated power still counts
  again <- update(m, . ~ . - Height, transforms = "estimate")
  ref <- lm_transformed(Volume ~ Girth, trees)
  expect_equal(again$response_lambda$lambda, ref$response_lambda$lambda)
})

test_that("predict with se.fit and type = \"transformed\" equals predict.lm", {
  pr <- pwb_pair_air()
  nd <- airquality[c(1, 5, 20, 40), ]
  nd2 <- pr$d[c(1, 5, 20, 40), ]
  p <- predict(pr$m, nd, se.fit = TRUE, interval = "prediction", type = "transformed")
  r <- predict(pr$ref, nd2, se.fit = TRUE, interval = "prediction")         # predict.lm
  expect_equal(unname(p$se.fit), unname(r$se.fit), tolerance = 1e-10)
  expect_equal(p$fit$fit, unname(r$fit[, "fit"]), tolerance = 1e-10)
  expect_equal(p$fit$upr, unname(r$fit[, "upr"]), tolerance = 1e-10)
  expect_equal(p$df, r$df)
  expect_equal(p$residual.scale, r$residual.scale, tolerance = 1e-10)
  expect_true(is.na(p$se.fit[2]))  # row 5 has no Solar.R: NA, in place
  # the older `scale` argument still works
  expect_equal(predict(pr$m, nd, scale = "transformed")$fit, p$fit$fit)
})

test_that("empty and mistyped newdata", {
  pr <- pwb_pair_trees()
  e <- predict(pr$m, trees[0, ])
  expect_equal(nrow(e), 0L)
  expect_named(e, c("fit", "lwr", "upr", "bounded", "invalid"))
  bad <- data.frame(Girth = "8", Height = 70)
  expect_error(predict(pr$m, bad), "`Girth` in `newdata` is character.*as.numeric")
})

test_that("lm objects and missing data are accepted as in estimate_response_lambda", {
  fit <- lm(mpg ~ wt, mtcars)
  m1 <- lm_transformed(fit, response = "none")
  expect_equal(unname(coef(m1)), unname(coef(fit)), tolerance = 1e-10)
  x <- trees$Girth
  y <- trees$Volume
  m2 <- lm_transformed(y ~ x, response = new_transform("log"))
  expect_equal(unname(coef(m2)), unname(coef(lm(log(y) ~ x))), tolerance = 1e-10)
})
