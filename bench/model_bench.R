# Fitting, predicting and storing a pwb_model against lm() on the transformed data, measured in
# one run (ratios). Not part of the tests.
#   R_LIBS=<lib with powerback> Rscript bench/model_bench.R [n] [m]
# n rows (default 1e6) with 10 numeric predictors and a 5-level factor; the response and two
# predictors are log-transformed (fixed transforms). m new rows (default 1e5) are predicted with
# a 95% prediction interval (median). Each timing is the fastest of three, interleaved.
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

best <- function(expr_fun) {
  t <- numeric(3)
  for (i in 1:3) {
    gc()
    t[i] <- system.time(expr_fun())[["elapsed"]]
  }
  min(t)
}
t_fit <- t_lm <- t_pred <- t_plm <- Inf
for (i in 1:3) {
  gc()
  t_fit <- min(t_fit, system.time(mod <- lm_transformed(f, d, response = rtr,
                                                        predictors = ptr))[["elapsed"]])
  gc()
  t_lm <- min(t_lm, system.time(fit <- lm(f, dt))[["elapsed"]])
  gc()
  t_pred <- min(t_pred, system.time(p1 <- predict(mod, nd, interval = "prediction"))[["elapsed"]])
  gc()
  t_plm <- min(t_plm, system.time(p2 <- predict(fit, ndt, interval = "prediction"))[["elapsed"]])
}
stopifnot(isTRUE(all.equal(p1$fit, unname(exp(p2[, "fit"])), tolerance = 1e-8)))
size_ratio <- as.numeric(object.size(mod)) / as.numeric(object.size(fit))
ser_ratio <- length(serialize(mod, NULL)) / length(serialize(fit, NULL))
cat(sprintf("rows=%g new_rows=%g\n", n, m))
cat(sprintf("fit_seconds=%.3f lm_seconds=%.3f fit_ratio=%.3f (target <= 1.3)\n", t_fit, t_lm,
            t_fit / t_lm))
cat(sprintf("predict_seconds=%.3f predict_lm_seconds=%.3f predict_ratio=%.3f (target <= 1.2)\n",
            t_pred, t_plm, t_pred / t_plm))
cat(sprintf("object_size_ratio=%.3f serialize_ratio=%.3f (target <= 1.5)\n", size_ratio,
            ser_ratio))
