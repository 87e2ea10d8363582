# Folds of compare_transforms(): stratified by factors, grouped, or given; failures named by the
# user's rows.

test_that("folds are stratified so a level of two or more rows is in every training part", {
  # mtcars (datasets package): carb has levels 1, 2, 3 (3 rows), 4, 6 (1 row) and 8 (1 row)
  cmp <- compare_transforms(mpg ~ wt + factor(carb), mtcars, candidates = "none", folds = 5,
                            repeats = 3, seed = 1, progress = FALSE)
  expect_equal(cmp$fold_kind, "stratified")
  for (r in 1:3) for (lev in c("1", "2", "3", "4")) {
    at <- mtcars$carb == as.numeric(lev)
    # every training part (the rows outside fold k) holds the level
    for (k in 1:5) expect_true(any(at & cmp$fold_ids[, r] != k))
  }
  # only the two single-row levels can fail, once each per repeat, and the notes say why
  expect_equal(nrow(cmp$failures), 2L * 3L)
  expect_match(cmp$failures$message, "new levels? (6|8)", all = TRUE)
  expect_equal(sum(grepl("has 1 row", cmp$fold_notes)), 2L)
  expect_output(print(cmp), "level 6 of factor\\(carb\\) has 1 row")
  # fold sizes differ by at most one: 32 rows in 5 folds
  for (r in 1:3) expect_setequal(unique(as.vector(table(cmp$fold_ids[, r]))), c(6L, 7L))
  # across seeds: stratified folds never put all rows of a level in one fold; random folds do
  # (three levels of 2 rows: a random 5-fold split puts both in one fold with chance ~1/5)
  d <- data.frame(x = 1:26, g = rep(c("a", "b", "c", "d"), c(20, 2, 2, 2)))
  d$y <- d$x + cos(d$x)
  lost <- function(stratify) sum(vapply(1:10, function(seed) {
    x <- compare_transforms(y ~ x + g, d, candidates = "none", folds = 5,
                            repeats = 3, seed = seed, progress = FALSE, stratify = stratify)
    sum(grepl("^all [0-9]+ rows of level", x$fold_notes))
  }, numeric(1)))
  expect_equal(lost(TRUE), 0)
  expect_gt(lost(FALSE), 0)
})

test_that("a level whose rows all share a fold is said", {
  d <- data.frame(x = 1:12, g = rep(c("a", "b"), c(10, 2)))
  d$y <- d$x + (d$g == "b") + sin(d$x)
  ids <- c(rep(1:2, 5), 1, 1)  # both rows of level b in fold 1
  cmp <- compare_transforms(y ~ x + g, d, candidates = "none", folds = ids, progress = FALSE)
  expect_equal(cmp$fold_kind, "given")
  expect_match(cmp$fold_notes, "all 2 rows of level b of g are in fold 1", fixed = TRUE)
  expect_equal(cmp$failures$fold, 1L)
})

test_that("the user's fold ids are used as given", {
  d <- data.frame(x = c(1:10, 2.5), y = c(2, 4, 5, 9, 10, 12, 15, 15, 18, 21, NA))
  ids <- c("a", "b", "c", "a", "b", "c", "a", "b", "c", "a", "b")
  cmp <- compare_transforms(y ~ x, d, candidates = "none", folds = ids, progress = FALSE)
  # row 11 is omitted (NA response); the others keep their ids, numbered in order of appearance
  expect_equal(as.vector(cmp$fold_ids), match(ids[1:10], c("a", "b", "c")))
  expect_equal(cmp$folds_k, 3L)
  expect_true(is.na(cmp$seed))
  # fold "a" predicted from rows outside it (base R lm() and predict.lm())
  p <- cmp$predictions[cmp$predictions$fold == 1, ]
  fit <- lm(y ~ x, d[c(2, 3, 5, 6, 8, 9), ])
  expect_equal(p$fit_median, unname(predict(fit, d[c(1, 4, 7, 10), ])), tolerance = 1e-10)
  expect_error(compare_transforms(y ~ x, d, folds = ids[-1], progress = FALSE),
               "one id per row of `data` \\(11\\), not 10")
  expect_error(compare_transforms(y ~ x, d, folds = ids, repeats = 2, progress = FALSE),
               "repeats = 1")
  expect_error(compare_transforms(y ~ x, d, folds = rep("a", 11), progress = FALSE),
               "at least 2 folds")
})

test_that("grouped folds keep every row of a group in one fold", {
  set.seed(3)
  d <- data.frame(site = rep(sprintf("s%02d", 1:9), times = c(2, 5, 3, 4, 6, 2, 3, 5, 4)))
  d$x <- runif(nrow(d), 1, 5)
  d$y <- exp(0.3 * d$x + rnorm(nrow(d), sd = 0.2))
  cmp <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, repeats = 2, seed = 4,
                            groups = "site", progress = FALSE)
  expect_equal(cmp$fold_kind, "grouped")
  for (r in 1:2) {
    per_site <- tapply(cmp$fold_ids[, r], d$site, function(v) length(unique(v)))
    expect_true(all(per_site == 1L))
    expect_setequal(unique(cmp$fold_ids[, r]), 1:3)
  }
  # a vector of groups works the same way
  again <- compare_transforms(y ~ x, d, candidates = "none", folds = 3, repeats = 2, seed = 4,
                              groups = d$site, progress = FALSE)
  expect_identical(again$fold_ids, cmp$fold_ids)
  expect_error(compare_transforms(y ~ x, d, folds = 10, groups = "site", progress = FALSE),
               "fewer groups \\(9\\) than folds \\(10\\)")
  expect_error(compare_transforms(y ~ x, d, groups = "plot", progress = FALSE),
               "`groups` names no column")
  expect_error(compare_transforms(y ~ x, d, groups = d$site[-1], progress = FALSE),
               "one value per row")
})

test_that("fold failures name the rows of the data, by row name where it has them", {
  # boot::poisons (boot package) with two survival times set to zero: Box-Cox cannot take them
  d <- boot::poisons
  d$time[c(25, 34)] <- 0
  cmp <- compare_transforms(time ~ poison * treat, d, candidates = "ml", folds = 5, seed = 1,
                            progress = FALSE)
  expect_equal(nrow(cmp$failures), 5L)
  for (i in seq_len(5)) {
    k <- cmp$failures$fold[i]
    zero_rows <- intersect(c(25, 34), which(cmp$fold_ids[, 1] != k))
    expect_match(cmp$failures$message[i],
                 sprintf("at rows? %s:", paste(zero_rows, collapse = ", ")), fixed = FALSE)
  }
  rownames(d) <- sprintf("cage%02d", seq_len(nrow(d)))
  named <- compare_transforms(time ~ poison * treat, d, candidates = "ml", folds = 5, seed = 1,
                              progress = FALSE)
  expect_true(all(grepl("cage25|cage34", named$failures$message)))
  expect_false(any(grepl("rows? [0-9]", named$failures$message)))
  ok <- compare_transforms(time ~ poison, d, candidates = "none", folds = 2, seed = 1,
                           progress = FALSE)
  expect_equal(ok$predictions$row_name, rownames(d)[ok$predictions$row])
})

test_that("a prediction failure names the held-out rows of the data", {
  d <- data.frame(x = 1:15, g = c(rep(c("a", "b"), 7)[1:13], "z", "a"))
  d$y <- d$x + (d$g == "b") + sin(d$x)
  cmp <- compare_transforms(y ~ x + g, d, candidates = "none", folds = 3, seed = 5,
                            progress = FALSE)
  f <- cmp$failures
  expect_equal(nrow(f), 1L)
  expect_equal(f$fold, cmp$fold_ids[14, 1])
  expect_match(f$message, "\"z\" \\(at row 14\\)")
})
