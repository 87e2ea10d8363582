# Structure methods of pwb_model: model.frame, model.matrix, terms, formula, update.

#' Model frame, design, terms and updates of a transformed linear model
#'
#' `model.frame()` gives the variables as they entered the fit, on the transformed scale (each
#' transformed column keeps its raw name; with weights, a `(weights)` column), as
#' [stats::model.frame()] gives them for an `lm` fitted to the transformed columns.
#' `model.matrix()` gives the design with its intercept column. `terms()` and `formula()` are
#' those of the raw formula.
#'
#' `update()` refits with a changed formula or arguments. By default (`transforms = "keep"`) the
#' fitted transforms are kept: the response transform (as its `pwb_lambda` when the power was
#' estimated, so the log-likelihood still counts it) and the predictor transforms of variables
#' still in the formula; `transforms = "estimate"` re-runs the original call with the changes, so
#' every transform chosen from the data is chosen again. Arguments given in `...` (such as
#' `response =` or `predictors =`) win in both cases.
#'
#' @param formula,object,x a `pwb_model` from [lm_transformed()].
#' @param formula. a formula changing the model's formula, as in [stats::update()].
#' @param transforms `"keep"` or `"estimate"` (see Details).
#' @param evaluate `FALSE` returns the call instead of fitting it.
#' @param ... for `update()`, arguments of [lm_transformed()] to change; otherwise unused.
#' @return `model.frame`: a data frame; `model.matrix`: a matrix; `terms`: a `terms` object;
#'   `formula`: a formula; `update`: a `pwb_model` (or a call).
#' @examples
#' m <- lm_transformed(Volume ~ Girth + Height, trees, response = new_transform("log"),
#'                     predictors = list(Girth = new_transform("log")))
#' head(model.frame(m))
#' head(model.matrix(m))
#' formula(m)
#' m2 <- update(m, . ~ . - Height)
#' anova(m2, m)
#' @name pwb_model_structure
NULL

#' @rdname pwb_model_structure
#' @export
model.frame.pwb_model <- function(formula, ...) {
  object <- formula
  vars <- pwb_transform_columns(pwb_frame_variables(object$frame), object$predictors)
  vars[[object$yname]] <- pwb_map_values(object$response, vars[[object$yname]], object$yname,
                                         "error", inverse = FALSE)
  mf <- stats::model.frame(object$terms, vars, na.action = stats::na.pass)
  w <- stats::model.weights(object$frame)
  if (!is.null(w)) mf[["(weights)"]] <- w
  attr(mf, "na.action") <- object$na.action
  mf
}

#' @rdname pwb_model_structure
#' @export
model.matrix.pwb_model <- function(object, ...) {
  vars <- pwb_transform_columns(pwb_frame_variables(object$frame), object$predictors)
  mf <- stats::model.frame(object$terms, vars, na.action = stats::na.pass)
  stats::model.matrix(object$terms, mf, contrasts.arg = object$contrasts)
}

#' @rdname pwb_model_structure
#' @export
terms.pwb_model <- function(x, ...) x$terms

#' @rdname pwb_model_structure
#' @export
formula.pwb_model <- function(x, ...) x$formula

#' @rdname pwb_model_structure
#' @export
update.pwb_model <- function(object, formula., ..., transforms = c("keep", "estimate"),
                             evaluate = TRUE) {
  transforms <- pwb_match_choice(transforms, "transforms")
  call <- object$call
  extras <- match.call(expand.dots = FALSE)$...
  if (!missing(formula.))
    call$formula <- stats::update.formula(stats::formula(object), formula.)
  if (transforms == "keep") {
    if (is.null(extras$response))
      call$response <- if (!is.null(object$response_lambda)) object$response_lambda
                       else object$response
    if (is.null(extras$predictors)) {
      f <- if (is.null(call$formula)) object$formula else eval(call$formula, parent.frame())
      keep <- intersect(names(object$predictors), all.vars(stats::formula(f)))
      call$predictors <- if (length(keep)) object$predictors[keep]
    }
  }
  for (nm in names(extras)) call[[nm]] <- extras[[nm]]
  if (evaluate) eval(call, parent.frame()) else call
}
