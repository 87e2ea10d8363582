# Methods of pwb_screen: print (a compact table), summary (every figure per variable) and
# as.data.frame.

#' @export
print.pwb_screen <- function(x, digits = 3, ...) {
  t <- x$table
  cat("<pwb_screen> skewness screen of", nrow(t), pwb_plural(nrow(t), "variable"), "\n")
  if (nrow(t) > 0L) {
    f <- function(v) ifelse(is.na(v), "-", formatC(v, digits = digits, format = "g"))
    p <- function(v) ifelse(is.na(v), "-", format.pval(v, digits = 2, eps = 1e-4))
    lad <- vapply(t$variable, function(v) pwb_screen_tr_text(x$ladder[[v]]), character(1))
    mlt <- ifelse(is.na(t$ml_lambda), "-",
                  sprintf("%s %s [%s, %s] -> %s", ifelse(t$ml_family == "box-cox", "BC", "YJ"),
                          f(t$ml_lambda), f(t$ml_conf_low), f(t$ml_conf_high), f(t$ml_convenient)))
    out <- data.frame(
      variable = t$variable,
      n = ifelse(t$n_missing > 0L, sprintf("%d (%d NA)", t$n, t$n_missing), as.character(t$n)),
      G1 = f(t$skewness), z = f(t$skewness_z), SW_p = p(t$sw_p),
      ladder = lad, `G1 after` = f(t$ladder_skewness), `SW_p after` = p(t$ladder_sw_p),
      `ML lambda [CI] -> used` = mlt, `G1 after ML` = f(t$ml_skewness),
      `SW_p after ML` = p(t$ml_sw_p), check.names = FALSE, stringsAsFactors = FALSE)
    print(out, row.names = FALSE, right = FALSE)
  }
  notes <- t$note[nzchar(t$note)]
  if (length(notes)) {
    cat("Notes:\n")
    cat(paste0("  ", t$variable[nzchar(t$note)], ": ", notes, "\n"), sep = "")
  }
  if (length(x$skipped))
    cat("Skipped (not numeric):", paste(x$skipped, collapse = ", "), "\n")
  r <- x$rule
  cat(sprintf(paste0("Ladder: skewed when |z| > %g (n < %d) or |G1| > %g (n >= %d); sqrt for ",
                     "|G1| <= %g, log10 <= %g, reciprocal above; left skew reflected first.\n"),
              r$z_cut, r$large_n, r$size_cut, r$large_n, r$log10_cut, r$reciprocal_cut))
  cat(sprintf("ML: Box-Cox (BC) or Yeo-Johnson (YJ) lambda with %g%% interval, then the convenient value.\n",
              100 * x$level))
  cat("A transform changes what a model estimates; back-transformed means need a correction.\n")
  invisible(x)
}

#' @export
summary.pwb_screen <- function(object, ...) {
  structure(list(table = object$table, ladder = object$ladder, ml = object$ml,
                 skipped = object$skipped, level = object$level), class = "summary.pwb_screen")
}

#' @export
print.summary.pwb_screen <- function(x, digits = 4, ...) {
  t <- x$table
  g <- function(v) if (is.na(v)) "NA" else formatC(v, digits = digits, format = "g")
  for (i in seq_len(nrow(t))) {
    r <- t[i, ]
    cat(sprintf("== %s: n = %d", r$variable, r$n))
    if (r$n_missing > 0L) cat(sprintf(" (%d missing values left out)", r$n_missing))
    cat("\n")
    cat(sprintf("  skewness G1 = %s (SE %s, z = %s); excess kurtosis G2 = %s (SE %s, z = %s)\n",
                g(r$skewness), g(r$skewness_se), g(r$skewness_z), g(r$kurtosis),
                g(r$kurtosis_se), g(r$kurtosis_z)))
    cat(sprintf("  Shapiro-Wilk W = %s, p = %s\n", g(r$sw_w), g(r$sw_p)))
    if (!is.null(x$ladder[[r$variable]]))
      cat(sprintf("  ladder: %s -> G1 = %s, W = %s, p = %s\n",
                  pwb_screen_tr_text(x$ladder[[r$variable]]), g(r$ladder_skewness),
                  g(r$ladder_sw_w), g(r$ladder_sw_p)))
    if (!is.na(r$ml_lambda)) {
      flags <- c(if (isTRUE(r$ml_at_bound)) "at the search bound",
                 if (isFALSE(r$ml_converged)) "not converged")
      cat(sprintf("  ML %s: lambda = %s, %g%% CI [%s, %s]%s; using %s -> G1 = %s, W = %s, p = %s\n",
                  r$ml_family, g(r$ml_lambda), 100 * x$level, g(r$ml_conf_low), g(r$ml_conf_high),
                  if (length(flags)) paste0(" (", paste(flags, collapse = ", "), ")") else "",
                  g(r$ml_convenient), g(r$ml_skewness), g(r$ml_sw_w), g(r$ml_sw_p)))
    }
    if (nzchar(r$note)) cat("  note:", r$note, "\n")
  }
  if (length(x$skipped)) cat("Skipped (not numeric):", paste(x$skipped, collapse = ", "), "\n")
  invisible(x)
}

#' @export
as.data.frame.pwb_screen <- function(x, ...) x$table

pwb_screen_tr_text <- function(tr) {
  if (is.null(tr)) return("-")
  if (identical(tr$family, "identity")) return("none")
  format(tr)
}
