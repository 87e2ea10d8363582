# How many threads the compiled code may use for work that splits into independent pieces
# (responses of a many-response call, rows of a smearing mean). Results never depend on it.
#
# The option `powerback.threads` sets it (a positive whole number); by default 2, or 1 where
# only one core is reported. Checks that limit packages to two cores are met by the default.
pwb_threads <- function() {
  n <- getOption("powerback.threads")
  if (is.null(n)) {
    cores <- tryCatch(parallel::detectCores(logical = TRUE), error = function(e) NA_integer_)
    return(if (is.na(cores) || cores < 2L) 1L else 2L)
  }
  if (!is.numeric(n) || length(n) != 1L || is.na(n) || n < 1 || n != round(n))
    stop("option `powerback.threads` must be one positive whole number, e.g. options(powerback.threads = 2)",
         call. = FALSE)
  as.integer(n)
}
