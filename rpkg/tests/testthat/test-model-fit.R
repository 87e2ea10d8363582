# lm_transformed(): the fit on the transformed scale against R's lm(), stored transforms,
# the original-scale log-likelihood, bad input.

pwb_sim_cost <- function(n = 60, seed = 1) {
  set.seed(seed)
  d <- data.frame(area = runif(n, 50, 300), age = runif(n, 0, 40),
                  region = factor(sample(c("north", "south", "east"), n, replace = TRUE)))
  d$cost <- exp(2 + 0.008 * d$area - 0.015 * d$age + 0.2 * (d$region == "south") +
                  rnorm(n, sd = 0.3))
  d
}

test_that("the fit equals lm() on the transformed variables", {
  d <- pwb_sim_cost()
  m <- lm_transformed(cost ~ log(area) + age * region, d, response = new_transform("log"),
                      predictors = list(age = new_transform("sqrt", shift = 1)))
  # Reference: base R lm() on hand-transformed data. Tolerance 1e-10 as the issue asks.
  d2 <- d
  d2$age <- sqrt(d$age + 1)
  d2$cost <- log(d$cost)
  ref <- lm(cost ~ log(area) + age * region, d2)
  expect_equal(coef(m), coef(ref), tolerance = 1e-10)
  expect_equal(unname(m$coefficients), unname(coef(ref)), tolerance = 1e-10)
  expect_equal(unname(m$se), unname(summary(ref)$coefficients[, 2]), tolerance = 1e-10)
  expect_equal(m$sigma, summary(ref)$sigma, tolerance = 1e-10)
  expect_equal(m$df_residual, ref$df.residual)
  expect_equal(unname(m$leverages), unname(hatvalues(ref)), tolerance = 1e-10)
  expect_equal(unname(residuals(m)), unname(residuals(ref)), tolerance = 1e-10)
  expect_equal(unname(fitted(m)), unname(exp(fitted(ref))), tolerance = 1e-10)
  expect_s3_class(m$lm, "lm")
  expect_equal(confint(m), confint(ref), tolerance = 1e-10)
})

test_that("logLik is on the original scale with the Jacobian", {
  d <- pwb_sim_cost(80, 2)
  m <- lm_transformed(cost ~ area + age, d, response = new_transform("log"))
  # Reference: base R logLik() of the lm on log(cost), plus the Jacobian -sum(log(cost))
  # (change of variables); equivalently the sum of dlnorm() log-densities at the MLE sigma.
  ref <- lm(log(cost) ~ area + age, d)
  s_mle <- sqrt(sum(residuals(ref)^2) / 80)
  want <- sum(dlnorm(d$cost, fitted(ref), s_mle, log = TRUE))
  expect_equal(as.numeric(logLik(m)), want, tolerance = 1e-10)
  expect_equal(as.numeric(logLik(m)), as.numeric(logLik(ref)) - sum(log(d$cost)), tolerance = 1e-10)
  expect_equal(attr(logLik(m), "df"), 4)
  # The untransformed model's logLik is lm's; AIC then compares the two response scales.
  m0 <- lm_transformed(cost ~ area + age, d, response = "none")
  expect_equal(as.numeric(logLik(m0)), as.numeric(logLik(lm(cost ~ area + age, d))),
               tolerance = 1e-10)
  expect_lt(AIC(m), AIC(m0))  # lognormal truth: the log model fits better
})

test_that("rank-deficient designs report aliased coefficients as lm does", {
  d <- pwb_sim_cost(40, 3)
  d$area2 <- 2 * d$area
  m <- lm_transformed(cost ~ area + area2 + age, d, response = new_transform("log"))
  ref <- lm(log(cost) ~ area + area2 + age, d)
  expect_identical(is.na(coef(m)), is.na(coef(ref)))
  expect_true(m$aliased[["area2"]])
  expect_true(is.na(m$coefficients[["area2"]]))
  expect_equal(m$rank, ref$rank)
  expect_equal(unname(predict(m, d[1:3, ], scale = "transformed")$fit),
               unname(suppressWarnings(predict(ref, d[1:3, ]))), tolerance = 1e-10)
})

test_that("missing values follow na.action and keep alignment", {
  d <- pwb_sim_cost(30, 4)
  d$age[c(3, 10)] <- NA
  m <- lm_transformed(cost ~ area + age, d, response = new_transform("log"),
                      na.action = na.exclude)
  expect_length(fitted(m), 30)
  expect_true(all(is.na(fitted(m)[c(3, 10)])))
  expect_equal(m$n, 28)
  p <- predict(m)
  expect_equal(nrow(p), 30)
  expect_true(all(is.na(p$fit[c(3, 10)])))
  m2 <- lm_transformed(cost ~ area + age, d, response = new_transform("log"),
                       na.action = na.omit)
  expect_length(fitted(m2), 28)
})

test_that("bad input is refused with the variable, rows and remedy", {
  d <- pwb_sim_cost(20, 5)
  d$cost[c(2, 7)] <- -1
  expect_error(lm_transformed(cost ~ area, d, response = new_transform("log")),
               "`cost`.*rows 2, 7")
  expect_error(lm_transformed(log(cost) ~ area, d, response = "none"), "variable name")
  expect_error(lm_transformed(cost ~ area + nope, d, response = "none"), "`nope`")
  expect_error(lm_transformed(cost ~ area, d, response = "none", level = 1), "strictly between")
  expect_error(lm_transformed(cost ~ area + region, d, response = "none",
                              predictors = list(region = new_transform("log"))), "not numeric")
  expect_error(lm_transformed(cost ~ area, d, response = "none",
                              predictors = list(age = new_transform("log"))), "not a predictor")
  expect_error(lm_transformed(cost ~ area, d, response = "cube"), "`response` must be")
})

test_that("print and summary show the transforms and the original-scale fit", {
  d <- pwb_sim_cost(40, 6)
  m <- lm_transformed(cost ~ area + age, d, response = new_transform("log"),
                      predictors = list(area = new_transform("log")))
  expect_output(print(m), "response cost: log of cost")
  expect_output(print(m), "predictor area: log")
  s <- summary(m)
  expect_s3_class(s, "summary.pwb_model")
  # Reference: summary.lm of the honest lm (base R), the same fit with transformed names.
  expect_equal(unname(s$coefficients), unname(summary(m$lm)$coefficients), tolerance = 1e-10)
  expect_output(print(s), "Original-scale log-likelihood")
  expect_equal(nobs(m), 40)
})
