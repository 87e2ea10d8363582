#' Predictions of a transformed linear model in original units
#'
#' The model's linear predictor is computed on the transformed scale and mapped back through
#' the inverse of the response transform.
#'
#' `center = "median"` gives the inverse of the transformed-scale fit: with symmetric errors on
#' that scale this is the median of the response, not its mean. `center = "mean"` estimates the
#' mean: `mean_method = "smearing"` averages the inverse over the fit plus each training
#' residual (Duan's 1983 smearing estimate, which assumes nothing about the error distribution);
#' `"normal"` assumes normal errors and integrates the inverse over them (exactly
#' `exp(mu + sigma^2 / 2)` for a log response; adaptive quadrature for other families).
#'
#' The normal-theory mean is defined for every family and power as the mean of the inverse
#' under the normal distribution truncated to the inverse's range (for Box-Cox with a power
#' other than 0, `1 + lambda * z > 0`): the normal mass beyond the limit is cut off, the rest
#' renormalised, and the mass cut off is returned per row in the column `cut_mass`. Where the
#' inverse grows without bound at its limit fast enough that the integral diverges (Box-Cox
#' and Yeo-Johnson with `-1 <= lambda < 0`, the reciprocal, Yeo-Johnson with
#' `2 < lambda <= 3`) the mean is `Inf` for every row, however little mass lies beyond: use the
#' smearing mean or the median there.
#'
#' Intervals are computed on the transformed scale with Student t quantiles and their endpoints
#' mapped back (swapped when the transform reflects). With `center = "median"` a confidence
#' interval covers the median of the response at those predictor values. A prediction interval
#' covers a new observation whatever `center` is (with `center = "mean"` only the `fit` column
#' changes to the mean estimate; the interval stays the one for a new observation, not for the
#' mean).
#'
#' **Intervals for the mean.** With `interval = "confidence", center = "mean"` the interval
#' covers the original-scale MEAN of the response at each new row (or, with `by`, the average of
#' those means over each group of rows, such as the mean load per station and season). A
#' back-transformed fit is a median, and the mean needs a correction (`mean_method`); its
#' interval comes from `mean_interval`:
#' * `"delta"`: a first-order (delta-method) standard error of the mean estimate that counts
#'   the error of the coefficients (including their effect on the residuals the smearing mean
#'   averages) and the sampling error of the residual average (smearing) or of
#'   \eqn{\hat\sigma^2} (normal theory, variance \eqn{2\sigma^4/df}); normal quantiles. For a
#'   log response on an intercept-only model the normal-theory interval is the "Cox method"
#'   interval for a lognormal mean (Zhou and Gao, 1997, Statistics in Medicine).
#' * `"bootstrap"`: `R` refits on residuals resampled with the given `seed` (the design and the
#'   transforms fixed), and the percentile interval of the recomputed means. Residuals rather
#'   than cases are resampled so that the design keeps its rank and factor levels; this assumes
#'   exchangeable errors, as the smearing mean does. The same seed gives the same interval on
#'   every platform; `seed = NULL` draws one from R's random stream (so `set.seed()` applies).
#'
#' The interval is formed on the log of the mean and exponentiated when the mean is positive,
#' which keeps both endpoints positive. Both methods treat the response and predictor
#' transforms as known: when a power was estimated from the same data, its uncertainty is not
#' included and the interval is too narrow by that much. A mean on the original scale is what a
#' load, a total or a budget needs; the median describes a typical value. These results inform,
#' and do not replace, the domain's standards and judgement.
#'
#' Where the inverse has a limited range (for example Box-Cox with a power other than 0 needs
#' `1 + lambda * z > 0`) a value beyond the limit is set to the limit in original units (such as
#' 0 or `Inf`) and the row is marked in the column `bounded`.
#' A row whose linear predictor overflows the floating-point range (finite predictor values
#' of extreme magnitude) comes back `NA` with a warning naming it.
#'
#' `se.fit = TRUE` adds the standard errors of the transformed-scale fit
#' (\eqn{\sigma\sqrt{x_0'(X'WX)^{-1}x_0}}, as [stats::predict.lm()] gives them) and returns a
#' list shaped like `predict.lm`'s: `fit` (the data frame above), `se.fit`, `df` and
#' `residual.scale`. A new row has weight 1 in a prediction interval (variance \eqn{\sigma^2}),
#' as `predict.lm`'s default.
#'
#' @param object a `pwb_model` from [lm_transformed()].
#' @param newdata a data frame with the raw predictor variables; when omitted, the rows used in
#'   fitting (padded with `NA` rows when the model was fitted with `na.exclude`). A data frame
#'   with no rows gives a result with no rows.
#' @param se.fit logical: also return the standard errors of the transformed-scale fit.
#' @param interval `"none"`, `"confidence"` or `"prediction"`.
#' @param level the interval's confidence level, strictly between 0 and 1.
#' @param type `"response"` (original units, the default) or `"transformed"` (the fit and
#'   interval on the transformed scale, as `predict.lm` on the transformed columns gives them).
#' @param center `"median"` or `"mean"` (see Details).
#' @param mean_method `"smearing"` or `"normal"`, used when `center = "mean"`.
#' @param invalid what to do with new predictor values outside a transform's domain:
#'   `"error"` (name the rows) or `"na"` (return those rows as `NA` with `invalid = TRUE`).
#' @param mean_interval how an interval for the mean is computed (`interval = "confidence",
#'   center = "mean"`): `"delta"` or `"bootstrap"` (see Details).
#' @param R the number of bootstrap replicates (a whole number, at least 10).
#' @param seed `NULL` or a whole number seeding the bootstrap.
#' @param by groups of rows whose mean is wanted (`interval = "confidence", center = "mean"`
#'   only): a character vector naming variables of `newdata`, or a factor (or a list of
#'   vectors) with one value per row. The result then has one row per group: the group
#'   columns, `fit`, `lwr`, `upr`, `n` (rows in the group) and `bounded`. A group with a row
#'   whose predictors are missing is `NA`.
#' @param scale the older name of `type`: `"original"` is `type = "response"`,
#'   `"transformed"` is `type = "transformed"`.
#' @param ... unused.
#' @return A data frame with one row per row of `newdata`: `fit`, `lwr`, `upr` (`NA` when
#'   `interval = "none"`), `bounded` and `invalid` (logical), and with `center = "mean",
#'   mean_method = "normal"` also `cut_mass` (the normal mass beyond the inverse's range limit).
#'   Rows with missing predictor values are `NA`, in place. With `se.fit = TRUE`, a list of `fit`
#'   (that data frame), `se.fit`, `df` and `residual.scale`; for an interval for the mean,
#'   `se.fit` holds the mean's standard error (delta) or the bootstrap replicates' standard
#'   deviation. With `by`, one row per group (see `by`).
#' @examples
#' river <- river_data()
#' m <- lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + season, river,
#'                     response = new_transform("log"),
#'                     predictors = list(flow_m3s = new_transform("log")))
#' new <- head(river_data("new"), 4)
#' new$flow_m3s[3] <- NA   # a missing predictor gives an NA row, alignment kept
#' predict(m, new, interval = "prediction")
#' predict(m, new, center = "mean")
#' predict(m, new, center = "mean", mean_method = "normal")
#' predict(m, new, type = "transformed", se.fit = TRUE)
#' # intervals for the mean, per row and per season
#' predict(m, new, interval = "confidence", center = "mean")
#' predict(m, river_data("new"), interval = "confidence", center = "mean", by = "season")
#' predict(m, new, interval = "confidence", center = "mean", mean_interval = "bootstrap",
#'         R = 199, seed = 1)
#' @export
predict.pwb_model <- function(object, newdata, se.fit = FALSE,
                              interval = c("none", "confidence", "prediction"),
                              level = 0.95, type = c("response", "transformed"),
                              center = c("median", "mean"),
                              mean_method = c("smearing", "normal"), invalid = c("error", "na"),
                              scale = NULL, mean_interval = c("delta", "bootstrap"), R = 999,
                              seed = NULL, by = NULL, ...) {
  interval <- pwb_match_choice(interval, "interval")
  type <- pwb_match_choice(type, "type")
  if (!is.null(scale)) {
    scale <- pwb_match_choice(scale, "scale", c("original", "transformed"))
    type <- if (scale == "original") "response" else "transformed"
  }
  center <- pwb_match_choice(center, "center")
  mean_method <- pwb_match_choice(mean_method, "mean_method")
  invalid <- pwb_match_choice(invalid, "invalid")
  pwb_check_level(level)
  if (!is.logical(se.fit) || length(se.fit) != 1L || is.na(se.fit))
    stop("`se.fit` must be TRUE or FALSE", call. = FALSE)
  mean_interval <- pwb_match_choice(mean_interval, "mean_interval")
  if (interval == "confidence" && center == "mean")
    return(pwb_predict_mean_interval(object, if (missing(newdata)) NULL else newdata, level,
                                     type, mean_method, mean_interval, R, seed, by, invalid,
                                     se.fit))
  if (!is.null(by))
    stop("`by` needs interval = \"confidence\" and center = \"mean\"", call. = FALSE)
  bad <- integer()
  if (missing(newdata) || is.null(newdata)) {
    Xnew <- NULL
  } else {
    nd <- pwb_prepare_newdata(object, newdata, invalid)
    bad <- nd$invalid_rows
    Xnew <- nd$X
  }
  handle <- pwb_handle(object)
  codes <- list(match(interval, c("none", "confidence", "prediction")) - 1L,
                match(center, c("median", "mean")) - 1L,
                match(mean_method, c("smearing", "normal")) - 1L)
  if (is.null(Xnew)) {
    # The training rows, read from the core model (their design is not rebuilt).
    res <- rpwb_model_predict_fitted(handle, level, codes[[1L]], codes[[2L]], codes[[3L]],
                                     type == "transformed")
    if (se.fit) {
      w <- stats::model.weights(object$frame)
      lev <- rpwb_model_vector(handle, 2L)
      res$se <- object$sigma * sqrt(if (is.null(w)) lev else ifelse(w > 0, lev / w, NA_real_))
    }
  } else {
    res <- rpwb_model_predict(handle, Xnew, level, codes[[1L]], codes[[2L]], codes[[3L]],
                              type == "transformed", se.fit)
  }
  out <- data.frame(fit = res$fit, lwr = res$lwr, upr = res$upr,
                    bounded = bitwAnd(res$flags, 1L) > 0L,
                    invalid = rep(FALSE, length(res$fit)))
  out$invalid[bad] <- TRUE
  over <- which(bitwAnd(res$flags, 4L) > 0L)  # PWB_PRED_OVERFLOW: x'b beyond the double range
  if (length(over))
    warning(sprintf(paste0("x'b overflows the floating-point range in %d %s (%s): predictor ",
                           "values of extreme magnitude; those predictions are NA. Rescale ",
                           "the predictors (e.g. other units)"), length(over),
                    pwb_plural(length(over), "row"), pwb_format_rows(over)), call. = FALSE)
  se <- res$se
  if (center == "mean" && mean_method == "normal" && type == "response")
    out$cut_mass <- res$cut_mass
  if (is.null(Xnew)) {
    if (inherits(object$na.action, "exclude")) {
      out <- pwb_pad_excluded(out, object$na.action)
      if (se.fit) se <- stats::napredict(object$na.action, se)
    } else {
      out <- pwb_copy_row_names(out, object$frame)
    }
  } else {
    out <- pwb_copy_row_names(out, newdata)
  }
  if (!se.fit) return(out)
  names(se) <- row.names(out)
  list(fit = out, se.fit = se, df = object$df_residual, residual.scale = object$sigma)
}

# `out` with the row names of `from` (a data frame of as many rows, or anything row.names()
# reads). A data frame's row names are unique already, so they are copied as stored (automatic
# ones stay compact) instead of going through `row.names<-`, whose duplicate check on 1e5
# strings cost more than the prediction itself.
pwb_copy_row_names <- function(out, from) {
  if (is.data.frame(from) && .row_names_info(from, 2L) == nrow(out)) {
    attr(out, "row.names") <- .row_names_info(from, 0L)
    return(out)
  }
  rn <- row.names(from)
  if (!is.null(rn)) row.names(out) <- rn
  out
}

# Rows of `df` placed back among the excluded ones (as na.exclude does for residuals).
pwb_pad_excluded <- function(df, omit) {
  n <- nrow(df) + length(omit)
  keep <- setdiff(seq_len(n), as.integer(omit))
  out <- df[rep(NA_integer_, n), , drop = FALSE]
  out[keep, ] <- df
  out$bounded[-keep] <- FALSE
  out$invalid[-keep] <- FALSE
  nm <- character(n)
  nm[keep] <- rownames(df)
  nm[as.integer(omit)] <- names(omit)
  row.names(out) <- if (anyDuplicated(nm) || any(!nzchar(nm))) seq_len(n) else nm
  out
}

# The design matrix (no intercept column) of new data, after checking variables, their classes
# and factor levels and applying the stored predictor transforms.
pwb_prepare_newdata <- function(object, newdata, invalid) {
  if (!is.data.frame(newdata)) stop("`newdata` must be a data frame", call. = FALSE)
  missing_vars <- setdiff(object$xvars, names(newdata))
  if (length(missing_vars))
    stop(sprintf("`newdata` lacks the %s %s used by the model",
                 pwb_plural(length(missing_vars), "variable"),
                 paste0("`", missing_vars, "`", collapse = ", ")), call. = FALSE)
  for (v in object$xvars) {
    was_numeric <- is.numeric(object$frame[[v]])
    if (was_numeric && !is.numeric(newdata[[v]]))
      stop(sprintf(paste0("`%s` in `newdata` is %s, but the model was fitted with it numeric: ",
                          "convert it first, e.g. newdata$%s <- as.numeric(newdata$%s)"),
                   v, class(newdata[[v]])[1L], v, v), call. = FALSE)
  }
  for (v in intersect(names(object$xlevels), names(newdata))) {
    known <- object$xlevels[[v]]
    vals <- as.character(newdata[[v]])
    unseen <- !is.na(vals) & !vals %in% known
    if (any(unseen))
      stop(sprintf(paste0("`%s` in `newdata` has %s not seen in fitting: %s (at %s %s); ",
                          "the model knows %s"), v,
                   pwb_plural(length(unique(vals[unseen])), "level"),
                   paste0("\"", unique(vals[unseen]), "\"", collapse = ", "),
                   pwb_plural(sum(unseen), "row"), pwb_format_rows(which(unseen)),
                   paste0("\"", known, "\"", collapse = ", ")), call. = FALSE)
  }
  p <- length(object$coefficients) - as.integer(attr(object$terms, "intercept") == 1L)
  if (nrow(newdata) == 0L)
    return(list(X = matrix(0, 0L, p), invalid_rows = integer()))
  bad <- integer()
  for (v in names(object$predictors)) {
    z <- pwb_map_values(object$predictors[[v]], newdata[[v]], v, invalid, inverse = FALSE)
    bad <- union(bad, attr(z, "invalid_rows"))
    attr(z, "invalid_rows") <- NULL
    newdata[[v]] <- z
  }
  tt <- stats::delete.response(object$terms)
  mf <- stats::model.frame(tt, newdata, na.action = stats::na.pass, xlev = object$xlevels)
  mm <- stats::model.matrix(tt, mf, contrasts.arg = object$contrasts)
  X <- if (attr(tt, "intercept") == 1L) mm[, -1L, drop = FALSE] else mm
  storage.mode(X) <- "double"
  list(X = X, invalid_rows = sort(as.integer(bad)))
}
