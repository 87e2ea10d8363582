# estimate_response_lambda() through R against lm() on the same data, in one process: from a
# formula and from an lm object, n rows (default 1e6), p = 10 + a 5-level factor. Each timing is
# the fastest of `reps` runs, interleaved.
#   Rscript bench/lambda_r_bench.R [n] [reps]
args <- commandArgs(TRUE)
n <- if (length(args) >= 1) as.numeric(args[1]) else 1e6
reps <- if (length(args) >= 2) as.integer(args[2]) else 3L
here <- dirname(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE)))
source(file.path(here, "lambda_r_data.R"))
suppressPackageStartupMessages(library(powerback))
d <- pwb_bench_data(n)
f <- pwb_bench_formula
t_lm <- t_f <- t_o <- Inf
for (r in seq_len(reps)) {
  gc()
  t_lm <- min(t_lm, system.time(fit <- lm(f, data = d))[["elapsed"]])
  gc()
  t_f <- min(t_f, system.time(e1 <- estimate_response_lambda(f, data = d))[["elapsed"]])
  gc()
  t_o <- min(t_o, system.time(e2 <- estimate_response_lambda(fit))[["elapsed"]])
}
stopifnot(abs(e1$lambda - e2$lambda) < 1e-10)
cat(sprintf("n=%g lambda=%.6f ci=[%.6f, %.6f]\n", n, e1$lambda, e1$conf_int[1], e1$conf_int[2]))
cat(sprintf("lm_seconds=%.3f\nformula_seconds=%.3f\nlm_object_seconds=%.3f\n", t_lm, t_f, t_o))
cat(sprintf("ratio_formula_over_lm=%.3f\nratio_lm_object_over_lm=%.3f\n", t_f / t_lm, t_o / t_lm))
