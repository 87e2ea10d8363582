#' Build a variable transform
#'
#' A transform maps a variable `x` in three steps, each constant stored so that new data get
#' exactly the same map: reflect (optional) `v = pivot - x`; shift `v = v + shift`; then the
#' family with its power `lambda` where it has one. Every family is increasing, so only
#' reflection reverses the order of values.
#'
#' Families: `"identity"`; `"box-cox"` \eqn{(v^\lambda - 1)/\lambda}, `log v` at
#' \eqn{\lambda = 0}, for `v > 0`; `"yeo-johnson"` (any real `v`); `"log"`; `"log10"`; `"sqrt"`;
#' `"reciprocal"` (defined as `-1/v` so that it is increasing); `"power"` (`lambda != 0`,
#' sign-preserving \eqn{v^\lambda}, and \eqn{-v^\lambda} for \eqn{\lambda < 0}); `"asinh"`;
#' `"logit"` (`0 < v < 1`).
#'
#' @param family one of the family names above.
#' @param lambda the power, for `"box-cox"`, `"yeo-johnson"` and `"power"`; ignored otherwise.
#' @param shift a constant added after the optional reflection.
#' @param reflect logical: reflect the variable about `pivot` first (for left-skewed data).
#' @param pivot the reflection point, required when `reflect = TRUE` (a common choice is
#'   `max(x) + 1`, learned once from the fitting data).
#' @return An object of class `pwb_transform`: a list with `family`, `lambda`, `shift`,
#'   `reflect` and `pivot` (`NA` where unused).
#' @seealso [apply_transform()], [invert_transform()]
#' @examples
#' tr <- new_transform("box-cox", lambda = 0.5, shift = 1)
#' tr
#' z <- apply_transform(tr, c(0, 3, 8))
#' invert_transform(tr, z)
#'
#' # left-skewed percentages: reflect about 101, then log
#' new_transform("log", reflect = TRUE, pivot = 101)
#' @export
new_transform <- function(family, lambda = NULL, shift = 0, reflect = FALSE, pivot = NULL) {
  if (!is.character(family) || length(family) != 1L || is.na(family))
    stop("`family` must be one family name, e.g. \"box-cox\"", call. = FALSE)
  num1 <- function(v, what) {
    if (is.null(v) || identical(v, NA)) return(NA_real_)
    if (!is.numeric(v) || length(v) != 1L)
      stop(sprintf("`%s` must be a single number", what), call. = FALSE)
    as.double(v)
  }
  pwb_check_flag(reflect, "reflect")
  spec <- list(family = family, lambda = num1(lambda, "lambda"), shift = num1(shift, "shift"),
               reflect = reflect, pivot = num1(pivot, "pivot"))
  if (is.na(spec$shift)) stop("`shift` must be a finite number", call. = FALSE)
  # The library validates the spec and normalises unused constants to NA.
  structure(rpwb_transform_normalise(spec), class = "pwb_transform")
}

#' Apply a transform, or its inverse
#'
#' `apply_transform()` maps original values to the transformed scale; `invert_transform()` maps
#' transformed values back to original units, so that `invert_transform(tr,
#' apply_transform(tr, x))` returns `x`.
#'
#' Missing values (`NA`, `NaN`) stay missing. Infinite values and values outside the transform's
#' domain (or, for the inverse, its range) are errors that name the rows and a remedy; with
#' `invalid = "na"` they become `NA` instead and their rows are listed in the attribute
#' `"invalid_rows"`.
#'
#' @param tr a `pwb_transform` from [new_transform()].
#' @param x,z numeric vectors of original or transformed values.
#' @param invalid `"error"` (default) or `"na"`: what to do with values that cannot be mapped.
#' @return A numeric vector as long as the input, with its names; a matrix input keeps its
#'   dimensions and dimnames.
#' @examples
#' tr <- new_transform("log10")
#' apply_transform(tr, c(1, 10, 1000))
#' apply_transform(tr, c(5, -1, 50), invalid = "na")
#' invert_transform(tr, c(0, 1, 2))
#' @export
apply_transform <- function(tr, x, invalid = c("error", "na")) {
  invalid <- pwb_match_choice(invalid, "invalid")
  pwb_map_values(tr, x, deparse1(substitute(x)), invalid, inverse = FALSE)
}

#' @rdname apply_transform
#' @export
invert_transform <- function(tr, z, invalid = c("error", "na")) {
  invalid <- pwb_match_choice(invalid, "invalid")
  pwb_map_values(tr, z, deparse1(substitute(z)), invalid, inverse = TRUE)
}

pwb_check_transform <- function(tr) {
  if (!inherits(tr, "pwb_transform"))
    stop("`tr` must be a pwb_transform made by new_transform()", call. = FALSE)
}

pwb_map_values <- function(tr, x, xname, invalid, inverse) {
  pwb_check_transform(tr)
  if (!is.numeric(x))
    stop(sprintf("`%s` must be numeric, not %s", xname, class(x)[1L]), call. = FALSE)
  keep <- !is.na(x)
  out <- rep(NA_real_, length(x))
  res <- rpwb_transform_map(tr, as.double(x[keep]), if (inverse) 1L else 0L)
  out[keep] <- res$value
  # the result has the shape of the input: names, or a matrix's dim and dimnames
  if (!is.null(dim(x))) {
    dim(out) <- dim(x)
    dimnames(out) <- dimnames(x)
  } else {
    names(out) <- names(x)
  }
  if (res$status == 0L) return(out)
  bad <- which(keep)[is.na(res$value)]
  if (invalid == "na") {
    attr(out, "invalid_rows") <- bad
    return(out)
  }
  stop(pwb_invalid_message(tr, x, bad, xname, inverse), call. = FALSE)
}

pwb_invalid_message <- function(tr, x, bad, xname, inverse) {
  n_inf <- sum(is.infinite(x[bad]))
  if (n_inf > 0L) {
    rows <- bad[is.infinite(x[bad])]
    return(sprintf("`%s` has %d infinite %s at %s %s: remove or replace them first", xname,
                   n_inf, pwb_plural(n_inf, "value"), pwb_plural(n_inf, "row"),
                   pwb_format_rows(rows)))
  }
  need <- rpwb_transform_describe(tr, if (inverse) 1L else 0L)
  remedy <- if (inverse) "these values lie beyond what the transform can produce"
            else rpwb_transform_describe(tr, 2L)
  sprintf("%s; %d of %d values of `%s` are outside, at %s %s: %s", need, length(bad),
          sum(!is.na(x)), xname, pwb_plural(length(bad), "row"), pwb_format_rows(bad), remedy)
}

#' Describe and print a transform
#'
#' `format()` gives a one-line description of a transform that names the variable it maps, e.g.
#' `"log of Volume"` or `"sqrt of (101 - forest_pct)"`; a Box-Cox power of 0 is the natural log
#' and is written as such.
#'
#' @param x a `pwb_transform` from [new_transform()].
#' @param name the variable's name (or expression) to write in the description.
#' @param ... unused.
#' @return `format()`: a character string; `print()`: `x`, invisibly.
#' @examples
#' format(new_transform("box-cox", lambda = 0), name = "Volume")
#' new_transform("sqrt", shift = 1)
#' @export
format.pwb_transform <- function(x, name = "x", ...) pwb_transform_label(x, name)

#' @rdname format.pwb_transform
#' @export
print.pwb_transform <- function(x, ...) {
  pwb_cat_wrap("<pwb_transform> ", format(x))
  invisible(x)
}

# "log of Volume", "yeo-johnson(lambda = 0.3) of (rain - 2)": the library's description with
# the variable's name in place of its generic x.
pwb_transform_label <- function(tr, name = "x") {
  if (is.null(tr)) return(name)
  txt <- rpwb_transform_describe(tr, 3L)
  cut <- regexpr(" of ", txt, fixed = TRUE)
  if (cut < 0L) return(txt)
  head <- substr(txt, 1L, cut - 1L)
  arg <- substr(txt, cut + 4L, nchar(txt))
  if (identical(tr$family, "box-cox") && isTRUE(tr$lambda == 0)) head <- "log"
  arg <- gsub("(?<![[:alnum:]_.])x(?![[:alnum:]_.])", name, arg, perl = TRUE)
  if (identical(head, "identity")) return(paste("untransformed", arg))
  paste(head, "of", arg)
}
