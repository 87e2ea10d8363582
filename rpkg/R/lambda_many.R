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
# factorisation of the shared design; a pwb_lambda_set. The table comes from the library's
# columns of results; each response's full pwb_lambda (with its profile curve) is built only when
# response_fits() asks for it, from the model frame the set keeps.
pwb_lambda_set_estimate <- function(mf, y, family, range, level) {
  mt <- attr(mf, "terms")
  lhs <- attr(mt, "variables")[[2L]]
  if (ncol(y) == 0L) stop("the matrix response has no columns", call. = FALSE)
  if (attr(mt, "intercept") != 1L)
    stop("the response lambda needs a model with an intercept: remove `- 1` or `+ 0`",
         call. = FALSE)
  resp <- pwb_response_names(lhs, y)
  mm <- stats::model.matrix(mt, mf)
  res <- pwb_lambda_set_call(mf, y, mm, family, range, level, 0L)
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
  r <- res$fits
  tab <- data.frame(response = resp, lambda = r$lambda, conf_low = r$conf_low,
                    conf_high = r$conf_high, convenient = r$convenient, at_bound = r$at_bound,
                    converged = r$converged, n = as.integer(r$n),
                    stringsAsFactors = FALSE, row.names = NULL)
  # What response_fits() needs to build each response's pwb_lambda: the model frame (from which
  # the responses and the design are taken again) and the shared design's facts; the fits built
  # so far are kept in `fits`.
  src <- new.env(parent = emptyenv())
  src$mf <- mf
  src$aliased <- colnames(mm)[res$aliased + 1L]  # the shared design's, 0-based, 0 the intercept
  src$rank <- as.integer(r$rank)
  src$weighted <- !is.null(stats::model.weights(mf))
  src$fits <- stats::setNames(vector("list", length(resp)), resp)
  attr(tab, "source") <- src
  attr(tab, "open") <- r$low_open | r$high_open
  attr(tab, "family") <- family
  attr(tab, "level") <- level
  attr(tab, "range") <- range
  attr(tab, "predictors") <- deparse1(mt[[3L]])
  attr(tab, "na_action") <- attr(mf, "na.action")
  class(tab) <- c("pwb_lambda_set", "data.frame")
  tab
}

# The library's many-response call on the columns `cols` of y (all when NULL), with n_grid
# profile points per response (0: none), on pwb_threads() threads.
pwb_lambda_set_call <- function(mf, y, mm, family, range, level, n_grid, cols = NULL) {
  w <- stats::model.weights(mf)
  if (!is.null(cols)) y <- y[, cols, drop = FALSE]
  ym <- if (is.double(y)) y else matrix(as.double(y), nrow = nrow(y))  # no copy when double
  rpwb_estimate_response_lambdas(ym, mm, family, range[1L], range[2L], level, n_grid,
                                 if (is.null(w)) NULL else as.double(w), 1L, pwb_threads())
}

# The pwb_lambda objects of the responses at positions `idx` of the set x, each with its profile
# curve (101 points, as a single-response call draws it): computed on the first request, in one
# many-response call for all those not yet built, and kept for later requests.
pwb_lambda_set_fits <- function(x, idx) {
  src <- attr(x, "source")
  todo <- idx[vapply(src$fits[idx], is.null, logical(1))]
  todo <- todo[!duplicated(todo)]
  if (length(todo)) {
    mf <- src$mf
    mt <- attr(mf, "terms")
    y <- pwb_frame_response(mf)
    mm <- stats::model.matrix(mt, mf)
    family <- attr(x, "family")
    level <- attr(x, "level")
    range <- attr(x, "range")
    cols <- if (length(todo) == ncol(y) && all(todo == seq_len(ncol(y)))) NULL else todo
    res <- pwb_lambda_set_call(mf, y, mm, family, range, level, 101L, cols)
    if (!is.null(res$error))  # the same data estimated before: not expected
      stop("the responses could not be estimated again: ", res$error, call. = FALSE)
    r <- res$fits
    resp <- names(src$fits)
    for (k in seq_along(todo)) {
      j <- todo[k]
      one <- list(lambda = r$lambda[k], conf_low = r$conf_low[k], conf_high = r$conf_high[k],
                  convenient = r$convenient[k], loglik = r$loglik[k], at_bound = r$at_bound[k],
                  converged = r$converged[k], n = r$n[k], low_open = r$low_open[k],
                  high_open = r$high_open[k], grid = r$grid[, k], grid_loglik = r$grid_loglik[, k])
      out <- pwb_new_lambda(one, family, level, range, resp[j], attr(x, "predictors"),
                            attr(x, "na_action"))
      out$rank <- src$rank[j]
      out$aliased <- src$aliased
      out$weighted <- src$weighted
      src$fits[[j]] <- out
    }
  }
  src$fits[idx]
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
#' A `pwb_lambda_set` keeps the model frame it was estimated from, and builds a response's
#' `pwb_lambda` the first time it is asked for: the profile curves (101 points each) are
#' computed then, for all the requested responses in one pass over the shared design, and kept
#' for later requests. The estimates and intervals are the same numbers as in the table.
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
  lambdas <- inherits(x, "pwb_lambda_set")
  if (!lambdas && !inherits(x, "pwb_model_set"))
    stop("`x` must be a pwb_lambda_set or a pwb_model_set (from a matrix response)",
         call. = FALSE)
  if (lambdas && (!is.environment(attr(x, "source")) || !"response" %in% names(x) ||
                  !identical(x$response, names(attr(x, "source")$fits))))
    stop("`x` has lost its per-response fits (rows or columns taken from the table): use the ",
         "object the estimator returned", call. = FALSE)
  resp <- if (lambdas) x$response else names(x)
  idx <- if (is.null(which)) seq_along(resp)
         else if (is.character(which)) match(which, resp)
         else if (is.numeric(which)) ifelse(which %in% seq_along(resp), which, NA_integer_)
         else stop("`which` must be response names or positions", call. = FALSE)
  if (anyNA(idx))
    stop(sprintf("no response %s: the responses are %s",
                 paste0("`", which[is.na(idx)], "`", collapse = ", "),
                 paste0("`", resp, "`", collapse = ", ")), call. = FALSE)
  fits <- if (lambdas) pwb_lambda_set_fits(x, idx) else unclass(x)[idx]
  if (!is.null(which) && length(which) == 1L) fits[[1L]] else fits
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
#' `pwb_lambda`. The responses are estimated on up to `getOption("powerback.threads")` threads
#' (by default 2); the results do not depend on the number.
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
  open <- attr(x, "open")
  if (length(open) != nrow(x) ||
      !all(c("response", "lambda", "conf_low", "conf_high", "n") %in% names(x)))
    return(invisible(print(as.data.frame(x), ...)))
  level <- attr(x, "level")
  pwb_cat_wrap(sprintf("<pwb_lambda_set> %s lambdas of %d %s given %s (n = %d)",
                       pwb_lambda_family_label(attr(x, "family")), nrow(x),
                       pwb_plural(nrow(x), "response"), attr(x, "predictors"), x$n[1L]))
  f <- function(v) pwb_format_num(v, digits)
  resp <- ifelse(nchar(x$response) > 24L, paste0(substr(x$response, 1L, 23L), "~"), x$response)
  flags <- ifelse(x$at_bound, "at bound", "")
  flags <- ifelse(!x$converged, trimws(paste(flags, "not converged")), flags)
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
  for (a in c("source", "open", "family", "level", "range", "predictors", "na_action"))
    attr(out, a) <- NULL
  class(out) <- "data.frame"
  if (!is.null(row.names)) rownames(out) <- row.names
  out
}
