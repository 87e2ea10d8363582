#' Residual checks of a linear model
#'
#' Four checks of the residuals, on the scale where the model's errors live (the transformed
#' scale for a `pwb_model`):
#' \itemize{
#'   \item Shapiro-Wilk W and its p-value (normality; approximate, since residuals of a fit are
#'     not independent);
#'   \item Koenker's studentized Breusch-Pagan statistic: n times the R-squared of the squared
#'     residuals regressed on the model's regressors, chi-square with as many degrees of freedom
#'     as regressors besides the intercept (constant variance);
#'   \item Ramsey's RESET: the F test of adding the squared and cubed fitted values (a missing
#'     curve or interaction);
#'   \item the sample skewness of the residuals.
#' }
#' A small p-value is evidence against the assumption; a large one is not proof of it, and with
#' many rows tiny departures become significant. These checks inform, but do not replace,
#' looking at the residual plots ([plot.pwb_model()]) and judgement about the subject matter.
#'
#' With `compare = TRUE` and a `pwb_model`, the same checks are made for its untransformed twin
#' (the same formula fitted by `lm()` to the raw variables) and a before/after table is added.
#'
#' @param object a `pwb_model` from [lm_transformed()] or an unweighted `lm` fit.
#' @param compare logical: also check the untransformed twin of a `pwb_model`.
#' @return An object of class `pwb_checks`: a list with `n`, `shapiro_wilk` (`statistic`,
#'   `p_value`, `computed`, `note`), `breusch_pagan` (`statistic`, `df`, `p_value`), `reset`
#'   (`statistic`, `df1`, `df2`, `p_value`), `skewness`, `table` (one row per check) and, with
#'   `compare = TRUE`, `untransformed` (the twin's `pwb_checks`) and `comparison` (a data frame
#'   with the statistics and p-values before and after).
#' @examples
#' river <- river_data()
#' m <- lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + forest_pct + season, river,
#'                     response = new_transform("log"),
#'                     predictors = list(flow_m3s = new_transform("log")))
#' residual_checks(m, compare = TRUE)
#' residual_checks(lm(sediment_t_day ~ flow_m3s + season, river))
#' @export
residual_checks <- function(object, compare = FALSE) {
  if (!is.logical(compare) || length(compare) != 1L || is.na(compare))
    stop("`compare` must be TRUE or FALSE", call. = FALSE)
  if (inherits(object, "pwb_model")) {
    design <- pwb_design_parts(stats::model.matrix(object$lm))
    out <- pwb_checks_from(rpwb_model_checks(object$y, design$X, design$intercept,
                                             pwb_spec_or_null(object$response)))
    if (compare) {
      twin <- pwb_untransformed_twin(object)
      before <- residual_checks(twin)
      out$untransformed <- before
      out$comparison <- data.frame(check = out$table$check,
                                   untransformed = before$table$statistic,
                                   untransformed_p = before$table$p_value,
                                   transformed = out$table$statistic,
                                   transformed_p = out$table$p_value)
    }
    return(out)
  }
  if (inherits(object, "lm") && !inherits(object, "glm")) {
    if (compare) stop("`compare = TRUE` needs a pwb_model (a plain lm has no twin)", call. = FALSE)
    if (!is.null(object$weights))
      stop("weighted lm fits are not supported: refit without weights", call. = FALSE)
    mf <- stats::model.frame(object)
    y <- stats::model.response(mf)
    if (!is.numeric(y) || NCOL(y) != 1L)
      stop("the lm's response must be one numeric column", call. = FALSE)
    design <- pwb_design_parts(stats::model.matrix(object))
    return(pwb_checks_from(rpwb_model_checks(as.double(y), design$X, design$intercept, NULL)))
  }
  stop("`object` must be a pwb_model (lm_transformed()) or an lm fit", call. = FALSE)
}

# The same formula fitted by lm() to the raw variables, with the same missing-value handling.
pwb_untransformed_twin <- function(object) {
  stats::lm(object$formula, data = object$data, na.action = object$na.action)
}

pwb_checks_from <- function(r) {
  tab <- data.frame(
    check = c("Shapiro-Wilk W", "Breusch-Pagan (Koenker)", "RESET F", "residual skewness"),
    statistic = c(r$sw_statistic, r$bp_statistic, r$reset_f, r$skewness),
    df = c(NA_character_, pwb_fmt_df(r$bp_df), pwb_fmt_df(c(r$reset_df1, r$reset_df2)),
           NA_character_),
    p_value = c(r$sw_p, r$bp_p, r$reset_p, NA_real_))
  structure(list(n = r$n,
                 shapiro_wilk = list(statistic = r$sw_statistic, p_value = r$sw_p,
                                     computed = r$sw_computed, note = r$sw_note),
                 breusch_pagan = list(statistic = r$bp_statistic, df = r$bp_df,
                                      p_value = r$bp_p),
                 reset = list(statistic = r$reset_f, df1 = r$reset_df1, df2 = r$reset_df2,
                              p_value = r$reset_p),
                 skewness = r$skewness, table = tab),
            class = "pwb_checks")
}

pwb_fmt_df <- function(df) if (anyNA(df)) NA_character_ else paste(format(df), collapse = ", ")
