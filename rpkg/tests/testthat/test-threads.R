# The thread-count option read by the calls that split work over threads.

test_that("powerback.threads is read and checked", {
  old <- options(powerback.threads = NULL)
  on.exit(options(old))
  # Default: 2 threads, or 1 where detectCores() (base R parallel) reports fewer than 2 cores.
  cores <- parallel::detectCores()
  expect_identical(powerback:::pwb_threads(), if (is.na(cores) || cores < 2L) 1L else 2L)
  options(powerback.threads = 3)
  expect_identical(powerback:::pwb_threads(), 3L)
  for (bad in list(0, 1.5, -1, NA_real_, c(1, 2), "2")) {
    options(powerback.threads = bad)
    expect_error(powerback:::pwb_threads(), "powerback.threads")
  }
})
