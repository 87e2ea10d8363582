test_that("plot(compare = TRUE) works with na.exclude and draws the non-missing residuals", {
  # airquality (datasets package): Ozone and Solar.R have missing values
  m <- lm_transformed(Ozone ~ Solar.R + Wind + Temp, airquality, na.action = na.exclude)
  calls <- recorded_calls(plot(m, compare = TRUE))
  xy <- recorded_xy(calls)
  twin <- lm(Ozone ~ Solar.R + Wind + Temp, airquality)  # base R lm(), na.omit
  # the first panel: residuals against fitted values of the untransformed twin
  # (na.exclude pads the 42 incomplete rows with NA, which base graphics leaves out)
  keep <- !is.na(xy[[1]]$y)
  expect_equal(sum(keep), 111L)
  expect_equal(unname(xy[[1]]$y[keep]), unname(residuals(twin)))
  expect_equal(unname(xy[[1]]$x[keep]), unname(fitted(twin)))
  # the twin's normal Q-Q panel holds one point per complete row (111), no NA
  qq <- Filter(function(e) length(e$x) == 111L && isTRUE(all.equal(sort(e$y),
                                                                   sort(unname(residuals(twin))))),
               xy)
  expect_gte(length(qq), 1L)
})
