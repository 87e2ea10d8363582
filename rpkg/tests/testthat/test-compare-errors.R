test_that("fewer rows than folds, bad arguments and unknown candidates", {
  d <- data.frame(x = 1:4, y = c(2, 3, 5, 4))
  expect_error(compare_transforms(y ~ x, d, folds = 5, progress = FALSE),
               "fewer usable rows \\(4\\) than folds \\(5\\)")
  d$x[2] <- NA  # missing rows are omitted before the folds are made
  expect_error(compare_transforms(y ~ x, d, folds = 4, progress = FALSE), "\\(3\\) than folds")
  expect_error(compare_transforms(y ~ x, d, candidates = "best", progress = FALSE),
               "unknown candidate \"best\"")
  expect_error(compare_transforms(y ~ x, d, candidates = list(function(t) list()), progress = FALSE),
               "candidate 1 needs a name")
  expect_error(compare_transforms(y ~ x, d, candidates = list(a = list(y = 1)), progress = FALSE),
               "named list of pwb_transform")
  expect_error(compare_transforms(y ~ x, d, folds = 1.5), "whole number")
  expect_error(compare_transforms(y ~ x, d, seed = -1), "seed")
  expect_error(compare_transforms(y ~ w, d), "no variable `w`")
})

test_that("a candidate failing in some folds is named and the others are still scored", {
  set.seed(6)
  d <- data.frame(x = runif(30, 1, 5))
  d$y <- exp(1 + 0.3 * d$x + rnorm(30, sd = 0.2))
  d$y[8] <- -0.5  # Box-Cox cannot use a training part that holds row 8
  bc <- function(train)
    list(y = new_transform("box-cox", lambda = estimate_response_lambda(y ~ x, train)$lambda))
  cmp <- compare_transforms(y ~ x, d, candidates = list("none", bc = bc), folds = 3, seed = 2,
                            progress = FALSE)
  k8 <- cmp$fold_ids[8, 1]
  expect_equal(sort(cmp$failures$fold[cmp$failures$candidate == "bc"]), setdiff(1:3, k8))
  expect_match(cmp$failures$message, "box-cox|positive|> 0", all = TRUE)
  expect_equal(cmp$folds$fold[cmp$folds$candidate == "bc"], k8)
  expect_equal(sum(cmp$folds$candidate == "none"), 3L)
  s <- cmp$summary
  expect_equal(s$folds_failed[s$candidate == "bc"], 2L)
  expect_true(is.na(s$aic[s$candidate == "bc"]))  # the full-data fit fails too
  expect_match(cmp$full$bc$error, "box-cox|positive|> 0")
})

test_that("a rank-deficient training part is reported and not scored", {
  set.seed(8)
  d <- data.frame(x = runif(20, 1, 5), w = 0)
  d$w[3] <- 1  # without row 3 the column w is all zero: aliased in that training part
  d$y <- 2 + d$x + rnorm(20, sd = 0.1)
  cmp <- compare_transforms(y ~ x + w, d, candidates = "none", folds = 4, seed = 3,
                            progress = FALSE)
  k3 <- cmp$fold_ids[3, 1]
  expect_equal(cmp$failures$fold, k3)
  expect_match(cmp$failures$message, "rank-deficient \\(aliased: w\\)")
  expect_equal(sort(cmp$folds$fold), setdiff(1:4, k3))
})
