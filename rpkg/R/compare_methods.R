# Assembling, printing and plotting a pwb_comparison.

pwb_cmp_assemble <- function(learners, formula, dat, yname, family, level, fold_rows,
                             lambda_rows, fail_rows, fold_ids, rows, seed, folds, repeats) {
  score_cols <- c("rmse_median", "mae_median", "r2_median", "rmse_mean", "mae_mean", "r2_mean",
                  "coverage", "width")
  fold_tab <- if (length(fold_rows)) do.call(rbind, fold_rows) else NULL
  lam_tab <- if (length(lambda_rows)) do.call(rbind, lambda_rows) else NULL
  fail_tab <- if (length(fail_rows)) do.call(rbind, fail_rows)
              else data.frame(candidate = character(0), repeat_no = integer(0),
                              fold = integer(0), message = character(0))
  if (!is.null(fold_tab)) rownames(fold_tab) <- NULL
  if (!is.null(lam_tab)) rownames(lam_tab) <- NULL
  rownames(fail_tab) <- NULL
  full <- list()
  summ <- lapply(names(learners), function(cand) {
    f <- if (is.null(fold_tab)) NULL else fold_tab[fold_tab$candidate == cand, , drop = FALSE]
    means <- vapply(score_cols, function(s) if (is.null(f) || nrow(f) == 0L) NA_real_
                                            else mean(f[[s]]), numeric(1))
    sdv <- function(s) if (is.null(f) || nrow(f) < 2L) NA_real_ else stats::sd(f[[s]])
    model <- tryCatch(learners[[cand]](dat, formula, yname, family, level),
                      error = function(e) conditionMessage(e))
    if (is.character(model)) {
      full[[cand]] <<- list(error = model)
      adj <- aic <- NA_real_
    } else {
      full[[cand]] <<- list(lambdas = pwb_cmp_lambdas(model, yname))
      adj <- summary(model$lm)$adj.r.squared
      aic <- stats::AIC(model)
    }
    data.frame(candidate = cand, t(means), rmse_sd = sdv("rmse_median"),
               r2_sd = sdv("r2_median"),
               folds_scored = if (is.null(f)) 0L else nrow(f),
               folds_failed = sum(fail_tab$candidate == cand),
               adj_r2_own_scale = adj, aic = aic, stringsAsFactors = FALSE)
  })
  summ <- do.call(rbind, summ)
  summ <- summ[order(summ$rmse_median, na.last = TRUE), , drop = FALSE]
  rownames(summ) <- NULL
  structure(list(summary = summ, folds = fold_tab, lambdas = lam_tab, full = full,
                 failures = fail_tab, fold_ids = fold_ids, rows = rows, seed = seed,
                 level = level, folds_k = folds, repeats = repeats, formula = formula,
                 yname = yname),
            class = "pwb_comparison")
}

#' @export
print.pwb_comparison <- function(x, digits = 4, ...) {
  cat(sprintf("<pwb_comparison> %s: %d-fold cross-validation x %d, seed %s, n = %d\n",
              deparse1(x$formula), x$folds_k, x$repeats, format(x$seed, scientific = FALSE),
              length(x$rows)))
  s <- x$summary
  tab <- data.frame(rank = seq_len(nrow(s)), candidate = s$candidate,
                    rmse = s$rmse_median, mae = s$mae_median, r2 = s$r2_median,
                    rmse_mean = s$rmse_mean, coverage = s$coverage, width = s$width,
                    aic = s$aic, adj_r2_own = s$adj_r2_own_scale,
                    folds = sprintf("%d/%d", s$folds_scored, s$folds_scored + s$folds_failed))
  num <- vapply(tab, is.double, logical(1))
  tab[num] <- lapply(tab[num], signif, digits = digits)
  print(tab, row.names = FALSE, ...)
  cat(sprintf(paste0("Held-out scores in original units (median back-transform; rmse_mean uses the ",
                     "smearing mean), %g%% prediction intervals. aic is comparable across ",
                     "candidates; adj_r2_own is on each candidate's own scale and is NOT.\n"),
              100 * x$level))
  nonfinite <- tapply(x$folds$n_nonfinite, x$folds$candidate, sum)
  nonfinite <- nonfinite[nonfinite > 0]
  if (length(nonfinite)) {
    cat(sprintf(paste0("%s: %d held-out %s left the transform's range (non-finite back-transform), ",
                       "so the folds holding them score NA; see $predictions.\n"),
                names(nonfinite), as.integer(nonfinite),
                ifelse(nonfinite == 1, "prediction", "predictions")), sep = "")
  }
  if (nrow(x$failures)) {
    cat(sprintf("%d candidate-fold %s failed:\n", nrow(x$failures),
                pwb_plural(nrow(x$failures), "fit")))
    f <- utils::head(x$failures, 5L)
    cat(sprintf("  %s, repeat %d, fold %d: %s\n", f$candidate, f$repeat_no, f$fold, f$message),
        sep = "")
    if (nrow(x$failures) > 5L) cat("  ... see $failures\n")
  }
  cat("Transforms change what a model estimates; let the ranking inform, not replace, judgement.\n")
  invisible(x)
}

#' @export
plot.pwb_comparison <- function(x, score = c("rmse_median", "mae_median", "r2_median",
                                             "rmse_mean", "coverage", "width"), ...) {
  score <- match.arg(score)
  if (is.null(x$folds) || nrow(x$folds) == 0L) stop("no fold was scored", call. = FALSE)
  cands <- x$summary$candidate
  f <- x$folds
  if (!any(is.finite(f[[score]]))) stop(sprintf("no fold has a finite %s", score), call. = FALSE)
  pos <- match(f$candidate, cands)
  graphics::plot(pos, f[[score]], xaxt = "n", xlim = c(0.5, length(cands) + 0.5),
                 xlab = "candidate", ylab = score, pch = 1, col = "grey40",
                 main = sprintf("held-out %s per fold (original units)", score), ...)
  graphics::axis(1, at = seq_along(cands), labels = cands)
  by_cand <- factor(f$candidate, levels = cands)
  m <- tapply(f[[score]], by_cand, mean)
  graphics::points(seq_along(cands), m, pch = 19, cex = 1.5, col = "red")
  # Folds without a score (see print()) are said, not left as an unexplained gap.
  n_na <- tapply(is.na(f[[score]]), by_cand, sum)
  n_all <- tapply(f[[score]], by_cand, length)
  for (i in which(!is.na(n_na) & n_na > 0)) {
    if (n_na[i] == n_all[i]) {
      graphics::text(i, mean(graphics::par("usr")[3:4]), "no fold scored", srt = 90, col = "grey40")
    } else {
      graphics::mtext(sprintf("%d of %d folds unscored", n_na[i], n_all[i]), side = 1, line = 2,
                      at = i, cex = 0.7, col = "grey40")
    }
  }
  if (score == "coverage") graphics::abline(h = x$level, lty = 2)
  invisible(x)
}
