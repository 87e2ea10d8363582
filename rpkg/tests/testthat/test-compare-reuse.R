# Fixed candidates ("none" and named lists of transforms) are fitted in every fold from one
# factor per fold; the comparison must equal the one fitting lm_transformed() in each fold.

# Both paths, same seed: the result of each and the folds the reuse served.
cmp_both <- function(...) {
  before <- powerback:::pwb_cmp_state$served
  fast <- compare_transforms(..., progress = FALSE)
  served <- powerback:::pwb_cmp_state$served - before
  slow <- powerback:::pwb_cmp_with_reuse(FALSE, compare_transforms(..., progress = FALSE))
  list(fast = fast, slow = slow, served = served)
}

# The two paths solve the same least-squares problems with different Householder sequences
# (stacked per-fold triangles vs. all training rows); on these designs (condition numbers
# below 1e5) they agree to about 1e-12 relative, so 1e-10 leaves a wide margin.
expect_same_comparison <- function(b) {
  expect_equal(b$fast$summary, b$slow$summary, tolerance = 1e-10)
  expect_equal(b$fast$folds, b$slow$folds, tolerance = 1e-10)
  expect_equal(b$fast$predictions, b$slow$predictions, tolerance = 1e-10)
  expect_identical(b$fast$failures, b$slow$failures)
  expect_identical(b$fast$lambdas, b$slow$lambdas)
  expect_identical(b$fast$fold_ids, b$slow$fold_ids)
}

test_that("fixed candidates score as a fit in each fold does, beside a learned one", {
  # mtcars (datasets): mpg on weight, power and cylinders as a factor
  cands <- list("none", "ml",
                logs = list(mpg = new_transform("log"), hp = new_transform("log")),
                sq = list(mpg = new_transform("sqrt")))
  b <- cmp_both(mpg ~ wt + hp + factor(cyl), mtcars, candidates = cands, folds = 4,
                repeats = 2, seed = 5)
  expect_same_comparison(b)
  # three fixed candidates x 4 folds x 2 repeats, every fold fitted (cyl levels in every part)
  expect_equal(b$served, 24L)
  expect_equal(nrow(b$fast$failures), 0L)
})

test_that("weights, zero weights among them, travel into the reused folds", {
  d <- mtcars
  d$w <- seq(0.5, 2, length.out = nrow(d))
  d$w[c(3, 11)] <- 0
  b <- cmp_both(mpg ~ wt + qsec, d,
                candidates = list("none", logy = list(mpg = new_transform("log"))),
                folds = 5, seed = 2, weights = w)
  expect_same_comparison(b)
  expect_equal(b$served, 10L)
})

test_that("a training part lacking a factor level fails as before, other folds are reused", {
  # carb has levels 6 and 8 with one car each: the fold holding that car cannot train on it
  b <- cmp_both(mpg ~ wt + factor(carb), mtcars, candidates = list("none",
                logy = list(mpg = new_transform("log"))), folds = 4, seed = 1)
  expect_same_comparison(b)
  fails <- b$fast$failures
  expect_gt(nrow(fails), 0L)
  expect_true(all(fails$candidate %in% c("none", "logy")))
  # every fold not failed was served from the fold factors
  expect_equal(b$served, 2L * 4L - nrow(fails))
  # your own folds putting all 4-cylinder cars in fold 1: its training part lacks the level
  ids <- ifelse(mtcars$cyl == 4, 1L, 2L + seq_len(nrow(mtcars)) %% 2L)
  b2 <- cmp_both(mpg ~ wt + factor(cyl), mtcars, candidates = list("none"), folds = ids)
  expect_same_comparison(b2)
  expect_equal(nrow(b2$fast$failures), 1L)
  expect_equal(b2$served, 2L)
})

test_that("rows dropped by na.action keep the predictions aligned with the data's rows", {
  # airquality (datasets) has missing Ozone and Solar.R values
  aq <- airquality
  b <- cmp_both(Ozone ~ Temp + Wind + Solar.R, aq,
                candidates = list("none", logy = list(Ozone = new_transform("log"))),
                folds = 5, seed = 3)
  expect_same_comparison(b)
  expect_equal(b$served, 10L)
  keep <- which(stats::complete.cases(aq[c("Ozone", "Temp", "Wind", "Solar.R")]))
  expect_identical(b$fast$rows, keep)
  p <- b$fast$predictions[b$fast$predictions$candidate == "none", ]
  expect_setequal(p$row, keep)
  expect_equal(p$y, aq$Ozone[p$row])
})

test_that("a predictor value a transform cannot take fails its training folds as before", {
  d <- mtcars
  d$hp[7] <- 0  # log cannot take it: an error where row 7 trains, NA where it is held out
  b <- cmp_both(mpg ~ wt + hp, d, candidates = list("none", lhp = list(hp = new_transform("log"))),
                folds = 4, seed = 8)
  expect_same_comparison(b)
  f <- b$fast$folds[b$fast$folds$candidate == "lhp", ]
  expect_equal(nrow(f), 1L)              # only the fold holding row 7 is fitted
  expect_equal(f$n_nonfinite, 1L)        # ... and its prediction of row 7 is not finite
  expect_equal(sum(b$fast$failures$candidate == "lhp"), 3L)
  expect_equal(b$served, 4L + 1L)
})

test_that("terms that depend on other rows keep the per-fold fits", {
  b <- cmp_both(mpg ~ poly(wt, 2) + hp, mtcars, candidates = list("none"), folds = 4, seed = 4)
  expect_same_comparison(b)
  expect_equal(b$served, 0L)
  expect_false(powerback:::pwb_cmp_rowwise_formula(y ~ scale(x)))
  expect_true(powerback:::pwb_cmp_rowwise_formula(y ~ log(x) + I(z^2) + factor(g)))
})

test_that("na.exclude drops the same rows and keeps the alignment", {
  old <- options(na.action = "na.exclude")
  on.exit(options(old))
  aq <- airquality  # datasets
  b <- cmp_both(Ozone ~ Temp + Wind, aq, candidates = list("none"), folds = 3, seed = 6)
  expect_same_comparison(b)
  expect_equal(b$served, 3L)
  expect_identical(b$fast$rows, which(!is.na(aq$Ozone)))
  p <- b$fast$predictions
  expect_equal(p$y, aq$Ozone[p$row])
  expect_identical(p$row_name, rownames(aq)[p$row])
})
