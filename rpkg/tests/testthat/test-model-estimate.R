# lm_transformed(response = "estimate") takes the power from the design built for the fit; the
# result must be the one estimate_response_lambda() gives on the same (transformed) data.

strip_call <- function(l) {
  l$na_action <- NULL
  l
}

test_that("the estimated power equals estimate_response_lambda() on the same rows", {
  # trees: plain predictors and a log-transformed one
  m <- lm_transformed(Volume ~ Girth + Height, trees,
                      predictors = list(Girth = new_transform("log")))
  td <- trees
  td$Girth <- log(td$Girth)
  ref <- estimate_response_lambda(Volume ~ Girth + Height, td)
  # the same compiled call on the same numbers: identical
  expect_identical(strip_call(m$response_lambda), strip_call(ref))
  # airquality: rows with missing values dropped by na.omit first
  m <- lm_transformed(Ozone ~ Wind + Temp + factor(Month), airquality)
  cc <- stats::complete.cases(airquality[c("Ozone", "Wind", "Temp", "Month")])
  ref <- estimate_response_lambda(Ozone ~ Wind + Temp + factor(Month), airquality[cc, ])
  expect_identical(strip_call(m$response_lambda), strip_call(ref))
  # weights, one of them 0
  w <- rep(c(0, 1, 2.5), length.out = nrow(mtcars))
  m <- lm_transformed(mpg ~ wt + factor(cyl), mtcars, weights = w)
  ref <- estimate_response_lambda(mpg ~ wt + factor(cyl), mtcars, weights = w)
  expect_identical(strip_call(m$response_lambda), strip_call(ref))
  expect_true(m$response_lambda$weighted)
})

test_that("an aliased column or a bad response still gets estimate_response_lambda's words", {
  set.seed(4)
  d <- data.frame(y = exp(seq(0.1, 3, length.out = 20) + rnorm(20, sd = 0.2)), x = 1:20)
  d$x2 <- 2 * d$x
  m <- lm_transformed(y ~ x + x2, d)
  expect_identical(m$response_lambda$aliased, "x2")
  expect_identical(strip_call(m$response_lambda),
                   strip_call(estimate_response_lambda(y ~ x + x2, d)))
  d$y[c(3, 7)] <- -1
  expect_error(lm_transformed(y ~ x, d), "Box-Cox needs y > 0; 2 values <= 0 at rows 3, 7",
               fixed = TRUE)
})
