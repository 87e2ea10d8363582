# Methods of pwb_chunked_fit: a model fitted from chunk summaries (no per-row residuals kept).

#' A model fitted from chunk summaries
#'
#' `pwb_chunked_fit` objects come from [fit_chunked()] or [finish_fit()]. They hold what a fit of
#' [lm_transformed()] reports about the whole data (coefficients, their covariance, sigma, the
#' original-scale log-likelihood, residual checks) but no per-row values: predictions are a
#' per-row map of new data, and the smearing mean uses binned sums of the training residuals.
#'
#' Intervals are formed on the transformed scale with Student t quantiles and mapped back, so
#' that a confidence interval covers the original-scale *median* and a prediction interval a new
#' observation, whichever `center` is asked for. `center = "mean"` with `mean_method =
#' "smearing"` needs the residual sums of [fit_chunked()] (or [checks_summary()] given to
#' `finish_fit()`'s result as `$smearing`); `"normal"` uses the lognormal mean
#' exp(mu + sigma^2 / 2) and is available for the log transform (Box-Cox at lambda 0) only.
#'
#' @param object,x a `pwb_chunked_fit`.
#' @param newdata a data frame with the design's predictor columns.
#' @param interval `"none"`, `"confidence"` or `"prediction"`.
#' @param level the interval's level.
#' @param center `"median"` (the back-transformed fit) or `"mean"`.
#' @param mean_method `"smearing"` or `"normal"` (see Details).
#' @param parm,... further arguments (unused; `parm` as [stats::confint()]).
#' @return `predict()`: a data frame `fit, lwr, upr` in original units, one row per row of
#'   `newdata` (rows with missing predictors give `NA`). `coef()`, `vcov()`, `sigma()`,
#'   `nobs()`, `logLik()`, `confint()`: as their `lm` methods, on the transformed scale
#'   (`logLik()` on the original scale, Jacobian included).
#' @name pwb_chunked_fit
NULL

#' @rdname pwb_chunked_fit
#' @export
print.pwb_chunked_fit <- function(x, ...) {
  tr <- x$response
  cat(sprintf("<pwb_chunked_fit> %s, n = %d rows", deparse1(x$design$formula), x$n))
  if (!is.null(x$chunks)) cat(sprintf(" in %d chunks", x$chunks))
  cat("\n")
  if (!is.null(x$lambda))
    cat(sprintf("  response power %s (estimate %.3f, %g%% interval [%.3f, %.3f])\n",
                format(x$lambda$convenient), x$lambda$lambda, 100 * x$lambda$level,
                x$lambda$conf_int[1L], x$lambda$conf_int[2L]))
  cat(sprintf("  response transform: %s\n", format(tr)))
  tab <- cbind(estimate = x$coefficients, std_error = x$se)
  print(signif(tab, 4))
  cat(sprintf("  sigma %s on %d df; log-likelihood (original scale) %s\n", format(x$sigma, digits = 4),
              x$df_residual, format(x$loglik, digits = 7)))
  if (x$n_missing > 0) cat(sprintf("  %d rows left out for missing values\n", as.integer(x$n_missing)))
  if (!is.null(x$checks)) {
    b <- x$checks$breusch_pagan
    r <- x$checks$reset
    cat(sprintf("  checks: Breusch-Pagan p = %s, RESET p = %s, residual skewness %s\n",
                format(b$p_value, digits = 3), format(r$p_value, digits = 3),
                format(x$checks$skewness, digits = 3)))
  }
  invisible(x)
}

#' @rdname pwb_chunked_fit
#' @export
coef.pwb_chunked_fit <- function(object, ...) object$coefficients

#' @rdname pwb_chunked_fit
#' @export
vcov.pwb_chunked_fit <- function(object, ...) object$covariance

#' @rdname pwb_chunked_fit
#' @export
sigma.pwb_chunked_fit <- function(object, ...) object$sigma

#' @rdname pwb_chunked_fit
#' @export
nobs.pwb_chunked_fit <- function(object, ...) object$n

#' @rdname pwb_chunked_fit
#' @export
logLik.pwb_chunked_fit <- function(object, ...) {
  structure(object$loglik, df = object$loglik_df, nobs = object$n, class = "logLik")
}

#' @rdname pwb_chunked_fit
#' @export
confint.pwb_chunked_fit <- function(object, parm, level = 0.95, ...) {
  pwb_check_level(level)
  cf <- object$coefficients
  if (missing(parm)) parm <- names(cf)
  q <- stats::qt(1 - (1 - level) / 2, object$df_residual)
  out <- cbind(cf - q * object$se, cf + q * object$se)[parm, , drop = FALSE]
  colnames(out) <- sprintf("%g %%", 100 * c((1 - level) / 2, 1 - (1 - level) / 2))
  out
}

#' @rdname pwb_chunked_fit
#' @export
predict.pwb_chunked_fit <- function(object, newdata, interval = c("none", "confidence", "prediction"),
                                    level = 0.95, center = c("median", "mean"),
                                    mean_method = c("smearing", "normal"), ...) {
  interval <- pwb_match_choice(interval, "interval")
  center <- pwb_match_choice(center, "center")
  mean_method <- pwb_match_choice(mean_method, "mean_method")
  pwb_check_level(level)
  pwb_check_data_frame(newdata, "newdata")
  d <- object$design
  tt <- stats::delete.response(d$terms)
  for (v in names(d$xlevels)) {
    if (!v %in% names(newdata)) next
    new <- setdiff(unique(as.character(stats::na.omit(newdata[[v]]))), d$xlevels[[v]])
    if (length(new))
      stop(sprintf("`newdata`'s `%s` has %s not seen in fitting: %s", v, pwb_plural(length(new), "level"),
                   paste0("\"", new, "\"", collapse = ", ")), call. = FALSE)
  }
  mf <- stats::model.frame(tt, newdata, xlev = d$xlevels, na.action = stats::na.pass)
  mm <- stats::model.matrix(tt, mf)
  cf <- object$coefficients
  cf[is.na(cf)] <- 0
  eta <- drop(mm %*% cf)
  tr <- object$response
  back <- function(z) invert_transform(tr, z, invalid = "na")
  fit <- if (center == "median") back(eta) else pwb_chunked_mean(object, eta, mean_method)
  lwr <- upr <- rep(NA_real_, length(eta))
  if (interval != "none") {
    V <- object$covariance
    V[is.na(V)] <- 0
    se <- sqrt(rowSums((mm %*% V) * mm))
    if (interval == "prediction") se <- sqrt(se^2 + object$sigma^2)
    q <- stats::qt(1 - (1 - level) / 2, object$df_residual)
    a <- back(eta - q * se)
    b <- back(eta + q * se)
    lwr <- pmin(a, b)
    upr <- pmax(a, b)
  }
  pwb_copy_row_names(data.frame(fit = fit, lwr = lwr, upr = upr), newdata)  # predict_model.R
}

pwb_chunked_mean <- function(object, eta, mean_method) {
  if (mean_method == "smearing") {
    if (is.null(object$smearing))
      stop("smearing means need the residual sums of a check pass: use fit_chunked(), or set ",
           "`$smearing` to a merged checks_summary()'s `$bytes`", call. = FALSE)
    return(rpwb_fit_checks_smearing(object$smearing, eta))
  }
  tr <- object$response
  if (!(identical(tr$family, "log") || (identical(tr$family, "box-cox") && isTRUE(tr$lambda == 0))) ||
      isTRUE(tr$reflect) || tr$shift != 0)
    stop("the normal-theory mean of a chunked fit is available for the log transform only: ",
         "use mean_method = \"smearing\"", call. = FALSE)
  exp(eta + object$sigma^2 / 2)
}
