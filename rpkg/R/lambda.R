#' Estimate the power of a Box-Cox or Yeo-Johnson transform by maximum likelihood
#'
#' `estimate_lambda()` finds the \eqn{\lambda} under which the transformed variable looks most
#' like a normal sample; `estimate_response_lambda()` finds the \eqn{\lambda} under which the
#' transformed response best fits a linear model with normal, constant-variance errors.
#'
#' Both maximise the profile log-likelihood
#' \deqn{l(\lambda) = -\frac{n}{2}\left[\log(2\pi) + 1 + \log\frac{RSS(\lambda)}{n}\right] +
#'   \sum_i \log|\psi'(v_i; \lambda)|,}{l(lambda) = -n/2 (log(2 pi) + 1 + log(RSS(lambda) / n))
#'   + sum log |psi'(v_i; lambda)|,}
#' where \eqn{RSS} is the residual sum of squares of the transformed values about their mean
#' (univariate) or about the least-squares fit (response). The last term (the Jacobian) puts
#' every \eqn{\lambda} on the original scale of the data, so `loglik` values compare. The
#' confidence interval holds the \eqn{\lambda} whose profile lies within
#' \eqn{\chi^2_1(level)/2} of the maximum (a likelihood-ratio interval). When the profile does
#' not drop that far before the end of `range`, that side is open: the endpoint is the range
#' edge and `low_open` or `high_open` is `TRUE`. `at_bound` says the estimate itself sits at a
#' range edge (widen `range` or question the family).
#'
#' The convenient value is the one of -2, -1, -0.5, 0, 0.5, 1, 2 nearest \eqn{\hat\lambda} inside
#' the interval (ties go to the smaller), or \eqn{\hat\lambda} rounded to two decimals when none
#' lies inside. A convenient power is easier to explain (0 is the log, -1 the reciprocal).
#'
#' For the response, the design is factored once (a Householder QR taken block by block, one
#' pass over the rows; columns that depend on earlier ones are dropped as [stats::lm()] drops
#' them, and named in `aliased`) and each \eqn{\lambda} costs one projection of the transformed
#' response; the model is never refitted.
#'
#' Cautions: a transform changes what the model estimates (on the log scale a coefficient acts
#' on the median multiplicatively, not on the mean additively); back-transformed fitted values
#' are medians, and means need a correction; and an estimated \eqn{\lambda} informs, but does
#' not replace, the conventions of your field and professional judgement.
#'
#' @param x a numeric vector. Missing values are handled by `getOption("na.action")` (as
#'   [stats::lm()] would); the rows removed are kept in `na_action`.
#' @param family `"box-cox"` (needs positive values) or `"yeo-johnson"` (any real values).
#' @param range the search range of \eqn{\lambda}, `c(lower, upper)`.
#' @param level the confidence level of the interval.
#' @return An object of class `pwb_lambda`: a list with `lambda`, `conf_int` (length 2),
#'   `convenient`, `loglik` (at \eqn{\hat\lambda}, original scale), `family`, `n`, `at_bound`,
#'   `converged`, `low_open`, `high_open`, `level`, `range`, `profile` (a data frame `lambda`,
#'   `loglik` of about 101 points spanning the interval), `variable` (the variable's name),
#'   `predictors` (`NULL`, or the right-hand side of the model), `rank` and `aliased` (response
#'   case) and `na_action`. Methods: print, plot, coef, confint, [as_transform()].
#' @seealso [as_transform()], [new_transform()], [lm_transformed()]
#' @examples
#' river <- river_data()
#' flow <- estimate_lambda(river$flow_m3s)
#' flow
#' coef(flow)
#' confint(flow)
#' as_transform(flow)
#'
#' # the response given predictors (a factor and a log-transformed flow)
#' estimate_response_lambda(sediment_t_day ~ log(flow_m3s) + rain72_mm + season, river)
#' @export
estimate_lambda <- function(x, family = c("box-cox", "yeo-johnson"), range = c(-3, 3),
                            level = 0.95) {
  xname <- deparse1(substitute(x))
  family <- match.arg(family)
  pwb_lambda_check_args(range, level)
  if (!is.numeric(x))
    stop(sprintf("`%s` must be numeric, not %s", xname, class(x)[1L]), call. = FALSE)
  x <- as.vector(x)
  na_fun <- getOption("na.action", "na.omit")
  kept <- do.call(na_fun, list(x))
  na_rows <- attr(kept, "na.action")
  pos <- seq_along(x)
  if (!is.null(na_rows)) pos <- pos[-as.integer(na_rows)]
  xv <- as.double(x[pos])
  pwb_lambda_check_values(xv, pos, xname, family)
  res <- rpwb_estimate_lambda(xv, family, range[1L], range[2L], level, 101L)
  pwb_new_lambda(res, family, level, range, xname, NULL, na_rows)
}

#' @rdname estimate_lambda
#' @param object a model formula such as `y ~ a + b` (with `data`), or a fitted [stats::lm()]
#'   object whose model frame is reused. Factors, interactions and `na.action` are handled as
#'   `lm` handles them. Weighted fits and offsets are not supported.
#' @param data a data frame holding the variables of the formula.
#' @param na.action for a formula: how to treat missing values, as in [stats::lm()]; by
#'   default `getOption("na.action")`.
#' @export
estimate_response_lambda <- function(object, data = NULL, family = c("box-cox", "yeo-johnson"),
                                     range = c(-3, 3), level = 0.95, na.action = NULL) {
  family <- match.arg(family)
  pwb_lambda_check_args(range, level)
  mf <- pwb_lambda_model_frame(object, data, na.action)
  y <- stats::model.response(mf, "numeric")
  yname <- deparse1(attr(attr(mf, "terms"), "variables")[[2L]])
  if (is.null(y) || !is.numeric(y))
    stop("the model needs a numeric response on the left of `~`", call. = FALSE)
  mm <- stats::model.matrix(attr(mf, "terms"), mf)
  if (attr(attr(mf, "terms"), "intercept") != 1L)
    stop("the response lambda needs a model with an intercept: remove `- 1` or `+ 0`",
         call. = FALSE)
  pos <- pwb_lambda_positions(mf, if (inherits(object, "lm")) NULL else data)
  yv <- as.double(y)
  pwb_lambda_check_values(yv, pos, yname, family)
  X <- mm[, colnames(mm) != "(Intercept)", drop = FALSE]
  bad <- which(rowSums(!is.finite(X)) > 0)
  if (length(bad))
    stop(sprintf("predictors have infinite values at %s %s: remove or replace them first",
                 pwb_plural(length(bad), "row"), pwb_format_rows(pos[bad])), call. = FALSE)
  Xd <- matrix(as.double(X), nrow = nrow(X), ncol = ncol(X))
  res <- rpwb_estimate_response_lambda(yv, Xd, family, range[1L], range[2L], level, 101L)
  aliased <- character(0)
  if (res$n_aliased > 0) {
    q <- qr(mm, tol = 1e-7)
    aliased <- colnames(mm)[q$pivot[-seq_len(q$rank)]]
  }
  rhs <- deparse1(attr(mf, "terms")[[3L]])
  out <- pwb_new_lambda(res, family, level, range, yname, rhs, attr(mf, "na.action"))
  out$rank <- as.integer(res$rank)
  out$aliased <- aliased
  out
}

pwb_lambda_check_args <- function(range, level) {
  if (!is.numeric(range) || length(range) != 2L || any(!is.finite(range)) || range[1L] >= range[2L])
    stop("`range` must be two finite numbers c(lower, upper) with lower < upper", call. = FALSE)
  if (!is.numeric(level) || length(level) != 1L || is.na(level) || level <= 0 || level >= 1)
    stop("`level` must be a single number strictly between 0 and 1, e.g. 0.95", call. = FALSE)
}

# Rows named in messages are the 1-based positions `pos` in the caller's data.
pwb_lambda_check_values <- function(v, pos, what, family) {
  inf <- which(!is.finite(v))
  if (length(inf))
    stop(sprintf("`%s` has %d infinite %s at %s %s: remove or replace them first", what,
                 length(inf), pwb_plural(length(inf), "value"), pwb_plural(length(inf), "row"),
                 pwb_format_rows(pos[inf])), call. = FALSE)
  if (family == "box-cox") {
    bad <- which(v <= 0)
    if (length(bad))
      stop(sprintf("Box-Cox needs %s > 0; %d %s <= 0 at %s %s: use Yeo-Johnson or a shift",
                   what, length(bad), pwb_plural(length(bad), "value"),
                   pwb_plural(length(bad), "row"), pwb_format_rows(pos[bad])), call. = FALSE)
  }
}

pwb_lambda_model_frame <- function(object, data, na.action) {
  if (inherits(object, "lm")) {
    if (!is.null(object$weights))
      stop("weighted lm fits are not supported: the profile likelihood here assumes equal weights",
           call. = FALSE)
    mf <- stats::model.frame(object)
    if (!is.null(stats::model.offset(mf)))
      stop("lm fits with an offset are not supported: move the offset into the response first",
           call. = FALSE)
    return(mf)
  }
  if (!inherits(object, "formula"))
    stop("`object` must be a formula (with `data`) or an lm fit", call. = FALSE)
  args <- list(formula = object, data = if (is.null(data)) environment(object) else data)
  if (!is.null(na.action)) args$na.action <- na.action
  mf <- do.call(stats::model.frame, args)
  if (!is.null(stats::model.offset(mf)))
    stop("offsets are not supported: move the offset into the response first", call. = FALSE)
  mf
}

# 1-based positions of the model frame's rows in the caller's data.
pwb_lambda_positions <- function(mf, data) {
  rn <- rownames(mf)
  pos <- if (is.data.frame(data)) match(rn, rownames(data)) else suppressWarnings(as.integer(rn))
  if (anyNA(pos)) pos <- seq_len(nrow(mf))
  pos
}

pwb_new_lambda <- function(res, family, level, range, variable, predictors, na_action) {
  structure(list(
    lambda = res$lambda, conf_int = c(res$conf_low, res$conf_high), convenient = res$convenient,
    loglik = res$loglik, family = family, n = as.integer(res$n), at_bound = res$at_bound,
    converged = res$converged, low_open = res$low_open, high_open = res$high_open,
    level = level, range = range,
    profile = data.frame(lambda = res$grid, loglik = res$grid_loglik),
    variable = variable, predictors = predictors, rank = NA_integer_, aliased = character(0),
    na_action = na_action), class = "pwb_lambda")
}
