# Response lambdas of many responses against one design: estimate_response_lambda() with a
# matrix response (cbind(y1, y2, ...) ~ x), the pwb_lambda_set table and its methods.

# The names of the columns of a matrix response: its column names, else the arguments of a
# cbind() on the left of the formula, else "<lhs>[, j]".
pwb_response_names <- function(lhs, y) {
  q <- ncol(y)
  nm <- colnames(y)
  if (is.null(nm)) nm <- rep("", q)
  if (is.call(lhs) && identical(lhs[[1L]], as.name("cbind")) && length(lhs) == q + 1L) {
    args <- vapply(as.list(lhs)[-1L], deparse1, character(1))
    nm[!nzchar(nm)] <- args[!nzchar(nm)]
  }
  blank <- !nzchar(nm)
  nm[blank] <- sprintf("%s[, %d]", deparse1(lhs), which(blank))
  make.unique(nm)
}

# The lambdas of the columns of y (a numeric matrix from the model frame mf) with one
# factorisation of the shared design; a pwb_lambda_set.
pwb_lambda_set_estimate <- function(mf, y, family, range, level) {
  mt <- attr(mf, "terms")
  lhs <- attr(mt, "variables")[[2L]]
  if (ncol(y) == 0L) stop("the matrix response has no columns", call. = FALSE)
  if (attr(mt, "intercept") != 1L)
    stop("the response lambda needs a model with an intercept: remove `- 1` or `+ 0`",
         call. = FALSE)
  resp <- pwb_response_names(lhs, y)
  w <- stats::model.weights(mf)
  mm <- stats::model.matrix(mt, mf)
  ym <- if (is.double(y)) y else matrix(as.double(y), nrow = nrow(y))  # no copy when double
  res <- rpwb_estimate_response_lambdas(ym, mm, family, range[1L], range[2L], level, 101L,
                                        if (is.null(w)) NULL else as.double(w), 1L)
  if (!is.null(res$error)) {
    what <- if (res$column > 0L) resp[res$column] else "the responses"
    msg <- if (res$count > 0)
             tryCatch(pwb_lambda_stop(res, pwb_lambda_frame_rows(mf), what),
                      error = conditionMessage)
           else sub("Y column [0-9]+ \\(0-based\\)", what, res$error)
    if (res$column > 0L)
      msg <- sprintf("response `%s` (column %d of %s): %s", what, res$column, deparse1(lhs), msg)
    stop(msg, call. = FALSE)
  }
  aliased <- colnames(mm)[res$aliased + 1L]  # the shared design's, 0-based, 0 the intercept
  rhs <- deparse1(mt[[3L]])
  fits <- lapply(seq_along(resp), function(j) {
    out <- pwb_new_lambda(res$fits[[j]], family, level, range, resp[j], rhs,
                          attr(mf, "na.action"))
    out$rank <- as.integer(res$fits[[j]]$rank)
    out$aliased <- aliased
    out$weighted <- !is.null(w)
    out
  })
  names(fits) <- resp
  pwb_new_lambda_set(fits, family, level, range, rhs, attr(mf, "na.action"))
}

pwb_new_lambda_set <- function(fits, family, level, range, predictors, na_action) {
  num <- function(f) vapply(fits, f, numeric(1))
  lgl <- function(f) vapply(fits, f, logical(1))
  tab <- data.frame(response = names(fits), lambda = num(function(x) x$lambda),
                    conf_low = num(function(x) x$conf_int[1L]),
                    conf_high = num(function(x) x$conf_int[2L]),
                    convenient = num(function(x) x$convenient),
                    at_bound = lgl(function(x) x$at_bound),
                    converged = lgl(function(x) x$converged),
                    n = vapply(fits, function(x) x$n, integer(1)),
                    stringsAsFactors = FALSE, row.names = NULL)
  attr(tab, "fits") <- fits
  attr(tab, "family") <- family
  attr(tab, "level") <- level
  attr(tab, "range") <- range
  attr(tab, "predictors") <- predictors
  attr(tab, "na_action") <- na_action
  class(tab) <- c("pwb_lambda_set", "data.frame")
  tab
}

#' Each response's own fit from a many-response call
#'
#' [estimate_response_lambda()] and [lm_transformed()] with a matrix response
#' (`cbind(y1, y2, ...) ~ x`) return one result per response. `response_fits()` gives them as a
#' named list: for a `pwb_lambda_set` each element is the full `pwb_lambda` of that response
#' (with its profile, for [plot()][plot.pwb_lambda], [confint()][confint.pwb_lambda] and
#' [as_transform()]); for a `pwb_model_set` each element is that response's `pwb_model` (the
#' same as `x[[name]]`).
#'
#' @param x a `pwb_lambda_set` or a `pwb_model_set`.
#' @param which optional response names or positions: only those, in that order.
#' @return A named list of `pwb_lambda` or `pwb_model` objects; a single object when `which`
#'   names one response.
#' @examples
#' set <- estimate_response_lambda(cbind(Ozone, Wind) ~ Temp + Month, datasets::airquality)
#' set
#' fits <- response_fits(set)
#' fits$Ozone
#' confint(response_fits(set, "Wind"))
#' @export
response_fits <- function(x, which = NULL) {
  fits <- if (inherits(x, "pwb_lambda_set")) attr(x, "fits")
          else if (inherits(x, "pwb_model_set")) unclass(x)
          else stop("`x` must be a pwb_lambda_set or a pwb_model_set (from a matrix response)",
                    call. = FALSE)
  if (is.null(fits))
    stop("`x` has lost its per-response fits (rows or columns taken from the table): use the ",
         "object the estimator returned", call. = FALSE)
  if (is.null(which)) return(fits)
  bad <- if (is.character(which)) setdiff(which, names(fits))
         else which[!which %in% seq_along(fits)]
  if (length(bad))
    stop(sprintf("no response %s: the responses are %s", paste0("`", bad, "`", collapse = ", "),
                 paste0("`", names(fits), "`", collapse = ", ")), call. = FALSE)
  if (length(which) == 1L) fits[[which]] else fits[which]
}

#' Print the lambdas of many responses
#'
#' A `pwb_lambda_set` (from [estimate_response_lambda()] with a matrix response such as
#' `cbind(y1, y2) ~ x`) is a data frame with one row per response: `response`, `lambda`
#' (\eqn{\hat\lambda}), `conf_low`, `conf_high` (the likelihood-ratio interval), `convenient`,
#' `at_bound`, `converged` and `n`. Every response was estimated against the same design and the
#' same rows (rows missing in any response are handled by `na.action`, as [stats::lm()] handles a
#' matrix response), with one factorisation of that design; each row equals a separate
#' `estimate_response_lambda()` of that response on those rows. The print shows the table
#' (response names cut to fit 80 columns) and flags; [response_fits()] gives each response's full
#' `pwb_lambda`.
#'
#' Cautions: a transform changes what each model estimates, back-transformed means need a
#' correction, and a power chosen per response makes the responses' scales differ; the estimates
#' inform, but do not replace, the conventions of your field and professional judgement.
#'
#' @param x a `pwb_lambda_set`.
#' @param digits significant digits.
#' @param ... passed to the data frame print when the set's attributes were dropped.
#' @return `x`, invisibly.
#' @examples
#' set <- estimate_response_lambda(cbind(Ozone, Wind) ~ Temp + Month, datasets::airquality)
#' print(set)
#' as.data.frame(set)
#' @export
print.pwb_lambda_set <- function(x, digits = 3, ...) {
  fits <- attr(x, "fits")
  if (is.null(fits) || !all(c("response", "lambda", "conf_low", "conf_high") %in% names(x)))
    return(invisible(print(as.data.frame(x), ...)))
  level <- attr(x, "level")
  pwb_cat_wrap(sprintf("<pwb_lambda_set> %s lambdas of %d %s given %s (n = %d)",
                       pwb_lambda_family_label(attr(x, "family")), nrow(x),
                       pwb_plural(nrow(x), "response"), attr(x, "predictors"), x$n[1L]))
  f <- function(v) pwb_format_num(v, digits)
  resp <- ifelse(nchar(x$response) > 24L, paste0(substr(x$response, 1L, 23L), "~"), x$response)
  flags <- ifelse(x$at_bound, "at bound", "")
  flags <- ifelse(!x$converged, trimws(paste(flags, "not converged")), flags)
  open <- vapply(fits, function(ft) ft$low_open || ft$high_open, logical(1))
  flags <- ifelse(open, trimws(paste(flags, "open interval")), flags)
  tab <- data.frame(response = resp, lambda = f(x$lambda),
                    interval = sprintf("[%s, %s]", f(x$conf_low), f(x$conf_high)),
                    convenient = f(x$convenient), flags = flags,
                    stringsAsFactors = FALSE, check.names = FALSE)
  names(tab)[3L] <- sprintf("%g%% interval", 100 * level)
  if (!any(nzchar(flags))) tab$flags <- NULL
  print(tab, right = FALSE, row.names = FALSE)
  na <- attr(x, "na_action")
  if (length(na))
    pwb_cat_wrap(sprintf("note: %d %s with a missing value in some variable omitted (%s)",
                         length(na), pwb_plural(length(na), "row"), class(na)[1L]),
                 indent = 2L, exdent = 4L)
  pwb_cat_wrap("Each response's full estimate and profile: response_fits(x). A transform ",
               "changes what a model estimates; back-transformed means need a correction.",
               indent = 2L, exdent = 2L)
  invisible(x)
}

#' @rdname print.pwb_lambda_set
#' @param row.names,optional as for [base::as.data.frame()].
#' @export
as.data.frame.pwb_lambda_set <- function(x, row.names = NULL, optional = FALSE, ...) {
  out <- x
  for (a in c("fits", "family", "level", "range", "predictors", "na_action")) attr(out, a) <- NULL
  class(out) <- "data.frame"
  if (!is.null(row.names)) rownames(out) <- row.names
  out
}
