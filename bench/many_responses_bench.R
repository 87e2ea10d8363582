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
# time when other jobs share the machine); each the fastest of the runs. The 40-response call
# runs on 1 and on 2 threads (option powerback.threads); the single call has one response to
# give its thread.
cpu <- function(st) st[["user.self"]] + st[["sys.self"]]
best <- function(a, st) c(min(a[1], st[["elapsed"]]), min(a[2], cpu(st)))
t_one <- t_many1 <- t_many2 <- c(Inf, Inf)
for (r in seq_len(reps)) {
  gc()
  t_one <- best(t_one, system.time(one <- estimate_response_lambda(f_one, d)))
  gc()
  options(powerback.threads = 1)
  t_many1 <- best(t_many1, system.time(many <- estimate_response_lambda(f_many, d)))
  gc()
  options(powerback.threads = 2)
  t_many2 <- best(t_many2, system.time(many2 <- estimate_response_lambda(f_many, d)))
}
# The same through the glue alone (model frame and matrix built beforehand): the library's
# share of each call (the single call with its 101-point curve, as estimate_response_lambda
# asks for it; the many-response call without curves, as the table needs none).
mf <- stats::model.frame(f_many, d)
ym <- stats::model.response(mf)
mm <- stats::model.matrix(attr(mf, "terms"), mf)
glue <- get("rpwb_estimate_response_lambdas", envir = asNamespace("powerback"))
glue_one <- get("rpwb_estimate_response_lambda", envir = asNamespace("powerback"))
l_one <- l_many1 <- l_many2 <- c(Inf, Inf)
for (r in seq_len(reps)) {
  l_one <- best(l_one, system.time(glue_one(ym[, 1], mm, "box-cox", -3, 3, 0.95, 101L, NULL, 1L)))
  l_many1 <- best(l_many1, system.time(glue(ym, mm, "box-cox", -3, 3, 0.95, 0L, NULL, 1L, 1L)))
  l_many2 <- best(l_many2, system.time(glue(ym, mm, "box-cox", -3, 3, 0.95, 0L, NULL, 1L, 2L)))
}
# Every response's full pwb_lambda with its profile curve, built on request (one run).
t_fits <- system.time(fits <- response_fits(many2))[["elapsed"]]
gc()
t_sep <- system.time(sep <- lapply(seq_len(q), function(j)
  estimate_response_lambda(stats::as.formula(paste0("y", j, " ~ ", rhs)), d)))[["elapsed"]]
# The shared factorisation and the threads change no figure: every response equals its separate
# call, and the two thread counts agree bit for bit.
stopifnot(abs(many$lambda[1] - one$lambda) < 1e-10,
          max(abs(many$lambda - vapply(sep, function(e) e$lambda, 0))) < 1e-10,
          max(abs(many$conf_low - vapply(sep, function(e) e$conf_int[1], 0))) < 1e-10,
          max(abs(many$conf_high - vapply(sep, function(e) e$conf_int[2], 0))) < 1e-10,
          max(abs(fits[[q]]$profile$loglik - sep[[q]]$profile$loglik)) < 1e-10 * abs(sep[[q]]$loglik),
          identical(as.data.frame(many), as.data.frame(many2)))
row <- function(label, a, b)
  cat(sprintf("%-34s elapsed %.3f / %.3f = %5.2f   cpu %.3f / %.3f = %5.2f\n", label, a[1], b[1],
              a[1] / b[1], a[2], b[2], a[2] / b[2]))
cat(sprintf("n=%g p=%d q=%d (target: %d responses <= 3 x one)\n", n, p, q, q))
row("whole call, 1 thread / single", t_many1, t_one)
row("whole call, 2 threads / single", t_many2, t_one)
row("library, 1 thread / single", l_many1, l_one)
row("library, 2 threads / single", l_many2, l_one)
cat(sprintf("separate_seconds=%.3f  ratio_separate_over_many_2_threads=%.2f\n", t_sep,
            t_sep / t_many2[1]))
cat(sprintf("response_fits_all_seconds=%.3f  (2 threads, the curves computed then)\n", t_fits))
