# Validators shared by the entry points: each stops with a message naming the argument and what
# it should be. One definition per check, so every entry point words a bad argument the same way.

# A confidence level strictly between 0 and 1.
pwb_check_level <- function(level) {
  if (!is.numeric(level) || length(level) != 1L || is.na(level) || level <= 0 || level >= 1)
    stop("`level` must be a single number strictly between 0 and 1, e.g. 0.95", call. = FALSE)
}

# A search range c(lower, upper) of two finite numbers with lower < upper.
pwb_check_range <- function(range, what = "range") {
  if (!is.numeric(range) || length(range) != 2L || any(!is.finite(range)) ||
      range[1L] >= range[2L])
    stop(sprintf("`%s` must be two finite numbers c(lower, upper) with lower < upper", what),
         call. = FALSE)
}

# TRUE or FALSE (a compare = / progress = style switch).
pwb_check_flag <- function(x, what) {
  if (!is.logical(x) || length(x) != 1L || is.na(x))
    stop(sprintf("`%s` must be TRUE or FALSE", what), call. = FALSE)
}

# A single finite number > 0 (a tolerance, a step).
pwb_check_positive <- function(v, what) {
  if (!is.numeric(v) || length(v) != 1L || !is.finite(v) || v <= 0)
    stop(sprintf("`%s` must be a single positive number", what), call. = FALSE)
}

# A whole number >= lo, returned as an integer.
pwb_check_whole <- function(v, what, lo) {
  if (!is.numeric(v) || length(v) != 1L || is.na(v) || v != round(v) || v < lo)
    stop(sprintf("`%s` must be a whole number >= %d", what, as.integer(lo)), call. = FALSE)
  as.integer(v)
}

# NULL or a whole number in [0, 2^53), the seeds of the package's own generator.
pwb_check_seed <- function(seed) {
  if (!is.null(seed) && (!is.numeric(seed) || length(seed) != 1L || is.na(seed) || seed < 0 ||
                         seed != round(seed) || seed >= 2^53))
    stop("`seed` must be NULL or a whole number >= 0", call. = FALSE)
}

# A data frame.
pwb_check_data_frame <- function(data, what = "data") {
  if (!is.data.frame(data)) stop(sprintf("`%s` must be a data frame", what), call. = FALSE)
}

# A two-sided formula with one variable name on the left.
pwb_check_response_formula <- function(formula) {
  if (!inherits(formula, "formula") || length(formula) != 3L)
    stop("`formula` must be a two-sided formula with a variable name on the left, e.g. y ~ x",
         call. = FALSE)
  if (!is.symbol(formula[[2L]]))
    stop(sprintf(paste0("`formula` must be a two-sided formula with a variable name on the left, ",
                        "e.g. y ~ x; its left side is `%s`"), deparse1(formula[[2L]])),
         call. = FALSE)
}

# NULL or a list whose every element is named.
pwb_check_named_list <- function(x, what) {
  if (!is.null(x) && (!is.list(x) || is.null(names(x)) || any(!nzchar(names(x)))))
    stop(sprintf("`%s` must be a named list, e.g. list(flow = c(10, 20))", what), call. = FALSE)
}

# A single file path.
pwb_check_path <- function(file) {
  if (!is.character(file) || length(file) != 1L || is.na(file) || !nzchar(file))
    stop("`file` must be a single path, e.g. file.path(tempdir(), \"transforms.pwbspec\")",
         call. = FALSE)
}

# One of the given names; `arg` is what the user passed.
pwb_check_choice <- function(arg, choices, what) {
  if (!is.character(arg) || length(arg) != 1L || is.na(arg) || !arg %in% choices)
    stop(sprintf("`%s` must be one of %s", what, paste0("\"", choices, "\"", collapse = ", ")),
         call. = FALSE)
  arg
}

# A character argument whose default lists its choices, as match.arg() reads it: the default
# (or NULL) gives the first choice, a unique abbreviation the full name; anything else stops
# with a message naming the argument and its choices. `what` is the argument's name in the caller.
pwb_match_choice <- function(arg, what, choices = NULL) {
  if (is.null(choices)) choices <- eval(formals(sys.function(sys.parent()))[[what]])
  if (is.null(arg) || identical(arg, choices)) return(choices[1L])
  i <- if (is.character(arg) && length(arg) == 1L && !is.na(arg)) pmatch(arg, choices) else NA
  if (is.na(i))
    stop(sprintf("`%s` must be one of %s", what, paste0("\"", choices, "\"", collapse = ", ")),
         call. = FALSE)
  choices[i]
}
