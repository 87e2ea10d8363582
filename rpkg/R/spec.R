#' Write transforms to a portable text file, and read them back
#'
#' `write_transforms()` saves named transforms in the plain-text format "powerback-spec 1", so
#' that a scoring service in another language (through the C library of this package) or a later
#' R session applies exactly the same transforms: every constant is written as a hexadecimal
#' floating number and reads back bit for bit. `read_transforms()` reads such a file.
#'
#' The format has one line per transform, for example
#' `transform name="income" family=box-cox lambda=0x1p-1 shift=0x1p+0 reflect=false`, between
#' a first line `powerback-spec 1` and a last line `end`. The reader is strict: unknown or
#' repeated keys, missing fields, malformed or non-finite numbers, binary content, a file cut
#' short and text after the last line are errors naming the line and column. A file written by a
#' newer version of the format is refused with a message naming that version. Limits: 16 MiB
#' per file, 4096 bytes per line, 65536 transforms, 256 bytes per name.
#'
#' A saved transform is only half of what a model needs: a model fitted on the transformed scale
#' estimates effects on that scale, and its back-transformed fitted values are medians, not
#' means, unless corrected. The file records the transforms, not the judgement that chose them.
#'
#' A fitted model can be saved too: its transforms, and a model record holding the response's
#' name, the coefficients on the transformed scale in design order (intercept first; an aliased
#' coefficient is written `NA`), the residual standard deviation and the residual degrees of
#' freedom. These are the values of `coef(x)`, `x$sigma` and `x$df_residual`; they describe
#' the model on the transformed scale, where a back-transformed prediction is a median unless
#' corrected.
#'
#' @param x a named list of `pwb_transform` objects (from [new_transform()]); names must be
#'   distinct, non-empty and at most 256 bytes in UTF-8. Or a `pwb_model` (from
#'   [lm_transformed()]): its response transform is written under the response's name, then
#'   each predictor transform under its variable's name, then its model record.
#' @param file a path to write or read.
#' @return `write_transforms()` returns `file`, invisibly. `read_transforms()` returns a named
#'   list of `pwb_transform` objects, in the order of the file. When the file holds a model
#'   record, the list carries it as the attribute `"model"`: a list with `response` (the
#'   response's name), `coefficients` (a named numeric vector, `NA` for an aliased
#'   coefficient), `sigma` (`NA` when not available) and `df` (residual degrees of freedom);
#'   without one, `attr(result, "model")` is `NULL`.
#' @seealso [new_transform()], [apply_transform()]
#' @examples
#' trs <- list(income = new_transform("box-cox", lambda = 0.5, shift = 1),
#'             score = new_transform("log", reflect = TRUE, pivot = 101))
#' path <- file.path(tempdir(), "transforms.pwbspec")
#' write_transforms(trs, path)
#' cat(readLines(path), sep = "\n")
#' back <- read_transforms(path)
#' apply_transform(back$income, c(0, 3, 8))
#'
#' # a fitted model: its transforms and its coefficients
#' d <- data.frame(x = c(1, 2, 4, 8, 16, 32), y = c(2.1, 2.9, 4.2, 5.8, 8.3, 11.9))
#' fit <- lm_transformed(y ~ x, d, response = new_transform("log"),
#'                       predictors = list(x = new_transform("log")))
#' write_transforms(fit, path)
#' attr(read_transforms(path), "model")
#' unlink(path)
#' @export
write_transforms <- function(x, file) {
  model <- list()
  if (inherits(x, "pwb_model")) {
    model <- pwb_spec_model_record(x)
    x <- c(stats::setNames(list(x$response), x$yname), x$predictors)
  }
  if (inherits(x, "pwb_transform"))
    stop("`x` must be a named list of transforms; wrap one transform as list(name = tr)",
         call. = FALSE)
  if (!is.list(x) || length(x) == 0L)
    stop("`x` must be a non-empty named list of pwb_transform objects", call. = FALSE)
  bad <- which(!vapply(x, inherits, logical(1), what = "pwb_transform"))
  if (length(bad) > 0L)
    stop(sprintf("`x` must hold only pwb_transform objects; %s %s %s not: build them with new_transform()",
                 pwb_plural(length(bad), "element"), pwb_format_rows(bad),
                 if (length(bad) == 1L) "is" else "are"), call. = FALSE)
  nms <- names(x)
  if (is.null(nms) || anyNA(nms) || any(!nzchar(nms))) {
    miss <- if (is.null(nms)) seq_along(x) else which(is.na(nms) | !nzchar(nms))
    stop(sprintf("every transform in `x` needs a name; %s %s %s none: use list(name = transform)",
                 pwb_plural(length(miss), "element"), pwb_format_rows(miss),
                 if (length(miss) == 1L) "has" else "have"), call. = FALSE)
  }
  dup <- unique(nms[duplicated(nms)])
  if (length(dup) > 0L)
    stop(sprintf("names in `x` must be distinct; repeated: %s", paste(dup, collapse = ", ")),
         call. = FALSE)
  pwb_check_path(file)
  rpwb_spec_write_file(unname(lapply(x, unclass)), pwb_utf8_names(nms, "names in `x`"),
                       path.expand(file), model)
  invisible(file)
}

#' @rdname write_transforms
#' @export
read_transforms <- function(file) {
  pwb_check_path(file)
  if (!file.exists(file))
    stop(sprintf("the file \"%s\" does not exist", file), call. = FALSE)
  specs <- tryCatch(rpwb_spec_read_file(path.expand(file)), error = function(e)
    stop(sprintf("cannot read transforms from \"%s\": %s", file, conditionMessage(e)),
         call. = FALSE))
  out <- lapply(specs, function(s) structure(s, class = "pwb_transform"))
  attr(out, "model") <- attr(specs, "model")
  out
}

# The model record of a pwb_model for the glue: list(response, names, coefficients, sigma, df).
pwb_spec_model_record <- function(x) {
  cf <- stats::coef(x)
  sg <- x$sigma
  list(response = pwb_utf8_names(x$yname, "the response's name"),
       names = pwb_utf8_names(names(cf), "coefficient names"),
       coefficients = as.double(unname(cf)),
       sigma = if (is.finite(sg)) as.double(sg) else NA_real_,
       df = as.double(x$df_residual))
}

# Names as UTF-8 for the spec. A name whose bytes are not valid in its declared encoding (e.g.
# "\xff" in a UTF-8 session) is an error: converting it would rewrite it silently.
pwb_utf8_names <- function(nms, what) {
  native_utf8 <- isTRUE(l10n_info()[["UTF-8"]])
  claims_utf8 <- Encoding(nms) == "UTF-8" | (Encoding(nms) == "unknown" & native_utf8)
  bad <- which(claims_utf8 & !validUTF8(nms))
  if (length(bad))
    stop(sprintf(paste0("%s must be valid UTF-8; %s %s %s not (invalid bytes): give the %s in ",
                        "UTF-8, e.g. with iconv(..., from = \"latin1\", to = \"UTF-8\")"),
                 what, pwb_plural(length(bad), "element"), pwb_format_rows(bad),
                 if (length(bad) == 1L) "is" else "are", pwb_plural(length(bad), "name")),
         call. = FALSE)
  enc2utf8(nms)
}
