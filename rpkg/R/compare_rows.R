# The rows compare_transforms() uses: subset, weights and na.action as lm() applies them, and
# the refusal of offsets.

# Offsets would be ignored by the per-fold fits' predictions: refused with the same words
# as estimate_response_lambda().
pwb_cmp_check_offset <- function(formula, data) {
  tt <- tryCatch(stats::terms(formula, data = data), error = function(e) NULL)
  if (!is.null(tt) && !is.null(attr(tt, "offset")))
    stop("offsets are not supported: move the offset into the response first", call. = FALSE)
}

# weights = NULL, a column name of data, or an expression evaluated in data (then in env), as
# lm() reads it: one precision weight per row of data. NA follows na.action; a negative or
# non-finite weight is an error naming the rows of data.
pwb_cmp_weights <- function(expr, data, env) {
  if (is.null(expr)) return(NULL)
  w <- eval(expr, data, env)
  if (is.null(w)) return(NULL)
  if (is.character(w) && length(w) == 1L && nrow(data) != 1L) {
    if (!w %in% names(data))
      stop(sprintf("`weights` names no column of `data`: \"%s\"", w), call. = FALSE)
    w <- data[[w]]
  }
  if (!is.numeric(w) || is.matrix(w))
    stop("`weights` must be numeric: one precision weight per row of `data`", call. = FALSE)
  if (length(w) != nrow(data))
    stop(sprintf("`weights` needs one value per row of `data` (%d), not %d", nrow(data),
                 length(w)), call. = FALSE)
  labels <- pwb_row_labels(data)
  bad <- which(!is.na(w) & !is.finite(w))
  if (length(bad))
    stop(sprintf("`weights` is not finite at %s %s: give every row a finite weight >= 0",
                 pwb_plural(length(bad), "row"), paste(utils::head(labels[bad], 8L),
                                                       collapse = ", ")), call. = FALSE)
  bad <- which(!is.na(w) & w < 0)
  if (length(bad))
    stop(sprintf("`weights` is negative at %s %s: precision weights must be >= 0 (0 drops a row)",
                 pwb_plural(length(bad), "row"), paste(utils::head(labels[bad], 8L),
                                                       collapse = ", ")), call. = FALSE)
  as.double(w)
}

# subset = NULL, or a logical, numeric or row-name vector (an expression evaluated in data, then
# in env) as lm() reads it: the positions of the rows kept, in order. NA in a logical subset
# drops the row.
pwb_cmp_subset <- function(expr, data, env) {
  if (is.null(expr)) return(NULL)
  s <- eval(expr, data, env)
  if (is.null(s)) return(NULL)
  all <- seq_len(nrow(data))
  if (is.logical(s)) {
    if (length(s) != nrow(data))
      stop(sprintf("`subset` as a logical vector needs one value per row of `data` (%d), not %d",
                   nrow(data), length(s)), call. = FALSE)
    return(which(s))
  }
  if (is.numeric(s)) {
    out <- all[s]
    if (anyNA(out))
      stop("`subset` holds row numbers outside the rows of `data`", call. = FALSE)
    return(out)
  }
  if (is.character(s)) {
    out <- match(s, rownames(data))
    if (anyNA(out))
      stop(sprintf("`subset` names rows `data` does not have: %s",
                   paste(utils::head(s[is.na(out)], 8L), collapse = ", ")), call. = FALSE)
    return(out)
  }
  stop("`subset` must be a logical, numeric or row-name vector", call. = FALSE)
}

# The rows used after subset and na.action (positions in data, taken from the na.action's
# record rather than by matching row names) and their variables.
pwb_cmp_used_rows <- function(data, vars, w, keep) {
  idx <- if (is.null(keep)) seq_len(nrow(data)) else keep
  tmp <- data[idx, vars, drop = FALSE]
  if (!is.null(w)) tmp[["(weights)"]] <- w[idx]
  act <- getOption("na.action")
  fun <- if (is.null(act)) stats::na.omit else match.fun(act)
  done <- fun(tmp)
  omitted <- attr(done, "na.action")
  rows <- if (length(omitted)) idx[-as.integer(omitted)] else idx
  dat <- if (length(omitted) || !is.null(w)) done[vars] else tmp
  list(rows = rows, dat = dat)
}
