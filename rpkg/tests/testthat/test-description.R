test_that("the maintainer's address is the project's own neutral one", {
  m <- utils::packageDescription("powerback")$Maintainer
  expect_match(m, "<maintainers@powerback\\.invalid>$")
  # no machine- or session-specific identifier (long hex runs) in the address
  expect_false(grepl("[0-9a-f]{8}", m))
})
