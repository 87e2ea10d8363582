# Methods of pwb_model: print, summary, coef, confint, residuals, fitted, logLik, nobs.

#' Methods for transformed linear models
#'
#' `coef()` and `confint()` give the coefficients on the transformed scale (those of
#' `object$lm`). `fitted()` gives original-scale medians (the inverse of the transformed-scale
#' fit); for means use [predict.pwb_model()] with `center = "mean"`. `residuals()` gives
#' transformed-scale residuals by default (where the model's error assumptions live), or
#' original-scale response minus fitted median with `type = "original"`. `logLik()` is on the
#' original scale: the normal log-likelihood of the transformed response at the maximum-
#' likelihood sigma, plus the log-Jacobian of the response transform, so `AIC()` compares
#' models with different response transforms of the same response; its `df` counts the
#' coefficients, sigma, and 1 when the response power was estimated from the data.
#'
#' @param object,x a `pwb_model` from [lm_transformed()].
#' @param parm,level as for [stats::confint()].
#' @param type `"transformed"` or `"original"` residuals.
#' @param ... passed on (`summary`, `confint`) or unused.
#' @return `coef`: named numeric (`NA` for aliased columns, as `lm`); `confint`: a matrix;
#'   `residuals`, `fitted`: numeric vectors aligned as `na.action` says; `logLik`: a `logLik`
#'   object; `summary`: a `summary.pwb_model` list holding the `lm` summary, the transforms and
#'   the original-scale log-likelihood.
#' @examples
#' river <- river_data()
#' m <- lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + season, river,
#'                     response = new_transform("log"),
#'                     predictors = list(flow_m3s = new_transform("log")))
#' coef(m)
#' confint(m)
#' head(fitted(m))
#' logLik(m)
#' summary(m)
#' @name pwb_model_methods
NULL

#' @rdname pwb_model_methods
#' @export
print.pwb_model <- function(x, ...) {
  cat("<pwb_model> linear model on the transformed scale\n")
  cat("  response ", x$yname, ": ", format(x$response), "\n", sep = "")
  pwb_lambda_warnings(x$response_lambda)
  if (length(x$predictors)) {
    for (v in names(x$predictors))
      cat("  predictor ", v, ": ", format(x$predictors[[v]]), "\n", sep = "")
  } else {
    cat("  predictors: untransformed\n")
  }
  cat("\nCoefficients (transformed scale):\n")
  print(x$coefficients, digits = 4L)
  cat(sprintf("\nResidual standard error %.4g on %d df; n = %d\n", x$sigma,
              as.integer(x$df_residual), x$n))
  ll <- logLik(x)
  cat(sprintf("Original-scale log-likelihood %.4f (df = %g), AIC %.4f\n", as.numeric(ll),
              attr(ll, "df"), stats::AIC(ll)))
  cat("Fitted values back-transform to medians; use predict(center = \"mean\") for means.\n")
  invisible(x)
}

#' @rdname pwb_model_methods
#' @export
summary.pwb_model <- function(object, ...) {
  structure(list(lm = summary(object$lm, ...), response = object$response,
                 predictors = object$predictors, yname = object$yname,
                 response_lambda = object$response_lambda, loglik = logLik(object)),
            class = "summary.pwb_model")
}

#' @export
print.summary.pwb_model <- function(x, ...) {
  cat("Transforms:\n")
  cat("  response ", x$yname, ": ", format(x$response), "\n", sep = "")
  if (!is.null(x$response_lambda))
    cat(sprintf("    estimated lambda %.4g, interval [%.4g, %.4g]\n", x$response_lambda$lambda,
                x$response_lambda$conf_int[1L], x$response_lambda$conf_int[2L]))
  pwb_lambda_warnings(x$response_lambda)
  for (v in names(x$predictors))
    cat("  predictor ", v, ": ", format(x$predictors[[v]]), "\n", sep = "")
  cat("\nFit on the transformed scale:")
  print(x$lm, ...)
  cat(sprintf("Original-scale log-likelihood %.4f (df = %g), AIC %.4f\n", as.numeric(x$loglik),
              attr(x$loglik, "df"), stats::AIC(x$loglik)))
  cat("A transform changes what coefficients mean; back-transformed fits are medians.\n")
  invisible(x)
}

#' @rdname pwb_model_methods
#' @export
coef.pwb_model <- function(object, ...) stats::coef(object$lm)

#' @rdname pwb_model_methods
#' @export
confint.pwb_model <- function(object, parm, level = 0.95, ...) {
  pwb_check_level(level)
  if (missing(parm)) stats::confint(object$lm, level = level, ...)
  else stats::confint(object$lm, parm, level = level, ...)
}

#' @rdname pwb_model_methods
#' @export
residuals.pwb_model <- function(object, type = c("transformed", "original"), ...) {
  type <- match.arg(type)
  r <- if (type == "transformed") object$residuals else object$y - pwb_fitted_median(object)
  names(r) <- row.names(object$lm$model)
  stats::naresid(object$lm$na.action, r)
}

#' @rdname pwb_model_methods
#' @export
fitted.pwb_model <- function(object, ...) {
  f <- pwb_fitted_median(object)
  names(f) <- row.names(object$lm$model)
  stats::napredict(object$lm$na.action, f)
}

pwb_fitted_median <- function(object) {
  res <- rpwb_transform_map(unclass(object$response), object$fitted, 1L)
  if (res$status == 0L) return(res$value)
  # Fitted values beyond the inverse's range: the library's bounded back-transform.
  design <- pwb_design_parts(stats::model.matrix(object$lm))
  rpwb_model_predict(object$y, design$X, design$intercept, pwb_spec_or_null(object$response),
                     object$estimated, design$X, 0.95, 0L, 0L, 0L, FALSE)$fit
}

#' @rdname pwb_model_methods
#' @export
logLik.pwb_model <- function(object, ...) {
  structure(object$loglik, df = object$loglik_df, nobs = object$n, class = "logLik")
}

#' @rdname pwb_model_methods
#' @export
nobs.pwb_model <- function(object, ...) object$n

# Say so when the response power was not a clean interior maximum.
pwb_lambda_warnings <- function(lam) {
  if (is.null(lam)) return(invisible())
  if (isTRUE(lam$at_bound))
    cat("    note: the estimated power lies at the edge of its search range\n")
  if (isFALSE(lam$converged))
    cat("    note: the search for the power did not converge\n")
  invisible()
}
