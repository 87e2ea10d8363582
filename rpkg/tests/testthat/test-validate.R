# The shared argument checks: one wording for each kind of bad argument.

test_that("validators accept good values and name the argument in their errors", {
  v <- asNamespace("powerback")
  expect_silent(v$pwb_check_level(0.9))
  for (bad in list(0, 1, NA, c(0.9, 0.95), "0.9"))
    expect_error(v$pwb_check_level(bad), "`level` must be a single number strictly between 0 and 1")
  expect_silent(v$pwb_check_range(c(-2, 2)))
  expect_error(v$pwb_check_range(c(2, -2)), "`range` must be two finite numbers")
  expect_error(v$pwb_check_range(c(-Inf, 2)), "lower < upper")
  expect_silent(v$pwb_check_flag(TRUE, "compare"))
  expect_error(v$pwb_check_flag(NA, "compare"), "`compare` must be TRUE or FALSE")
  expect_identical(v$pwb_check_whole(3, "folds", 2L), 3L)
  expect_error(v$pwb_check_whole(1.5, "folds", 2L), "`folds` must be a whole number >= 2")
  expect_error(v$pwb_check_whole(1, "folds", 2L), ">= 2")
  expect_silent(v$pwb_check_seed(NULL))
  expect_error(v$pwb_check_seed(-1), "`seed` must be NULL or a whole number >= 0")
  expect_error(v$pwb_check_data_frame(1:3), "`data` must be a data frame")
  expect_error(v$pwb_check_response_formula(~ x), "two-sided formula")
  expect_error(v$pwb_check_response_formula(log(y) ~ x), "its left side is `log\\(y\\)`")
  expect_silent(v$pwb_check_positive(1e-6, "tol"))
  for (bad in list(0, -1, NA, Inf, c(1, 2), "1"))
    expect_error(v$pwb_check_positive(bad, "tol"), "`tol` must be a single positive number")
  expect_silent(v$pwb_check_named_list(list(a = 1), "at"))
  expect_error(v$pwb_check_named_list(list(1), "at"), "`at` must be a named list")
  expect_error(v$pwb_check_path(NA_character_), "`file` must be a single path")
  f <- function(kind = c("alpha", "beta")) v$pwb_match_choice(kind, "kind")
  expect_identical(f(), "alpha")
  expect_identical(f("be"), "beta")
  expect_identical(f("alpha"), "alpha")
  expect_error(f("gamma"), "`kind` must be one of \"alpha\", \"beta\"")
  expect_error(f(c("alpha", "beta", "x")), "`kind` must be one of")
  expect_identical(v$pwb_check_choice("mean", c("median", "mean"), "center"), "mean")
  expect_error(v$pwb_check_choice("mode", c("median", "mean"), "center"),
               "`center` must be one of \"median\", \"mean\"")
})

test_that("entry points word a bad level the same way", {
  msg <- "`level` must be a single number strictly between 0 and 1"
  expect_error(screen_skew(trees, level = 2), msg)  # trees (datasets package)
  expect_error(compare_transforms(Volume ~ Girth, trees, level = 0), msg)
  expect_error(confint(estimate_lambda(trees$Volume), level = 1), msg)
})

test_that("entry points word a bad range, flag or tolerance the same way", {
  # trees (datasets package)
  expect_error(lambda_influence(Volume ~ Girth, trees, range = c(1, -1)),
               "`range` must be two finite numbers")
  expect_error(estimate_lambda(trees$Volume, range = c(-Inf, 2)), "`range` must be two finite numbers")
  expect_error(residual_checks(lm(Volume ~ Girth, trees), compare = NA), "`compare` must be TRUE or FALSE")
  expect_error(box_tidwell(Volume ~ Girth, trees, tol = 0), "`tol` must be a single positive number")
  expect_error(box_tidwell(Volume ~ Girth, trees, max_iter = 2.5), "`max_iter` must be a whole number >= 1")
  expect_error(lambda_influence(Volume ~ Girth, trees, family = "log"),
               "`family` must be one of \"box-cox\", \"yeo-johnson\"")
  expect_error(apply_transform(new_transform("log"), 1:3, invalid = "drop"),
               "`invalid` must be one of \"error\", \"na\"")
})

test_that("choice arguments of the entry points are matched and worded alike", {
  expect_error(lm_transformed(mpg ~ wt, datasets::mtcars, family = "log"),
               "`family` must be one of \"box-cox\", \"yeo-johnson\"")
  expect_error(estimate_response_lambda(mpg ~ wt, datasets::mtcars, family = "logit"),
               "`family` must be one of")
  m <- lm_transformed(mpg ~ wt, datasets::mtcars, response = "none")
  expect_error(predict(m, datasets::mtcars[1:2, ], interval = "both"),
               "`interval` must be one of \"none\", \"confidence\", \"prediction\"")
  # a unique abbreviation is completed, as match.arg() does
  expect_equal(predict(m, datasets::mtcars[1:2, ], interval = "pred")$lwr,
               predict(m, datasets::mtcars[1:2, ], interval = "prediction")$lwr)
  expect_equal(coef(lm_transformed(mpg ~ wt, datasets::mtcars, family = "yeo")),
               coef(lm_transformed(mpg ~ wt, datasets::mtcars, family = "yeo-johnson")))
})
