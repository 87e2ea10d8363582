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
#' The convenient value is the one of -2, -1, -1/2, -1/3, 0, 1/3, 1/2, 1, 2 nearest
#' \eqn{\hat\lambda} inside the interval (ties go to the smaller), or \eqn{\hat\lambda} rounded to
#' two decimals when none lies inside. A convenient power is easier to explain (0 is the log,
#' 1/3 the cube root, common for volumes, counts and concentrations, -1 the reciprocal).
#'
#' `range` may not reach beyond -100 or 100: there a power follows only the most extreme values.
#' `at_bound` is `TRUE` when the estimate lies within a few steps of the maximiser (relative
#' 3e-8 each) of a range end, however wide the range. A response that the predictors fit exactly
#' (1 - R^2 below 1e-12 on the transformed scale at the estimate) is an error: the likelihood
#' has no maximum there, so any estimate or interval would be arbitrary.
#'
#' With `weights` (precision weights as in [stats::lm()]: the error variance of row i is
#' \eqn{\sigma^2 / w_i}) the residual sum of squares is weighted and the profile gains
#' \eqn{\frac12\sum\log w_i}{1/2 sum log w_i}, so that at a fixed \eqn{\lambda} it equals `logLik()` of
#' the weighted `lm` of the transformed response plus the (unweighted) Jacobian. Rows of weight 0
#' are dropped, as `lm` drops them from its likelihood: they do not count in `n` and their
#' response is not checked. Negative or infinite weights are an error naming the rows.
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
#' @param weights optional precision weights (finite, \eqn{\ge 0}), one per observation. For
#'   `estimate_lambda()` a numeric vector; for `estimate_response_lambda()` evaluated as
#'   [stats::lm()] evaluates its `weights`: a column of `data` or a vector (`NULL` for equal
#'   weights).
#' @return An object of class `pwb_lambda`: a list with `lambda`, `conf_int` (length 2),
#'   `convenient`, `loglik` (at \eqn{\hat\lambda}, original scale), `family`, `n`, `at_bound`,
#'   `converged`, `low_open`, `high_open`, `level`, `range`, `profile` (a data frame `lambda`,
#'   `loglik` of about 101 points spanning the interval), `variable` (the variable's name),
#'   `predictors` (`NULL`, or the right-hand side of the model), `rank` and `aliased` (response
#'   case) and `na_action`. Methods: print, plot, coef, confint, [as_transform()].
#'
#'   With a matrix response (`cbind(y1, y2, ...) ~ x`, or a numeric matrix column of `data`),
#'   `estimate_response_lambda()` returns a `pwb_lambda_set` instead: a data frame with one row
#'   per response (`response`, `lambda`, `conf_low`, `conf_high`, `convenient`, `at_bound`,
#'   `converged`, `n`; see [print.pwb_lambda_set()]), each response estimated against the same
#'   design with one factorisation of it, and equal to a separate call on that response over the
#'   same rows. Rows with a missing value in any response are handled by `na.action`, as
#'   [stats::lm()] handles a matrix response. [response_fits()] gives each response's full
#'   `pwb_lambda` (with its profile). A column that Box-Cox cannot take (a value \eqn{\le 0}) is
#'   an error naming the column and its rows.
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
#'
#' # several responses against the same predictors, one factorisation of the design
#' estimate_response_lambda(cbind(Ozone, Wind) ~ Temp + Month, datasets::airquality)
#' @export
estimate_lambda <- function(x, family = c("box-cox", "yeo-johnson"), range = c(-3, 3),
                            level = 0.95, weights = NULL) {
  xname <- deparse1(substitute(x))
  family <- pwb_match_choice(family, "family")
  pwb_lambda_check_args(range, level)
  if (!is.numeric(x))
    stop(sprintf("`%s` must be numeric, not %s", xname, class(x)[1L]), call. = FALSE)
  x <- as.vector(x)
  if (!is.null(weights) && (!is.numeric(weights) || length(weights) != length(x)))
    stop(sprintf("`weights` must be a numeric vector as long as `%s` (%d values)", xname,
                 length(x)), call. = FALSE)
  na_fun <- getOption("na.action", "na.omit")
  frame <- if (is.null(weights)) data.frame(x = x) else data.frame(x = x, w = weights)
  kept <- do.call(na_fun, list(frame))
  na_rows <- attr(kept, "na.action")
  res <- rpwb_estimate_lambda(as.double(kept$x), family, range[1L], range[2L], level, 101L,
                              if (is.null(weights)) NULL else as.double(kept$w))
  if (!is.null(res$error))
    pwb_lambda_stop(res, pwb_lambda_rows(length(x), na_rows), xname)
  pwb_new_lambda(res, family, level, range, xname, NULL, na_rows)
}

#' @rdname estimate_lambda
#' @param object a model formula such as `y ~ a + b` (with `data`), or a fitted [stats::lm()]
#'   object whose model frame (and weights) are reused. Factors, interactions and `na.action` are
#'   handled as `lm` handles them. Offsets are not supported.
#' @param data a data frame holding the variables of the formula.
#' @param subset an optional vector choosing the rows to use, evaluated as [stats::lm()]
#'   evaluates its `subset` (formula only).
#' @param na.action for a formula: how to treat missing values, as in [stats::lm()]; by
#'   default `getOption("na.action")`.
#' @export
estimate_response_lambda <- function(object, data = NULL, family = c("box-cox", "yeo-johnson"),
                                     range = c(-3, 3), level = 0.95, na.action = NULL,
                                     weights = NULL, subset = NULL) {
  family <- pwb_match_choice(family, "family")
  pwb_lambda_check_args(range, level)
  if (inherits(object, "lm")) {
    if (!missing(weights) || !missing(subset))
      stop("`weights` and `subset` come from the lm fit itself; refit it to change them",
           call. = FALSE)
    mf <- pwb_lambda_lm_frame(object)
  } else {
    mf <- pwb_lambda_formula_frame(object, data, na.action, substitute(weights),
                                   substitute(subset), parent.frame())
  }
  mt <- attr(mf, "terms")
  yname <- deparse1(attr(mt, "variables")[[2L]])
  y <- pwb_frame_response(mf)  # model_frame_nocopy.R
  if (is.null(y))
    stop("the model needs a response on the left of `~`", call. = FALSE)
  if (is.matrix(y) && is.numeric(y))  # many responses, one design: lambda_many.R
    return(pwb_lambda_set_estimate(mf, y, family, range, level))
  if (!is.numeric(y) || is.matrix(y))
    stop(sprintf(paste0("the response `%s` is %s, not a numeric vector: convert it (e.g. ",
                        "as.numeric() on a column of numbers stored as text) or choose a numeric ",
                        "response"), yname, class(y)[1L]), call. = FALSE)
  if (attr(mt, "intercept") != 1L)
    stop("the response lambda needs a model with an intercept: remove `- 1` or `+ 0`",
         call. = FALSE)
  w <- stats::model.weights(mf)
  mm <- stats::model.matrix(mt, mf)
  res <- rpwb_estimate_response_lambda(y, mm, family, range[1L], range[2L], level, 101L,
                                       if (is.null(w)) NULL else as.double(w), 1L)
  if (!is.null(res$error)) pwb_lambda_stop(res, pwb_lambda_frame_rows(mf), yname)
  aliased <- colnames(mm)[res$aliased + 1L]  # 0-based design columns, 0 the intercept
  rhs <- deparse1(mt[[3L]])
  out <- pwb_new_lambda(res, family, level, range, yname, rhs, attr(mf, "na.action"))
  out$rank <- as.integer(res$rank)
  out$aliased <- aliased
  out$weighted <- !is.null(w)
  out
}

pwb_lambda_check_args <- function(range, level) {
  pwb_check_range(range)
  pwb_check_level(level)
}

# The model frame of a formula, with weights and subset evaluated as lm evaluates them (in `data`,
# then in the caller's frame), and a column of the rows' positions in `data` when a subset is
# given (so that messages name the caller's rows).
pwb_lambda_formula_frame <- function(formula, data, na.action, wexpr, sexpr, env) {
  if (!inherits(formula, "formula"))
    stop("`object` must be a formula (with `data`) or an lm fit", call. = FALSE)
  if (!is.null(data) && !is.data.frame(data) && !is.environment(data) && !is.list(data))
    stop("`data` must be a data frame", call. = FALSE)
  fenv <- environment(formula)
  if (is.null(fenv)) fenv <- env
  for (v in setdiff(all.vars(formula), ".")) {
    if (!is.null(data) && !is.environment(data) && v %in% names(data)) next
    if (exists(v, envir = if (is.environment(data)) data else fenv)) next
    stop(sprintf(paste0("the formula's variable `%s` is not a column of `data` nor an object in ",
                        "the formula's environment: check its spelling, or pass the data frame ",
                        "that holds it as `data`"), v), call. = FALSE)
  }
  where <- if (is.null(data)) fenv else data
  args <- list(formula = formula, data = where, drop.unused.levels = TRUE)
  if (!is.null(wexpr)) args$weights <- eval(wexpr, where, env)
  if (!is.null(sexpr)) {
    args$subset <- eval(sexpr, where, env)
    if (is.data.frame(data)) args$pwb_row <- seq_len(nrow(data))
  }
  if (!is.null(na.action)) args$na.action <- na.action
  mf <- pwb_model_frame(args)  # model_frame_nocopy.R: no copy of complete data
  if (!is.null(stats::model.offset(mf)))
    stop("offsets are not supported: move the offset into the response first", call. = FALSE)
  mf
}

pwb_lambda_lm_frame <- function(object) {
  mf <- stats::model.frame(object)
  if (!is.null(stats::model.offset(mf)))
    stop("lm fits with an offset are not supported: move the offset into the response first",
         call. = FALSE)
  mf
}

# 1-based positions, in the caller's data, of the rows kept after `na_rows` were removed from
# n rows.
pwb_lambda_rows <- function(n, na_rows) {
  pos <- seq_len(n)
  if (length(na_rows)) pos[-as.integer(na_rows)] else pos
}

# The same for a model frame: from its row column (subset given), else from its na.action.
pwb_lambda_frame_rows <- function(mf) {
  if (!is.null(mf[["(pwb_row)"]])) return(mf[["(pwb_row)"]])
  na_rows <- attr(mf, "na.action")
  pwb_lambda_rows(nrow(mf) + length(na_rows), na_rows)
}

# Stops with a message naming the caller's rows (pos maps the library's 0-based rows).
pwb_lambda_stop <- function(res, pos, what) {
  rows <- pos[res$rows + 1]
  k <- as.integer(res$count)
  at <- sprintf("%s %s", pwb_plural(k, "row"), pwb_format_rows(rows))
  if (k > length(rows)) at <- paste0(at, ", ...")
  more <- if (k > length(rows)) sprintf(" (%d in all)", k) else ""
  msg <- switch(paste(res$input, res$status),
    "0 PWB_ERR_NONFINITE" = sprintf("`%s` has %d infinite %s at %s%s: remove or replace them first",
                                    what, k, pwb_plural(k, "value"), at, more),
    "0 PWB_ERR_DOMAIN" = sprintf("Box-Cox needs %s > 0; %d %s <= 0 at %s%s: use Yeo-Johnson or a shift",
                                 what, k, pwb_plural(k, "value"), at, more),
    "1 PWB_ERR_NONFINITE" = sprintf("predictors have infinite values at %s%s: remove or replace them first",
                                    at, more),
    "2 PWB_ERR_NONFINITE" = sprintf(paste0("`weights` have %d infinite %s at %s%s: give every row a ",
                                           "finite weight >= 0 (0 drops the row)"),
                                    k, pwb_plural(k, "value"), at, more),
    "2 PWB_ERR_ARGUMENT" = sprintf(paste0("`weights` must be >= 0; %d negative at %s%s: precision ",
                                          "weights are inverse relative variances (0 drops a row)"),
                                   k, at, more),
    res$error)
  stop(msg, call. = FALSE)
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
