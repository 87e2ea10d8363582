# Model frames without a copy of complete data.
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
