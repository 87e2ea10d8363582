# Assembling, printing and plotting a pwb_comparison.

pwb_cmp_assemble <- function(learners, formula, dat, yname, family, level, fold_rows,
                             lambda_rows, fail_rows, fold_ids, rows, seed, folds, repeats,
                             w = NULL) {
  mean_cols <- c("rmse_median", "mae_median", "r2_median", "rmse_mean", "mae_mean", "r2_mean",
                 "coverage", "unbounded")
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
    if (!is.null(f)) f <- f[!is.na(f$rmse_median), , drop = FALSE]
    scored <- if (is.null(f)) 0L else nrow(f)
    # each statistic over the scored folds where it is defined
    stat <- function(s, fun) {
      v <- if (scored) f[[s]] else numeric(0)
      v <- v[!is.na(v)]
      if (length(v)) fun(v) else NA_real_
    }
    means <- vapply(mean_cols, stat, numeric(1), fun = mean)
    sdv <- function(s) if (scored < 2L) NA_real_ else stats::sd(f[[s]])
    model <- tryCatch(learners[[cand]](dat, formula, yname, family, level, w),
                      error = function(e) conditionMessage(e))
    if (is.character(model)) {
      full[[cand]] <<- list(error = model)
      adj <- aic <- NA_real_
    } else if (inherits(model, "pwb_cmp_glm_fit")) {
      # a GLM has no transformed scale; its AIC (NA for a quasi family) is on y's own scale
      full[[cand]] <<- list(lambdas = pwb_cmp_lambdas(model, yname))
      adj <- NA_real_
      aic <- model$aic
    } else {
      # rows at the boundary of the response transform's domain make AIC Inf: said in print()
      full[[cand]] <<- list(lambdas = pwb_cmp_lambdas(model, yname),
                            boundary_rows = pwb_boundary_rows(model))
      adj <- pwb_cmp_adj_r2(model)
      aic <- stats::AIC(pwb_loglik(model))
    }
    n_fit <- if (is.null(fold_tab)) 0L else sum(fold_tab$candidate == cand)
    data.frame(candidate = cand, t(means), width_median = stat("width_median", stats::median),
               rmse_sd = sdv("rmse_median"), r2_sd = sdv("r2_median"),
               folds_scored = scored, folds_failed = sum(fail_tab$candidate == cand),
               folds_unscored = n_fit - scored, adj_r2_own_scale = adj, aic = aic,
               stringsAsFactors = FALSE)
  })
  summ <- do.call(rbind, summ)
  summ$ranked <- summ$folds_failed == 0L & summ$folds_unscored == 0L & summ$folds_scored > 0L
  summ <- summ[order(!summ$ranked, summ$rmse_median, na.last = TRUE), , drop = FALSE]
  summ$rank <- ifelse(summ$ranked, cumsum(summ$ranked), NA_integer_)
  summ <- summ[c("rank", "ranked", setdiff(names(summ), c("rank", "ranked")))]
  rownames(summ) <- NULL
  structure(list(summary = summ, folds = fold_tab, lambdas = lam_tab, full = full,
                 failures = fail_tab, fold_ids = fold_ids, rows = rows, seed = seed,
                 level = level, folds_k = folds, repeats = repeats, formula = formula,
                 yname = yname),
            class = "pwb_comparison")
}

#' Print and plot a comparison of transforms
#'
#' `print()` shows the ranked candidates (those with every fold scored, by held-out RMSE of the
#' median back-transform), then the unranked ones apart, then notes on unscored folds, failures
#' and factor levels missing from a training part, and for a candidate whose `aic` is `Inf`
#' because rows of the response lie at the boundary of its transform's domain (their
#' log-Jacobian is `-Inf`), which rows and what to do. Tables wider than `getOption("width")` are
#' split into blocks that each repeat the candidate column. `plot()` draws one held-out score
#' per fold for each candidate (open circles) and its mean over the scored folds (filled).
#'
#' @param x a `pwb_comparison` from [compare_transforms()].
#' @param digits significant digits of the scores.
#' @param score the held-out score to plot.
#' @param ... unused by `print()`; further graphical arguments for `plot()`.
#' @return `x`, invisibly.
#' @examples
#' cmp <- compare_transforms(mpg ~ wt + hp, mtcars, candidates = c("none", "ml"), folds = 4,
#'                           seed = 3, progress = FALSE)
#' print(cmp)
#' f <- file.path(tempdir(), "comparison.png")
#' grDevices::png(f)
#' plot(cmp, "coverage")
#' grDevices::dev.off()
#' unlink(f)
#' @export
print.pwb_comparison <- function(x, digits = 4, ...) {
  kind <- if (is.null(x$fold_kind)) "random" else x$fold_kind
  seed <- if (is.na(x$seed)) "" else sprintf(", seed %s", format(x$seed, scientific = FALSE))
  pwb_cat_wrap(sprintf("<pwb_comparison> %s: %d-fold cross-validation (%s folds) x %d%s, n = %d",
                       deparse1(x$formula), x$folds_k, kind, x$repeats, seed, length(x$rows)))
  s <- x$summary
  g <- function(v) pwb_format_num(v, digits)
  tab <- data.frame(rank = ifelse(is.na(s$rank), "-", as.character(s$rank)),
                    candidate = s$candidate, rmse = g(s$rmse_median), mae = g(s$mae_median),
                    r2 = g(s$r2_median), rmse_mean = g(s$rmse_mean), coverage = g(s$coverage),
                    width_median = g(s$width_median), unbounded = g(s$unbounded),
                    aic = g(s$aic), adj_r2_own = g(s$adj_r2_own_scale),
                    folds = sprintf("%d/%d", s$folds_scored,
                                    s$folds_scored + s$folds_failed + s$folds_unscored),
                    stringsAsFactors = FALSE)
  num <- setdiff(names(tab), "candidate")
  if (any(s$ranked))
    pwb_print_table(tab[s$ranked, , drop = FALSE], key = c("rank", "candidate"), right = num)
  if (any(!s$ranked)) {
    pwb_cat_wrap("Unranked (a fold failed or could not be scored, so its mean is not ",
                 "comparable):")
    pwb_print_table(tab[!s$ranked, names(tab) != "rank", drop = FALSE], key = "candidate",
                    right = num)
  }
  for (line in pwb_cmp_kind_lines(x$kinds)) pwb_cat_wrap(line)
  if (!is.null(x$weights))
    pwb_cat_wrap("Fits and held-out scores are weighted by `weights` (precision weights).")
  pwb_cat_wrap(sprintf(paste0("Held-out scores in original units (median back-transform; ",
                              "rmse_mean uses the smearing mean), %g%% prediction intervals ",
                              "(width_median: median width; unbounded: share of intervals ",
                              "with an infinite end, which still cover). aic is comparable ",
                              "across candidates; adj_r2_own is on each candidate's own scale ",
                              "and is NOT."), 100 * x$level))
  for (cand in names(x$full)) {
    note <- pwb_boundary_note(x$full[[cand]]$boundary_rows, x$yname)
    if (!is.null(note)) pwb_cat_wrap(cand, ": aic is Inf. ", note)
  }
  if (!is.null(x$folds) && nrow(x$folds)) {
    nonfinite <- tapply(x$folds$n_nonfinite, x$folds$candidate, sum)
    nonfinite <- nonfinite[nonfinite > 0]
    for (nm in names(nonfinite))
      pwb_cat_wrap(sprintf(paste0("%s: %d held-out %s no finite prediction (outside the ",
                                  "transform's domain or range), so the folds holding them ",
                                  "are unscored; see $predictions."), nm,
                           as.integer(nonfinite[[nm]]),
                           if (nonfinite[[nm]] == 1) "row has" else "rows have"))
  }
  if (nrow(x$failures)) {
    cat(sprintf("%d candidate-fold %s failed:\n", nrow(x$failures),
                pwb_plural(nrow(x$failures), "fit")))
    f <- utils::head(x$failures, 5L)
    pwb_cat_wrap(sprintf("%s, repeat %d, fold %d: %s", f$candidate, f$repeat_no, f$fold,
                         f$message), indent = 2L, exdent = 4L)
    if (nrow(x$failures) > 5L) cat("  ... see $failures\n")
  }
  if (length(x$fold_notes)) {
    cat("Folds:\n")
    pwb_cat_wrap(utils::head(x$fold_notes, 5L), indent = 2L, exdent = 4L)
    if (length(x$fold_notes) > 5L) cat("  ... see $fold_notes\n")
  }
  pwb_cat_wrap("Transforms change what a model estimates; let the ranking inform, not replace, ",
               "judgement.")
  invisible(x)
}

#' @rdname print.pwb_comparison
#' @export
plot.pwb_comparison <- function(x, score = c("rmse_median", "mae_median", "r2_median",
                                             "rmse_mean", "coverage", "width_median",
                                             "unbounded"), ...) {
  score <- pwb_match_choice(score, "score")
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
  m <- tapply(f[[score]], by_cand, function(v) mean(v[is.finite(v)]))
  graphics::points(seq_along(cands), m, pch = 19, cex = 1.5, col = "red")
  # Folds without a score (see print()) are said, not left as an unexplained gap.
  n_na <- tapply(!is.finite(f[[score]]), by_cand, sum)
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

# The adjusted R^2 of a fitted pwb_model on its own transformed scale, from the model's own
# numbers (its weighted residual sum of squares, fitted values and residual df), as
# summary.lm() defines it: R^2 = MSS / (MSS + RSS), MSS about the weighted mean of the fitted
# values when the model has an intercept (about 0 without), rows of weight 0 not counted.
pwb_cmp_adj_r2 <- function(model) {
  fit <- model$fitted
  w <- model$weights
  if (is.null(w)) w <- rep(1, length(fit))
  if (length(w) != length(fit)) return(summary(model$lm)$adj.r.squared)
  keep <- w != 0
  fit <- fit[keep]
  w <- w[keep]
  intercept <- attr(model$terms, "intercept") == 1L
  mss <- if (intercept) sum(w * (fit - sum(w * fit) / sum(w))^2) else sum(w * fit^2)
  rss <- model$rss
  rdf <- model$df_residual
  r2 <- mss / (mss + rss)
  1 - (1 - r2) * ((length(fit) - intercept) / rdf)
}

# One data frame from pieces that are named lists of equally long atomic columns (the same
# names in each): the columns concatenated once, without rbind's per-piece row-name work (which
# costs more than the fits for a million held-out rows). NULL for no pieces.
pwb_cmp_bind_columns <- function(pieces) {
  if (!length(pieces)) return(NULL)
  cols <- names(pieces[[1L]])
  # c() joins character vectors several times faster than unlist() does
  out <- lapply(stats::setNames(cols, cols), function(nm) {
    v <- do.call(c, unname(lapply(pieces, .subset2, nm)))
    names(v) <- NULL
    v
  })
  structure(out, row.names = c(NA_integer_, -length(out[[1L]])), class = "data.frame")
}
