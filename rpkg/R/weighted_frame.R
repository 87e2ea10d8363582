# Model frames with lm's `weights =` and `subset =` for box_tidwell() and lambda_influence(): a
# formula with data, or a fitted lm (whose prior weights are used). Rows are reported as the
# data's row names where it has its own, else as 1-based positions in the data.

pwb_weighted_frame <- function(object, data, weights, subset, env, caller) {
  if (inherits(object, "lm")) {
    if (!is.null(weights) || !is.null(subset))
      stop(sprintf(paste0("%s(): give `weights` and `subset` when fitting the lm, ",
                          "or pass its formula with `data`"), caller), call. = FALSE)
    mf <- stats::model.frame(object)
    if (is.null(data)) data <- tryCatch(eval(object$call$data, environment(stats::formula(object))),
                                        error = function(e) NULL)
  } else if (inherits(object, "formula")) {
    if (is.null(data) || !is.data.frame(data))
      stop(sprintf("%s() needs `data`, a data frame holding the variables of the formula", caller),
           call. = FALSE)
    cl <- list(quote(stats::model.frame), formula = object, data = data)
    if (!is.null(weights)) cl$weights <- weights
    if (!is.null(subset)) cl$subset <- subset
    mf <- eval(as.call(cl), env)
  } else {
    stop(sprintf("`object` must be a formula (with `data`) or an lm fit, not %s",
                 class(object)[1L]), call. = FALSE)
  }
  tt <- attr(mf, "terms")
  if (!is.null(attr(tt, "offset")) || "(offset)" %in% names(mf))
    stop(sprintf("%s() does not support offsets: fit the model without them", caller),
         call. = FALSE)
  if (attr(tt, "response") == 0L)
    stop("the formula has no response: write it as y ~ x1 + x2", call. = FALSE)
  if (attr(tt, "intercept") != 1L)
    stop(sprintf("%s() needs a model with an intercept", caller), call. = FALSE)
  y <- stats::model.response(mf)
  yname <- deparse1(tt[[2L]])
  if (!is.numeric(y) || is.matrix(y))
    stop(sprintf("the response `%s` must be a numeric vector", yname), call. = FALSE)
  named <- !is.null(data) && .row_names_info(data) > 0L
  labels <- if (named) rownames(mf) else {
    pos <- if (!is.null(data)) match(rownames(mf), rownames(data)) else NA
    if (anyNA(pos)) seq_len(nrow(mf)) else pos
  }
  w <- stats::model.weights(mf)
  if (!is.null(w)) {
    if (!is.numeric(w)) stop("`weights` must be numeric", call. = FALSE)
    bad <- which(!is.finite(w) | w < 0)
    if (length(bad) > 0L)
      stop(sprintf(paste0("weights must be finite and >= 0: %d %s at %s %s; ",
                          "fix them or drop those rows (a weight of 0 leaves a row out)"),
                   length(bad), pwb_plural(length(bad), "value"),
                   pwb_plural(length(bad), "row"), pwb_format_labels(labels[bad])), call. = FALSE)
    w <- as.double(w)
  }
  mm <- stats::model.matrix(tt, mf)
  list(mf = mf, terms = tt, y = as.double(y), yname = yname, labels = labels, named = named,
       weights = w, X = mm[, colnames(mm) != "(Intercept)", drop = FALSE])
}

# "4, 17, 88" or "Fiat 128, Honda Civic" (at most `most` listed, then "...").
pwb_format_labels <- function(labels, most = 8L) {
  txt <- paste(utils::head(as.character(labels), most), collapse = ", ")
  if (length(labels) > most) txt <- paste0(txt, ", ...")
  txt
}
