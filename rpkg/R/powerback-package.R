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
#' Effects in original units: [effect_table()] reads a fitted model's coefficients as effects on
#' the median of the response (percent changes and elasticities for a log response, changes
#' between stated values otherwise), with confidence intervals.
#'
#' @useDynLib powerback, .registration = TRUE
#' @importFrom Rcpp evalCpp
#' @importFrom stats coef confint predict residuals fitted logLik model.frame model.matrix
#'   model.response na.omit qnorm qt pchisq pf nobs
#' @importFrom graphics plot abline lines points legend par mtext
#' @importFrom grDevices png dev.off
#' @keywords internal
"_PACKAGE"
