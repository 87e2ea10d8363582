test_that("the demo data ship with the package and match their data dictionary", {
  fit <- river_data("fit")
  new <- river_data("new")
  expect_identical(dim(fit), c(480L, 6L))
  expect_identical(dim(new), c(60L, 6L))
  expect_identical(names(fit), c("station", "season", "flow_m3s", "rain72_mm", "forest_pct",
                                 "sediment_t_day"))
  expect_true(all(fit$flow_m3s > 0) && all(fit$sediment_t_day > 0))
  expect_gt(mean(fit$rain72_mm == 0), 0.3)                      # many zeros
  expect_lt(mean(fit$forest_pct) - median(fit$forest_pct), 0)   # left-skewed
  expect_identical(levels(fit$season), c("winter", "spring", "summer", "autumn"))
  # the generating truth is recoverable with base R's lm (log-log rating curve)
  b <- coef(lm(log(sediment_t_day) ~ log(flow_m3s) + rain72_mm + forest_pct + season, fit))
  expect_equal(unname(b["log(flow_m3s)"]), 1.25, tolerance = 0.15)
})
