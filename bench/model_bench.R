# Fitting, predicting and storing a pwb_model against lm() on the transformed data, measured in
# one run (ratios). Not part of the tests.
#   R_LIBS=<lib with powerback> Rscript bench/model_bench.R [n] [m]
# n rows (default 1e6) with 10 numeric predictors and a 5-level factor; the response and two
# predictors are log-transformed (fixed transforms). m new rows (default 1e5) are predicted with
# a 95% prediction interval (median). Each timing is the fastest of three, interleaved. Also: the
# fit with an estimated response power against lm() on the data transformed by the chosen
# power, and 1000 new rows predicted (median and smearing mean, with prediction intervals)
# against predict.lm() + exp() (+ the closed-form smearing factor), trained on n and on 1e4 rows.
suppressPackageStartupMessages(library(powerback))
args <- commandArgs(TRUE)
n <- if (length(args) >= 1L) as.numeric(args[1L]) else 1e6
m <- if (length(args) >= 2L) as.numeric(args[2L]) else 1e5

set.seed(1)
make <- function(k) {
  d <- as.data.frame(matrix(runif(k * 10, 1, 10), k, 10, dimnames = list(NULL, paste0("x", 1:10))))
  d$g <- factor(sample(letters[1:5], k, TRUE))
  d$y <- exp(1 + 0.3 * log(d$x1) + 0.2 * log(d$x2) + 0.05 * rowSums(d[, 3:10]) +
               0.1 * as.integer(d$g) + rnorm(k, sd = 0.3))
  d
}
d <- make(n)
nd <- make(m)
f <- y ~ x1 + x2 + x3 + x4 + x5 + x6 + x7 + x8 + x9 + x10 + g
ptr <- list(x1 = new_transform("log"), x2 = new_transform("log"))
rtr <- new_transform("log")
logged <- function(d) {
  d$y <- log(d$y)
  d$x1 <- log(d$x1)
  d$x2 <- log(d$x2)
  d
}
dt <- logged(d)
ndt <- logged(nd)

# CPU seconds of this process (user + system), the fastest of three interleaved runs: on a
# shared machine the elapsed time counts other programs' turns too. Elapsed seconds (also the
# fastest of three) are printed beside them.
cpu_el <- function(f, k = 1L) {
  gc()
  t0 <- proc.time()
  for (i in seq_len(k)) f()
  t1 <- proc.time() - t0
  c(cpu = (t1[["user.self"]] + t1[["sys.self"]]) / k, elapsed = t1[["elapsed"]] / k)
}
# A model with an estimated response power and the same fixed predictor transforms, and 1000
# new rows predicted with a prediction interval (median and smearing mean) against predict.lm()
# on the transformed rows plus exp() (and, for the mean, the closed-form smearing factor
# mean(exp(residuals)) of a log response), at the full training size and at 1e4 rows.
nd1k <- make(1000)
ndt1k <- logged(nd1k)
small <- d[seq_len(min(n, 1e4)), ]
k1 <- 20L
keys <- c("fit", "lm", "fit_est", "lm_est", "pred", "plm", "p1k_med", "p1k_mean", "plm1k_med",
          "plm1k_mean", "p1k_med_small", "p1k_mean_small", "plm1k_med_small", "plm1k_mean_small")
tm <- matrix(Inf, length(keys), 2L, dimnames = list(keys, c("cpu", "elapsed")))
keep <- function(key, t) tm[key, ] <<- pmin(tm[key, ], t)
lm_pred_mean <- function(fit, newdata) {
  p <- predict(fit, newdata, interval = "prediction")
  cbind(exp(p), mean = exp(p[, "fit"]) * mean(exp(residuals(fit))))
}
for (i in 1:3) {
  keep("fit", cpu_el(function() mod <<- lm_transformed(f, d, response = rtr, predictors = ptr)))
  keep("lm", cpu_el(function() fit <<- lm(f, dt)))
  keep("fit_est", cpu_el(function() mod_est <<- lm_transformed(f, d, response = "estimate",
                                                              predictors = ptr)))
  # lm() on the data transformed by the power the estimate chose (its convenient power)
  keep("lm_est", cpu_el(function() {
    dte <- d
    dte$y <- apply_transform(mod_est$response, d$y)
    dte$x1 <- log(d$x1)
    dte$x2 <- log(d$x2)
    lm(f, dte)
  }))
  keep("pred", cpu_el(function() p1 <<- predict(mod, nd, interval = "prediction")))
  keep("plm", cpu_el(function() p2 <<- predict(fit, ndt, interval = "prediction")))
  keep("p1k_med", cpu_el(function() predict(mod, nd1k, interval = "prediction"), k1))
  keep("p1k_mean", cpu_el(function() predict(mod, nd1k, interval = "prediction",
                                             center = "mean"), k1))
  keep("plm1k_med", cpu_el(function() exp(predict(fit, ndt1k, interval = "prediction")), k1))
  keep("plm1k_mean", cpu_el(function() lm_pred_mean(fit, ndt1k), k1))
}
mod_s <- lm_transformed(f, small, response = rtr, predictors = ptr)
fit_s <- lm(f, logged(small))
for (i in 1:3) {
  keep("p1k_med_small", cpu_el(function() predict(mod_s, nd1k, interval = "prediction"), k1))
  keep("p1k_mean_small", cpu_el(function() predict(mod_s, nd1k, interval = "prediction",
                                                   center = "mean"), k1))
  keep("plm1k_med_small", cpu_el(function() exp(predict(fit_s, ndt1k, interval = "prediction")),
                                 k1))
  keep("plm1k_mean_small", cpu_el(function() lm_pred_mean(fit_s, ndt1k), k1))
}
stopifnot(isTRUE(all.equal(p1$fit, unname(exp(p2[, "fit"])), tolerance = 1e-8)))
pm <- predict(mod, nd1k, interval = "prediction", center = "mean")
stopifnot(isTRUE(all.equal(pm$fit, unname(lm_pred_mean(fit, ndt1k)[, "mean"]), tolerance = 1e-8)))
size_ratio <- as.numeric(object.size(mod)) / as.numeric(object.size(fit))
ser_ratio <- length(serialize(mod, NULL)) / length(serialize(fit, NULL))
line <- function(label, a, b, target) {
  cat(sprintf("%-46s cpu %.4f / %.4f s = %.3f (elapsed %.4f / %.4f = %.3f) target <= %s\n",
              label, tm[a, "cpu"], tm[b, "cpu"], tm[a, "cpu"] / tm[b, "cpu"], tm[a, "elapsed"],
              tm[b, "elapsed"], tm[a, "elapsed"] / tm[b, "elapsed"], target))
}
cat(sprintf("rows=%g new_rows=%g; estimated response: %s\n", n, m,
            format(mod_est$response$family)))
line("fit, fixed transforms / lm", "fit", "lm", "1.3")
line("fit, estimated response / lm (chosen power)", "fit_est", "lm_est", "1.5")
line(sprintf("predict %g rows, PI, median / predict.lm", m), "pred", "plm", "1.2")
line("predict 1000 rows, PI, median / predict.lm+exp", "p1k_med", "plm1k_med", "3")
line("predict 1000 rows, PI, mean / predict.lm+smear", "p1k_mean", "plm1k_mean", "3")
line("same, trained on 1e4 rows: median", "p1k_med_small", "plm1k_med_small", "3")
line("same, trained on 1e4 rows: mean", "p1k_mean_small", "plm1k_mean_small", "3")
cat(sprintf("object_size_ratio=%.3f serialize_ratio=%.3f (target <= 1.5)\n", size_ratio,
            ser_ratio))
