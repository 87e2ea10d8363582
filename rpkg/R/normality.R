# Normality statistics shared by the R front end: thin, validated calls of the glue.
# Missing values are the caller's business; these helpers report how many were left out.

# Shapiro-Wilk of the non-missing values of x: list(statistic, p_value, n, computed, note,
# n_missing). Not computed (with a note) for fewer than 3 or more than 5000 values, or a
# constant x. Infinite values are an error naming their positions.
pwb_shapiro_wilk <- function(x, what = "x") {
  x <- pwb_finite_values(x, what)
  out <- rpwb_shapiro_wilk(x$values)
  out$n_missing <- x$n_missing
  out
}

# Sample moments (mean, sd, G1 with SE and z, G2 with SE and z) of the non-missing values of x.
pwb_moments <- function(x, what = "x") {
  x <- pwb_finite_values(x, what)
  out <- rpwb_moments(x$values)
  out$n_missing <- x$n_missing
  out
}

# The non-missing values of a numeric x and how many were missing; an error naming the
# positions of infinite values.
pwb_finite_values <- function(x, what) {
  if (!is.numeric(x))
    stop(sprintf("`%s` must be numeric, not %s", what, class(x)[1L]), call. = FALSE)
  miss <- is.na(x)
  inf <- which(is.infinite(x))
  if (length(inf) > 0L)
    stop(sprintf("`%s` has %d infinite %s at %s %s: remove or replace them first", what,
                 length(inf), pwb_plural(length(inf), "value"), pwb_plural(length(inf), "row"),
                 pwb_format_rows(inf)), call. = FALSE)
  list(values = as.double(x[!miss]), n_missing = sum(miss))
}
