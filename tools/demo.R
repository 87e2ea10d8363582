# powerback demo report on the invented river-monitoring data (vignettes-data/).
#   Rscript tools/demo.R DATADIR OUTDIR
args <- commandArgs(TRUE)
data_dir <- if (length(args) >= 1) args[1] else "vignettes-data"
out_dir <- if (length(args) >= 2) args[2] else "out"
suppressPackageStartupMessages(library(powerback))

fit <- utils::read.csv(file.path(data_dir, "river_fit.csv"), stringsAsFactors = TRUE)
cat("powerback", as.character(utils::packageVersion("powerback")), "demo: invented river data,",
    nrow(fit), "rows\n\n")

cat("Round trip of each numeric variable through each family\n")
cat("(reflect -> shift -> family; constants stored; error = max |invert(apply(x)) - x| / |x|)\n\n")
vars <- list(flow_m3s = fit$flow_m3s, rain72_mm = fit$rain72_mm, forest_pct = fit$forest_pct,
             forest_share = fit$forest_pct / 100, sediment_t_day = fit$sediment_t_day)
rows <- list()
for (v in names(vars)) {
  x <- vars[[v]]
  pos_shift <- if (min(x) > 0) 0 else 1 - min(x)      # make the minimum 1 when needed
  transforms <- list(
    new_transform("identity"),
    new_transform("box-cox", lambda = 0.5, shift = pos_shift),
    new_transform("yeo-johnson", lambda = 0.5),
    new_transform("log", shift = pos_shift),
    new_transform("log10", shift = pos_shift),
    new_transform("sqrt", shift = pos_shift),
    new_transform("reciprocal", shift = pos_shift),
    new_transform("power", lambda = 1 / 3),
    new_transform("asinh"),
    new_transform("log", reflect = TRUE, pivot = max(x) + 1)   # for left skew
  )
  if (max(x) < 1 && min(x) > 0) transforms <- c(transforms, list(new_transform("logit")))
  for (tr in transforms) {
    z <- apply_transform(tr, x)
    back <- invert_transform(tr, z)
    err <- max(abs(back - x) / ifelse(x == 0, 1, abs(x)))
    rows[[length(rows) + 1]] <- data.frame(
      variable = v, transform = format(tr), min_z = signif(min(z), 4),
      max_z = signif(max(z), 4), roundtrip_error = signif(err, 2))
  }
}
tab <- do.call(rbind, rows)
print(tab, row.names = FALSE, right = FALSE)
cat("\nLargest round-trip error over all:", format(max(tab$roundtrip_error), digits = 2), "\n")
