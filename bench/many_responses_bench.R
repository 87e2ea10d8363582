# estimate_response_lambda() with q responses against one design (cbind(y1, ..., yq) ~ x1 + ...
# + xp, one factorisation of the design) against the same call with one response, in one
# process; also q separate single-response calls, for context. Each timing is the fastest of
# `reps` runs, interleaved (the q separate calls: one run).
#   Rscript bench/many_responses_bench.R [n] [p] [q] [reps]     (default 1e5 10 40 3)
args <- commandArgs(TRUE)
n <- if (length(args) >= 1) as.numeric(args[1]) else 1e5
p <- if (length(args) >= 2) as.integer(args[2]) else 10L
q <- if (length(args) >= 3) as.integer(args[3]) else 40L
reps <- if (length(args) >= 4) as.integer(args[4]) else 3L
suppressPackageStartupMessages(library(powerback))

# p normal predictors; q positive responses, each a power (from -1 to 1) of a linear predictor
# plus noise, so the estimates differ from response to response.
set.seed(2026)
d <- as.data.frame(matrix(rnorm(n * p), n, p, dimnames = list(NULL, paste0("x", seq_len(p)))))
eta <- drop(as.matrix(d) %*% rep(c(0.1, -0.1), length.out = p))
for (j in seq_len(q)) {
  lam <- -1 + 2 * (j - 1) / max(1, q - 1)
  z <- 1 + (eta + rnorm(n, sd = 0.15)) / 4
  d[[paste0("y", j)]] <- if (abs(lam) < 1e-8) exp(z) else pmax(1 + lam * z, 1e-3)^(1 / lam)
}
rhs <- paste(paste0("x", seq_len(p)), collapse = " + ")
f_one <- stats::as.formula(paste("y1 ~", rhs))
f_many <- stats::as.formula(paste0("cbind(", paste0("y", seq_len(q), collapse = ", "), ") ~ ", rhs))

# Elapsed and CPU seconds (user + system: this process only, so less disturbed than elapsed
# time when other jobs share the machine); each the fastest of the runs.
cpu <- function(st) st[["user.self"]] + st[["sys.self"]]
t_one <- t_many <- c_one <- c_many <- Inf
for (r in seq_len(reps)) {
  gc()
  st <- system.time(one <- estimate_response_lambda(f_one, d))
  t_one <- min(t_one, st[["elapsed"]]); c_one <- min(c_one, cpu(st))
  gc()
  st <- system.time(many <- estimate_response_lambda(f_many, d))
  t_many <- min(t_many, st[["elapsed"]]); c_many <- min(c_many, cpu(st))
}
# The same through the glue alone (model frame and matrix built beforehand): the library's
# share of each call.
mf <- stats::model.frame(f_many, d)
ym <- stats::model.response(mf)
mm <- stats::model.matrix(attr(mf, "terms"), mf)
glue <- get("rpwb_estimate_response_lambdas", envir = asNamespace("powerback"))
glue_one <- get("rpwb_estimate_response_lambda", envir = asNamespace("powerback"))
t_lib_one <- t_lib_many <- c_lib_one <- c_lib_many <- Inf
for (r in seq_len(reps)) {
  st <- system.time(glue_one(ym[, 1], mm, "box-cox", -3, 3, 0.95, 101L, NULL, 1L))
  t_lib_one <- min(t_lib_one, st[["elapsed"]]); c_lib_one <- min(c_lib_one, cpu(st))
  st <- system.time(glue(ym, mm, "box-cox", -3, 3, 0.95, 101L, NULL, 1L))
  t_lib_many <- min(t_lib_many, st[["elapsed"]]); c_lib_many <- min(c_lib_many, cpu(st))
}
gc()
t_sep <- system.time(sep <- lapply(seq_len(q), function(j)
  estimate_response_lambda(stats::as.formula(paste0("y", j, " ~ ", rhs)), d)))[["elapsed"]]
# The shared factorisation changes no figure: every response equals its separate call.
stopifnot(abs(many$lambda[1] - one$lambda) < 1e-10,
          max(abs(many$lambda - vapply(sep, function(e) e$lambda, 0))) < 1e-10)
cat(sprintf("n=%g p=%d q=%d\n", n, p, q))
cat(sprintf("single_seconds=%.3f\nmany_seconds=%.3f\nseparate_seconds=%.3f\n", t_one, t_many, t_sep))
cat(sprintf("ratio_many_over_single=%.2f  (target <= 3)\n", t_many / t_one))
cat(sprintf("ratio_separate_over_many=%.2f\n", t_sep / t_many))
cat(sprintf("library_single_seconds=%.3f\nlibrary_many_seconds=%.3f\n", t_lib_one, t_lib_many))
cat(sprintf("library_ratio_many_over_single=%.2f\n", t_lib_many / t_lib_one))
cat(sprintf("cpu_single_seconds=%.3f\ncpu_many_seconds=%.3f\ncpu_ratio_many_over_single=%.2f\n",
            c_one, c_many, c_many / c_one))
cat(sprintf("cpu_library_single_seconds=%.3f\ncpu_library_many_seconds=%.3f\n", c_lib_one, c_lib_many))
cat(sprintf("cpu_library_ratio_many_over_single=%.2f\n", c_lib_many / c_lib_one))
