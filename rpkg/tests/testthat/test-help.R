# Every exported function and every S3 method has a help page reachable from `?`, and the
# package's own page is in the help index. Read from the installed package's help metadata.

help_pages <- function() readRDS(system.file("Meta", "Rd.rds", package = "powerback"))

test_that("every export and every registered S3 method has a help topic", {
  topics <- unlist(help_pages()$Aliases)
  exports <- getNamespaceExports("powerback")
  expect_equal(setdiff(exports, topics), character(0))
  s3 <- getNamespaceInfo(asNamespace("powerback"), "S3methods")
  methods <- paste(s3[, 1], s3[, 2], sep = ".")
  expect_equal(setdiff(methods, topics), character(0))
})

test_that("?powerback is the package's page and is listed in the index", {
  pages <- help_pages()
  pkg <- pages[pages$Name == "powerback-package", ]
  expect_equal(nrow(pkg), 1L)
  expect_true("powerback" %in% pkg$Aliases[[1]])
  # pages with the keyword "internal" are left out of the help index
  expect_false("internal" %in% unlist(pkg$Keywords))
})
