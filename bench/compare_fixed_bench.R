# compare_transforms() with fixed candidates only ("none" and a log of the response and of every
# predictor), 5 folds: the fold factors shared (the default) against the per-fold lm_transformed()
# fits, and against a by-hand base-R k-fold loop doing the same work (lm() on the transformed
# variables per training fold, predict.lm() with 95% prediction intervals, the back-transformed
# median, the smearing mean in closed form (fit + mean(e) for "none", exp(fit) * mean(exp(e))
# for the log) and the scores). CPU seconds (user + system) of this process, measured in one
# run; the growth exponent is the slope of log time on log n.
#   Rscript bench/compare_fixed_bench.R [n ...]      (default n = 1e4 1e5)
# Data: lognormal y, 10 lognormal predictors and a 5-level factor (as compare_bench.R).
suppressPackageStartupMessages(library(powerback))
args <- commandArgs(trailingOnly = TRUE)
ns <- if (length(args)) as.numeric(args) else c(1e4, 1e5)

here <- dirname(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE)[1L]))
source(file.path(here, "compare_data.R"))

cpu <- function(expr) {
  t0 <- proc.time()
  force(expr)
  t <- proc.time() - t0
  c(cpu = unname(t[["user.self"]] + t[["sys.self"]]), elapsed = unname(t[["elapsed"]]))
}

score <- function(y, fit, lwr, upr) {
  c(sqrt(mean((y - fit)^2)), mean(abs(y - fit)), 1 - sum((y - fit)^2) / sum((y - mean(y))^2),
    mean(lwr <= y & y <= upr), stats::median(upr - lwr))
}

by_hand <- function(d, ids, logs) {
  xs <- grep("^x", names(d), value = TRUE)
  dl <- d
  dl[xs] <- lapply(d[xs], log)
  dl$y <- log(d$y)
  out <- list()
  for (k in sort(unique(ids))) {
    te <- ids == k
    for (cand in c("none", "logs")) {
      dd <- if (cand == "none") d else dl
      fit <- stats::lm(y ~ ., dd[!te, ])
      pr <- stats::predict(fit, dd[te, ], interval = "prediction", level = 0.95)
      e <- stats::residuals(fit)
      if (cand == "none") {
        med <- pr[, "fit"]; lo <- pr[, "lwr"]; hi <- pr[, "upr"]; mn <- med + mean(e)
      } else {
        med <- exp(pr[, "fit"]); lo <- exp(pr[, "lwr"]); hi <- exp(pr[, "upr"])
        mn <- med * mean(exp(e))
      }
      out[[length(out) + 1L]] <- c(score(d$y[te], med, lo, hi), score(d$y[te], mn, lo, hi)[1:3])
    }
  }
  out
}

cands <- function(d) {
  xs <- grep("^x", names(d), value = TRUE)
  logs <- stats::setNames(rep(list(new_transform("log")), length(xs) + 1L), c("y", xs))
  list("none", logs = logs)
}

res <- NULL
for (n in ns) {
  d <- sim(n)
  f <- y ~ x1 + x2 + x3 + x4 + x5 + x6 + x7 + x8 + x9 + x10 + f
  cs <- cands(d)
  t_fast <- cpu(cmp <- compare_transforms(f, d, candidates = cs, folds = 5, seed = 1,
                                          progress = FALSE))
  t_slow <- cpu(slow <- powerback:::pwb_cmp_with_reuse(FALSE, compare_transforms(
    f, d, candidates = cs, folds = 5, seed = 1, progress = FALSE)))
  t_hand <- cpu(by_hand(d, cmp$fold_ids[, 1], TRUE))
  stopifnot(isTRUE(all.equal(cmp$folds, slow$folds, tolerance = 1e-10)))
  cat(sprintf(paste0("n = %g: CPU shared fold factors %.2f s, per-fold fits %.2f s, by hand ",
                     "%.2f s; ratios %.2f (shared / per-fold), %.2f (shared / by hand)\n"),
              n, t_fast[["cpu"]], t_slow[["cpu"]], t_hand[["cpu"]],
              t_fast[["cpu"]] / t_slow[["cpu"]], t_fast[["cpu"]] / t_hand[["cpu"]]))
  res <- rbind(res, data.frame(n = n, fast = t_fast[["cpu"]], slow = t_slow[["cpu"]],
                               hand = t_hand[["cpu"]]))
}
if (nrow(res) > 1L) {
  slope <- function(t) unname(stats::coef(stats::lm(log(t) ~ log(res$n)))[2L])
  cat(sprintf("growth exponents (CPU): shared %.2f, per-fold %.2f, by hand %.2f\n",
              slope(res$fast), slope(res$slow), slope(res$hand)))
}
