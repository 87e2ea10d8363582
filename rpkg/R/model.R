#' Fit a linear model on transformed variables
#'
#' The formula names raw variables (`cost ~ area + age + region`). The chosen transforms are
#' applied to those variables first, every constant is stored, and the linear model is fitted
#' on the transformed scale by the package's core library, which stays alive inside the
#' returned object: coefficients, their covariance, sigma, residuals, leverages and predictions
#' all come from that one fit (after [saveRDS()]/[readRDS()] the core model is rebuilt once, on
#' first use, from the stored model frame, and predicts exactly as before). Predictions with
#' [predict.pwb_model()] come back in original units.
#'
#' Response: `"estimate"` finds the maximum-likelihood power of the response given the
#' (transformed) predictors with [estimate_response_lambda()] (over `range`, with the same
#' weights) and uses its convenient value; a warning says so when the estimate sits at an edge
#' of `range`. `"none"` keeps the response as it is; a `pwb_transform` is used as given; a
#' `pwb_lambda` is turned into its convenient transform by [as_transform()].
#'
#' Predictors: `NULL` (none transformed); `"ladder"` (the ladder-of-powers transforms proposed
#' by [screen_skew()] for skewed numeric predictors); `"ml"` (maximum-likelihood powers for
#' linearity: [box_tidwell()] on every positive numeric predictor entering the formula as a
#' plain term, using its suggested transform, and none where it suggests none; the response is
#' taken as given by `response` when that is a transform, raw otherwise); `"marginal"` (a
#' maximum-likelihood power making each skewed numeric predictor look normal on its own, from
#' [screen_skew()]: Box-Cox when every value is positive, otherwise Yeo-Johnson; this aims at
#' symmetric predictors, not at a straight-line relation); or a named list of `pwb_transform`
#' objects, one per raw variable. Factors and interactions of raw variables are handled by the
#' formula as usual; a transformed variable enters every term that names it.
#'
#' Weights are precision weights as in [stats::lm()]: row i has variance \eqn{\sigma^2/w_i}; a
#' zero weight leaves the row out of the fit (it keeps a fitted value and a residual); negative
#' or missing weights are an error naming the rows. `subset` and `na.action` work as in `lm()`.
#' Offsets are not supported.
#'
#' The log-likelihood ([logLik.pwb_model()]) is on the original scale of the response: the
#' (weighted) normal log-likelihood on the transformed scale plus the log-Jacobian of the
#' response transform, so AIC compares models with different response transforms of the same
#' data. Its degrees of freedom count the coefficients, sigma, and one more when the response
#' power was estimated from the data (`response = "estimate"` or a `pwb_lambda`).
#'
#' An ordinary `lm` of the same fit, whose formula calls the stored transforms (so its
#' coefficient names, `summary()` and `anova()` show them and `predict()` takes raw new data),
#' is made on request by [transformed_lm()]; `model$lm` is a shortcut for it.
#'
#' Cautions: a transform changes what the model estimates (on the log scale a coefficient is a
#' multiplicative effect on the median, not an additive effect on the mean); back-transformed
#' fitted values are medians, and means need a correction (`center = "mean"` in
#' [predict.pwb_model()]); and these results inform, but do not replace, domain standards and
#' professional judgement.
#'
#' @param formula a two-sided formula of raw variables; its left side must be a variable name,
#'   or `cbind(y1, y2, ...)` of variable names for one model per response (see Value).
#'   A fitted `lm` is accepted too: its formula, data, weights, subset and `na.action` are
#'   reused (arguments given here override its `na.action`).
#' @param data a data frame holding the variables of the formula; when missing, the variables
#'   are taken from the formula's environment (as [stats::lm()] and
#'   [estimate_response_lambda()] do).
#' @param response `"estimate"`, `"none"`, a `pwb_transform` or a `pwb_lambda` (see Details).
#' @param predictors `NULL`, `"ladder"`, `"ml"`, `"marginal"` or a named list of
#'   `pwb_transform` (see Details).
#' @param family the family whose power is estimated for the response: `"box-cox"` or
#'   `"yeo-johnson"`.
#' @param level confidence level of the power's profile-likelihood interval (which decides its
#'   convenient value).
#' @param na.action a missing-value function such as [stats::na.omit()] or [stats::na.exclude()]
#'   (the latter pads residuals, fitted values and predictions without `newdata` with `NA`);
#'   `NULL` uses `getOption("na.action")`.
#' @param weights optional precision weights, evaluated in `data` like `lm()`'s (see Details).
#' @param subset optional rows to use, evaluated in `data` like `lm()`'s.
#' @param range the search range of the response power when `response = "estimate"`.
#' @return An object of class `pwb_model`: a list with `call`, `formula`, `terms`, `frame` (the
#'   raw variables of the rows used, with `(weights)`), `response` (the response's
#'   `pwb_transform`), `predictors` (named list of `pwb_transform`), `response_lambda` (the
#'   `pwb_lambda` when one was used), `coefficients`, `se`, `aliased`, `vcov`, `sigma`,
#'   `df_residual`, `rank`, `loglik`, `loglik_df`, `nobs`, `na.action`, `xlevels`,
#'   `contrasts` and the live core model (`handle`). `$residuals`, `$fitted` (transformed
#'   scale), `$leverages`, `$y` (raw response) and `$lm` are read from the core model on request.
#'
#'   With `cbind(y1, y2, ...)` on the left, a `pwb_model_set` (see [print.pwb_model_set()]): a
#'   named list of one `pwb_model` per response, each equal to a separate `lm_transformed()` of
#'   that response with the same arguments over the same rows (a row with a missing value in any
#'   response is left out of every model through `na.action`, as [stats::lm()] treats a matrix
#'   response); `data` must then be a data frame. Each model's `call` names its own response
#'   (re-running it does not drop the rows missing only in the other responses).
#' @seealso [predict.pwb_model()], [pwb_model_methods], [anova.pwb_model()],
#'   [transformed_lm()], [residual_checks()], [plot.pwb_model()]
#' @examples
#' river <- river_data()
#' new <- river_data("new")
#' m <- lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + forest_pct + season, river,
#'                     predictors = list(flow_m3s = new_transform("log")))
#' m
#' predict(m, head(new), interval = "prediction")
#' AIC(m, lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + forest_pct + season, river,
#'                       response = "none"))
#' # precision weights (e.g. the number of samples averaged into each row)
#' w <- rep(c(1, 2), length.out = nrow(river))
#' mw <- lm_transformed(sediment_t_day ~ flow_m3s + season, river, weights = w,
#'                      response = new_transform("log"))
#' coef(mw)
#' @export
lm_transformed <- function(formula, data, response = "estimate", predictors = NULL,
                           family = "box-cox", level = 0.95, na.action = NULL, weights = NULL,
                           subset = NULL, range = c(-3, 3)) {
  if (pwb_is_cbind_formula(formula))  # several responses: model_many.R
    return(pwb_model_set_fit(formula, match.call(), parent.frame()))
  call <- match.call()
  pwb_check_level(level)
  family <- pwb_match_choice(family, "family", c("box-cox", "yeo-johnson"))
  pwb_check_range(range)
  src <- pwb_model_source(formula, if (missing(data)) NULL else data, call, parent.frame(),
                          na.action)
  formula <- src$formula
  frame <- pwb_variables_frame(src)
  yname <- as.character(formula[[2L]])
  xvars <- setdiff(all.vars(formula[[3L]]), yname)
  xvars <- intersect(xvars, names(frame))
  w <- stats::model.weights(frame)
  if (!is.null(w)) pwb_check_weights(w, frame, src$data)
  vars_df <- pwb_frame_variables(frame)
  ptrs <- pwb_choose_predictor_transforms(predictors, vars_df, formula, xvars, yname, response,
                                          level, w)
  tdata <- pwb_transform_columns(vars_df, ptrs)
  design <- pwb_model_design(list(formula = formula, contrasts = NULL), tdata, full = TRUE)
  resp <- pwb_choose_response_transform(response, formula, tdata, family, level, range, w,
                                        design)
  if (isTRUE(resp$lambda$at_bound))
    warning(sprintf(paste0("the estimated response power %.4g lies at the edge of its search ",
                           "range [%g, %g]: widen it with `range =` (e.g. range = c(%g, %g)) ",
                           "or question the family"), resp$lambda$lambda, range[1L], range[2L],
                    2 * range[1L], 2 * range[2L]), call. = FALSE)
  pwb_check_response_domain(resp$transform, frame[[yname]], yname, frame, src$data)
  object <- list(call = call, formula = formula, frame = frame, response = resp$transform,
                 predictors = ptrs, response_lambda = resp$lambda, estimated = resp$estimated,
                 yname = yname, xvars = xvars, na.action = attr(frame, "na.action"),
                 contrasts = NULL)
  handle <- pwb_fit_core_model(design, resp$transform, resp$estimated, w)
  s <- rpwb_model_summary(handle)
  nm <- design$names
  names(s$coefficients) <- names(s$se) <- names(s$aliased) <- nm
  dimnames(s$vcov) <- list(nm, nm)
  object$terms <- design$terms
  object$xlevels <- design$xlevels
  object$contrasts <- design$contrasts
  object$assign <- design$assign
  object <- c(object, s[c("coefficients", "se", "aliased", "vcov", "sigma", "df_residual", "rank",
                          "loglik", "loglik_df", "jacobian", "nobs", "rss")],
              list(n = as.integer(s$n), weighted = !is.null(w),
                   handle = pwb_new_handle_env(handle)))
  structure(object, class = "pwb_model")
}

pwb_spec_or_null <- function(tr) {
  if (is.null(tr) || identical(tr$family, "identity") && !isTRUE(tr$reflect) && tr$shift == 0)
    return(NULL)
  unclass(tr)
}

# Response values outside the domain of its transform: an error naming the caller's rows.
pwb_check_response_domain <- function(tr, y, yname, frame, data) {
  chk <- rpwb_transform_map(unclass(tr), as.double(y), 0L)
  if (chk$status == 0L) return(invisible())
  pos <- pwb_frame_rows(frame, data)
  bad <- which(is.na(chk$value))
  x <- rep(NA_real_, max(pos))
  x[pos] <- y
  stop(pwb_invalid_message(tr, x, pos[bad], yname, FALSE), call. = FALSE)
}

# Negative or non-finite weights: an error naming the rows of the caller's data.
pwb_check_weights <- function(w, frame, data) {
  bad <- which(!is.finite(w) | w < 0)
  if (!length(bad)) return(invisible())
  rows <- pwb_frame_rows(frame, data)[bad]
  stop(sprintf(paste0("weights must be finite and >= 0: %d %s negative or missing at %s %s; ",
                      "fix them, or give those rows weight 0 to leave them out"),
               length(bad), if (length(bad) == 1L) "is" else "are",
               pwb_plural(length(bad), "row"), pwb_format_rows(rows)), call. = FALSE)
}

# 1-based positions of the frame's rows in the caller's data (by row name when possible).
pwb_frame_rows <- function(frame, data) {
  pos <- if (is.data.frame(data)) match(rownames(frame), rownames(data))
         else suppressWarnings(as.integer(rownames(frame)))
  if (anyNA(pos)) pos <- seq_len(nrow(frame))
  pos
}

# The raw variables of the frame as a plain data frame (no weights column, no terms).
pwb_frame_variables <- function(frame) {
  keep <- setdiff(names(frame), c("(weights)", "(subset)"))
  out <- as.data.frame(as.list(frame)[keep], optional = TRUE, stringsAsFactors = FALSE)
  attr(out, "row.names") <- attr(frame, "row.names")
  out
}

# The frame's variables with the predictor transforms applied (rows named as the frame's).
pwb_transform_columns <- function(vars_df, ptrs) {
  for (v in names(ptrs))
    vars_df[[v]] <- pwb_map_values(ptrs[[v]], vars_df[[v]], v, "error", inverse = FALSE)
  vars_df
}

# list(transform, lambda, estimated) for the response.
pwb_choose_response_transform <- function(response, formula, tdata, family, level, range, w,
                                          design = NULL) {
  if (inherits(response, "pwb_transform"))
    return(list(transform = response, lambda = NULL, estimated = 0L))
  if (inherits(response, "pwb_lambda"))
    return(list(transform = as_transform(response, "convenient"), lambda = response,
                estimated = 1L))
  if (!is.character(response) || length(response) != 1L || !response %in% c("estimate", "none"))
    stop(paste0("`response` must be \"estimate\", \"none\", a pwb_transform (new_transform()) ",
                "or a pwb_lambda (estimate_response_lambda())"), call. = FALSE)
  if (response == "none")
    return(list(transform = new_transform("identity"), lambda = NULL, estimated = 0L))
  # the design already built for the fit serves when it can (see model_estimate.R)
  lam <- if (is.null(design)) NULL else pwb_lambda_on_design(design, formula, family, level,
                                                             range, w)
  if (is.null(lam)) {
    args <- list(formula, data = tdata, family = family, range = range, level = level,
                 na.action = stats::na.fail)
    if (!is.null(w)) args$weights <- w
    lam <- do.call(estimate_response_lambda, args)
  }
  list(transform = as_transform(lam, "convenient"), lambda = lam, estimated = 1L)
}
