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
#' mapped back (swapped when the transform reflects). Whatever `center` is, a confidence
#' interval covers the median of the response at those predictor values, and a prediction
#' interval covers a new observation; neither is an interval for the mean.
#'
#' Where the inverse has a limited range (for example Box-Cox with a power other than 0 needs
#' `1 + lambda * z > 0`) a value beyond the limit is set to the limit in original units (such as
#' 0 or `Inf`) and the row is marked in the column `bounded`.
#'
#' @param object a `pwb_model` from [lm_transformed()].
#' @param newdata a data frame with the raw predictor variables; when omitted, the rows used in
#'   fitting (padded with `NA` rows when the model was fitted with `na.exclude`).
#' @param interval `"none"`, `"confidence"` or `"prediction"`.
#' @param level the interval's confidence level, strictly between 0 and 1.
#' @param center `"median"` or `"mean"` (see Details).
#' @param mean_method `"smearing"` or `"normal"`, used when `center = "mean"`.
#' @param invalid what to do with new predictor values outside a transform's domain:
#'   `"error"` (name the rows) or `"na"` (return those rows as `NA` with `invalid = TRUE`).
#' @param scale `"original"` (default) or `"transformed"`, to get the fit and interval on the
#'   transformed scale (as [stats::predict.lm()] on `object$lm` would).
#' @param ... unused.
#' @return A data frame with one row per row of `newdata`: `fit`, `lwr`, `upr` (`NA` when
#'   `interval = "none"`), `bounded` and `invalid` (logical), and with `center = "mean",
#'   mean_method = "normal"` also `cut_mass` (the normal mass beyond the inverse's range limit).
#'   Rows with missing predictor values are `NA`, in place.
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
#' @export
predict.pwb_model <- function(object, newdata, interval = c("none", "confidence", "prediction"),
                              level = 0.95, center = c("median", "mean"),
                              mean_method = c("smearing", "normal"), invalid = c("error", "na"),
                              scale = c("original", "transformed"), ...) {
  interval <- match.arg(interval)
  center <- match.arg(center)
  mean_method <- match.arg(mean_method)
  invalid <- match.arg(invalid)
  scale <- match.arg(scale)
  pwb_check_level(level)
  design <- pwb_design_parts(stats::model.matrix(object$lm))
  bad <- integer()
  if (missing(newdata) || is.null(newdata)) {
    Xnew <- design$X
    row_names <- NULL
  } else {
    nd <- pwb_prepare_newdata(object, newdata, invalid)
    bad <- nd$invalid_rows
    Xnew <- nd$X
    row_names <- row.names(newdata)
  }
  res <- rpwb_model_predict(object$y, design$X, design$intercept,
                            pwb_spec_or_null(object$response), object$estimated, Xnew, level,
                            match(interval, c("none", "confidence", "prediction")) - 1L,
                            match(center, c("median", "mean")) - 1L,
                            match(mean_method, c("smearing", "normal")) - 1L,
                            scale == "transformed")
  out <- data.frame(fit = res$fit, lwr = res$lwr, upr = res$upr,
                    bounded = bitwAnd(res$flags, 1L) > 0L, invalid = FALSE)
  out$invalid[bad] <- TRUE
  if (center == "mean" && mean_method == "normal" && scale == "original")
    out$cut_mass <- res$cut_mass
  if (is.null(row_names)) {
    if (!is.null(object$lm$na.action) && inherits(object$lm$na.action, "exclude"))
      out <- pwb_pad_excluded(out, object$lm$na.action)
    else row.names(out) <- row.names(object$lm$model)
  } else {
    row.names(out) <- row_names
  }
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

# The design matrix (no intercept column) of new data, after checking variables and factor
# levels and applying the stored predictor transforms.
pwb_prepare_newdata <- function(object, newdata, invalid) {
  if (!is.data.frame(newdata)) stop("`newdata` must be a data frame", call. = FALSE)
  missing_vars <- setdiff(object$xvars, names(newdata))
  if (length(missing_vars))
    stop(sprintf("`newdata` lacks the %s %s used by the model", 
                 pwb_plural(length(missing_vars), "variable"),
                 paste0("`", missing_vars, "`", collapse = ", ")), call. = FALSE)
  for (v in intersect(names(object$lm$xlevels), names(newdata))) {
    known <- object$lm$xlevels[[v]]
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
  bad <- integer()
  for (v in names(object$predictors)) {
    if (!is.numeric(newdata[[v]]))
      stop(sprintf("`%s` in `newdata` must be numeric", v), call. = FALSE)
    z <- pwb_map_values(object$predictors[[v]], newdata[[v]], v, invalid, inverse = FALSE)
    bad <- union(bad, attr(z, "invalid_rows"))
    attr(z, "invalid_rows") <- NULL
    newdata[[v]] <- z
  }
  tt <- stats::delete.response(stats::terms(object$lm))
  mf <- stats::model.frame(tt, newdata, na.action = stats::na.pass, xlev = object$lm$xlevels)
  mm <- stats::model.matrix(tt, mf, contrasts.arg = object$lm$contrasts)
  list(X = pwb_design_parts(mm)$X, invalid_rows = sort(as.integer(bad)))
}
