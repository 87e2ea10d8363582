# The model frame of lm_transformed(): where the variables come from (a formula with data, or a
# fitted lm), the frame of raw variables (after subset, weights and na.action), the design on
# the transformed scale, and the live core model kept in the object (rebuilt after a reload).

# list(formula, data, subset, weights (expressions), na.action, env) from lm_transformed()'s
# arguments. `formula` may be an lm fit, whose call supplies data, subset, weights, na.action.
pwb_model_source <- function(formula, data, call, caller_env, na.action) {
  if (inherits(formula, "lm")) {
    fit <- formula
    if (inherits(fit, c("glm", "mlm")))
      stop("`formula` must be a formula or an lm fit (not a glm or multi-response fit)",
           call. = FALSE)
    formula <- stats::formula(fit)
    env <- environment(formula)
    if (is.null(data) && !is.null(fit$call$data)) data <- eval(fit$call$data, env)
    subset <- fit$call$subset
    weights <- fit$call$weights
    if (is.null(na.action) && !is.null(fit$call$na.action)) na.action <- eval(fit$call$na.action, env)
  } else {
    if (!inherits(formula, "formula") || length(formula) != 3L)
      stop(paste0("`formula` must be a two-sided formula such as cost ~ area + age, or an lm ",
                  "fit whose formula and data are reused"), call. = FALSE)
    env <- caller_env
    subset <- call$subset
    weights <- call$weights
  }
  if (is.null(data)) data <- environment(formula)
  if (!is.data.frame(data) && !is.environment(data) && !is.list(data))
    stop("`data` must be a data frame (or leave it out to use the formula's environment)",
         call. = FALSE)
  if (!is.symbol(formula[[2L]]))
    stop(sprintf(paste0("the left side of the formula must be a variable name, not `%s`: ",
                        "choose the response's transform with `response =`"),
                 deparse1(formula[[2L]])), call. = FALSE)
  tt <- if (is.data.frame(data)) stats::terms(formula, data = data) else stats::terms(formula)
  if (!is.null(attr(tt, "offset")))
    stop("offsets are not supported: move the offset into the response first", call. = FALSE)
  formula <- stats::formula(tt)
  environment(formula) <- environment(tt)
  if (is.null(na.action)) na.action <- getOption("na.action", "na.omit")
  list(formula = formula, data = data, subset = subset, weights = weights,
       na.action = na.action, env = env)
}

# The raw variables of the formula for the rows used: model.frame of `~ v1 + v2 + ...` with
# subset, weights and na.action, levels of unused factor values dropped (as lm does).
pwb_variables_frame <- function(src) {
  formula <- src$formula
  vars <- all.vars(formula)
  data <- src$data
  fenv <- environment(formula)
  present <- vapply(vars, function(v) {
    if (is.data.frame(data) && v %in% names(data)) return(TRUE)
    val <- tryCatch(get(v, envir = if (is.environment(data)) data else fenv),
                    error = function(e) NULL)
    !is.null(val) && !is.function(val) && NROW(val) > 1L
  }, logical(1))
  missing_vars <- vars[!present & vars %in% c(as.character(formula[[2L]]),
                                               all.vars(formula[[3L]]))]
  missing_vars <- missing_vars[!vapply(missing_vars, exists, logical(1), envir = fenv)]
  if (length(missing_vars))
    stop(sprintf("`data` has no %s %s: add %s or change the formula",
                 pwb_plural(length(missing_vars), "variable"),
                 paste0("`", missing_vars, "`", collapse = ", "),
                 pwb_plural(length(missing_vars), "it", "them")), call. = FALSE)
  vars <- vars[present]
  vf <- stats::as.formula(paste("~", paste0("`", vars, "`", collapse = " + ")), env = fenv)
  mfcall <- call("model.frame", formula = vf, data = quote(data), na.action = src$na.action,
                 drop.unused.levels = TRUE)
  mfcall[[1L]] <- quote(stats::model.frame)
  if (!is.null(src$subset)) mfcall$subset <- src$subset
  if (!is.null(src$weights)) mfcall$weights <- src$weights
  frame <- eval(mfcall, list(data = data), src$env)
  yname <- as.character(formula[[2L]])
  if (!is.numeric(frame[[yname]]) || is.matrix(frame[[yname]]))
    stop(sprintf("the response `%s` must be a numeric vector, not %s", yname,
                 class(frame[[yname]])[1L]), call. = FALSE)
  if (nrow(frame) == 0L) stop("no rows are left to fit (after subset and na.action)", call. = FALSE)
  attr(frame, "terms") <- NULL
  frame
}

# The design of a pwb_model from its transformed variables `tdata` (the frame's variables with
# the predictor transforms applied): the raw response y, the design X without its intercept
# column, and what prediction needs (terms, xlevels, contrasts). The same steps rebuild the core
# model after a reload, so the design is the same bit for bit. With `full = TRUE` the design is
# returned whole as `D` (the model matrix, intercept column included) and no X is made: the core
# model reads D in place (one copy of the design in all).
pwb_model_design <- function(object, tdata, full = FALSE) {
  tt <- stats::terms(object$formula)
  vars <- as.list(attr(tt, "variables"))[-1L]
  if (all(vapply(vars, is.symbol, logical(1)))) {
    # Every variable is a plain name: the model frame is those columns of tdata (no copy).
    mf <- tdata[vapply(vars, as.character, character(1))]
    attr(mf, "terms") <- tt
  } else {
    mf <- stats::model.frame(tt, tdata, na.action = stats::na.pass)
  }
  mm <- stats::model.matrix(attr(mf, "terms"), mf, contrasts.arg = object$contrasts)
  intercept <- ncol(mm) > 0L && colnames(mm)[1L] == "(Intercept)"
  y <- .subset2(mf, 1L)  # the response column (model.response() would name 1e6 rows)
  if (!is.double(y)) y <- as.double(y)
  out <- list(y = y, X = NULL, D = NULL, intercept = intercept,
              names = colnames(mm), terms = attr(mf, "terms"),
              xlevels = stats::.getXlevels(tt, mf), contrasts = attr(mm, "contrasts"),
              assign = attr(mm, "assign"))
  if (full) {
    # mm itself, unmodified: changing it (even its attributes) would copy it.
    if (!is.double(mm)) storage.mode(mm) <- "double"
    out$D <- mm
  } else {
    X <- if (intercept) mm[, -1L, drop = FALSE] else mm
    storage.mode(X) <- "double"
    out$X <- X
  }
  out
}

# The design of a pwb_model rebuilt from its stored frame and predictor transforms.
pwb_stored_design <- function(object, full = FALSE) {
  tdata <- pwb_transform_columns(pwb_frame_variables(.subset2(object, "frame")),
                                 .subset2(object, "predictors"))
  pwb_model_design(unclass(object), tdata, full)
}

# The live core model of a design made with full = TRUE: the model reads design$D in place and
# the returned handle keeps that matrix alive.
pwb_fit_core_model <- function(design, transform, estimated, w) {
  rpwb_model_new(design$y, design$D, design$intercept, pwb_spec_or_null(transform), estimated,
                 w, TRUE)
}

# An environment holding the external pointer of the core model. An environment is shared by
# copies of the object, so a handle rebuilt after a reload serves them all.
pwb_new_handle_env <- function(ptr) {
  env <- new.env(parent = emptyenv())
  env$ptr <- ptr
  env
}

# The live core model of `object`; rebuilt once (one core fit on the stored frame) when the
# object was saved and reloaded (its pointer is then NULL).
pwb_handle <- function(object) {
  env <- .subset2(object, "handle")
  if (!is.environment(env)) stop("`object` is not a pwb_model made by lm_transformed()", call. = FALSE)
  if (!is.null(env$ptr) && rpwb_model_is_live(env$ptr)) return(env$ptr)
  design <- pwb_stored_design(object, full = TRUE)
  env$ptr <- pwb_fit_core_model(design, .subset2(object, "response"),
                                .subset2(object, "estimated"),
                                stats::model.weights(.subset2(object, "frame")))
  env$ptr
}

#' Parts of a pwb_model read on request
#'
#' `model$name` returns a stored part of the model (see [lm_transformed()]) or one computed on
#' request: `lm` (the honest lm of [transformed_lm()], fitted anew each time), `y` (the raw
#' response of the rows used), `weights`, `residuals`, `fitted` (transformed scale, from the core
#' model), `leverages`, `z` (the transformed response) and `data` (the model's raw variables
#' placed back at their rows, `NA` in rows left out by `na.action`). Other names match stored
#' parts partially, as `$` on a list does.
#'
#' @param x a `pwb_model`.
#' @param name the part's name.
#' @return The part, or `NULL` when there is none.
#' @examples
#' m <- lm_transformed(Volume ~ Girth, trees, response = new_transform("log"))
#' head(m$residuals)
#' m$lm
#' @export
`$.pwb_model` <- function(x, name) {
  if (name %in% names(x)) return(.subset2(x, name))
  switch(name,
         lm = transformed_lm(x),
         y = .subset2(x, "frame")[[.subset2(x, "yname")]],
         weights = stats::model.weights(.subset2(x, "frame")),
         residuals = rpwb_model_vector(pwb_handle(x), 0L),
         fitted = rpwb_model_vector(pwb_handle(x), 1L),
         leverages = rpwb_model_vector(pwb_handle(x), 2L),
         z = rpwb_model_vector(pwb_handle(x), 3L),
         data = pwb_padded_variables(x),
         .subset2(x, name, exact = FALSE))
}

# The model's raw variables placed back at their rows (rows left out by na.action hold NA).
pwb_padded_variables <- function(x) {
  vars <- pwb_frame_variables(.subset2(x, "frame"))
  omit <- .subset2(x, "na.action")
  if (is.null(omit)) return(vars)
  n <- nrow(vars) + length(omit)
  keep <- setdiff(seq_len(n), as.integer(omit))
  out <- vars[rep(NA_integer_, n), , drop = FALSE]
  out[keep, ] <- vars
  row.names(out) <- NULL
  out
}
