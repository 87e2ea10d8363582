#' Print residual checks
#'
#' Shows one line per check (statistic, degrees of freedom, p-value) and, for checks made with
#' `compare = TRUE`, the before/after table. Tables wider than `getOption("width")` are split
#' into blocks that each repeat the check's name. A check that could not be computed is printed
#' as `NA` with a note saying why.
#'
#' @param x a `pwb_checks` from [residual_checks()].
#' @param digits significant digits of the statistics.
#' @param ... unused.
#' @return `x`, invisibly.
#' @examples
#' residual_checks(lm(mpg ~ wt + hp, mtcars))
#' @export
print.pwb_checks <- function(x, digits = 4L, ...) {
  cat(sprintf("<pwb_checks> residual checks, n = %d\n", as.integer(x$n)))
  tab <- x$table
  out <- data.frame(check = tab$check, statistic = pwb_format_num(tab$statistic, digits),
                    df = ifelse(is.na(tab$df), "", tab$df),
                    p_value = pwb_format_pval(tab$p_value, na = ""), stringsAsFactors = FALSE)
  out$statistic[is.na(tab$statistic)] <- "NA"
  pwb_print_table(out, key = "check", right = c("statistic", "df", "p_value"))
  if (!isTRUE(x$shapiro_wilk$computed) && nzchar(x$shapiro_wilk$note))
    pwb_cat_wrap("Shapiro-Wilk: ", x$shapiro_wilk$note)
  pwb_checks_reset_note(x)
  if (!is.null(x$comparison)) {
    cat("\nBefore (untransformed) and after (transformed):\n")
    cmp <- x$comparison
    both <- data.frame(check = cmp$check,
                       untransformed = pwb_format_num(cmp$untransformed, digits),
                       untransformed_p = pwb_format_pval(cmp$untransformed_p, na = ""),
                       transformed = pwb_format_num(cmp$transformed, digits),
                       transformed_p = pwb_format_pval(cmp$transformed_p, na = ""),
                       stringsAsFactors = FALSE)
    pwb_print_table(both, key = "check", right = setdiff(names(both), "check"))
    if (!is.null(x$untransformed)) pwb_checks_reset_note(x$untransformed, "untransformed")
  }
  pwb_cat_wrap("Small p-values are evidence against an assumption; they inform, not replace, ",
               "judgement.")
  invisible(x)
}

# Why RESET is NA: the squared and cubed fitted values are already in the model's span (a model
# with a mean for every cell of its factors: the fitted values take one value per cell), or no
# residual degrees of freedom are left for the test.
pwb_checks_reset_note <- function(x, which = "") {
  r <- x$reset
  if (is.null(r) || !is.na(r$p_value)) return(invisible())
  lead <- if (nzchar(which)) sprintf("RESET (%s)", which) else "RESET"
  why <- if (!is.na(r$df2) && r$df2 <= 0)
           "no residual degrees of freedom are left for the added terms"
         else paste0("the squared and cubed fitted values add nothing the model does not ",
                     "already span (as when it fits a mean to every cell of its factors, so a ",
                     "missing curve cannot be detected this way)")
  pwb_cat_wrap(lead, " is NA: ", why, ".")
}
