# compare_transforms() (5 folds, default candidates "none", "ladder", "ml") against a by-hand
# base-R k-fold loop over the same candidates on the same data and folds, at several n; prints
# the time ratio at each n and the growth exponent (slope of log time on log n).
#   Rscript bench/compare_bench.R [n ...]        (default n = 1e4 3e4)
# Data: lognormal y, 10 lognormal predictors and a 5-level factor.
#
# The by-hand loop does, per fold and candidate, what a careful analyst would write in base R:
#   - the search work: for "ml", optimize() over the response's profile log-likelihood with one
#     lm.fit() per evaluation and a univariate Box-Cox optimize() per transformed predictor; for
#     "ladder", the sample skewness of each variable;
#   - then, with the transforms powerback learned in that fold (read from cmp$lambdas, so both
#     sides fit the same models), lm() on the transformed variables, predict.lm() with 95%
#     prediction intervals, the back-transformed median, and the smearing mean (closed form
#     exp(fit) * mean(exp(e)) for a log response; the pairwise mean over training residuals,
#     in blocks, for another power).
# It then scores the held-out rows (RMSE, MAE, R^2, coverage, median width).
suppressPackageStartupMessages(library(powerback))
args <- commandArgs(trailingOnly = TRUE)
ns <- if (length(args)) as.numeric(args) else c(1e4, 3e4)

sim <- function(n, p = 10, seed = 1) {
  set.seed(seed)
  X <- matrix(stats::rlnorm(n * p, 0, 0.6), n, p, dimnames = list(NULL, paste0("x", 1:p)))
  d <- as.data.frame(X)
  d$f <- factor(sample(letters[1:5], n, TRUE))
  d$y <- exp(0.5 + drop(log(X) %*% rep(0.1, p)) + 0.1 * as.integer(d$f) +
               stats::rnorm(n, sd = 0.4))
  d
}

fwd <- function(x, family, lambda) {
  switch(family, identity = x, log = log(x), log10 = log10(x), sqrt = sqrt(x),
         reciprocal = -1 / x,
         "box-cox" = if (lambda == 0) log(x) else (x^lambda - 1) / lambda,
         stop("by-hand loop: no base-R formula for family ", family))
}
inv <- function(z, family, lambda) {
  switch(family, identity = z, log = exp(z), log10 = 10^z, sqrt = z^2, reciprocal = -1 / z,
         "box-cox" = if (lambda == 0) exp(z) else (lambda * z + 1)^(1 / lambda),
         stop("by-hand loop: no base-R inverse for family ", family))
}
smear <- function(fit, e, family, lambda) {
  if (family == "identity") return(fit)
  if (family == "log" || (family == "box-cox" && lambda == 0)) return(exp(fit) * mean(exp(e)))
  if (family == "log10") return(10^fit * mean(10^e))
  out <- numeric(length(fit))
  for (b in split(seq_along(fit), ceiling(seq_along(fit) / 256)))
    out[b] <- rowMeans(inv(outer(fit[b], e, "+"), family, lambda))
  out
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
        stats::optimize(prof, c(-3, 3), maximum = TRUE)
        for (v in xs) {
          x <- tr[[v]]
          slx <- sum(log(x))
          uni <- function(lam) {
            z <- if (abs(lam) < 1e-12) log(x) else (x^lam - 1) / lam
            -m / 2 * log(mean((z - mean(z))^2)) + (lam - 1) * slx
          }
          stats::optimize(uni, c(-3, 3), maximum = TRUE)
        }
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

fml <- stats::reformulate(c(paste0("x", 1:10), "f"), "y")
res <- data.frame(n = ns, powerback = NA_real_, by_hand = NA_real_)
for (i in seq_along(ns)) {
  d <- sim(ns[i])
  gc()
  prof <- tempfile()
  utils::Rprof(prof, interval = 0.02)
  t_pb <- system.time(cmp <- compare_transforms(fml, d, folds = 5, seed = 1,
                                                progress = FALSE))[["elapsed"]]
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
  t_bh <- system.time(by_hand(d, fml, cmp))[["elapsed"]]
  res$powerback[i] <- t_pb
  res$by_hand[i] <- t_bh
  cat(sprintf("n = %g: compare_transforms %.2f s, by hand %.2f s, ratio %.2f\n", ns[i], t_pb,
              t_bh, t_pb / t_bh))
}
res$ratio <- res$powerback / res$by_hand
print(res)
if (nrow(res) > 1) {
  slope <- function(t) unname(stats::coef(stats::lm(log(t) ~ log(res$n)))[2])
  cat(sprintf("growth exponent: compare_transforms %.2f, by hand %.2f\n", slope(res$powerback),
              slope(res$by_hand)))
}
