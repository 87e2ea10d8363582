# Methods of pwb_screen: print (a compact table), summary (every figure per variable) and
# as.data.frame.

#' Print, summarise and convert a skewness screen
#'
#' `print()` shows one line per variable: its skewness G1 and z, the Shapiro-Wilk p-value, and
#' the same after the ladder step and after the maximum-likelihood power. A table wider than
#' `getOption("width")` is split into blocks that each repeat the variable column; notes and
#' footers are wrapped. `summary()` gives every figure per variable; `as.data.frame()` returns
#' the table.
#'
#' @param x,object a `pwb_screen` from [screen_skew()] (or its summary, for printing).
#' @param digits significant digits.
#' @param ... unused.
#' @return `print()`: `x`, invisibly; `summary()`: an object of class `summary.pwb_screen`;
#'   `as.data.frame()`: the screen's table.
#' @examples
#' s <- screen_skew(airquality[c("Ozone", "Wind")])
#' print(s)
#' summary(s)
#' head(as.data.frame(s), 2)
#' @export
print.pwb_screen <- function(x, digits = 3, ...) {
  t <- x$table
  cat("<pwb_screen> skewness screen of", nrow(t), pwb_plural(nrow(t), "variable"), "\n")
  if (nrow(t) > 0L) {
    f <- function(v) pwb_format_num(v, digits, na = "-")
    p <- function(v) pwb_format_pval(v, na = "-")
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
      G1 = f(t$skewness), z = f(t$skewness_z), SW_p = p(t$sw_p),
      ladder = lad, ladder_G1 = f(t$ladder_skewness), ladder_SW_p = p(t$ladder_sw_p),
      ML = ml, `lambda-hat [CI]` = hat, ML_G1 = f(t$ml_skewness), ML_SW_p = p(t$ml_sw_p),
      check.names = FALSE, stringsAsFactors = FALSE)
    pwb_print_table(out, key = "variable",
                    right = c("n", "G1", "z", "SW_p", "ladder_G1", "ladder_SW_p", "ML_G1",
                              "ML_SW_p"))
    if (any(bound)) pwb_cat_wrap("* lambda-hat at the edge of the search range (-3, 3)")
    if (any(open))
      pwb_cat_wrap("^ the interval runs past the search range: that endpoint is the range edge")
  }
  notes <- t$note[nzchar(t$note)]
  if (length(notes)) {
    cat("Notes:\n")
    pwb_cat_wrap(paste0(t$variable[nzchar(t$note)], ": ", notes), indent = 2L, exdent = 4L)
  }
  if (length(x$skipped))
    pwb_cat_wrap("Skipped (not numeric): ", paste(x$skipped, collapse = ", "))
  r <- x$rule
  pwb_cat_wrap(sprintf(paste0("Ladder: skewed when |z| > %g (n < %d) or |G1| > %g (n >= %d); ",
                              "sqrt for |G1| <= %g, log10 <= %g, reciprocal (-1/v) above; left ",
                              "skew reflected first."),
                       r$z_cut, r$large_n, r$size_cut, r$large_n, r$log10_cut, r$reciprocal_cut))
  pwb_cat_wrap(sprintf(paste0("ML: Box-Cox (BC) or Yeo-Johnson (YJ) at the convenient lambda; ",
                              "lambda-hat with its %g%% interval. ladder_* and ML_* columns ",
                              "describe the variable after each transform."), 100 * x$level))
  pwb_cat_wrap("A transform changes what a model estimates; back-transformed means need a ",
               "correction.")
  invisible(x)
}

#' @rdname print.pwb_screen
#' @export
summary.pwb_screen <- function(object, ...) {
  structure(list(table = object$table, ladder = object$ladder, ml = object$ml,
                 skipped = object$skipped, level = object$level), class = "summary.pwb_screen")
}

#' @rdname print.pwb_screen
#' @export
print.summary.pwb_screen <- function(x, digits = 4, ...) {
  t <- x$table
  g <- function(v) pwb_format_num(v, digits)
  gp <- function(v) pwb_format_pval(v, digits = 2L)
  for (i in seq_len(nrow(t))) {
    r <- t[i, ]
    cat(sprintf("== %s: n = %d", r$variable, r$n))
    if (r$n_missing > 0L) cat(sprintf(" (%d missing values left out)", r$n_missing))
    cat("\n")
    pwb_cat_wrap(sprintf("skewness G1 = %s (SE %s, z = %s); excess kurtosis G2 = %s (SE %s, z = %s)",
                         g(r$skewness), g(r$skewness_se), g(r$skewness_z), g(r$kurtosis),
                         g(r$kurtosis_se), g(r$kurtosis_z)), indent = 2L, exdent = 4L)
    pwb_cat_wrap(sprintf("Shapiro-Wilk W = %s, p = %s", g(r$sw_w), gp(r$sw_p)), indent = 2L,
                 exdent = 4L)
    if (!is.null(x$ladder[[r$variable]]))
      pwb_cat_wrap(sprintf("ladder: %s -> G1 = %s, W = %s, p = %s",
                           pwb_screen_tr_text(x$ladder[[r$variable]], r$variable),
                           g(r$ladder_skewness), g(r$ladder_sw_w), gp(r$ladder_sw_p)),
                   indent = 2L, exdent = 4L)
    if (!is.na(r$ml_lambda)) {
      flags <- c(if (isTRUE(r$ml_at_bound)) "at the search bound",
                 if (isTRUE(r$ml_low_open) || isTRUE(r$ml_high_open))
                   "interval open at the range edge",
                 if (isFALSE(r$ml_converged)) "not converged")
      pwb_cat_wrap(sprintf("ML %s: lambda = %s, %g%% CI [%s, %s]%s; using %s -> G1 = %s, W = %s, p = %s",
                           r$ml_family, g(r$ml_lambda), 100 * x$level, g(r$ml_conf_low),
                           g(r$ml_conf_high),
                           if (length(flags)) paste0(" (", paste(flags, collapse = ", "), ")")
                           else "",
                           g(r$ml_convenient), g(r$ml_skewness), g(r$ml_sw_w), gp(r$ml_sw_p)),
                   indent = 2L, exdent = 4L)
    }
    if (nzchar(r$note)) pwb_cat_wrap("note: ", r$note, indent = 2L, exdent = 4L)
  }
  if (length(x$skipped))
    pwb_cat_wrap("Skipped (not numeric): ", paste(x$skipped, collapse = ", "))
  invisible(x)
}

#' @rdname print.pwb_screen
#' @param row.names,optional unused (for the generic).
#' @export
as.data.frame.pwb_screen <- function(x, row.names = NULL, optional = FALSE, ...) x$table

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

pwb_screen_tr_text <- function(tr, name = "x") {
  if (is.null(tr)) return("-")
  if (identical(tr$family, "identity")) return("none")
  format(tr, name = name)
}
