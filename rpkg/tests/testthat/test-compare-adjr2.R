# The comparison's in-sample adjusted R^2, computed from the model's own numbers.

test_that("adj_r2_own_scale equals summary.lm's with zero and unequal weights", {
  d <- airquality
  d$w <- rep(c(0, 1, 2, 3), length.out = nrow(d))
  cmp <- compare_transforms(Ozone ~ Wind + Temp, d, weights = w, folds = 3, seed = 2,
                            candidates = list("none", logy = list(Ozone = new_transform("log"))),
                            progress = FALSE)
  s <- cmp$summary
  cc <- stats::complete.cases(d[c("Ozone", "Wind", "Temp")])
  # base R lm() with the same weights (rows of weight 0 are left out of summary.lm's count);
  # the two differ only by summation order: 1e-10
  ref_log <- summary(lm(log(Ozone) ~ Wind + Temp, d[cc, ], weights = w))$adj.r.squared
  ref_none <- summary(lm(Ozone ~ Wind + Temp, d[cc, ], weights = w))$adj.r.squared
  expect_equal(s$adj_r2_own_scale[s$candidate == "logy"], ref_log, tolerance = 1e-10)
  expect_equal(s$adj_r2_own_scale[s$candidate == "none"], ref_none, tolerance = 1e-10)
})

test_that("adj_r2_own_scale follows summary.lm without an intercept", {
  cmp <- compare_transforms(Volume ~ Girth + Height - 1, trees, folds = 3, seed = 5,
                            candidates = list("none", logy = list(Volume = new_transform("log"))),
                            progress = FALSE)
  s <- cmp$summary
  # summary.lm's R^2 about 0 for a model without intercept (base R lm); summation order: 1e-10
  expect_equal(s$adj_r2_own_scale[s$candidate == "logy"],
               summary(lm(log(Volume) ~ Girth + Height - 1, trees))$adj.r.squared,
               tolerance = 1e-10)
  expect_equal(s$adj_r2_own_scale[s$candidate == "none"],
               summary(lm(Volume ~ Girth + Height - 1, trees))$adj.r.squared, tolerance = 1e-10)
})
