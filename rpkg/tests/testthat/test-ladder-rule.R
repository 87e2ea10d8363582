# The ladder rule's thresholds come from the library: the screen reports them as the C ABI does.

test_that("the ladder rule is the library's", {
  rule <- powerback:::pwb_ladder_rule()
  expect_identical(rule, powerback:::rpwb_ladder_rule())
  # The values screen_skew() documents (copied constants: exact).
  expect_identical(rule, list(large_n = 300, z_cut = 3.29, size_cut = 0.5, log10_cut = 1,
                              reciprocal_cut = 2))
  expect_identical(screen_skew(trees)$rule, rule)
})
