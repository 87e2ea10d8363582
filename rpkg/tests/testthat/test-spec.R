# write_transforms() / read_transforms(): the portable text spec from R.

spec_file <- function() tempfile("spec", fileext = ".pwbspec")

test_that("transforms round-trip through a file bit for bit", {
  trs <- list(income = new_transform("box-cox", lambda = 1 / 3, shift = 0.1),
              score = new_transform("log", reflect = TRUE, pivot = 101),
              share = new_transform("logit"),
              growth = new_transform("power", lambda = -2.5e-7))
  path <- spec_file()
  on.exit(unlink(path))
  expect_identical(write_transforms(trs, path), path)
  back <- read_transforms(path)
  # identical() compares doubles exactly: the hexadecimal text loses no bit.
  expect_identical(back, trs)
  expect_identical(names(back), names(trs))
  x <- c(0.5, 2, 40)
  expect_identical(apply_transform(back$income, x), apply_transform(trs$income, x))
})

test_that("the file has the documented layout", {
  path <- spec_file()
  on.exit(unlink(path))
  write_transforms(list(income = new_transform("box-cox", lambda = 0.5, shift = 1),
                        score = new_transform("log", reflect = TRUE, pivot = 101)), path)
  # 0.5 = 0x1p-1, 1 = 0x1p+0, 101 = 0x1.94p+6 (C99 hexadecimal floating constants)
  expect_identical(readLines(path), c(
    "powerback-spec 1",
    "transform name=\"income\" family=box-cox lambda=0x1p-1 shift=0x1p+0 reflect=false",
    "transform name=\"score\" family=log shift=0x0p+0 reflect=true pivot=0x1.94p+6",
    "end"))
})

test_that("names with quotes, backslashes and non-ASCII letters survive", {
  nms <- c("log(x + 1)", "a \"b\" \\ c", "caf\u00e9", "tab\there")
  trs <- stats::setNames(rep(list(new_transform("asinh")), 4), nms)
  path <- spec_file()
  on.exit(unlink(path))
  write_transforms(trs, path)
  back <- read_transforms(path)
  expect_identical(names(back), nms)
  expect_identical(Encoding(names(back))[3], "UTF-8")
})

test_that("bad arguments to write_transforms() name the elements and the remedy", {
  tr <- new_transform("sqrt")
  path <- spec_file()
  expect_error(write_transforms(tr, path), "wrap one transform as list\\(name = tr\\)")
  expect_error(write_transforms(list(tr, tr), path), "elements 1, 2 have none")
  expect_error(write_transforms(list(a = tr, tr), path), "element 2 has none")
  expect_error(write_transforms(list(a = tr, b = 3, c = "x"), path),
               "elements 2, 3 are not: build them with new_transform")
  expect_error(write_transforms(list(a = tr, a = tr), path), "repeated: a")
  expect_error(write_transforms(list(), path), "non-empty named list")
  expect_error(write_transforms(list(a = tr), c("x", "y")), "`file` must be a single path")
  expect_error(write_transforms(stats::setNames(list(tr), strrep("n", 257)), path),
               "at most 256")
  expect_false(file.exists(path))
})

test_that("malformed files are refused with the line and column", {
  path <- spec_file()
  on.exit(unlink(path))
  put <- function(lines) writeLines(lines, path)
  put(c("powerback-spec 1", "transform name=\"x\" family=log shift=0 reflect=false lamda=1", "end"))
  expect_error(read_transforms(path), "line 2, column 53: unknown key lamda")
  put(c("powerback-spec 3", "end"))
  expect_error(read_transforms(path), "format version 3, newer than the version 1")
  put(c("powerback-spec 1", "transform name=\"x\" family=log shift=Inf reflect=false", "end"))
  expect_error(read_transforms(path), "line 2, column 37: NaN and infinite values")
  put(c("powerback-spec 1", "transform name=\"x\" family=log shift=0 reflect=false"))
  expect_error(read_transforms(path), "the end line is missing: the spec is truncated")
  put(c("powerback-spec 1", "transform name=\"x\" family=log shift=0 shift=1 reflect=false", "end"))
  expect_error(read_transforms(path), "column 39: the key shift appears twice")
  writeBin(as.raw(c(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00)), path)
  expect_error(read_transforms(path), "spec line 1, column 1: invalid UTF-8")
  expect_error(read_transforms(file.path(tempdir(), "no-such-file.pwbspec")), "does not exist")
})

test_that("a fitted model writes its response and predictor transforms", {
  d <- river_data()
  m <- lm_transformed(sediment_t_day ~ flow_m3s + forest_pct, d,
                      response = new_transform("box-cox", lambda = 0.25),
                      predictors = list(flow_m3s = new_transform("log")))
  path <- spec_file()
  on.exit(unlink(path))
  write_transforms(m, path)
  back <- read_transforms(path)
  expect_identical(names(back), c("sediment_t_day", "flow_m3s"))
  expect_identical(back$sediment_t_day, m$response)
  expect_identical(back$flow_m3s, m$predictors$flow_m3s)
})

test_that("a name with invalid UTF-8 is refused, not rewritten; latin1 names are converted", {
  path <- tempfile(fileext = ".pwbspec")
  on.exit(unlink(path))
  bad <- "ab\xffc"  # the byte 0xff is never valid in UTF-8
  Encoding(bad) <- "UTF-8"
  expect_error(write_transforms(stats::setNames(list(new_transform("log")), bad), path),
               "must be valid UTF-8; element 1 is not")
  expect_false(file.exists(path))
  latin <- "caf\xe9"
  Encoding(latin) <- "latin1"
  write_transforms(stats::setNames(list(new_transform("log")), latin), path)
  back <- read_transforms(path)
  expect_identical(names(back), enc2utf8(latin))
  expect_identical(names(back), "caf\u00e9")
})
