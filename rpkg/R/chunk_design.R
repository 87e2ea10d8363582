# The design shared by every chunk: terms (with their data-dependent parts fixed), factor levels,
# the response and weights columns; and the matrices of one chunk built from it.

#' Fix a model's design before summarising data in chunks
#'
#' Chunks of one data set must build identical design matrices: the same factor levels in the
#' same order, and the same constants inside data-dependent terms such as `poly(x, 2)` or
#' `scale(x)`. `chunk_design()` fixes them once, from one chunk (a first look at the data) and
#' from `levels`, which you give when a chunk may not show every level. Every chunk summarised
#' with the design is checked against it: a factor level not in the set is an error naming the
#' level and the chunk.
#'
#' @param formula a two-sided formula whose left side is the response's column name, e.g.
#'   `load ~ log(flow) + season`; it needs an intercept.
#' @param data a data frame: one chunk of the data (the first, or any representative one).
#' @param levels optional named list of the complete level sets of factor (or character)
#'   predictors, e.g. `list(season = c("winter", "spring", "summer", "autumn"))`; levels not
#'   given are taken from `data`.
#' @param weights optional name of a column of precision weights (as `lm`'s `weights`; zero
#'   drops a row).
#' @param na.action how rows with missing values are handled in every chunk: `"na.omit"` (the
#'   default; the rows are left out and counted) or `"na.fail"` (an error).
#' @param x a `pwb_chunk_design` (for `print()`).
#' @param ... unused.
#' @return A `pwb_chunk_design`: a list with the terms, the factor levels, the coefficient
#'   names, the response and weights columns. `print()` returns `x` invisibly.
#' @seealso [fit_chunked()] runs the whole job; [lambda_summary()], [fit_summary()].
#' @examples
#' river <- river_data()
#' d <- chunk_design(sediment_t_day ~ log(flow_m3s) + season, river[1:100, ],
#'                   levels = list(season = levels(river$season)))
#' d
#' @export
chunk_design <- function(formula, data, levels = NULL, weights = NULL, na.action = c("na.omit", "na.fail")) {
  na.action <- pwb_match_choice(na.action, "na.action")
  pwb_check_response_formula(formula)
  pwb_check_data_frame(data)
  if (!is.null(weights) && !(is.character(weights) && length(weights) == 1L && weights %in% names(data)))
    stop("`weights` must be the name of a column of `data`", call. = FALSE)
  yname <- as.character(formula[[2L]])
  # Formulas built inside functions would carry their whole frame to every worker.
  environment(formula) <- globalenv()
  tt0 <- stats::terms(formula, data = data)
  if (attr(tt0, "intercept") != 1L)
    stop("chunked summaries need a model with an intercept: remove `- 1` or `+ 0`", call. = FALSE)
  mf <- stats::model.frame(tt0, data, na.action = stats::na.omit)
  if (nrow(mf) == 0L) stop("`data` has no complete rows to fix the design from", call. = FALSE)
  tt <- attr(mf, "terms")  # its predvars fix the data-dependent terms
  xlev <- stats::.getXlevels(tt, mf)
  if (!is.null(levels)) {
    if (!is.list(levels) || is.null(names(levels)) || any(names(levels) == ""))
      stop("`levels` must be a named list of level sets, e.g. list(season = c(\"a\", \"b\"))", call. = FALSE)
    unknown <- setdiff(names(levels), names(xlev))
    if (length(unknown))
      stop(sprintf("`levels` names %s, which %s not a factor or character predictor of the formula",
                   paste0("`", unknown, "`", collapse = ", "), if (length(unknown) == 1L) "is" else "are"),
           call. = FALSE)
    for (v in names(levels)) {
      seen <- setdiff(xlev[[v]], as.character(levels[[v]]))
      if (length(seen))
        stop(sprintf("`levels$%s` misses %s, seen in `data`", v, paste0("\"", seen, "\"", collapse = ", ")),
             call. = FALSE)
      xlev[[v]] <- as.character(levels[[v]])
    }
  }
  design <- structure(list(formula = formula, terms = tt, xlevels = xlev, yname = yname,
                           weights = weights, na.action = na.action, coef_names = NULL),
                      class = "pwb_chunk_design")
  mm <- pwb_chunk_frame(design, data, "used to fix the design", need_response = TRUE)$mm
  design$coef_names <- colnames(mm)
  design$key <- paste(c(deparse(tt), deparse(xlev), deparse(weights), na.action), collapse = "\n")
  design
}

#' @rdname chunk_design
#' @export
print.pwb_chunk_design <- function(x, ...) {
  cat("<pwb_chunk_design>", deparse1(x$formula), "\n")
  cat(sprintf("  %d coefficients: %s\n", length(x$coef_names), paste(x$coef_names, collapse = ", ")))
  for (v in names(x$xlevels))
    cat(sprintf("  levels of %s: %s\n", v, paste(x$xlevels[[v]], collapse = ", ")))
  if (!is.null(x$weights)) cat(sprintf("  weights: column `%s`\n", x$weights))
  invisible(x)
}

pwb_check_design <- function(design) {
  if (!inherits(design, "pwb_chunk_design"))
    stop("`design` must be a pwb_chunk_design from chunk_design()", call. = FALSE)
}

# The response, design matrix (without the intercept column) and weights of one chunk, rows with
# missing values left out (counted) or refused as the design says. `label` names the chunk.
pwb_chunk_frame <- function(design, data, label, need_response = TRUE) {
  if (!is.data.frame(data))
    stop(sprintf("chunk %s is not a data frame (a reader must return one)", label), call. = FALSE)
  for (v in names(design$xlevels)) {
    if (!v %in% names(data)) next
    vals <- data[[v]]
    new <- setdiff(unique(as.character(vals[!is.na(vals)])), design$xlevels[[v]])
    if (length(new))
      stop(sprintf("chunk %s: `%s` has %s %s not in the design's set (%s): list every level in `levels =` of chunk_design()",
                   label, v, pwb_plural(length(new), "level"), paste0("\"", new, "\"", collapse = ", "),
                   paste(design$xlevels[[v]], collapse = ", ")), call. = FALSE)
  }
  tt <- if (need_response) design$terms else stats::delete.response(design$terms)
  mf <- tryCatch(stats::model.frame(tt, data, xlev = design$xlevels, na.action = stats::na.pass),
                 error = function(e) stop(sprintf("chunk %s: %s", label, conditionMessage(e)), call. = FALSE))
  w <- NULL
  if (!is.null(design$weights) && need_response) {
    if (!design$weights %in% names(data))
      stop(sprintf("chunk %s has no weights column `%s`", label, design$weights), call. = FALSE)
    w <- as.double(data[[design$weights]])
  }
  ok <- stats::complete.cases(mf) & (if (is.null(w)) TRUE else !is.na(w))
  if (!all(ok) && design$na.action == "na.fail")
    stop(sprintf("chunk %s has missing values at %s %s (na.action = \"na.fail\")", label,
                 pwb_plural(sum(!ok), "row"), pwb_format_rows(which(!ok))), call. = FALSE)
  rows <- which(ok)
  mf <- mf[rows, , drop = FALSE]
  mm <- stats::model.matrix(tt, mf)
  if (!is.null(design$coef_names) && !identical(colnames(mm), design$coef_names))
    stop(sprintf("chunk %s gives the columns %s, not the design's %s", label,
                 paste(colnames(mm), collapse = ", "), paste(design$coef_names, collapse = ", ")), call. = FALSE)
  X <- mm[, colnames(mm) != "(Intercept)", drop = FALSE]
  X <- matrix(as.double(X), nrow = nrow(X), ncol = ncol(X))
  bad <- which(rowSums(!is.finite(X)) > 0)
  if (length(bad))
    stop(sprintf("chunk %s: predictors have infinite values at %s %s: remove or replace them first",
                 label, pwb_plural(length(bad), "row"), pwb_format_rows(rows[bad])), call. = FALSE)
  y <- if (need_response) as.double(stats::model.response(mf, "numeric")) else NULL
  if (need_response && is.null(y)) stop(sprintf("chunk %s has no response column", label), call. = FALSE)
  if (!is.null(w)) {
    w <- w[rows]
    badw <- which(!is.finite(w) | w < 0)
    if (length(badw))
      stop(sprintf("chunk %s: weights must be finite and >= 0; %s at %s %s", label,
                   pwb_plural(length(badw), "value is not", "values are not"),
                   pwb_plural(length(badw), "row"), pwb_format_rows(rows[badw])), call. = FALSE)
  }
  list(y = y, X = X, w = w, mm = mm, rows = rows, n_missing = sum(!ok))
}
