#' Screen variables for skewness and suggest transforms
#'
#' For every numeric variable of `data`, `screen_skew()` reports the sample skewness and excess
#' kurtosis with their standard errors and z values, the Shapiro-Wilk test, and two candidate
#' transforms with the skewness and Shapiro-Wilk test after each:
#' \itemize{
#'   \item the \strong{ladder of powers}, a rule of thumb from applied multivariate statistics
#'     texts (e.g. Tabachnick and Fidell, Using Multivariate Statistics, chapter on screening
#'     data). A variable counts as skewed when \eqn{|z| > 3.29} (the conservative p < .001 cut
#'     those texts give for small and medium samples) if it has fewer than 300 values, and when
#'     \eqn{|G_1| > 0.5} from 300 values on, because z grows with n (the switch at 300 and the
#'     0.5 cut are common practice; at n = 300 the z cut equals \eqn{|G_1| = 0.46}). The step
#'     follows the size of the skewness (common practice): \eqn{|G_1| \le 1} square root,
#'     \eqn{\le 2} log10, above 2 reciprocal. Negative skew is first reflected about
#'     `max + 1`; otherwise a minimum at or below 0 is shifted to 1.
#'   \item the \strong{maximum-likelihood} power: Box-Cox when every value is positive, else
#'     Yeo-Johnson, with \eqn{\hat\lambda} and its profile-likelihood interval (see
#'     [estimate_lambda()]); the statistics after it use the convenient \eqn{\lambda}.
#' }
#' Both transforms are returned as `pwb_transform` objects that store their constants (the
#' reflection pivot, the shift, \eqn{\lambda}), so [apply_transform()] gives new data exactly
#' the same map.
#'
#' Missing values of a column are left out of that column's statistics and counted in
#' `n_missing`. Non-numeric columns are skipped and listed. A column with fewer than 3
#' non-missing values, a constant column, or one with infinite values gets a row that says so
#' in `note` instead of stopping the whole screen.
#'
#' Cautions: a transform changes what a model estimates (a slope on the log scale is a
#' multiplicative effect on the median); back-transformed means need a correction; normality of
#' a predictor is not an assumption of linear regression (only of its errors), so screen
#' predictors for the sake of linearity and influence, not normality; and these rules inform,
#' but do not replace, the standards of your field and your professional judgement. The
#' Shapiro-Wilk test is computed for 3 to 5000 values only (Royston's algorithm); with many
#' values tiny departures become significant.
#'
#' @param data a data frame (or a matrix, or a single numeric vector).
#' @param vars `NULL` (every column) or a character vector of column names to screen.
#' @param level confidence level of the interval for \eqn{\lambda}.
#' @return An object of class `pwb_screen`: a list with `table` (a data frame, one row per
#'   numeric variable: `variable`, `n`, `n_missing`, `skewness`, `skewness_se`, `skewness_z`,
#'   `kurtosis`, `kurtosis_se`, `kurtosis_z`, `sw_w`, `sw_p`, `ladder` (the step),
#'   `ladder_skewness`, `ladder_sw_w`, `ladder_sw_p`, `ml_family`, `ml_lambda`, `ml_conf_low`,
#'   `ml_conf_high`, `ml_convenient`, `ml_at_bound`, `ml_converged`, `ml_low_open` and
#'   `ml_high_open` (the interval runs past the search range on that side, so the endpoint is the
#'   range edge), `ml_skewness`, `ml_sw_w`, `ml_sw_p`, `note`), `ladder` and `ml` (named lists
#'   of `pwb_transform`, `NULL` where there is none), `skipped` (names of non-numeric columns), `level` and `rule` (the ladder's
#'   thresholds).
#' @seealso [estimate_lambda()], [new_transform()], [apply_transform()]
#' @examples
#' river <- river_data()
#' s <- screen_skew(river)
#' s
#' summary(s)
#' # the ladder's transform of forest cover (reflected), reused on new data
#' s$ladder$forest_pct
#' apply_transform(s$ladder$forest_pct, river_data("new")$forest_pct[1:5])
#' @export
screen_skew <- function(data, vars = NULL, level = 0.95) {
  if (is.numeric(data) && is.null(dim(data))) {
    # a vector is labelled by the expression that gave it, as estimate_lambda() does
    nm <- deparse1(substitute(data))
    data <- data.frame(data)
    names(data) <- nm
  }
  if (is.matrix(data)) data <- as.data.frame(data)
  if (!is.data.frame(data))
    stop("`data` must be a data frame, a matrix or a numeric vector", call. = FALSE)
  pwb_check_level(level)
  if (is.null(vars)) {
    vars <- names(data)
  } else {
    if (!is.character(vars) || anyNA(vars))
      stop("`vars` must be NULL or a character vector of column names", call. = FALSE)
    unknown <- setdiff(vars, names(data))
    if (length(unknown) > 0L)
      stop(sprintf("`vars` names %s not in `data`: %s", pwb_plural(length(unknown), "a column",
                   "columns"), paste(unknown, collapse = ", ")), call. = FALSE)
  }
  numeric <- vapply(vars, function(v) is.numeric(data[[v]]), logical(1))
  skipped <- vars[!numeric]
  vars <- vars[numeric]
  rows <- vector("list", length(vars))
  ladder <- ml <- stats::setNames(vector("list", length(vars)), vars)
  for (i in seq_along(vars)) {
    one <- pwb_screen_one(data[[vars[i]]], vars[i], level)
    rows[[i]] <- one$row
    if (!is.null(one$ladder)) ladder[[vars[i]]] <- one$ladder
    if (!is.null(one$ml)) ml[[vars[i]]] <- one$ml
  }
  table <- if (length(rows)) do.call(rbind, rows) else pwb_screen_row("", 0L, 0L, NULL)[0, ]
  rownames(table) <- NULL
  structure(list(table = table, ladder = ladder, ml = ml, skipped = skipped, level = level,
                 rule = pwb_ladder_rule()),
            class = "pwb_screen")
}

# The ladder's thresholds (documented in screen_skew()), as the library holds them.
pwb_ladder_rule <- function() rpwb_ladder_rule()

# One variable: the table row and its two transforms (NULL when absent).
pwb_screen_one <- function(x, name, level) {
  miss <- is.na(x)
  inf <- which(is.infinite(x))
  if (length(inf) > 0L) {
    note <- sprintf("%d infinite %s at %s %s: remove or replace them, then screen again",
                    length(inf), pwb_plural(length(inf), "value"),
                    pwb_plural(length(inf), "row"), pwb_format_rows(inf))
    return(list(row = pwb_screen_row(name, sum(!miss), sum(miss), NULL, note)))
  }
  res <- rpwb_screen_variable(as.double(x[!miss]), level, -3, 3)
  lad <- if (!is.null(res$ladder$spec)) structure(res$ladder$spec, class = "pwb_transform")
  mlt <- if (!is.null(res$ml$spec)) structure(res$ml$spec, class = "pwb_transform")
  list(row = pwb_screen_row(name, sum(!miss), sum(miss), res, res$note), ladder = lad, ml = mlt)
}

pwb_screen_row <- function(name, n, n_missing, res, note = "") {
  num <- function(v) if (is.null(v)) NA_real_ else as.double(v)
  m <- if (is.null(res)) list() else res$moments
  sw <- if (is.null(res)) list() else res$sw
  ml <- if (is.null(res)) list(done = FALSE) else res$ml
  lad <- if (is.null(res)) list() else res$ladder
  data.frame(
    variable = name, n = as.integer(n), n_missing = as.integer(n_missing),
    skewness = num(m$skewness), skewness_se = num(m$skewness_se), skewness_z = num(m$skewness_z),
    kurtosis = num(m$kurtosis), kurtosis_se = num(m$kurtosis_se), kurtosis_z = num(m$kurtosis_z),
    sw_w = num(sw$w), sw_p = num(sw$p),
    ladder = if (is.null(lad$step) || !nzchar(lad$step)) NA_character_ else lad$step,
    ladder_skewness = num(lad$skewness), ladder_sw_w = num(sw$ladder_w),
    ladder_sw_p = num(sw$ladder_p),
    ml_family = if (isTRUE(ml$done)) ml$spec$family else NA_character_,
    ml_lambda = num(ml$lambda), ml_conf_low = num(ml$conf_low), ml_conf_high = num(ml$conf_high),
    ml_convenient = num(ml$convenient),
    ml_at_bound = if (isTRUE(ml$done)) ml$at_bound else NA,
    ml_converged = if (isTRUE(ml$done)) ml$converged else NA,
    ml_low_open = if (isTRUE(ml$done)) ml$low_open else NA,
    ml_high_open = if (isTRUE(ml$done)) ml$high_open else NA,
    ml_skewness = num(ml$skewness), ml_sw_w = num(sw$ml_w), ml_sw_p = num(sw$ml_p),
    note = pwb_screen_note(note, sw), stringsAsFactors = FALSE)
}

# The row's note: the screen's own, plus why Shapiro-Wilk was skipped (once).
pwb_screen_note <- function(note, sw) {
  parts <- c(note, sw$note, sw$ladder_note, sw$ml_note)
  parts <- unique(parts[!is.null(parts) & nzchar(parts)])
  if (length(parts)) paste(parts, collapse = "; ") else ""
}
