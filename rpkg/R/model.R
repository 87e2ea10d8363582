#' Fit a linear model on transformed variables
#'
#' The formula names raw variables (`cost ~ area + age + region`). The chosen transforms are
#' applied to those variables first, every constant is stored, and an ordinary [stats::lm()] fit
#' is made on the transformed scale and kept as `$lm`, so `summary(model$lm)`, `anova(model$lm)`
#' and other habits still work. Predictions with [predict.pwb_model()] come back in original
#' units.
#'
#' Response: `"estimate"` finds the maximum-likelihood power of the response given the
#' (transformed) predictors with [estimate_response_lambda()] and uses its convenient value;
#' `"none"` keeps the response as it is; a `pwb_transform` is used as given; a `pwb_lambda` is
#' turned into its convenient transform by [as_transform()].
#'
#' Predictors: `NULL` (none transformed); `"ladder"` (the ladder-of-powers transforms proposed
#' by [screen_skew()] for skewed numeric predictors); `"ml"` (a maximum-likelihood power for each
#' numeric predictor the screen finds skewed: Box-Cox when every value is positive, otherwise
#' Yeo-Johnson); or a named list of `pwb_transform` objects, one per raw variable. Factors and
#' interactions of raw variables are handled by the formula as usual; a transformed variable
#' enters every term that names it.
#'
#' Missing values follow `na.action` (by default `getOption("na.action")`), as in `lm()`.
#'
#' The log-likelihood ([logLik.pwb_model()]) is on the original scale of the response: the
#' normal log-likelihood on the transformed scale plus the log-Jacobian of the response
#' transform, so AIC compares models with different response transforms of the same data. Its
#' degrees of freedom count the coefficients, sigma, and one more when the response power was
#' estimated from the data (`response = "estimate"` or a `pwb_lambda`).
#'
#' Cautions: a transform changes what the model estimates (on the log scale a coefficient is a
#' multiplicative effect on the median, not an additive effect on the mean); back-transformed
#' fitted values are medians, and means need a correction (`center = "mean"` in
#' [predict.pwb_model()]); and these results inform, but do not replace, domain standards and
#' professional judgement.
#'
#' @param formula a two-sided formula of raw variables; its left side must be a variable name.
#' @param data a data frame holding every variable of the formula.
#' @param response `"estimate"`, `"none"`, a `pwb_transform` or a `pwb_lambda` (see Details).
#' @param predictors `NULL`, `"ladder"`, `"ml"` or a named list of `pwb_transform`.
#' @param family the family whose power is estimated for the response: `"box-cox"` or
#'   `"yeo-johnson"`.
#' @param level confidence level of the power's profile-likelihood interval (which decides its
#'   convenient value).
#' @param na.action a missing-value function such as [stats::na.omit()] or [stats::na.exclude()]
#'   (the latter pads residuals, fitted values and predictions without `newdata` with `NA`);
#'   `NULL` uses `getOption("na.action")`.
#' @return An object of class `pwb_model`: a list with `lm` (the fit on the transformed scale),
#'   `response` (the response's `pwb_transform`), `predictors` (named list of `pwb_transform`),
#'   `response_lambda` (the `pwb_lambda` when one was used), `coefficients`, `se`, `aliased`,
#'   `sigma`, `df_residual`, `rank`, `loglik`, `loglik_df`, and what prediction needs.
#' @seealso [predict.pwb_model()], [residual_checks()], [plot.pwb_model()]
#' @examples
#' river <- river_data()
#' new <- river_data("new")
#' m <- lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + forest_pct + season, river,
#'                     predictors = list(flow_m3s = new_transform("log")))
#' m
#' predict(m, head(new), interval = "prediction")
#' AIC(m, lm_transformed(sediment_t_day ~ flow_m3s + rain72_mm + forest_pct + season, river,
#'                       response = "none"))
#' @export
lm_transformed <- function(formula, data, response = "estimate", predictors = NULL,
                           family = "box-cox", level = 0.95, na.action = NULL) {
  call <- match.call()
  if (!inherits(formula, "formula") || length(formula) != 3L)
    stop("`formula` must be a two-sided formula such as cost ~ area + age", call. = FALSE)
  if (!is.data.frame(data)) stop("`data` must be a data frame", call. = FALSE)
  pwb_check_level(level)
  family <- match.arg(family, c("box-cox", "yeo-johnson"))
  if (!is.symbol(formula[[2L]]))
    stop(sprintf(paste0("the left side of the formula must be a variable name, not `%s`: ",
                        "choose the response's transform with `response =`"),
                 deparse1(formula[[2L]])), call. = FALSE)
  yname <- as.character(formula[[2L]])
  formula <- stats::formula(stats::terms(formula, data = data))
  vars <- all.vars(formula)
  missing_vars <- setdiff(vars, names(data))
  if (length(missing_vars))
    stop(sprintf("`data` has no %s %s: add %s or change the formula",
                 pwb_plural(length(missing_vars), "variable"),
                 paste0("`", missing_vars, "`", collapse = ", "),
                 pwb_plural(length(missing_vars), "it", "them")), call. = FALSE)
  if (!is.numeric(data[[yname]]))
    stop(sprintf("the response `%s` must be numeric, not %s", yname, class(data[[yname]])[1L]),
         call. = FALSE)
  xvars <- setdiff(vars, yname)
  if (is.null(na.action)) na.action <- getOption("na.action", "na.omit")

  ptrs <- pwb_choose_predictor_transforms(predictors, data, xvars, level)
  tdata <- data
  for (v in names(ptrs))
    tdata[[v]] <- pwb_map_values(ptrs[[v]], data[[v]], v, "error", inverse = FALSE)

  resp <- pwb_choose_response_transform(response, formula, tdata, family, level, na.action)
  tdata[[yname]] <- pwb_map_values(resp$transform, data[[yname]], yname, "error", inverse = FALSE)

  fit <- stats::lm(formula, data = tdata, na.action = na.action)
  fit$call <- call("lm", formula = formula, data = quote(transformed_data))
  used <- seq_len(nrow(data))
  if (!is.null(fit$na.action)) used <- used[-as.integer(fit$na.action)]
  design <- pwb_design_parts(stats::model.matrix(fit))
  y <- as.double(data[[yname]][used])
  core <- rpwb_model_fit(y, design$X, design$intercept, pwb_spec_or_null(resp$transform),
                         resp$estimated)
  names(core$coefficients) <- names(core$se) <- names(core$aliased) <- design$names

  keep <- intersect(c(yname, xvars), names(data))
  structure(c(list(lm = fit, call = call, formula = formula, response = resp$transform,
                   predictors = ptrs, response_lambda = resp$lambda, estimated = resp$estimated,
                   yname = yname, xvars = xvars, y = y, data = data[, keep, drop = FALSE],
                   na.action = na.action, n = length(y)),
                core[c("coefficients", "se", "aliased", "sigma", "df_residual", "rank",
                       "residuals", "fitted", "leverages", "loglik", "loglik_df", "jacobian")]),
            class = "pwb_model")
}

# The design without its intercept column, the intercept flag and the column names.
pwb_design_parts <- function(mm) {
  intercept <- ncol(mm) > 0L && colnames(mm)[1L] == "(Intercept)"
  names <- colnames(mm)
  X <- if (intercept) mm[, -1L, drop = FALSE] else mm
  X <- matrix(as.double(X), nrow = nrow(mm), ncol = ncol(X))
  list(X = X, intercept = intercept, names = names)
}

pwb_spec_or_null <- function(tr) {
  if (is.null(tr) || identical(tr$family, "identity") && !isTRUE(tr$reflect) && tr$shift == 0)
    return(NULL)
  unclass(tr)
}

pwb_check_level <- function(level) {
  if (!is.numeric(level) || length(level) != 1L || is.na(level) || level <= 0 || level >= 1)
    stop("`level` must be a single number strictly between 0 and 1, e.g. 0.95", call. = FALSE)
}

# list(transform, lambda, estimated) for the response.
pwb_choose_response_transform <- function(response, formula, tdata, family, level, na.action) {
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
  lam <- estimate_response_lambda(formula, data = tdata, family = family, level = level,
                                  na.action = na.action)
  list(transform = as_transform(lam, "convenient"), lambda = lam, estimated = 1L)
}

# Named list of pwb_transform for the predictors.
pwb_choose_predictor_transforms <- function(predictors, data, xvars, level) {
  if (is.null(predictors)) return(list())
  numeric_x <- xvars[vapply(xvars, function(v) is.numeric(data[[v]]), logical(1))]
  if (is.character(predictors) && length(predictors) == 1L && predictors %in% c("ladder", "ml"))
    return(pwb_auto_predictor_transforms(predictors, data, numeric_x, level))
  if (!is.list(predictors) || is.null(names(predictors)) || any(!nzchar(names(predictors))))
    stop("`predictors` must be NULL, \"ladder\", \"ml\" or a named list of pwb_transform",
         call. = FALSE)
  for (v in names(predictors)) {
    if (!inherits(predictors[[v]], "pwb_transform"))
      stop(sprintf("`predictors$%s` must be a pwb_transform made by new_transform()", v),
           call. = FALSE)
    if (!v %in% xvars)
      stop(sprintf("`predictors` names `%s`, which is not a predictor of the formula", v),
           call. = FALSE)
    if (!is.numeric(data[[v]]))
      stop(sprintf("`%s` is not numeric and cannot be transformed", v), call. = FALSE)
  }
  predictors
}

# "ladder" or "ml" transforms of the numeric predictors that screen_skew() finds skewed (its
# ladder step is not "none"); the others stay as they are.
pwb_auto_predictor_transforms <- function(how, data, vars, level) {
  if (!length(vars)) return(list())
  s <- screen_skew(data, vars = vars, level = level)
  step <- s$table$ladder
  skewed <- s$table$variable[!is.na(step) & step != "none"]
  trs <- if (how == "ladder") s$ladder[skewed] else s$ml[skewed]
  trs[!vapply(trs, is.null, logical(1))]
}
