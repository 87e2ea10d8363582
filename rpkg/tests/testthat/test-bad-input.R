# Bad and extreme input, one row per case: the input, and either the error it must raise (a
# regular expression matched against the message) or a check of the result it must return
# (after the warning it must give, when the row names one).
# Every entry point refuses what it cannot handle with a message naming the problem; extreme
# but valid input gives the right numbers.

set.seed(20260)
x_pos <- exp(rnorm(40, 1, 0.5))
dat <- data.frame(x1 = runif(40, 1, 5), x2 = runif(40, 1, 5))
dat$y <- exp(0.3 + 0.2 * dat$x1 - 0.1 * dat$x2 + rnorm(40, 0, 0.1))

# A small spec file with a malformed line.
bad_spec <- tempfile(fileext = ".pwbspec")
writeLines(c("powerback-spec 1", "transform name=\"a\" family=box-cox lambda=oops"), bad_spec)

# Wide data: more columns than rows, many of them aliased.
wide <- as.data.frame(matrix(rnorm(30 * 120), 30, 120))
wide$y <- exp(rnorm(30))

cases <- list(
  # NA, NaN, Inf
  # NA and NaN are missing values: dropped as na.omit drops them, and counted.
  list(what = "NA in a sample", expr = quote(estimate_lambda(c(x_pos[1:9], NA))),
       check = function(r) {
         expect_identical(r$n, 9L)
         expect_identical(r$lambda, estimate_lambda(x_pos[1:9])$lambda)
       }),
  list(what = "NaN in a sample", expr = quote(estimate_lambda(c(x_pos[1:9], NaN))),
       check = function(r) expect_identical(r$n, 9L)),
  list(what = "Inf in a sample", expr = quote(estimate_lambda(c(x_pos[1:9], Inf))),
       error = "infinite|Inf|non-finite"),
  list(what = "Inf in a transform input",
       expr = quote(apply_transform(new_transform("log"), c(1, Inf))), error = "infinite.*row 2"),
  # y <= 0
  list(what = "zero and negative values for Box-Cox",
       expr = quote(estimate_lambda(c(x_pos[1:8], 0, -1))),
       error = "2 values <= 0|> 0.*rows? 9, 10|yeo-johnson"),
  list(what = "a value <= 0 for the log",
       expr = quote(apply_transform(new_transform("log"), c(2, 0, 3))), error = "v > 0.*row 2"),
  # constant and collinear columns
  list(what = "a constant sample", expr = quote(estimate_lambda(rep(3, 10))),
       error = "constant|identical"),
  list(what = "a collinear predictor is aliased, as lm drops it",
       expr = quote(lm_transformed(y ~ x1 + x2 + x3, transform(dat, x3 = x1 + 2 * x2),
                                   response = "none")),
       check = function(f) {
         b <- coef(f)
         ref <- coef(lm(y ~ x1 + x2 + x3, transform(dat, x3 = x1 + 2 * x2)))  # base R lm
         expect_true(is.na(b[["x3"]]))
         expect_equal(unname(b[1:3]), unname(ref[1:3]), tolerance = 1e-10)  # two QRs: rounding
       }),
  # n <= p + 1
  list(what = "too few rows for the predictors",
       expr = quote(estimate_response_lambda(y ~ x1 + x2, data = dat[1:3, ])),
       error = "rank|observations|rows"),
  # malformed specs
  list(what = "a malformed spec file", expr = quote(read_transforms(bad_spec)),
       error = "line 2"),
  list(what = "an unknown family", expr = quote(new_transform("cube-root")),
       error = "unknown family|family"),
  # non-numeric columns
  list(what = "a character response",
       expr = quote(lm_transformed(y ~ x1, transform(dat, y = as.character(y)), response = "none")),
       error = "numeric"),
  list(what = "a character sample", expr = quote(estimate_lambda(as.character(x_pos))),
       error = "numeric"),
  # unseen factor levels
  list(what = "a factor level the fit never saw",
       expr = quote(predict(lm_transformed(y ~ x1 + g, transform(dat, g = factor(rep(c("a", "b"), 20))),
                                           response = "none"),
                            newdata = data.frame(x1 = 2, g = "c"))),
       error = "level|c"),
  # empty and one-row data
  list(what = "an empty sample", expr = quote(estimate_lambda(numeric(0))),
       error = "at least|fewer|empty|values"),
  list(what = "one-row data", expr = quote(lm_transformed(y ~ x1, dat[1, ], response = "none")),
       error = "row|degrees of freedom|observations"),
  # offsets are refused where the lambda is estimated
  list(what = "an offset when estimating the response lambda",
       expr = quote(estimate_response_lambda(y ~ x1 + offset(x2), data = dat)),
       error = "offset"),
  # wide data: one factorisation, lm's aliased columns
  list(what = "more columns than rows",
       expr = quote(lm_transformed(y ~ ., wide[, c(1:40, 121)], response = "none")),
       error = "degrees of freedom|residual"),
  list(what = "wide data with spare rows: the columns lm keeps",
       expr = quote(lm_transformed(y ~ ., wide[, c(1:20, 121)], response = "none")),
       check = function(f) {
         ref <- coef(lm(y ~ ., wide[, c(1:20, 121)]))  # base R lm
         expect_equal(is.na(unname(coef(f))), is.na(unname(ref)))
         expect_equal(unname(coef(f)), unname(ref), tolerance = 1e-8)  # 21 columns, 30 rows
       }),
  # predictors in extreme units
  list(what = "predictors of magnitude 1e-200 are not dropped",
       expr = quote(lm_transformed(y ~ x1 + x2, transform(dat, x1 = x1 * 1e-200, x2 = x2 * 1e200),
                                   response = "none")),
       check = function(f) {
         ref <- coef(lm(y ~ x1 + x2, dat))  # base R lm in ordinary units
         b <- coef(f)
         expect_false(anyNA(b))
         # exact power-of-two scaling inside; 1e-10 covers the rounding of x * 1e-200
         expect_equal(b[["x1"]] * 1e-200, ref[["x1"]], tolerance = 1e-10)
         expect_equal(b[["x2"]] * 1e200, ref[["x2"]], tolerance = 1e-10)
       }),
  # skewness of values near the ends of the double range
  list(what = "values near 1e300 are not 'all identical'",
       expr = quote(screen_skew(data.frame(v = x_pos * 1e300))),
       check = function(s) {
         out <- capture.output(print(s))
         expect_false(any(grepl("identical", out)))
       }),
  list(what = "values near 1e-301 are not 'all identical'",
       expr = quote(screen_skew(data.frame(v = x_pos * 1e-301))),
       check = function(s) {
         out <- capture.output(print(s))
         expect_false(any(grepl("identical", out)))
       }),
  # a power response with lambda in (0, 1] and a zero y: the Jacobian is degenerate there, so
  # the log-likelihood is -Inf and AIC ranks the model last, never first, and says why in words
  list(what = "a square-root-power response with a zero y",
       expr = quote(lm_transformed(y ~ x, data.frame(y = c(0, 1, 4, 9, 16, 25, 37), x = 1:7),
                                   response = new_transform("power", lambda = 0.5))),
       check = function(f) {
         expect_warning(ll <- logLik(f), "1 row \\(row 1\\) lies at the boundary.*Yeo-Johnson")
         expect_identical(as.numeric(ll), -Inf)
         expect_identical(suppressWarnings(AIC(f)), Inf)
         expect_true(any(grepl("boundary", capture.output(print(f)))))
       }),
  # overflow of finite input
  list(what = "Box-Cox lambda = 2 at 1e300 overflows",
       expr = quote(apply_transform(new_transform("box-cox", lambda = 2), c(3, 1e300))),
       error = "row 2"),
  list(what = "an identity shift that overflows",
       expr = quote(apply_transform(new_transform("identity", shift = 1e308), 1e308)),
       error = "row 1"),
  # the round trip for negative lambda at large values
  list(what = "the round trip of Box-Cox lambda = -2 at 1e6 keeps 1e-4",
       expr = quote(invert_transform(new_transform("box-cox", lambda = -2),
                                     apply_transform(new_transform("box-cox", lambda = -2), 1e6))),
       check = function(v) expect_equal(v, 1e6, tolerance = 1e-4)),  # x^2/2 * 2^-53 ~ 6e-5
  list(what = "Box-Cox lambda = -2 at 1e9: no digits left to invert",
       expr = quote(invert_transform(new_transform("box-cox", lambda = -2),
                                     apply_transform(new_transform("box-cox", lambda = -2), 1e9))),
       error = "z < 0.5.*row 1"),
  # offsets are refused by every entry point, never silently ignored
  list(what = "an offset in lm_transformed with response = \"none\"",
       expr = quote(lm_transformed(y ~ x1 + offset(log(x2)), dat, response = "none")),
       error = "offsets are not supported"),
  list(what = "residual checks of an lm with an offset",
       expr = quote(residual_checks(lm(y ~ x1 + offset(log(x2)), dat))), error = "offset"),
  list(what = "an offset in compare_transforms",
       expr = quote(compare_transforms(y ~ x1 + offset(log(x2)), dat, seed = 1)),
       error = "offsets are not supported"),
  # a perfect fit has no maximum-likelihood power
  list(what = "a response computed exactly from its predictor",
       expr = quote(estimate_response_lambda(y ~ x1, transform(dat, y = 2 + 3 * x1))),
       error = "no power can be estimated"),
  # at_bound only at the range's ends, however wide the range
  list(what = "an interior power in a wide range is not at a bound",
       expr = quote(estimate_lambda(x_pos, range = c(-90, 90))),
       check = function(r) expect_false(r$at_bound)),
  list(what = "a search range of +-1e300",
       expr = quote(estimate_lambda(x_pos, range = c(-1e300, 1e300))), error = "range"),
  list(what = "a variable the data lack", expr = quote(estimate_response_lambda(y ~ zz, dat)),
       error = "zz"),
  # new data: empty, and a numeric column passed as text
  list(what = "empty new data",
       expr = quote(predict(lm_transformed(y ~ x1, dat, response = "none"), dat[0, ])),
       check = function(p) {
         expect_identical(nrow(p), 0L)
         expect_true(all(c("fit", "lwr", "upr") %in% names(p)))
       }),
  list(what = "a numeric predictor passed as text in new data",
       expr = quote(predict(lm_transformed(y ~ x1, dat, response = "none"),
                            transform(dat, x1 = as.character(x1)))),
       error = "x1"),
  # a linear predictor beyond the double range (finite x of extreme magnitude): NA, flagged, said
  list(what = "new predictor values whose x'b overflows",
       expr = quote(predict(lm_transformed(y ~ x, data.frame(x = 1:10, y = 1000 * (1:10) + sin(1:10)),
                                           response = "none"),
                            data.frame(x = c(1e306, 2, -1e306)), interval = "prediction")),
       warning = "overflows.*2 rows \\(1, 3\\)",
       check = function(p) {
         expect_true(all(is.na(p[c(1, 3), c("fit", "lwr", "upr")])))
         # the ordinary row as base R's predict.lm gives it; 1e-10: two QRs, rounding only
         ref <- predict(lm(y ~ x, data.frame(x = 1:10, y = 1000 * (1:10) + sin(1:10))),
                        data.frame(x = 2), interval = "prediction")
         expect_equal(unname(unlist(p[2, c("fit", "lwr", "upr")])), unname(ref[1, ]),
                      tolerance = 1e-10)
       }),
  list(what = "a matrix keeps its dimensions through a transform",
       expr = quote(apply_transform(new_transform("log"), matrix(1:4, 2))),
       check = function(v) expect_identical(dim(v), c(2L, 2L)))
)

for (cs in cases) {
  test_that(paste("bad input:", cs$what), {
    if (!is.null(cs$error)) {
      expect_error(eval(cs$expr), cs$error)
    } else if (!is.null(cs$warning)) {
      expect_warning(res <- eval(cs$expr), cs$warning)
      cs$check(res)
    } else {
      res <- eval(cs$expr)
      cs$check(res)
    }
  })
}
