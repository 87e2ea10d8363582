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
#' (the same formula fitted by `lm()` to the raw variables of the same rows, with the same
#' weights) and a before/after table is added.
#'
#' Weighted fits (a weighted `pwb_model` or an `lm` fitted with `weights =`) are checked through
#' their weighted regression, as R's own `lm` diagnostics use weighted residuals: the residuals
#' are \eqn{\sqrt{w_i} e_i}, the regressors of the Breusch-Pagan and RESET regressions are the
#' columns of \eqn{\sqrt{w}[1\ X]} (plus an intercept for Breusch-Pagan, so its df counts
#' \eqn{\sqrt{w}} as a regressor when the weights vary) and the fitted values are
#' \eqn{\sqrt{w_i}\hat z_i}; rows of zero weight are left out.
#'
#' A `pwb_model`'s checks are computed by its live core model (no refit); all four come from one
#' computation.
#'
#' @param object a `pwb_model` from [lm_transformed()], an `lm` fit (weighted or not), or a
#'   model formula, which is fitted by [stats::lm()] with `data`, `weights` and `subset` first.
#' @param compare logical: also check the untransformed twin of a `pwb_model`.
#' @param data,weights,subset for a formula: as in [stats::lm()] (`weights` and `subset` are
#'   evaluated in `data`). Not used with a fitted object, which carries its own.
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
residual_checks <- function(object, compare = FALSE, data = NULL, weights = NULL,
                            subset = NULL) {
  pwb_check_flag(compare, "compare")
  if (inherits(object, "formula")) {
    cl <- match.call()
    cl$compare <- NULL
    names(cl)[names(cl) == "object"] <- "formula"
    cl[[1L]] <- quote(stats::lm)
    return(residual_checks(eval(cl, parent.frame()), compare = compare))
  }
  if (!is.null(data) || !missing(weights) || !missing(subset))
    stop(paste0("`data`, `weights` and `subset` go with a formula; a fitted model carries its ",
                "own (refit it with them)"), call. = FALSE)
  if (inherits(object, "pwb_model")) {
    out <- pwb_checks_from(rpwb_model_checks(pwb_handle(object)))
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
  if (inherits(object, "lm") && !inherits(object, c("glm", "mlm"))) {
    if (compare) stop("`compare = TRUE` needs a pwb_model (a plain lm has no twin)", call. = FALSE)
    mf <- stats::model.frame(object)
    if (!is.null(stats::model.offset(mf)))
      stop("lm fits with an offset are not supported: move the offset into the response first",
           call. = FALSE)
    y <- stats::model.response(mf)
    if (!is.numeric(y) || NCOL(y) != 1L)
      stop("the lm's response must be one numeric column", call. = FALSE)
    mm <- stats::model.matrix(object)
    intercept <- ncol(mm) > 0L && colnames(mm)[1L] == "(Intercept)"
    X <- if (intercept) mm[, -1L, drop = FALSE] else mm
    storage.mode(X) <- "double"
    w <- stats::model.weights(mf)
    h <- rpwb_model_new(as.double(y), X, intercept, NULL, 0L,
                        if (is.null(w)) NULL else as.double(w))
    return(pwb_checks_from(rpwb_model_checks(h)))
  }
  stop("`object` must be a pwb_model (lm_transformed()) or an lm fit", call. = FALSE)
}

# The same formula fitted by lm() to the raw variables of the rows the model used, with its
# weights.
pwb_untransformed_twin <- function(object) {
  pwb_lm_on_frame(object$formula, object$frame)
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
