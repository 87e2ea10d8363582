# Methods of pwb_screen: print (a compact table), summary (every figure per variable) and
# as.data.frame.

#' @export
print.pwb_screen <- function(x, digits = 3, ...) {
  t <- x$table
  cat("<pwb_screen> skewness screen of", nrow(t), pwb_plural(nrow(t), "variable"), "\n")
  if (nrow(t) > 0L) {
    f <- function(v) pwb_screen_num(v, digits)
    p <- function(v) ifelse(is.na(v), "-", format.pval(v, digits = 2, eps = 1e-4))
    lad <- vapply(t$variable, function(v) pwb_screen_tr_short(x$ladder[[v]], digits),
                  character(1))
    ml <- vapply(t$variable, function(v) pwb_screen_tr_short(x$ml[[v]], digits), character(1))
    bound <- !is.na(t$ml_at_bound) & t$ml_at_bound
    open <- (!is.na(t$ml_low_open) & t$ml_low_open) | (!is.na(t$ml_high_open) & t$ml_high_open)
    hat <- ifelse(is.na(t$ml_lambda), "-",
                  sprintf("%s [%s, %s]%s%s", f(t$ml_lambda), f(t$ml_conf_low), f(t$ml_conf_high),
                          ifelse(bound, "*", ""), ifelse(open, "^", "")))
    out <- data.frame(
      variable = t$variable,
      n = ifelse(t$n_missing > 0L, sprintf("%d (%d NA)", t$n, t$n_missing), as.character(t$n)),
      G1 = f(t$skewness), z = f(t$skewness_z), `SW p` = p(t$sw_p),
      ladder = lad, `G1 ` = f(t$ladder_skewness), `SW p ` = p(t$ladder_sw_p),
      ML = ml, `lambda-hat [CI]` = hat, `G1  ` = f(t$ml_skewness), `SW p  ` = p(t$ml_sw_p),
      check.names = FALSE, stringsAsFactors = FALSE)
    print(out, row.names = FALSE, right = FALSE)
    if (any(bound)) cat("* lambda-hat at the edge of the search range (-3, 3)\n")
    if (any(open)) cat("^ the interval runs past the search range: that endpoint is the range edge\n")
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
                     "|G1| <= %g, log10 <= %g, reciprocal (-1/v) above; left skew reflected ",
                     "first.\n"),
              r$z_cut, r$large_n, r$size_cut, r$large_n, r$log10_cut, r$reciprocal_cut))
  cat(sprintf(paste0("ML: Box-Cox (BC) or Yeo-Johnson (YJ) at the convenient lambda; lambda-hat ",
                     "with its %g%% interval. G1 and SW p after each transform follow it.\n"),
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
  g <- function(v) if (is.na(v)) "NA" else format(signif(v, digits))
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
                 if (isTRUE(r$ml_low_open) || isTRUE(r$ml_high_open))
                   "interval open at the range edge",
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

pwb_screen_num <- function(v, digits) {
  ifelse(is.na(v), "-", vapply(v, function(a) format(signif(a, digits)), character(1)))
}

# "log10(x + 1)", "sqrt(101 - x)", "BC 0.5", "YJ -1(x)": the transform in a few characters.
pwb_screen_tr_short <- function(tr, digits = 3) {
  if (is.null(tr)) return("-")
  if (identical(tr$family, "identity")) return("none")
  arg <- if (isTRUE(tr$reflect)) paste(format(signif(tr$pivot, digits + 2)), "- x") else "x"
  if (tr$shift != 0)
    arg <- sprintf("%s %s %s", arg, if (tr$shift > 0) "+" else "-",
                   format(signif(abs(tr$shift), digits + 2)))
  fam <- switch(tr$family, "box-cox" = "BC", "yeo-johnson" = "YJ", tr$family)
  if (!is.na(tr$lambda)) fam <- paste(fam, format(signif(tr$lambda, digits)))
  if (arg == "x" && !is.na(tr$lambda)) fam else sprintf("%s(%s)", fam, arg)
}

pwb_screen_tr_text <- function(tr) {
  if (is.null(tr)) return("-")
  if (identical(tr$family, "identity")) return("none")
  format(tr)
}
