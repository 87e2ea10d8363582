# Printed output fits getOption("width"), and wide tables keep their key column in every block.

print_lines <- function(x, width) {
  old <- options(width = width)
  on.exit(options(old))
  capture.output(print(x))
}

expect_fits <- function(lines, width) {
  too_long <- lines[nchar(lines, type = "width") > width]
  expect(length(too_long) == 0L,
         sprintf("%d lines wider than %d, e.g. \"%s\"", length(too_long), width, too_long[1]))
}

# every block of a split table starts with a header line whose first word is the key column
expect_key_in_blocks <- function(lines, key) {
  blank <- which(lines == "")
  headers <- lines[grepl(sprintf("^%s\\b", key), lines)]
  expect_gte(length(headers), 1L)
  for (b in blank) if (b < length(lines)) expect_match(lines[b + 1L], sprintf("^(%s|[A-Z])", key))
}

test_that("screen_skew prints within 60, 80 and 120 columns with the variable in each block", {
  s <- screen_skew(airquality)  # airquality (datasets package)
  for (w in c(60, 80, 120)) {
    out <- print_lines(s, w)
    expect_fits(out, w)
    expect_key_in_blocks(out, "variable")
    # every variable appears in every block of the table
    expect_equal(sum(grepl("^Ozone ", out)), sum(grepl("^variable ", out)))
  }
  expect_gt(sum(grepl("^variable ", print_lines(s, 60))), sum(grepl("^variable ", print_lines(s, 120))))
  for (w in c(60, 80)) expect_fits(print_lines(summary(s), w), w)
})

test_that("compare_transforms prints within 60, 80 and 120 columns", {
  # boot::poisons (boot package)
  cmp <- compare_transforms(time ~ poison * treat, boot::poisons, seed = 1, progress = FALSE)
  d <- boot::poisons
  d$time[c(25, 34)] <- 0
  bad <- compare_transforms(time ~ poison * treat, d, seed = 1, progress = FALSE)
  for (w in c(60, 80, 120)) {
    for (x in list(cmp, bad)) {
      out <- print_lines(x, w)
      expect_fits(out, w)
      expect_equal(sum(grepl("^ *[0-9]+ (none|ladder|ml) ", out)) %% 1, 0)
      expect_key_in_blocks(out, "(rank|candidate)")
    }
  }
  out <- print_lines(cmp, 60)
  # each candidate is in every block of the ranked table
  expect_equal(sum(grepl("^ *1 ml ", out)), sum(grepl("^rank candidate", out)))
  expect_gt(sum(grepl("^rank candidate", out)), 1L)
})

test_that("residual checks, lambda and transform prints fit 60, 80 and 120 columns", {
  m <- lm_transformed(time ~ poison * treat, boot::poisons,  # boot package
                      response = new_transform("reciprocal"))
  ch <- residual_checks(m, compare = TRUE)
  fit <- estimate_response_lambda(Ozone ~ Solar.R + Wind + Temp + Month + Day, airquality)
  tr <- new_transform("yeo-johnson", lambda = 0.123456, shift = 12.5, reflect = TRUE,
                      pivot = 101.25)
  for (w in c(60, 80, 120)) {
    out <- print_lines(ch, w)
    expect_fits(out, w)
    expect_key_in_blocks(out, "check")
    expect_fits(print_lines(fit, w), w)
    expect_fits(print_lines(tr, w), w)
  }
  out <- print_lines(ch, 60)
  expect_equal(sum(grepl("^RESET F", out)), sum(grepl("^check", out)))
})

test_that("p-values follow one style: format.pval's '<' below 1e-4, no trailing zeros", {
  expect_equal(powerback:::pwb_format_pval(c(0.07216, 0.5, 1e-7, NA, 0.000123, 1)),
               c("0.072", "0.5", "<0.0001", "NA", "0.00012", "1"))
  s <- screen_skew(airquality)
  out <- print_lines(s, 200)
  expect_false(any(grepl("e-0", out)))          # no scientific p-values beside fixed ones
  expect_false(any(grepl("\\b0\\.[0-9]*0 ", out)))  # no trailing zeros
  ch <- print_lines(residual_checks(lm(time ~ poison * treat, boot::poisons)), 200)
  expect_false(any(grepl("e-0", ch)))
})

test_that("RESET printed as NA for a saturated factor model carries a note", {
  # boot::poisons: poison * treat fits a mean to each of the 12 cells, so the squared and cubed
  # fitted values lie in the model's span
  ch <- residual_checks(lm(time ~ poison * treat, boot::poisons))
  expect_true(is.na(ch$reset$p_value))
  expect_output(print(ch), "RESET is NA: the squared and cubed fitted values add nothing")
  ok <- residual_checks(lm(time ~ poison + treat, boot::poisons))
  expect_false(is.na(ok$reset$p_value))
  expect_false(any(grepl("RESET is NA", capture.output(print(ok)))))
})
