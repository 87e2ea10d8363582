# write_transforms() / read_transforms() with a fitted model: the model record.

spec_file <- function() tempfile("spec", fileext = ".pwbspec")

model_data <- function() {
  set.seed(11)
  n <- 40
  x <- exp(stats::runif(n, 0, 3))
  z <- stats::runif(n)
  y <- exp(0.5 + 0.8 * log(x) - 0.3 * z + stats::rnorm(n, sd = 0.2))
  data.frame(y = y, x = x, z = z, z2 = 2 * z)
}

test_that("a fitted model's coefficients, sigma and df round-trip bit for bit", {
  fit <- lm_transformed(y ~ x + z, model_data(), response = new_transform("log"),
                        predictors = list(x = new_transform("log")))
  path <- spec_file()
  on.exit(unlink(path))
  write_transforms(fit, path)
  back <- read_transforms(path)
  m <- attr(back, "model")
  expect_identical(names(back), c("y", "x"))
  expect_identical(m$response, "y")
  # identical() compares doubles exactly: the hexadecimal text loses no bit.
  expect_identical(m$coefficients, coef(fit))
  # base R coef() of the honest lm (its names show the transform) agrees to rounding.
  expect_equal(unname(m$coefficients), unname(stats::coef(fit$lm)), tolerance = 1e-12)
  # The record holds the core's sigma, the one the package's intervals use.
  expect_identical(m$sigma, fit$sigma)
  # base R sigma() of the lm fit agrees to rounding: two QR computations of the same residuals.
  expect_equal(m$sigma, stats::sigma(fit$lm), tolerance = 1e-12)
  expect_identical(m$df, as.double(stats::df.residual(fit$lm)))
  expect_identical(names(m), c("response", "coefficients", "sigma", "df"))
  lines <- readLines(path)
  expect_identical(lines[4], sprintf("model response=\"y\" coefficients=3 sigma=%s df=37",
                                     sprintf("%a", fit$sigma)))
  expect_identical(lines[5:7], sprintf("coefficient name=\"%s\" value=%s", names(coef(fit)),
                                       sprintf("%a", coef(fit))))
})

test_that("an aliased coefficient is written NA and read back as NA", {
  fit <- suppressWarnings(lm_transformed(y ~ x + z + z2, model_data(), response = "none"))
  cf <- coef(fit)
  expect_true(is.na(cf[["z2"]]))   # z2 = 2 z, so lm() aliases it
  path <- spec_file()
  on.exit(unlink(path))
  write_transforms(fit, path)
  expect_true("coefficient name=\"z2\" value=NA" %in% readLines(path))
  m <- attr(read_transforms(path), "model")
  expect_identical(m$coefficients, cf)
})

test_that("a list of transforms has no model attribute", {
  path <- spec_file()
  on.exit(unlink(path))
  write_transforms(list(a = new_transform("sqrt")), path)
  expect_null(attr(read_transforms(path), "model"))
})

test_that("a malformed model record is an error naming line and column", {
  path <- spec_file()
  on.exit(unlink(path))
  writeLines(c("powerback-spec 1", "model response=\"y\" coefficients=2 sigma=0x1p+0 df=3",
               "coefficient name=\"(Intercept)\" value=0x1p+0", "end"), path)
  expect_error(read_transforms(path),
               "spec line 4, column 1: the model record on line 2 declares 2 coefficients but 1")
  writeLines(c("powerback-spec 1", "model response=\"y\" coefficients=0 sigma=NA df=0",
               "model response=\"y\" coefficients=0 sigma=NA df=0", "end"), path)
  expect_error(read_transforms(path), "spec line 3, column 1: a second model record")
})
