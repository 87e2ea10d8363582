# Summaries of chunks as R objects: the library's bytes in a raw vector, with the design they
# belong to. Plain R data, so saveRDS(), serialize() and a parallel cluster carry them as they are.

#' Summaries of data chunks that merge, travel and finish like one pass
#'
#' For data too large for one R session (many files, several machines), each chunk is reduced to
#' a small summary whose size does not grow with its rows; summaries of different chunks merge in
#' any order, and the merged summary finishes into the same results as the one-pass functions:
#'
#' * `lambda_summary()` and `finish_lambda()`: the response power, as
#'   [estimate_response_lambda()] (a `pwb_lambda`).
#' * `fit_summary()` and `finish_fit()`: the model on the transformed scale at a fixed response
#'   transform, as [lm_transformed()] reports it (coefficients, covariance, sigma, the
#'   original-scale log-likelihood), as a `pwb_chunked_fit`.
#' * `checks_summary()` and `finish_checks()`: a second pass over the rows for the residual
#'   checks (Koenker's Breusch-Pagan, RESET, skewness; as [residual_checks()], without
#'   Shapiro-Wilk, which needs every residual at once) and the binned residual sums behind
#'   smearing means in [predict.pwb_chunked_fit()].
#' * `lambda_grid_summary()`: the one further pass a lambda summary asks for when its binned sums
#'   cannot serve every lambda of the range (a range beyond about \[-5, 5\], or a fit so close to
#'   exact that the residual sum of squares would lose its digits).
#'
#' `merge_summaries()` and `c()` merge summaries of one kind made with one design. Each summary
#' holds its bytes (`$bytes`, a raw vector in a versioned format with a checksum: corrupted or
#' truncated bytes are an error, never a crash), so `saveRDS()`, `serialize()` and
#' `parallel::parLapply()` carry it as it is. [fit_chunked()] runs the whole job.
#'
#' Accuracy: a lambda summary from any partition of the rows, merged in any order, finishes
#' within 1e-7 of the one-pass lambda-hat and 1e-9 of its interval ends; the grid pass (the
#' fallback) within about 1e-6 after its refinement pass. Fits agree with the one-pass fit to
#' rounding (about 1e-10 relative).
#'
#' As with any transform: the model estimates effects on the transformed scale, a back-transformed
#' fit is a median (means need the smearing or normal-theory correction), and the results inform
#' rather than replace domain standards and judgement.
#'
#' @param design a `pwb_chunk_design` from [chunk_design()].
#' @param data one chunk: a data frame with the design's columns.
#' @param family `"box-cox"` (needs a positive response) or `"yeo-johnson"`.
#' @param response the response's transform for the fit: a `pwb_transform`, a `pwb_lambda`
#'   (its convenient power is used, as in [lm_transformed()]) or `"none"`.
#' @param chunk a label for the chunk in error messages (its number or file name).
#' @param summary,fit a finished lambda summary or fit summary (merged over every chunk).
#' @param grid equally spaced lambdas (at least 4) at which a grid pass evaluates the profile.
#' @param ... summaries of one kind to merge.
#' @param range,level the lambda search range and the interval's level, as
#'   [estimate_response_lambda()].
#' @param pass a merged `lambda_grid_summary()` for `summary`, when finishing asked for one.
#' @param x a summary.
#' @return `lambda_summary()`, `lambda_grid_summary()`, `fit_summary()`, `checks_summary()`,
#'   `merge_summaries()` and `c()`: a summary (classes `pwb_lambda_summary`,
#'   `pwb_lambda_grid_summary`, `pwb_fit_summary`, `pwb_checks_summary`), a list with `bytes`,
#'   `design`, the number of rows `n` and what its kind needs. `finish_lambda()`: a `pwb_lambda`,
#'   with `$needs_pass` TRUE and `$pass_grid` set (and NA estimates) when one more pass is needed.
#'   `finish_fit()`: a `pwb_chunked_fit`. `finish_checks()`: a `pwb_checks`.
#' @examples
#' river <- river_data()
#' d <- chunk_design(sediment_t_day ~ log(flow_m3s) + season, river,
#'                   levels = list(season = levels(river$season)))
#' parts <- split(river, rep(1:3, length.out = nrow(river)))
#' s <- do.call(c, lapply(parts, function(ch) lambda_summary(d, ch)))
#' lam <- finish_lambda(s)
#' lam
#' f <- finish_fit(do.call(c, lapply(parts, function(ch) fit_summary(d, ch, lam))))
#' coef(f)
#' @name chunk_summaries
NULL

#' @rdname chunk_summaries
#' @export
lambda_summary <- function(design, data, family = c("box-cox", "yeo-johnson"), chunk = "1") {
  pwb_check_design(design)
  family <- pwb_match_choice(family, "family")
  fr <- pwb_chunk_frame(design, data, chunk)
  pwb_chunk_check_response(fr, design, family, chunk)
  bytes <- rpwb_lambda_summary_bytes(fr$y, fr$X, family, fr$w)
  pwb_new_summary("pwb_lambda_summary", bytes, design, length(fr$y), fr$n_missing, list(family = family))
}

#' @rdname chunk_summaries
#' @export
lambda_grid_summary <- function(summary, data, grid, chunk = "1") {
  if (!inherits(summary, "pwb_lambda_summary"))
    stop("`summary` must be a pwb_lambda_summary (lambda_summary(), merged)", call. = FALSE)
  fr <- pwb_chunk_frame(summary$design, data, chunk)
  pwb_chunk_check_response(fr, summary$design, summary$family, chunk)
  bytes <- rpwb_lambda_pass_bytes(summary$bytes, as.double(grid), fr$y, fr$X, fr$w)
  pwb_new_summary("pwb_lambda_grid_summary", bytes, summary$design, length(fr$y), fr$n_missing,
                  list(family = summary$family, grid = as.double(grid)))
}

#' @rdname chunk_summaries
#' @export
fit_summary <- function(design, data, response = "none", chunk = "1") {
  pwb_check_design(design)
  resp <- pwb_chunk_response(response)
  fr <- pwb_chunk_frame(design, data, chunk)
  tryCatch(pwb_map_values(resp$transform, fr$y, design$yname, "error", inverse = FALSE),
           error = function(e) stop(sprintf("chunk %s: %s", chunk, conditionMessage(e)), call. = FALSE))
  bytes <- rpwb_fit_summary_bytes(fr$y, fr$X, pwb_spec_or_null(resp$transform), resp$estimated, fr$w)
  pwb_new_summary("pwb_fit_summary", bytes, design, length(fr$y), fr$n_missing,
                  list(response = resp$transform, lambda = resp$lambda, estimated = resp$estimated))
}

#' @rdname chunk_summaries
#' @export
checks_summary <- function(fit, data, chunk = "1") {
  if (!inherits(fit, "pwb_fit_summary"))
    stop("`fit` must be a pwb_fit_summary (fit_summary(), merged over every chunk)", call. = FALSE)
  fr <- pwb_chunk_frame(fit$design, data, chunk)
  bytes <- rpwb_fit_checks_bytes(fit$bytes, fr$y, fr$X, fr$w)
  pwb_new_summary("pwb_checks_summary", bytes, fit$design, length(fr$y), fr$n_missing, list())
}

#' @rdname chunk_summaries
#' @export
merge_summaries <- function(...) {
  parts <- list(...)
  if (length(parts) == 1L && is.list(parts[[1L]]) && !inherits(parts[[1L]], "pwb_summary")) parts <- parts[[1L]]
  parts <- Filter(Negate(is.null), parts)
  if (!length(parts)) stop("nothing to merge", call. = FALSE)
  first <- parts[[1L]]
  if (!inherits(first, "pwb_summary")) stop("only powerback summaries can be merged", call. = FALSE)
  kind <- class(first)[1L]
  for (p in parts) {
    if (!inherits(p, kind))
      stop(sprintf("summaries of different kinds cannot be merged (%s and %s)", kind, class(p)[1L]), call. = FALSE)
    if (!identical(p$design$key, first$design$key))
      stop("summaries made with different designs cannot be merged: use one chunk_design() for every chunk",
           call. = FALSE)
  }
  which <- c(pwb_lambda_summary = "lambda", pwb_lambda_grid_summary = "pass", pwb_fit_summary = "fit",
             pwb_checks_summary = "checks")[[kind]]
  out <- first
  out$bytes <- rpwb_summary_merge(which, lapply(parts, `[[`, "bytes"))
  out$n <- sum(vapply(parts, function(p) p$n, numeric(1)))
  out$n_missing <- sum(vapply(parts, function(p) p$n_missing, numeric(1)))
  out
}

#' @rdname chunk_summaries
#' @export
c.pwb_summary <- function(...) merge_summaries(list(...))

#' @rdname chunk_summaries
#' @export
finish_lambda <- function(summary, range = c(-3, 3), level = 0.95, pass = NULL) {
  if (!inherits(summary, "pwb_lambda_summary"))
    stop("`summary` must be a pwb_lambda_summary (lambda_summary(), merged)", call. = FALSE)
  pwb_lambda_check_args(range, level)
  res <- if (is.null(pass)) rpwb_lambda_summary_finish(summary$bytes, range[1L], range[2L], level, 101L)
         else rpwb_lambda_pass_finish(pass$bytes, summary$bytes, range[1L], range[2L], level)
  d <- summary$design
  rhs <- deparse1(d$formula[[3L]])
  out <- pwb_new_lambda(res, summary$family, level, range, d$yname, rhs, NULL)
  out$rank <- as.integer(res$rank)
  out$n_missing <- summary$n_missing
  out$needs_pass <- res$needs_pass
  out$from_grid <- res$from_grid
  out$pass_grid <- if (res$needs_pass) seq(res$pass_lower, res$pass_upper, length.out = res$pass_points)
  out
}

#' @rdname chunk_summaries
#' @export
finish_fit <- function(fit) {
  if (!inherits(fit, "pwb_fit_summary"))
    stop("`fit` must be a pwb_fit_summary (fit_summary(), merged over every chunk)", call. = FALSE)
  r <- rpwb_fit_summary_finish(fit$bytes)
  nm <- fit$design$coef_names
  names(r$coefficients) <- names(r$se) <- names(r$aliased) <- nm
  dimnames(r$covariance) <- list(nm, nm)
  structure(c(r[c("coefficients", "se", "aliased", "covariance", "sigma", "rss", "loglik", "loglik_df",
                  "jacobian")],
              list(n = as.integer(r$n), rank = as.integer(r$rank), df_residual = as.integer(r$df_residual),
                   n_missing = fit$n_missing, response = fit$response, lambda = fit$lambda,
                   design = fit$design, fit_bytes = fit$bytes, checks = NULL, smearing = NULL)),
            class = "pwb_chunked_fit")
}

#' @rdname chunk_summaries
#' @export
finish_checks <- function(x) {
  if (!inherits(x, "pwb_checks_summary"))
    stop("`x` must be a pwb_checks_summary (checks_summary(), merged over every chunk)", call. = FALSE)
  pwb_checks_from(rpwb_fit_checks_finish(x$bytes))
}

#' @rdname chunk_summaries
#' @export
print.pwb_summary <- function(x, ...) {
  cat(sprintf("<%s> %d rows (%d left out for missing values), %d bytes\n", class(x)[1L],
              as.integer(x$n), as.integer(x$n_missing), length(x$bytes)))
  cat(" ", deparse1(x$design$formula), "\n")
  invisible(x)
}

pwb_new_summary <- function(kind, bytes, design, n, n_missing, extra) {
  structure(c(list(bytes = bytes, design = design, n = n, n_missing = n_missing), extra),
            class = c(kind, "pwb_summary"))
}

# The chunk's response: finite, and positive for Box-Cox; an error names the chunk and its rows.
pwb_chunk_check_response <- function(fr, design, family, chunk) {
  y <- fr$y
  what <- design$yname
  bad <- which(!is.finite(y))
  msg <- if (length(bad)) {
    sprintf("`%s` has %d infinite %s at %s %s: remove or replace them first", what, length(bad),
            pwb_plural(length(bad), "value"), pwb_plural(length(bad), "row"),
            pwb_format_rows(fr$rows[bad]))
  } else if (family == "box-cox" && any(y <= 0)) {
    bad <- which(y <= 0)
    sprintf("Box-Cox needs %s > 0; %d %s <= 0 at %s %s: use Yeo-Johnson or a shift", what,
            length(bad), pwb_plural(length(bad), "value"), pwb_plural(length(bad), "row"),
            pwb_format_rows(fr$rows[bad]))
  }
  if (!is.null(msg)) stop(sprintf("chunk %s: %s", chunk, msg), call. = FALSE)
  invisible()
}

# list(transform, lambda, estimated) for a fit summary's response.
pwb_chunk_response <- function(response) {
  if (inherits(response, "pwb_transform")) return(list(transform = response, lambda = NULL, estimated = 0L))
  if (inherits(response, "pwb_lambda")) {
    if (isTRUE(response$needs_pass) || is.na(response$convenient))
      stop("the pwb_lambda has no estimate yet (its summary asked for one more pass)", call. = FALSE)
    return(list(transform = as_transform(response, "convenient"), lambda = response, estimated = 1L))
  }
  if (identical(response, "none"))
    return(list(transform = new_transform("identity"), lambda = NULL, estimated = 0L))
  stop("`response` must be a pwb_transform, a pwb_lambda or \"none\"", call. = FALSE)
}
