# Reference written by R for the Python example: a spec of named transforms written by
# powerback::write_transforms() and, for each transform, values x, R's apply_transform(x) and
# R's invert_transform() of those. The Python module must reproduce them from the spec alone.
# Second part: a model fitted by lm_transformed() on the invented river demo data; its
# transforms go to r_reference_model.pwbspec, the rows it was fitted on and new rows to
# r_reference_model_data.csv, and R's predictions (median with prediction interval, mean by
# smearing, mean by the normal formula) to r_reference_model_pred.csv.
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

# The model: response and predictor transforms fixed here (not estimated), so the reference is
# stable; the columns of X are the formula's predictors in order.
d <- river_data()
fit_rows <- d[seq(1, nrow(d), by = 2), ]
new_rows <- d[seq(2, nrow(d), by = 16), ]
m <- lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + forest_pct, fit_rows,
                    response = new_transform("box-cox", lambda = 0.25),
                    predictors = list(flow_m3s = new_transform("log"),
                                      rain72_mm = new_transform("sqrt", shift = 1),
                                      forest_pct = new_transform("log", reflect = TRUE, pivot = 101)))
write_transforms(m, file.path(out, "r_reference_model.pwbspec"))
num <- function(v) sprintf("%.17g", v)
cols <- c("sediment_t_day", "flow_m3s", "rain72_mm", "forest_pct")
data_out <- rbind(data.frame(role = "fit", lapply(fit_rows[cols], num)),
                  data.frame(role = "new", lapply(new_rows[cols], num)))
utils::write.csv(data_out, file.path(out, "r_reference_model_data.csv"), row.names = FALSE)
p_med <- predict(m, new_rows, interval = "prediction", level = 0.9)
p_conf <- predict(m, new_rows, interval = "confidence")
p_smear <- predict(m, new_rows, center = "mean")
p_norm <- predict(m, new_rows, center = "mean", mean_method = "normal")
pred_out <- data.frame(median = num(p_med$fit), pred_lwr_90 = num(p_med$lwr),
                       pred_upr_90 = num(p_med$upr), conf_lwr_95 = num(p_conf$lwr),
                       conf_upr_95 = num(p_conf$upr), mean_smearing = num(p_smear$fit),
                       mean_normal = num(p_norm$fit))
utils::write.csv(pred_out, file.path(out, "r_reference_model_pred.csv"), row.names = FALSE)

if (check) {
  same <- function(f) identical(readBin(file.path(dir, f), "raw", 1e7), readBin(file.path(out, f), "raw", 1e7))
  for (f in c("r_reference.pwbspec", "r_reference.csv", "r_reference_model.pwbspec",
              "r_reference_model_data.csv", "r_reference_model_pred.csv"))
    if (!same(f)) stop(f, " differs from what R writes now; regenerate it")
  cat("r_reference reproduces:", nrow(values), "rows,", length(trs), "transforms\n")
}
