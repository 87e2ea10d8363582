# lm_transformed() with several responses (cbind(y1, y2, ...) ~ x): one pwb_model per response,
# the pwb_model_set list and its methods.

# TRUE when the formula's left side is a cbind() of responses.
pwb_is_cbind_formula <- function(formula) {
  inherits(formula, "formula") && length(formula) == 3L && is.call(formula[[2L]]) &&
    identical(formula[[2L]][[1L]], as.name("cbind"))
}

# One lm_transformed() per response of the cbind(), on the same rows: a row with a missing value
# in any response is missing in every one (then na.action treats it as lm treats a matrix
# response). `call` is lm_transformed()'s matched call, `env` its caller's frame.
pwb_model_set_fit <- function(formula, call, env) {
  lhs <- formula[[2L]]
  args <- as.list(lhs)[-1L]
  if (!length(args)) stop("cbind() on the left of the formula names no response", call. = FALSE)
  if (!all(vapply(args, is.symbol, logical(1))))
    stop(sprintf(paste0("each response in `%s` must be a variable name: transform responses ",
                        "with `response =`, not in the formula"), deparse1(lhs)), call. = FALSE)
  resp <- vapply(args, as.character, character(1))
  if (anyDuplicated(resp))
    stop(sprintf("`%s` names a response twice", deparse1(lhs)), call. = FALSE)
  data <- if (is.null(call$data)) NULL else eval(call$data, env)
  if (!is.data.frame(data))
    stop("several responses need `data` as a data frame holding them", call. = FALSE)
  absent <- setdiff(resp, names(data))
  if (length(absent))
    stop(sprintf("`data` has no %s %s: add %s or change the formula",
                 pwb_plural(length(absent), "column"), paste0("`", absent, "`", collapse = ", "),
                 pwb_plural(length(absent), "it", "them")), call. = FALSE)
  gap <- Reduce(`|`, lapply(resp, function(v) is.na(data[[v]])))
  fenv <- new.env(parent = env)
  fits <- lapply(resp, function(v) {
    d <- data
    if (any(gap)) d[[v]][gap] <- NA
    f <- formula
    f[[2L]] <- as.name(v)
    assign(".pwb_data", d, envir = fenv)
    assign(".pwb_formula", f, envir = fenv)
    cl <- call
    cl[[1L]] <- lm_transformed
    cl$formula <- quote(.pwb_formula)
    cl$data <- quote(.pwb_data)
    fit <- tryCatch(eval(cl, fenv), error = function(e)
      stop(sprintf("response `%s` of %s: %s", v, deparse1(lhs), conditionMessage(e)),
           call. = FALSE))
    fit$call <- call
    fit$call$formula <- f
    fit
  })
  names(fits) <- resp
  structure(fits, class = "pwb_model_set", call = call, formula = formula)
}

#' Print and summarise the models of many responses
#'
#' [lm_transformed()] with a matrix response (`cbind(y1, y2, ...) ~ x`) returns a
#' `pwb_model_set`: a named list with one [pwb_model][lm_transformed()] per response, each equal
#' to a separate `lm_transformed()` call on that response over the same rows (a row missing in
#' any response is left out of every model, through `na.action`, as [stats::lm()] treats a
#' matrix response). `x[["y1"]]` (or [response_fits()]) gives one model, for [predict()],
#' [summary()] and the other `pwb_model` methods. `print()` shows one line per response: the
#' response transform, the estimated power and its interval, `n`, the residual standard error on
#' the transformed scale and the original-scale log-likelihood. `summary()` gives each model's
#' summary (a named list of `summary.pwb_model`) and prints them in turn.
#'
#' Cautions: a transform changes what each model estimates, back-transformed fits are medians and
#' means need a correction, and the residual standard errors of responses on different scales
#' do not compare; the results inform, not replace, domain standards and judgement.
#'
#' @param x a `pwb_model_set` (print), or a `summary.pwb_model_set`.
#' @param object a `pwb_model_set`.
#' @param ... passed to the summaries' print.
#' @return `print()`: `x`, invisibly. `summary()`: a `summary.pwb_model_set`.
#' @examples
#' d <- datasets::airquality
#' set <- lm_transformed(cbind(Ozone, Wind) ~ Temp + Month, d)
#' set
#' coef(set[["Ozone"]])
#' summary(set)
#' @export
print.pwb_model_set <- function(x, ...) {
  fits <- unclass(x)
  pwb_cat_wrap(sprintf("<pwb_model_set> %d linear %s on transformed scales: %s", length(fits),
                       pwb_plural(length(fits), "model"),
                       deparse1(attr(x, "formula"))))
  f <- function(v) pwb_format_num(v, 3L)
  tab <- data.frame(
    response = names(fits),
    transform = vapply(fits, function(m) pwb_model_set_transform(m$response), character(1)),
    estimated = vapply(fits, function(m) {
      l <- m$response_lambda
      if (is.null(l)) "fixed" else sprintf("%s [%s, %s]", f(l$lambda), f(l$conf_int[1L]),
                                         f(l$conf_int[2L]))
    }, character(1)),
    n = vapply(fits, function(m) as.integer(m$nobs), integer(1)),
    sigma = vapply(fits, function(m) f(m$sigma), character(1)),
    loglik = vapply(fits, function(m) format(as.numeric(stats::logLik(m)), digits = 6),
                    character(1)),
    stringsAsFactors = FALSE, check.names = FALSE)
  tab$response <- ifelse(nchar(tab$response) > 14L, paste0(substr(tab$response, 1L, 13L), "~"),
                         tab$response)
  print(tab, right = FALSE, row.names = FALSE)
  pwb_cat_wrap("One model per response: x[[\"name\"]]; sigma on each transformed scale. ",
               "Back-transformed fits are medians; means need a correction.",
               indent = 2L, exdent = 2L)
  invisible(x)
}

#' @rdname print.pwb_model_set
#' @export
summary.pwb_model_set <- function(object, ...) {
  structure(lapply(unclass(object), summary), class = "summary.pwb_model_set")
}

#' @rdname print.pwb_model_set
#' @export
print.summary.pwb_model_set <- function(x, ...) {
  s <- unclass(x)
  for (v in names(s)) {
    cat(sprintf("== response %s ==\n", v))
    print(s[[v]], ...)
    cat("\n")
  }
  invisible(x)
}

#' @rdname print.pwb_model_set
#' @param i the responses to keep (names or positions): a smaller `pwb_model_set`.
#' @export
`[.pwb_model_set` <- function(x, i) {
  structure(unclass(x)[i], class = "pwb_model_set", call = attr(x, "call"),
            formula = attr(x, "formula"))
}

# A short label of a response transform for the set's table: "box-cox 0.333", "log", "none",
# with a shift or reflection noted.
pwb_model_set_transform <- function(tr) {
  if (is.null(tr) || identical(tr$family, "identity")) return("none")
  lab <- tr$family
  if (!is.null(tr$lambda) && !is.na(tr$lambda)) lab <- paste(lab, pwb_format_num(tr$lambda, 3L))
  if (isTRUE(tr$reflect)) lab <- paste(lab, "reflected")
  if (!is.null(tr$shift) && tr$shift != 0) lab <- paste0(lab, " +", format(tr$shift, digits = 3))
  if (nchar(lab) > 20L) paste0(substr(lab, 1L, 19L), "~") else lab
}
