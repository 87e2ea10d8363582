# The aliased predictor columns of the response lambda, named from the columns the library
# dropped; the reference is the NA coefficients of base R's lm() on the same design (stats::lm).

lm_aliased <- function(fit) names(which(is.na(stats::coef(fit))))

test_that("aliased columns are those lm drops (copies and linear combinations)", {
  f <- mpg ~ wt + I(2 * wt) + hp + I(wt + hp) + qsec
  fit <- estimate_response_lambda(f, data = mtcars)
  expect_identical(fit$aliased, lm_aliased(stats::lm(f, data = mtcars)))
  expect_identical(fit$aliased, c("I(2 * wt)", "I(wt + hp)"))  # worked by hand: later copies
  expect_identical(fit$rank, 4L)
  # A column that copies the intercept (design column 0) is named too.
  g <- mpg ~ I(0 * wt + 3) + wt
  expect_identical(estimate_response_lambda(g, data = mtcars)$aliased,
                   lm_aliased(stats::lm(g, data = mtcars)))
  # A factor whose dummies sum to another column's: lm's column names, in design order.
  d <- transform(mtcars, four = as.numeric(cyl == 4), cylf = factor(cyl))
  h <- mpg ~ cylf + four + wt
  expect_identical(estimate_response_lambda(h, data = d)$aliased,
                   lm_aliased(stats::lm(h, data = d)))
  expect_identical(estimate_response_lambda(mpg ~ wt + hp, data = mtcars)$aliased, character(0))
})

test_that("with weights, aliased columns are those the weighted lm drops", {
  d <- mtcars
  d$w <- d$disp / 100
  d$w[c(3, 9)] <- 0  # zero weights drop rows, as in lm
  f <- mpg ~ wt + hp + I(wt - hp) + drat
  fit <- estimate_response_lambda(f, data = d, weights = w)
  expect_identical(fit$aliased, lm_aliased(stats::lm(f, data = d, weights = w)))
  expect_identical(fit$aliased, "I(wt - hp)")
  # From an lm fit: the same names.
  expect_identical(estimate_response_lambda(stats::lm(f, data = d, weights = w))$aliased,
                   fit$aliased)
})

test_that("many responses name the shared design's aliased columns", {
  f <- cbind(mpg, qsec) ~ wt + hp + I(3 * hp) + I(wt + hp)
  g <- mpg ~ wt + hp + I(3 * hp) + I(wt + hp)  # one response, the same design
  set <- estimate_response_lambda(f, data = mtcars)
  want <- lm_aliased(stats::lm(g, data = mtcars))
  expect_identical(want, c("I(3 * hp)", "I(wt + hp)"))
  expect_length(response_fits(set), 2L)
  for (fit in response_fits(set)) expect_identical(fit$aliased, want)
  d <- mtcars
  d$w <- d$carb
  ws <- estimate_response_lambda(f, data = d, weights = w)
  expect_length(response_fits(ws), 2L)
  for (fit in response_fits(ws))
    expect_identical(fit$aliased,
                     lm_aliased(stats::lm(g, data = d, weights = w)))
})
