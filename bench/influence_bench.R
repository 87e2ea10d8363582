# Leave-one-out lambda for every row (lambda_influence) against one lm.fit() of the same design,
# measured in one run at n = 1e4, 1e5, 1e6 (p = 10 skewed predictors, lognormal response).
# Reports the ratio at each n and the growth exponent of lambda_influence's time (slope of
# log time on log n). Not a test.
#   R_LIBS=<lib with powerback> Rscript bench/influence_bench.R
suppressMessages(library(powerback))
sim <- function(n, p = 10L) {
  set.seed(1)
  X <- matrix(rlnorm(n * p, sdlog = 0.5), n, p, dimnames = list(NULL, paste0("x", seq_len(p))))
  d <- as.data.frame(X)
  d$y <- exp(1 + drop(X %*% rep(0.1, p)) + rnorm(n, sd = 0.3))
  d
}
best_of <- function(k, f) min(vapply(seq_len(k), function(i) system.time(f())[["elapsed"]], 0))
ns <- c(1e4, 1e5, 1e6)
out <- data.frame(n = ns, influence_s = NA_real_, lm_fit_s = NA_real_)
for (i in seq_along(ns)) {
  d <- sim(ns[i])
  f <- y ~ x1 + x2 + x3 + x4 + x5 + x6 + x7 + x8 + x9 + x10
  X <- cbind(1, as.matrix(d[paste0("x", 1:10)]))
  reps <- if (ns[i] < 1e6) 3L else 2L
  out$lm_fit_s[i] <- best_of(reps, function() stats::lm.fit(X, d$y))
  out$influence_s[i] <- best_of(reps, function() lambda_influence(f, d))
}
out$ratio <- out$influence_s / out$lm_fit_s
print(out, row.names = FALSE)
slope <- unname(coef(lm(log(influence_s) ~ log(n), out))[2])
cat(sprintf("growth exponent of lambda_influence over n = 1e4..1e6: %.3f\n", slope))
cat(sprintf("ratio to one lm.fit at n = 1e6: %.1f\n", out$ratio[3]))
