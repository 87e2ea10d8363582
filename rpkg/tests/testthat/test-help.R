# Every exported function and every S3 method has a help page reachable from `?`, and the
# package's own page is in the help index.

help_topics <- function() {
  # the installed package's help index: topic aliases (base R tools::Rd_db would also do)
  path <- system.file("help", "AnIndex", package = "powerback")
  idx <- utils::read.table(path, sep = "\t", quote = "", stringsAsFactors = FALSE)
  idx[[1]]
}

test_that("every export and every registered S3 method has a help topic", {
  topics <- help_topics()
  exports <- getNamespaceExports("powerback")
  expect_equal(setdiff(exports, topics), character(0))
  s3 <- getNamespaceInfo(asNamespace("powerback"), "S3methods")
  methods <- paste(s3[, 1], s3[, 2], sep = ".")
  expect_equal(setdiff(methods, topics), character(0))
})

test_that("?powerback is the package's page and is listed in the index", {
  expect_true("powerback" %in% help_topics())
  rd <- tools::Rd_db("powerback")
  page <- rd[[grep("^powerback-package", names(rd))]]
  kw <- unlist(lapply(page[vapply(page, function(e) identical(attr(e, "Rd_tag"), "\\keyword"),
                                  logical(1))], as.character))
  expect_false("internal" %in% kw)
})
