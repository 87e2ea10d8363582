# Model frames and their responses without copies.
#
# stats::na.omit() and na.exclude() copy every column of a model frame (a row subset) even when
# no row is dropped; with a matrix of many responses that copy is most of the frame's cost.
# When the na.action is one of R's three standard ones, the frame is built with na.pass first:
# if no variable has a missing value the standard action would return the same rows and values
# (and no "na.action" attribute), so that frame is kept. Otherwise, or for any other na.action,
# the frame is built again exactly as model.frame() builds it.

# `args`: the arguments of stats::model.frame (formula, data, ..., na.action when given).
pwb_model_frame <- function(args) {
  act <- if (is.null(args$na.action)) getOption("na.action", "na.omit") else args$na.action
  standard <- if (is.character(act)) length(act) == 1L && act %in% c("na.omit", "na.exclude", "na.fail")
              else is.function(act) && (identical(act, stats::na.omit) ||
                                         identical(act, stats::na.exclude) ||
                                         identical(act, stats::na.fail))
  if (standard) {
    mf <- do.call(stats::model.frame, c(args[names(args) != "na.action"],
                                        list(na.action = stats::na.pass)))
    if (!anyNA(mf, recursive = TRUE)) return(mf)
  }
  do.call(stats::model.frame, args)
}

# The response of a model frame as it is stored (NULL without one). stats::model.response()
# attaches the frame's row names to it, which converts every row number to text and copies the
# response (for a matrix of many responses, tens of milliseconds); the library reads the values
# only. A one-column matrix becomes a vector, as model.response() makes it.
pwb_frame_response <- function(mf) {
  if (!isTRUE(attr(attr(mf, "terms"), "response") == 1L)) return(NULL)
  v <- mf[[1L]]
  if (is.matrix(v) && ncol(v) == 1L) dim(v) <- NULL
  v
}
