# Rows of the response at the boundary of the response transform's domain (y = 0 under a power
# other than 1) make the log-Jacobian -Inf: logLik is -Inf and AIC Inf, which the printed output,
# logLik()/AIC() and the comparison say in words, naming the rows and the remedy.

# y = 0 in rows 1 and 2; the rest roughly quadratic in x (so a square root is a fair model).
zero_y <- data.frame(x = 1:12,
                     y = c(0, 0, 1.2, 2.1, 2.9, 4.2, 5.1, 5.8, 7.2, 8.1, 9.3, 9.8)^2)
sqrt_power <- new_transform("power", lambda = 0.5)

test_that("print and summary of a model with boundary rows say so in words", {
  m <- lm_transformed(y ~ x, zero_y, response = sqrt_power)
  expect_identical(m$loglik, -Inf)
  out <- capture.output(print(m))
  txt <- paste(out, collapse = " ")
  expect_match(txt, "log-likelihood -Inf", fixed = TRUE)
  expect_match(txt, "2 rows (rows 1, 2) lie at the boundary", fixed = TRUE)
  expect_match(txt, "not comparable")
  expect_match(txt, "Yeo-Johnson")
  expect_true(all(nchar(out) <= 80L))
  s_out <- paste(capture.output(print(summary(m))), collapse = " ")
  expect_match(s_out, "2 rows (rows 1, 2) lie at the boundary", fixed = TRUE)
})

test_that("logLik and AIC warn in words and still rank the model last", {
  m <- lm_transformed(y ~ x, zero_y, response = sqrt_power)
  expect_warning(ll <- logLik(m), "2 rows \\(rows 1, 2\\).*boundary.*not comparable")
  expect_identical(as.numeric(ll), -Inf)
  expect_warning(a <- AIC(m), "boundary")
  expect_identical(a, Inf)
  # the row names of the data, not positions: the same rows under other names
  named <- zero_y
  row.names(named) <- sprintf("site%02d", 1:12)
  m2 <- lm_transformed(y ~ x, named, response = sqrt_power)
  expect_warning(logLik(m2), "(rows site01, site02)", fixed = TRUE)
  # a zero weight takes the row out of the likelihood, and out of the count
  w <- c(0, rep(1, 11))
  m3 <- lm_transformed(y ~ x, zero_y, response = sqrt_power, weights = w)
  expect_warning(logLik(m3), "1 row (row 2) lies at the boundary", fixed = TRUE)
})

test_that("a model without boundary rows has a finite logLik and no note", {
  m <- lm_transformed(y ~ x, zero_y[-(1:2), ], response = sqrt_power)
  expect_true(is.finite(m$loglik))
  expect_silent(ll <- logLik(m))
  # logLik equals the lm log-likelihood on sqrt(y) plus the Jacobian sum log(1 / (2 sqrt(y)))
  # (base R lm and logLik.lm); 1e-10: the same sums in a different order
  ref <- logLik(lm(sqrt(y) ~ x, zero_y[-(1:2), ]))
  jac <- sum(log(0.5 / sqrt(zero_y$y[-(1:2)])))
  expect_equal(as.numeric(ll), as.numeric(ref) + jac, tolerance = 1e-10)
  expect_false(any(grepl("boundary", capture.output(print(m)))))
})

test_that("the comparison names the candidate whose AIC is Inf and why", {
  cmp <- compare_transforms(y ~ x, zero_y,
                            candidates = list("none", sqrt_y = list(y = sqrt_power)),
                            folds = 3, seed = 5, progress = FALSE)
  s <- cmp$summary
  expect_identical(s$aic[s$candidate == "sqrt_y"], Inf)
  expect_true(is.finite(s$aic[s$candidate == "none"]))
  expect_identical(cmp$full$sqrt_y$boundary_rows, c("1", "2"))
  out <- capture.output(print(cmp))
  txt <- paste(out, collapse = " ")
  expect_match(txt, "sqrt_y: aic is Inf. 2 rows (rows 1, 2) lie at the boundary", fixed = TRUE)
  expect_false(grepl("none: aic is Inf", txt, fixed = TRUE))
  expect_true(all(nchar(out) <= 80L))
})
