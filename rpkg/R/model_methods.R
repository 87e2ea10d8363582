# Methods of pwb_model: print, summary, coef, vcov, confint, sigma, df.residual, deviance, nobs,
# logLik, fitted, residuals, weights. Every number is read from the core model.

#' Methods for transformed linear models
#'
#' Each method behaves as the [stats::lm()] method of the same name does for a fit on the
#' transformed scale (the same arguments, shapes, `NA` padding under `na.exclude`, and
#' weights), with these exceptions on purpose:
#' \itemize{
#'   \item `fitted()` gives original-scale medians (the inverse transform of the
#'     transformed-scale fit) by default; `type = "transformed"` gives what `lm` would. For
#'     means use [predict.pwb_model()] with `center = "mean"`.
#'   \item `residuals()` gives transformed-scale residuals by default (where the model's error
#'     assumptions live); `type = "response"` (or its older name `"original"`) gives the
#'     original-scale response minus the fitted median.
#'   \item `logLik()` is on the original scale: the (weighted) normal log-likelihood of the
#'     transformed response at the maximum-likelihood sigma, plus the log-Jacobian of the response
#'     transform, so `AIC()` and `BIC()` compare models with different response transforms of
#'     the same response; its `df` counts the coefficients, sigma, and 1 when the response power
#'     was estimated from the data. When rows of the response lie at the boundary of the
#'     transform's domain (such as y = 0 under a power other than 1) their log-Jacobian is
#'     `-Inf`: `logLik()` is then `-Inf` and warns, naming the rows, that it is not comparable
#'     with other models (shift the response or use Yeo-Johnson); `print()` and `summary()`
#'     say the same.
#' }
#' `coef()`, `vcov()`, `confint()`, `sigma()`, `df.residual()` and `deviance()` (the weighted
#' residual sum of squares) are on the transformed scale. Influence measures are in
#' [pwb_model_influence].
#'
#' @param object,x a `pwb_model` from [lm_transformed()].
#' @param parm,level as for [stats::confint()].
#' @param type for `residuals()`: `"transformed"` or `"response"` (`"original"` is accepted as
#'   a synonym); for `fitted()`: `"response"` (original-scale medians) or `"transformed"`.
#' @param complete for `coef()` and `vcov()`: keep aliased coefficients (as `NA`), as `lm`.
#' @param ... passed on (`summary`, `confint`) or unused.
#' @return `coef`: named numeric (`NA` for aliased columns, as `lm`); `vcov`: a matrix;
#'   `confint`: a matrix; `residuals`, `fitted`: numeric vectors aligned as `na.action` says;
#'   `logLik`: a `logLik` object; `summary`: a `summary.pwb_model` list holding the coefficient
#'   table, the transforms and the original-scale log-likelihood.
#' @examples
#' river <- river_data()
#' m <- lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + season, river,
#'                     response = new_transform("log"),
#'                     predictors = list(flow_m3s = new_transform("log")))
#' coef(m)
#' vcov(m)
#' confint(m)
#' sigma(m)
#' head(fitted(m))
#' head(residuals(m, type = "response"))
#' logLik(m)
#' BIC(m)
#' summary(m)
#' @name pwb_model_methods
#' @importFrom stats vcov sigma df.residual deviance weights hatvalues cooks.distance rstandard
#'   rstudent terms formula update anova
NULL

#' @rdname pwb_model_methods
#' @export
print.pwb_model <- function(x, ...) {
  cat("<pwb_model> linear model on the transformed scale\n")
  cat("  response ", x$yname, ": ", format(x$response, name = x$yname), "\n", sep = "")
  pwb_lambda_warnings(x$response_lambda)
  if (length(x$predictors)) {
    for (v in names(x$predictors))
      cat("  predictor ", v, ": ", format(x$predictors[[v]], name = v), "\n", sep = "")
  } else {
    cat("  predictors: untransformed\n")
  }
  if (isTRUE(x$weighted)) cat("  weighted fit (precision weights)\n")
  cat("\nCoefficients (transformed scale):\n")
  print(x$coefficients, digits = 4L)
  cat(sprintf("\nResidual standard error %.4g on %d df; n = %d\n", x$sigma,
              as.integer(x$df_residual), as.integer(x$nobs)))
  ll <- pwb_loglik(x)
  cat(sprintf("Original-scale log-likelihood %.4f (df = %g), AIC %.4f\n", as.numeric(ll),
              attr(ll, "df"), stats::AIC(ll)))
  note <- pwb_boundary_note(pwb_boundary_rows(x), x$yname)
  if (!is.null(note)) pwb_cat_wrap("Note: ", note)
  cat("Fitted values back-transform to medians; use predict(center = \"mean\") for means.\n")
  invisible(x)
}

#' @rdname pwb_model_methods
#' @export
summary.pwb_model <- function(object, ...) {
  est <- object$coefficients[!object$aliased]
  se <- object$se[!object$aliased]
  tval <- est / se
  df <- object$df_residual
  coefs <- cbind(Estimate = est, `Std. Error` = se, `t value` = tval,
                 `Pr(>|t|)` = 2 * stats::pt(abs(tval), df, lower.tail = FALSE))
  structure(list(coefficients = coefs, aliased = object$aliased, sigma = object$sigma,
                 df = c(object$rank, df, length(object$coefficients)),
                 response = object$response, predictors = object$predictors,
                 yname = object$yname, formula = object$formula, weighted = object$weighted,
                 response_lambda = object$response_lambda, loglik = pwb_loglik(object),
                 boundary_note = pwb_boundary_note(pwb_boundary_rows(object), object$yname)),
            class = "summary.pwb_model")
}

#' @export
print.summary.pwb_model <- function(x, digits = max(3L, getOption("digits") - 3L), ...) {
  cat("Transforms:\n")
  cat("  response ", x$yname, ": ", format(x$response, name = x$yname), "\n", sep = "")
  if (!is.null(x$response_lambda))
    cat(sprintf("    estimated lambda %.4g, interval [%.4g, %.4g]\n", x$response_lambda$lambda,
                x$response_lambda$conf_int[1L], x$response_lambda$conf_int[2L]))
  pwb_lambda_warnings(x$response_lambda)
  for (v in names(x$predictors))
    cat("  predictor ", v, ": ", format(x$predictors[[v]], name = v), "\n", sep = "")
  cat("\nFit on the transformed scale", if (isTRUE(x$weighted)) " (weighted)", ": ",
      deparse1(x$formula), "\n", sep = "")
  if (any(x$aliased))
    cat(sprintf("(%d not defined because of singularities)\n", sum(x$aliased)))
  stats::printCoefmat(x$coefficients, digits = digits, ...)
  cat(sprintf("\nResidual standard error: %s on %d degrees of freedom\n",
              format(signif(x$sigma, digits)), as.integer(x$df[2L])))
  cat(sprintf("Original-scale log-likelihood %.4f (df = %g), AIC %.4f\n", as.numeric(x$loglik),
              attr(x$loglik, "df"), stats::AIC(x$loglik)))
  if (!is.null(x$boundary_note)) pwb_cat_wrap("Note: ", x$boundary_note)
  cat("A transform changes what coefficients mean; back-transformed fits are medians.\n")
  invisible(x)
}

#' @rdname pwb_model_methods
#' @export
coef.pwb_model <- function(object, complete = TRUE, ...) {
  cf <- object$coefficients
  if (complete) cf else cf[!object$aliased]
}

#' @rdname pwb_model_methods
#' @export
vcov.pwb_model <- function(object, complete = TRUE, ...) {
  v <- object$vcov
  if (complete) v else v[!object$aliased, !object$aliased, drop = FALSE]
}

#' @rdname pwb_model_methods
#' @export
confint.pwb_model <- function(object, parm, level = 0.95, ...) {
  pwb_check_level(level)
  cf <- object$coefficients
  pnames <- names(cf)
  if (missing(parm)) parm <- pnames
  else if (is.numeric(parm)) parm <- pnames[parm]
  a <- (1 - level) / 2
  a <- c(a, 1 - a)
  fac <- stats::qt(a, object$df_residual)
  pct <- paste(format(100 * a, trim = TRUE, scientific = FALSE, digits = 3L), "%")
  ci <- array(NA_real_, dim = c(length(parm), 2L), dimnames = list(parm, pct))
  ci[] <- cf[parm] + object$se[parm] %o% fac
  ci
}

#' @rdname pwb_model_methods
#' @export
sigma.pwb_model <- function(object, ...) object$sigma

#' @rdname pwb_model_methods
#' @export
df.residual.pwb_model <- function(object, ...) object$df_residual

#' @rdname pwb_model_methods
#' @export
deviance.pwb_model <- function(object, ...) object$rss

#' @rdname pwb_model_methods
#' @export
weights.pwb_model <- function(object, ...) {
  w <- stats::model.weights(object$frame)
  if (is.null(w)) return(NULL)
  stats::naresid(object$na.action, w)
}

#' @rdname pwb_model_methods
#' @export
residuals.pwb_model <- function(object, type = c("transformed", "response", "original"), ...) {
  type <- pwb_match_choice(type, "type")
  r <- if (type == "transformed") object$residuals else object$y - pwb_fitted_median(object)
  names(r) <- row.names(object$frame)
  stats::naresid(object$na.action, r)
}

#' @rdname pwb_model_methods
#' @export
fitted.pwb_model <- function(object, type = c("response", "transformed"), ...) {
  type <- pwb_match_choice(type, "type")
  f <- if (type == "transformed") object$fitted else pwb_fitted_median(object)
  names(f) <- row.names(object$frame)
  stats::napredict(object$na.action, f)
}

# Original-scale medians of the fitted rows: the inverse of the transformed-scale fit, with the
# library's bounded inverse where a value lies beyond the inverse's range.
pwb_fitted_median <- function(object) {
  f <- object$fitted
  res <- rpwb_transform_map(unclass(object$response), f, 1L)
  if (res$status == 0L) return(res$value)
  rpwb_model_predict_fitted(pwb_handle(object), 0.95, 0L, 0L, 0L, FALSE)$fit
}

#' @rdname pwb_model_methods
#' @export
logLik.pwb_model <- function(object, ...) {
  note <- pwb_boundary_note(pwb_boundary_rows(object), object$yname)
  if (!is.null(note)) warning(note, call. = FALSE)
  pwb_loglik(object)
}

# The logLik object without the boundary warning (print and summary say it in their own text).
pwb_loglik <- function(object) {
  structure(object$loglik, df = object$loglik_df, nobs = object$nobs, class = "logLik")
}

#' @rdname pwb_model_methods
#' @export
nobs.pwb_model <- function(object, ...) object$nobs

# Say so when the response power was not a clean interior maximum.
pwb_lambda_warnings <- function(lam) {
  if (is.null(lam)) return(invisible())
  if (isTRUE(lam$at_bound))
    cat("    note: the estimated power lies at the edge of its search range\n")
  if (isFALSE(lam$converged))
    cat("    note: the search for the power did not converge\n")
  invisible()
}
