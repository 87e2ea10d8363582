# Wide data: 50 rows and 10,000 numeric predictors, so that all but 49 columns are aliased.
# Times base R's lm() and powerback's entry points on the same data in one run and prints the
# ratios (each time the faster of two runs).
#   R_LIBS=<library with powerback> Rscript bench/wide_rank_bench.R [rows] [columns]
args <- commandArgs(trailingOnly = TRUE)
n <- if (length(args) >= 1) as.integer(args[1]) else 50L
p <- if (length(args) >= 2) as.integer(args[2]) else 10000L
suppressPackageStartupMessages(library(powerback))
set.seed(1)
d <- as.data.frame(matrix(rnorm(n * p), n, p))
d$y <- exp(rnorm(n))
best <- function(f) min(replicate(2, system.time(f())[["elapsed"]]))
t_lm <- best(function() lm(y ~ ., d))
# The profile needs n > rank + 1, which a design with as many columns kept as rows never has:
# the call returns (with that error) once the rank is known.
t_erl <- best(function() try(estimate_response_lambda(y ~ ., data = d), silent = TRUE))
msg <- tryCatch({estimate_response_lambda(y ~ ., data = d); "ok"}, error = conditionMessage)
cat(sprintf("rows %d, columns %d\n", n, p))
cat(sprintf("lm()                         %7.2f s\n", t_lm))
cat(sprintf("estimate_response_lambda()   %7.2f s  (ratio to lm %.2f)  -> %s\n", t_erl,
            t_erl / t_lm, substr(msg, 1, 60)))
