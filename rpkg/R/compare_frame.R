# Model frames shared by box_tidwell(), lambda_influence() and compare_transforms(): a formula
# with data, or a fitted lm. Rows are reported as positions in the caller's data (1-based).

pwb_cmp_frame <- function(object, data, caller) {
  if (inherits(object, "lm")) {
    mf <- stats::model.frame(object)
    if (is.null(data)) data <- tryCatch(eval(object$call$data, environment(stats::formula(object))),
                                        error = function(e) NULL)
  } else if (inherits(object, "formula")) {
    if (is.null(data) || !is.data.frame(data))
      stop(sprintf("%s() needs `data`, a data frame holding the variables of the formula", caller),
           call. = FALSE)
    mf <- stats::model.frame(object, data)
  } else {
    stop(sprintf("`object` must be a formula (with `data`) or an lm fit, not %s",
                 class(object)[1L]), call. = FALSE)
  }
  tt <- attr(mf, "terms")
  if ("(weights)" %in% names(mf) || !is.null(attr(tt, "offset")) || "(offset)" %in% names(mf))
    stop(sprintf("%s() does not support weights or offsets: fit the model without them",
                 caller), call. = FALSE)
  if (attr(tt, "response") == 0L)
    stop("the formula has no response: write it as y ~ x1 + x2", call. = FALSE)
  y <- stats::model.response(mf)
  yname <- deparse1(tt[[2L]])
  if (!is.numeric(y) || is.matrix(y))
    stop(sprintf("the response `%s` must be a numeric vector", yname), call. = FALSE)
  rows <- if (!is.null(data) && !is.null(rownames(data))) match(rownames(mf), rownames(data))
          else seq_len(nrow(mf))
  if (anyNA(rows)) rows <- seq_len(nrow(mf))
  list(mf = mf, terms = tt, y = as.double(y), yname = yname, rows = rows,
       omitted = attr(mf, "na.action"))
}

# The design without its intercept column; stops when the model has no intercept.
pwb_cmp_design <- function(fr, caller) {
  if (attr(fr$terms, "intercept") != 1L)
    stop(sprintf("%s() needs a model with an intercept", caller), call. = FALSE)
  mm <- stats::model.matrix(fr$terms, fr$mf)
  mm[, colnames(mm) != "(Intercept)", drop = FALSE]
}

# The level check of box_tidwell() and lambda_influence(): the shared one (see validate.R).
pwb_cmp_check_level <- function(level) pwb_check_level(level)
