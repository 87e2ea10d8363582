#' An ordinary lm of a transformed model, with the transforms in its formula
#'
#' Fits [stats::lm()] to the raw variables of a `pwb_model` with a formula that calls the
#' model's stored transforms: for a log response and a Box-Cox power 0.5 of `x` the formula is
#' `pwb_log(y) ~ pwb_boxcox0.5(x) + ...`, where each `pwb_*` function lives in the formula's
#' environment and applies the stored transform (with its shift and reflection). So its
#' coefficient names, `summary()` and `anova()` show the transforms, and
#' `predict(transformed_lm(m), newdata)` takes raw new data and returns the transformed-scale
#' prediction (equal to `predict(m, newdata, type = "transformed")`). Weights, the rows used and
#' the `na.action` padding are those of the model. `m$lm` is a shortcut; each call fits the `lm`
#' anew (a second fit of the same rows), so keep the result when it is used more than once.
#'
#' @param model a `pwb_model` from [lm_transformed()].
#' @return An `lm` object.
#' @examples
#' m <- lm_transformed(Volume ~ Girth + Height, trees, response = new_transform("log"),
#'                     predictors = list(Girth = new_transform("log")))
#' fit <- transformed_lm(m)
#' coef(fit)
#' predict(fit, data.frame(Girth = 8, Height = 70))  # log scale, from raw values
#' @export
transformed_lm <- function(model) {
  if (!inherits(model, "pwb_model")) stop("`model` must be a pwb_model from lm_transformed()",
                                          call. = FALSE)
  trs <- c(stats::setNames(list(model$response), model$yname), model$predictors)
  trs <- trs[!vapply(trs, pwb_is_identity, logical(1))]
  env <- new.env(parent = environment(model$formula))
  map <- list()
  specs <- list()
  for (v in names(trs)) {
    nm <- pwb_transform_fun_name(trs[[v]])
    base <- nm
    k <- 1L
    while (!is.null(specs[[nm]]) && !identical(specs[[nm]], unclass(trs[[v]]))) {
      k <- k + 1L
      nm <- paste0(base, "_", k)
    }
    specs[[nm]] <- unclass(trs[[v]])
    assign(nm, pwb_transform_fun(trs[[v]]), envir = env)
    map[[v]] <- nm
  }
  f <- pwb_wrap_variables(model$formula, map)
  f <- stats::as.formula(f, env = env)
  environment(f) <- env
  fit <- pwb_lm_on_frame(f, model$frame, model$contrasts)
  fit$call <- call("lm", formula = f, data = quote(model_variables),
                   weights = if (isTRUE(model$weighted)) quote(weights))
  fit$na.action <- model$na.action
  fit
}

utils::globalVariables(".pwb_weights")

# lm() of formula `f` on the raw variables of a model frame, with its weights when it has some.
pwb_lm_on_frame <- function(f, frame, contrasts = NULL) {
  data <- pwb_frame_variables(frame)
  w <- stats::model.weights(frame)
  if (is.null(w))
    return(stats::lm(f, data = data, contrasts = contrasts, na.action = stats::na.fail))
  data$.pwb_weights <- w
  stats::lm(f, data = data, weights = .pwb_weights, contrasts = contrasts,
            na.action = stats::na.fail)
}

pwb_is_identity <- function(tr) {
  is.null(tr) || identical(tr$family, "identity") && !isTRUE(tr$reflect) && tr$shift == 0
}

# A syntactic function name that describes the transform: pwb_ + [reflect<pivot>_] + family +
# [power] + [_shift<c>], numbers with 4 significant digits and "m" for a minus sign.
pwb_transform_fun_name <- function(tr) {
  num <- function(v) gsub("-", "m", trimws(formatC(v, digits = 4L, format = "fg")))
  fam <- switch(tr$family, "box-cox" = "boxcox", "yeo-johnson" = "yeojohnson",
                reciprocal = "recip", tr$family)
  nm <- fam
  # The library leaves lambda NA for families without one (rpwb_transform_normalise).
  if (!is.null(tr$lambda) && !is.na(tr$lambda))
    nm <- paste0(nm, num(tr$lambda))
  if (!is.null(tr$shift) && tr$shift != 0) nm <- paste0(nm, "_shift", num(tr$shift))
  if (isTRUE(tr$reflect)) nm <- paste0("reflect", num(tr$pivot), "_", nm)
  paste0("pwb_", gsub("[^A-Za-z0-9_.]", "_", nm))
}

# The stored transform as a function of raw values (an error names out-of-domain rows).
pwb_transform_fun <- function(tr) {
  force(tr)
  function(x) apply_transform(tr, x)
}

# The formula with every variable in `map` replaced by a call of its function.
pwb_wrap_variables <- function(expr, map) {
  if (is.symbol(expr)) {
    nm <- as.character(expr)
    if (!is.null(map[[nm]])) return(call(map[[nm]], expr))
    return(expr)
  }
  if (is.call(expr)) {
    for (i in seq_along(expr)[-1L])
      if (!is.null(expr[[i]])) expr[[i]] <- pwb_wrap_variables(expr[[i]], map)
    return(expr)
  }
  expr
}
