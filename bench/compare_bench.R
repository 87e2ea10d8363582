# compare_transforms() (5 folds, default candidates "none", "ladder", "ml") against a by-hand
# base-R k-fold loop over the same candidates on the same data and folds, at several n; prints
# the time ratio at each n and the growth exponent (slope of log time on log n).
#   Rscript bench/compare_bench.R [n ...]        (default n = 1e4 3e4)
# Data: lognormal y, 10 lognormal predictors and a 5-level factor.
#
# The by-hand loop does, per fold and candidate, what a careful analyst would write in base R:
#   - the search work: for "ml", optimize() over the response's profile log-likelihood with one
#     lm.fit() per evaluation, then the Box-Tidwell iteration for the predictors' powers on the
#     transformed response (two lm.fit() per update until every power moves by < 1e-6, and one
#     lm.fit() per predictor for its score test of power 1); for "ladder", the sample skewness
#     of each variable;
#   - then, with the transforms powerback learned in that fold (read from cmp$lambdas, so both
#     sides fit the same models), lm() on the transformed variables, predict.lm() with 95%
#     prediction intervals, the back-transformed median, and the smearing mean (closed form
#     exp(fit) * mean(exp(e)) for a log response; for another power the exact mean is the
#     pairwise mean over training residuals, O(n^2), which is skipped unless
#     PWB_BYHAND_PAIRWISE=1: by default the by-hand time is a lower bound).
# It then scores the held-out rows (RMSE, MAE, R^2, coverage, median width).
suppressPackageStartupMessages(library(powerback))
args <- commandArgs(trailingOnly = TRUE)
ns <- if (length(args)) as.numeric(args) else c(1e4, 3e4)

here <- dirname(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE)[1L]))
source(file.path(here, "compare_data.R"))

fwd <- function(x, family, lambda) {
  switch(family, identity = x, log = log(x), log10 = log10(x), sqrt = sqrt(x),
         reciprocal = -1 / x, power = if (lambda > 0) sign(x) * abs(x)^lambda else -x^lambda,
         "box-cox" = if (lambda == 0) log(x) else (x^lambda - 1) / lambda,
         stop("by-hand loop: no base-R formula for family ", family))
}
inv <- function(z, family, lambda) {
  switch(family, identity = z, log = exp(z), log10 = 10^z, sqrt = z^2, reciprocal = -1 / z,
         power = if (lambda > 0) sign(z) * abs(z)^(1 / lambda) else (-z)^(1 / lambda),
         "box-cox" = if (lambda == 0) exp(z) else (lambda * z + 1)^(1 / lambda),
         stop("by-hand loop: no base-R inverse for family ", family))
}
smear <- function(fit, e, family, lambda) {
  if (family == "identity") return(fit)
  if (family == "log" || (family == "box-cox" && lambda == 0)) return(exp(fit) * mean(exp(e)))
  if (family == "log10") return(10^fit * mean(10^e))
  # No closed form: the exact mean visits every (row, residual) pair, O(n^2). Skipped unless
  # PWB_BYHAND_PAIRWISE=1, so the by-hand time is a lower bound (the ratio an upper bound).
  if (Sys.getenv("PWB_BYHAND_PAIRWISE") != "1") return(rep(NA_real_, length(fit)))
  out <- numeric(length(fit))
  for (b in split(seq_along(fit), ceiling(seq_along(fit) / 256)))
    out[b] <- rowMeans(inv(outer(fit[b], e, "+"), family, lambda))
  out
}
# Box-Tidwell (1962) by hand: a_j += g_j / b_j, b_j the coefficient of x_j^a_j and g_j that
# of the added column x_j^a_j log x_j, until max |change| < 1e-6 (at most 50 updates); then one
# fit per variable for its score test of power 1 (t of x_j log x_j added alone).
box_tidwell_by_hand <- function(tr, xs, z) {
  lx <- log(as.matrix(tr[xs]))
  other <- stats::model.matrix(~ f, tr)
  a <- rep(1, length(xs))
  for (it in 1:50) {
    xa <- exp(sweep(lx, 2, a, "*"))
    b <- stats::lm.fit(cbind(other, xa), z)$coefficients[ncol(other) + seq_along(xs)]
    g <- stats::lm.fit(cbind(other, xa, xa * lx), z)$coefficients[ncol(other) +
                                                                   length(xs) + seq_along(xs)]
    step <- g / b
    a <- a + step
    if (max(abs(step)) < 1e-6) break
  }
  x1 <- exp(lx)
  for (j in seq_along(xs)) summary(stats::lm(z ~ other + x1 + I(x1[, j] * lx[, j]) - 1))
  a
}
skew <- function(v) mean((v - mean(v))^3) / mean((v - mean(v))^2)^1.5

by_hand <- function(d, fml, cmp) {
  xs <- paste0("x", 1:10)
  for (k in seq_len(cmp$folds_k)) {
    test <- cmp$fold_ids[, 1] == k
    tr <- d[!test, ]
    te <- d[test, ]
    for (cand in c("none", "ladder", "ml")) {
      if (cand == "ladder") invisible(vapply(tr[c("y", xs)], skew, 0))
      if (cand == "ml") {
        X <- stats::model.matrix(fml, tr)
        sly <- sum(log(tr$y))
        m <- nrow(tr)
        prof <- function(lam) {
          z <- if (abs(lam) < 1e-12) log(tr$y) else (tr$y^lam - 1) / lam
          -m / 2 * log(sum(stats::lm.fit(X, z)$residuals^2) / m) + (lam - 1) * sly
        }
        lhat <- stats::optimize(prof, c(-3, 3), maximum = TRUE)$maximum
        bt_y <- if (abs(lhat) < 1e-12) log(tr$y) else (tr$y^lhat - 1) / lhat
        box_tidwell_by_hand(tr, xs, bt_y)
      }
      lam <- cmp$lambdas[cmp$lambdas$candidate == cand & cmp$lambdas$fold == k, ]
      trt <- tr
      tet <- te
      for (i in seq_len(nrow(lam))) {
        v <- lam$variable[i]
        trt[[v]] <- fwd(tr[[v]], lam$family[i], lam$lambda[i])
        if (v != "y") tet[[v]] <- fwd(te[[v]], lam$family[i], lam$lambda[i])
      }
      fit <- stats::lm(fml, trt)
      pi <- stats::predict(fit, tet, interval = "prediction", level = 0.95)
      fy <- lam$family[lam$variable == "y"]
      ly <- lam$lambda[lam$variable == "y"]
      med <- inv(pi[, "fit"], fy, ly)
      lwr <- inv(pi[, "lwr"], fy, ly)
      upr <- inv(pi[, "upr"], fy, ly)
      mn <- smear(pi[, "fit"], stats::residuals(fit), fy, ly)
      c(sqrt(mean((te$y - med)^2)), mean(abs(te$y - med)),
        1 - sum((te$y - med)^2) / sum((te$y - mean(te$y))^2),
        sqrt(mean((te$y - mn)^2)), mean(te$y >= lwr & te$y <= upr), stats::median(upr - lwr))
    }
  }
}

# Elapsed and CPU seconds of this process (user + system). On a shared machine the elapsed time
# counts other programs' turns too; the ratio is taken on CPU time, with elapsed beside it.
timed <- function(expr) {
  t0 <- proc.time()
  force(expr)
  t1 <- proc.time() - t0
  c(elapsed = t1[["elapsed"]], cpu = t1[["user.self"]] + t1[["sys.self"]])
}

fml <- stats::reformulate(c(paste0("x", 1:10), "f"), "y")
res <- data.frame(n = ns, powerback = NA_real_, by_hand = NA_real_, powerback_elapsed = NA_real_,
                  by_hand_elapsed = NA_real_)
for (i in seq_along(ns)) {
  d <- sim(ns[i])
  gc()
  prof <- tempfile()
  utils::Rprof(prof, interval = 0.02)
  t_pb <- timed(cmp <- compare_transforms(fml, d, folds = 5, seed = 1, progress = FALSE))
  utils::Rprof(NULL)
  tot <- utils::summaryRprof(prof)$by.total
  share <- function(f) {
    f <- paste0("\"", f, "\"")
    if (f %in% rownames(tot)) tot[f, "total.pct"] else 0
  }
  cat(sprintf(paste0("n = %g: profile shares of compare_transforms: compiled prediction ",
                     "(rpwb_model_predict, held-out medians, intervals and smearing means) ",
                     "%.0f%%, lm_transformed %.0f%%, full-data fits (pwb_cmp_assemble) %.0f%%\n"),
              ns[i], share("rpwb_model_predict"), share("lm_transformed"),
              share("pwb_cmp_assemble")))
  unlink(prof)
  gc()
  t_bh <- timed(by_hand(d, fml, cmp))
  res$powerback[i] <- t_pb[["cpu"]]
  res$by_hand[i] <- t_bh[["cpu"]]
  res$powerback_elapsed[i] <- t_pb[["elapsed"]]
  res$by_hand_elapsed[i] <- t_bh[["elapsed"]]
  cat(sprintf(paste0("n = %g: CPU compare_transforms %.2f s, by hand %.2f s, ratio %.2f ",
                     "(elapsed %.2f s / %.2f s)\n"), ns[i], t_pb[["cpu"]], t_bh[["cpu"]],
              t_pb[["cpu"]] / t_bh[["cpu"]], t_pb[["elapsed"]], t_bh[["elapsed"]]))
}
res$ratio <- res$powerback / res$by_hand
print(res)
if (nrow(res) > 1) {
  slope <- function(t) unname(stats::coef(stats::lm(log(t) ~ log(res$n)))[2])
  cat(sprintf("growth exponent (CPU time): compare_transforms %.2f, by hand %.2f\n",
              slope(res$powerback), slope(res$by_hand)))
}
