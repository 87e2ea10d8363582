# The by-hand base-R way to get a response lambda and its interval: optimize() over the profile
# log-likelihood with one lm.fit() refit per lambda, then uniroot() on each side for the
# chi-square cut. Reads the data written by lambda_response_bench (raw doubles: y, then X).
#   Rscript lambda_response_byhand.R DATAFILE n p [n_used]
# Only the first n_used rows are used (default all): the refits cost O(n p^2) each, so the
# time scales linearly in n and run_lambda_bench.sh scales it up.
args <- commandArgs(trailingOnly = TRUE)
n <- as.integer(args[2]); p <- as.integer(args[3])
m <- if (length(args) > 3) as.integer(args[4]) else n
con <- file(args[1], "rb")
y <- readBin(con, "double", n)
X <- matrix(readBin(con, "double", n * p), n, p)
close(con)
y <- y[seq_len(m)]
X <- cbind(1, X[seq_len(m), , drop = FALSE])
sly <- sum(log(y))
prof <- function(lam) {
  z <- if (abs(lam) < 1e-12) log(y) else (y^lam - 1) / lam
  rss <- sum(stats::lm.fit(X, z)$residuals^2)
  -m / 2 * (log(2 * pi) + 1 + log(rss / m)) + (lam - 1) * sly
}
el <- Inf
for (rep in 1:2) {  # the faster of two runs, as for the C++ timings
  t0 <- proc.time()[["elapsed"]]
  best <- stats::optimize(prof, c(-3, 3), maximum = TRUE)
  cut <- best$objective - stats::qchisq(0.95, 1) / 2
  lo <- stats::uniroot(function(l) prof(l) - cut, c(-3, best$maximum))$root
  hi <- stats::uniroot(function(l) prof(l) - cut, c(best$maximum, 3))$root
  el <- min(el, proc.time()[["elapsed"]] - t0)
}
cat(sprintf("byhand n=%d lambda=%.6f ci=[%.6f, %.6f]\nbyhand_seconds=%.4f\n", m, best$maximum,
            lo, hi, el))
