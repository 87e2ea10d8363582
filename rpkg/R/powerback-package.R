#' powerback: power transformations for linear models, with honest back-transformation
#'
#' Choose transforms for skewed variables with evidence (maximum-likelihood powers and their
#' profile-likelihood intervals), fit linear models on the transformed scale, and report
#' predictions in original units. Every transform stores its constants (power, shift, reflection
#' pivot) so new data get exactly the transform learned at fit time.
#'
#' Cautions that apply to everything here: a transform changes what the model estimates (a
#' coefficient on the log scale is a multiplicative effect on the median, not an additive effect
#' on the mean); back-transforming a fitted value gives a median, and a mean needs a correction;
#' and the results inform, but do not replace, domain standards and professional judgement.
#'
#' The transform model: `v = (reflect ? pivot - x : x) + shift`, then `z = family(v; lambda)`.
#' See [new_transform()].
#'
#' Where to start: [screen_skew()] (which variables are skewed, and what would fix them),
#' [estimate_response_lambda()] (the response's power given the predictors),
#' [lm_transformed()] (the model, with [predict.pwb_model()] in original units),
#' [residual_checks()] and [compare_transforms()] (candidates judged by cross-validation in
#' original units), and [write_transforms()] (the transforms as portable text). The vignette,
#' `vignette("powerback")`, walks a whole analysis.
#'
#' Effects in original units: [effect_table()] reads a fitted model's coefficients as effects on
#' the median of the response (percent changes and elasticities for a log response, changes
#' between stated values otherwise), with confidence intervals.
#'
#' Many responses: [estimate_response_lambda()] and [lm_transformed()] take `cbind(y1, y2, ...)`
#' on the left of the formula (one factorisation of the shared design for the powers; one model
#' per response); [response_fits()] gives each response's own result.
#'
#' Threads: work that splits into independent pieces (the responses of a many-response call,
#' the rows of a smearing mean) may run on several threads of the compiled code. The option
#' `powerback.threads` sets how many (default 2, or 1 on a single-core machine); the results do
#' not depend on it.
#'
#' @useDynLib powerback, .registration = TRUE
#' @importFrom Rcpp evalCpp
#' @importFrom stats coef confint predict residuals fitted logLik model.frame model.matrix
#'   model.response na.omit qnorm qt pchisq pf nobs
#' @importFrom graphics plot abline lines points legend par mtext
#' @importFrom grDevices png dev.off
"_PACKAGE"

#' Print, extract and plot the results of box_tidwell(), lambda_influence() and a model summary
#'
#' `print()` of a `pwb_box_tidwell` shows each predictor's power with its standard error,
#' interval and the score test of power 1; `coef()` gives the powers by variable. `print()` of a
#' `pwb_influence` lists the rows whose deletion moves \eqn{\hat\lambda} most, and `plot()` draws
#' the change of \eqn{\hat\lambda} by row and against leverage. `print()` of a
#' `summary.pwb_model` shows the transforms and the fit on the transformed scale.
#'
#' @param x,object the result of [box_tidwell()], [lambda_influence()] or `summary()` of a
#'   [lm_transformed()] model.
#' @param digits significant digits.
#' @param n how many rows to list.
#' @param ... passed on to the printing or plotting of the underlying table or fit.
#' @return `print()` and `plot()`: `x`, invisibly; `coef()`: a named numeric vector.
#' @usage
#' \method{print}{pwb_box_tidwell}(x, digits = 4, ...)
#' \method{coef}{pwb_box_tidwell}(object, ...)
#' \method{print}{pwb_influence}(x, n = 5L, ...)
#' \method{plot}{pwb_influence}(x, ...)
#' \method{print}{summary.pwb_model}(x, digits = max(3L, getOption("digits") - 3L), ...)
#' @name pwb_result_methods
#' @aliases print.pwb_box_tidwell coef.pwb_box_tidwell print.pwb_influence plot.pwb_influence
#'   print.summary.pwb_model
#' @examples
#' bt <- box_tidwell(Volume ~ Girth + Height, trees)
#' bt
#' coef(bt)
NULL
