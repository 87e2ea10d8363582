sim_inf <- function(n, seed) {
  set.seed(seed)
  d <- data.frame(x = runif(n, 0, 3), g = factor(sample(c("a", "b"), n, TRUE)))
  d$y <- (2 + d$x + 0.5 * (d$g == "b") + rnorm(n, sd = 0.25))^2
  d
}

# Box-Cox profile log-likelihood of y given the design, by base R lm() (Box & Cox 1964, sec. 3:
# -n/2 log(RSS/n) + (lambda - 1) sum log y, constants dropped) and its maximum by optimize().
brute_lambda <- function(d) {
  prof <- function(l) {
    z <- if (abs(l) < 1e-12) log(d$y) else (d$y^l - 1) / l
    fit <- lm(z ~ x + g, data = cbind(d, z = z))
    -nrow(d) / 2 * log(sum(residuals(fit)^2) / nrow(d)) + (l - 1) * sum(log(d$y))
  }
  optimize(prof, c(-3, 3), maximum = TRUE, tol = 1e-10)$maximum
}

test_that("leave-one-out lambda equals refits without each row", {
  d <- sim_inf(30, 4)
  d$y[12] <- 4 * d$y[12]
  inf <- lambda_influence(y ~ x + g, d)
  ref <- vapply(seq_len(nrow(d)), function(i) brute_lambda(d[-i, ]), numeric(1))
  # both maximise the same profile: optimize() to 1e-10, the package's Brent to ~1.5e-8
  expect_lt(max(abs(inf$rows$lambda - ref)), 1e-6)
  expect_lt(abs(inf$lambda - brute_lambda(d)), 1e-6)
  expect_lt(max(abs(inf$rows$delta - (ref - inf$lambda))), 1e-6)
  expect_identical(inf$rows$outside, ref < inf$conf_int[1] | ref > inf$conf_int[2])
  expect_equal(which.max(abs(inf$rows$delta)), 12L)
  # leverages: hatvalues() of the same design (base R stats)
  expect_equal(inf$rows$leverage, unname(hatvalues(lm(y ~ x + g, d))), tolerance = 1e-10)
})

# The weighted profile by hand: weighted RSS from base R lm(weights =), unweighted Jacobian over
# the rows of positive weight (the constant 1/2 sum log w dropped), maximised by optimize().
brute_weighted <- function(d, w) {
  keep <- w > 0
  d <- d[keep, ]
  w <- w[keep]
  prof <- function(l) {
    z <- if (abs(l) < 1e-12) log(d$y) else (d$y^l - 1) / l
    fit <- lm(z ~ x + g, data = cbind(d, z = z), weights = w)
    -nrow(d) / 2 * log(sum(w * residuals(fit)^2)) + (l - 1) * sum(log(d$y))
  }
  optimize(prof, c(-3, 3), maximum = TRUE, tol = 1e-10)$maximum
}

test_that("weighted leave-one-out lambda equals weighted refits; subset follows lm", {
  d <- sim_inf(30, 6)
  d$w <- rep(c(0.5, 1, 2.5), 10)
  d$w[4] <- 0
  inf <- tryCatch(lambda_influence(y ~ x + g, d, weights = w), error = function(e) e)
  if (inherits(inf, "error")) {
    # a core whose lambda search has no weights refuses them with a clear message
    expect_match(conditionMessage(inf), "no weights")
  } else {
    ref <- vapply(seq_len(nrow(d)), function(i) brute_weighted(d[-i, ], d$w[-i]), numeric(1))
    used <- d$w > 0
    # optimize() to 1e-10, the package's Brent to ~1.5e-8 on the same profile
    expect_lt(max(abs(inf$rows$lambda - ref[used])), 1e-6)
    expect_lt(abs(inf$lambda - brute_weighted(d, d$w)), 1e-6)
    expect_false(4L %in% inf$rows$row)  # weight 0: left out, as lm does
    expect_equal(inf$n, 29L)
    # leverages: hatvalues() of the weighted lm (base R stats, which leaves weight-0 rows out too)
    expect_equal(inf$rows$leverage, unname(hatvalues(lm(y ~ x + g, d, weights = w))),
                 tolerance = 1e-10)
  }
  s <- lambda_influence(y ~ x + g, d, subset = x > 0.5)
  expect_equal(s$rows$lambda, lambda_influence(y ~ x + g, d[d$x > 0.5, ])$rows$lambda)
  expect_equal(s$rows$row, which(d$x > 0.5))
  d$w[6] <- -1
  expect_error(lambda_influence(y ~ x + g, d, weights = w), "at row 6")
})

test_that("rows are named by the data's row names where it has them", {
  d <- sim_inf(24, 3)
  rownames(d) <- paste0("plot_", LETTERS[1:24])
  d$y[5] <- 5 * d$y[5]
  inf <- lambda_influence(y ~ x + g, d)
  expect_equal(inf$rows$row, rownames(d))
  expect_equal(inf$n_outside, sum(inf$rows$outside))
  out <- capture.output(print(inf))
  expect_true(any(grepl("plot_E", out)))
  # the plot labels the rows that move lambda most by name: check the recorded text calls
  f <- tempfile(fileext = ".png")
  grDevices::png(f)
  grDevices::dev.control("enable")
  plot(inf)
  rec <- grDevices::recordPlot()
  grDevices::dev.off()
  unlink(f)
  # each recorded call is (function, (native routine, its arguments...)): the labels of C_text
  labels <- unlist(lapply(as.list(rec[[1]]), function(op) {
    args <- as.list(op[[2]])
    if (identical(args[[1]]$name, "C_text")) Filter(is.character, args[-1]) else NULL
  }))
  expect_true("plot_E" %in% labels)
})

test_that("lm and formula inputs agree; rows refer to the data", {
  d <- sim_inf(25, 9)
  d$x[3] <- NA
  a <- lambda_influence(y ~ x + g, d)
  b <- lambda_influence(lm(y ~ x + g, data = d))
  expect_equal(a$rows, b$rows)
  expect_false(3L %in% a$rows$row)
  expect_equal(nrow(a$rows), 24L)
  expect_output(print(a), "leave-one-out box-cox power")
  f <- tempfile(fileext = ".png")
  grDevices::png(f)
  expect_silent(plot(a))
  grDevices::dev.off()
  unlink(f)
})

test_that("bad input is named", {
  d <- sim_inf(20, 1)
  d$y[c(2, 5)] <- c(0, -1)
  expect_error(lambda_influence(y ~ x, d), "`y` has 2 values <= 0, at rows 2, 5")
  expect_error(lambda_influence(y ~ x, d, family = "yeo-johnson"), NA)
  expect_error(lambda_influence(y ~ x), "needs `data`")
  expect_error(lambda_influence(y ~ x, d, range = c(1, -1)), "lower < upper")
})

test_that("a pwb_model uses its transformed predictors and its response family", {
  d <- sim_inf(30, 12)
  m <- lm_transformed(y ~ x + g, d, response = "estimate")
  expect_equal(lambda_influence(m)$rows, lambda_influence(y ~ x + g, d)$rows)
  m2 <- lm_transformed(y ~ x + g, d, response = "none", predictors = list(x = new_transform("sqrt")))
  expect_equal(lambda_influence(m2)$rows, lambda_influence(y ~ sqrt(x) + g, d)$rows)
  my <- lm_transformed(y ~ x + g, d, response = "estimate", family = "yeo-johnson")
  expect_equal(lambda_influence(my)$family, "yeo-johnson")
})

test_that("a pwb_model with na.exclude is read from its stored design, rows named as in the data", {
  # airquality (datasets package): 42 rows with a missing Ozone or Solar.R are left out
  m <- lm_transformed(Ozone ~ Solar.R + Wind, airquality, response = "estimate",
                      na.action = na.exclude)
  a <- lambda_influence(m)
  b <- lambda_influence(Ozone ~ Solar.R + Wind, airquality)
  expect_identical(a$rows$row, b$rows$row)
  expect_identical(a$rows$row[1:4], c(1L, 2L, 3L, 4L))
  expect_false(5L %in% a$rows$row)  # row 5 has no Ozone
  # same rows and design: equal to rounding (1e-10 leaves room for a different column order)
  expect_equal(a$rows$lambda, b$rows$lambda, tolerance = 1e-10)
  expect_equal(a$lambda, b$lambda, tolerance = 1e-10)
})
