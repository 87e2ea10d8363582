# One call in a fresh process, for peak resident memory measured from outside
# (/usr/bin/time -v): what = "data" (only build the data), "lm" (lm(formula)), "lambda"
# (estimate_response_lambda(formula)), "model" (lm_transformed(formula), response power
# estimated) or "model_fixed" (lm_transformed(formula) with a fixed log response).
#   Rscript bench/lambda_r_memory.R WHAT [n]
args <- commandArgs(TRUE)
what <- args[1]
n <- if (length(args) >= 2) as.numeric(args[2]) else 1e7
here <- dirname(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE)))
source(file.path(here, "lambda_r_data.R"))
suppressPackageStartupMessages(library(powerback))
d <- pwb_bench_data(n)
invisible(gc())
t <- system.time(switch(what,
  data = NULL,
  lm = lm(pwb_bench_formula, data = d),
  lambda = estimate_response_lambda(pwb_bench_formula, data = d),
  model = lm_transformed(pwb_bench_formula, data = d),
  model_fixed = lm_transformed(pwb_bench_formula, data = d, response = new_transform("log"))))[["elapsed"]]
cat(sprintf("%s_seconds=%.2f\n", what, t))
