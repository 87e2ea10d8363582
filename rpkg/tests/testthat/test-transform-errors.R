test_that("out-of-domain values name the variable, the 1-based rows and a remedy", {
  flow <- c(3, 0, 5, -1, 2, -4)
  tr <- new_transform("box-cox", lambda = 0.5)
  expect_error(apply_transform(tr, flow),
               "box-cox needs v > 0; 3 of 6 values of `flow` are outside, at rows 2, 4, 6: use yeo-johnson")
  shifted <- new_transform("log", shift = 1)
  expect_error(apply_transform(shifted, flow), "where v = x \\+ shift; 2 of 6 values .* rows 4, 6")
  expect_error(apply_transform(new_transform("logit"), c(0.5, 1.2)), "0 < v < 1.*row 2")
})

test_that("invalid = 'na' gives NA with the rows flagged", {
  tr <- new_transform("sqrt")
  out <- apply_transform(tr, c(4, -1, 9, NA, 0, -2), invalid = "na")
  expect_equal(out[c(1, 3, 5)], c(2, 3, 0))  # sqrt's domain includes 0
  expect_true(all(is.na(out[c(2, 4, 6)])))
  expect_identical(attr(out, "invalid_rows"), c(2L, 6L))
})

test_that("infinite values are errors naming rows", {
  expect_error(apply_transform(new_transform("identity"), c(1, Inf, -Inf)),
               "`c\\(1, Inf, -Inf\\)` has 2 infinite values at rows 2, 3")
})

test_that("inverse outside the range is named", {
  tr <- new_transform("box-cox", lambda = 0.5)
  z <- c(0, -3)
  expect_error(invert_transform(tr, z), "needs z > -2; 1 of 2 values of `z` are outside, at row 2")
})

test_that("bad specs are clear errors", {
  expect_error(new_transform("boxcox"), "unknown family \"boxcox\"; known families: identity, box-cox")
  expect_error(new_transform("box-cox"), "box-cox needs a finite lambda")
  expect_error(new_transform("box-cox", lambda = NaN), "finite lambda")
  expect_error(new_transform("power", lambda = 0), "lambda != 0")
  expect_error(new_transform("log", reflect = TRUE), "reflect needs a finite pivot")
  expect_error(new_transform("log", shift = NA), "`shift` must be a finite number")
  expect_error(new_transform(c("log", "sqrt")), "one family name")
  expect_error(apply_transform(list(family = "log"), 1), "pwb_transform")
  expect_error(apply_transform(new_transform("log"), "a"), "must be numeric")
})

test_that("print shows the whole transform", {
  expect_output(print(new_transform("box-cox", lambda = 0.5, shift = 1)),
                "<pwb_transform> box-cox\\(lambda = 0.5\\) of \\(x \\+ 1\\)")
  expect_output(print(new_transform("log", reflect = TRUE, pivot = 101)),
                "log of \\(101 - x\\)")
})
