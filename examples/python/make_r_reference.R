# Reference written by R for the Python example: a spec of named transforms written by
# powerback::write_transforms() and, for each transform, values x, R's apply_transform(x) and
# R's invert_transform() of those. The Python module must reproduce them from the spec alone.
#
# Regenerate (with the powerback R package installed):
#   Rscript examples/python/make_r_reference.R examples/python
# Check that the committed files are what R writes now (ctest example.r_reference_reproduces):
#   Rscript examples/python/make_r_reference.R --check examples/python
# Exit status 77 means the powerback R package is not installed (the check is then skipped).
args <- commandArgs(TRUE)
check <- length(args) > 0L && args[1] == "--check"
dir <- if (check) args[2] else args[1]
if (is.na(dir)) stop("usage: make_r_reference.R [--check] DIR")
if (!requireNamespace("powerback", quietly = TRUE)) {
  message("the powerback R package is not installed; nothing to do")
  quit(status = 77)
}
library(powerback)

pos <- 10^seq(-3, 4, length.out = 15)
real <- c(-rev(pos), 0, pos)
trs <- list(
  income = new_transform("box-cox", lambda = 1 / 3, shift = 0.5),
  depth = new_transform("yeo-johnson", lambda = -0.7),
  score = new_transform("log", reflect = TRUE, pivot = 101),
  share = new_transform("logit"),
  visits = new_transform("sqrt", shift = 1),
  wait = new_transform("reciprocal", shift = 0.1),
  area = new_transform("log10"),
  growth = new_transform("power", lambda = 1.5),
  decay = new_transform("power", lambda = -0.5, reflect = TRUE, pivot = 10001, shift = 0.25),
  signal = new_transform("asinh"),
  raw = new_transform("identity", shift = 2.5),
  "odd \"name\"\\ here" = new_transform("box-cox", lambda = 0),
  "caf\u00e9" = new_transform("yeo-johnson", lambda = 2.2, shift = -0.1)
)
xs <- list(income = pos, depth = real, score = 101 - pos[pos < 100], share = (1:19) / 20,
           visits = c(0, pos), wait = pos, area = pos, growth = real, decay = 10000 - pos[-15],
           signal = real, raw = real)
xs[["odd \"name\"\\ here"]] <- pos
xs[["caf\u00e9"]] <- real

rows <- list()
for (nm in names(trs)) {
  z <- apply_transform(trs[[nm]], xs[[nm]])
  back <- invert_transform(trs[[nm]], z)
  rows[[nm]] <- data.frame(name = enc2utf8(nm), x = sprintf("%.17g", xs[[nm]]),
                           z = sprintf("%.17g", z), back = sprintf("%.17g", back))
}
values <- do.call(rbind, unname(rows))

out <- if (check) tempfile("r_reference") else dir
dir.create(out, showWarnings = FALSE)
write_transforms(trs, file.path(out, "r_reference.pwbspec"))
utils::write.csv(values, file.path(out, "r_reference.csv"), row.names = FALSE,
                 fileEncoding = "UTF-8")

if (check) {
  same <- function(f) identical(readBin(file.path(dir, f), "raw", 1e7), readBin(file.path(out, f), "raw", 1e7))
  for (f in c("r_reference.pwbspec", "r_reference.csv"))
    if (!same(f)) stop(f, " differs from what R writes now; regenerate it")
  cat("r_reference reproduces:", nrow(values), "rows,", length(trs), "transforms\n")
}
