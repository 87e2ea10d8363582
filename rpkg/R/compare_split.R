# The folds of compare_transforms(): random, stratified by the model's factors, grouped, or
# given by the user; and the user's row labels in messages about training parts.

# The fold ids (n-by-repeats integer matrix), the number of folds, the kind of split and notes
# on factor levels that miss a training part.
pwb_cmp_make_folds <- function(formula, dat, rows, given, groups, k, repeats, seed, stratify) {
  factors <- pwb_cmp_factors(formula, dat)
  n <- nrow(dat)
  if (!is.null(given)) {
    g <- given[rows]
    ids <- matrix(match(g, unique(g)), ncol = 1L)
    k <- length(unique(g))
    if (k < 2L) stop("`folds` as fold ids must name at least 2 folds among the used rows",
                     call. = FALSE)
    kind <- "given"
  } else if (!is.null(groups)) {
    codes <- match(groups, unique(groups)) - 1L
    ids <- rpwb_cv_folds_by(n, k, repeats, seed, NULL, codes)
    kind <- "grouped"
  } else if (stratify && length(factors)) {
    ids <- rpwb_cv_folds_by(n, k, repeats, seed, pwb_cmp_strata(factors), NULL)
    kind <- "stratified"
  } else {
    ids <- rpwb_cv_folds_by(n, k, repeats, seed, NULL, NULL)
    kind <- "random"
  }
  list(ids = ids, k = as.integer(k), kind = kind, notes = pwb_cmp_fold_notes(factors, ids, k))
}

# The model's factor-like predictors (as the formula builds them, e.g. factor(carb)), as a
# named list of factors over the rows of dat.
pwb_cmp_factors <- function(formula, dat) {
  mf <- tryCatch(stats::model.frame(formula, dat, na.action = stats::na.pass),
                 error = function(e) NULL)
  if (is.null(mf) || ncol(mf) < 2L || nrow(mf) != nrow(dat)) return(list())
  preds <- mf[-1L]
  keep <- vapply(preds, function(v) is.factor(v) || is.character(v) || is.logical(v),
                 logical(1))
  # a missing value (kept when the na.action passes it) counts as a level, so it has a code
  lapply(preds[keep], function(v) droplevels(addNA(as.factor(v), ifany = TRUE)))
}

# Stratum codes (0-based): one factor's levels, or the combination of several with the factor
# holding the rarest level first, so that factor's levels stay together when the rows are dealt.
pwb_cmp_strata <- function(factors) {
  rarest <- vapply(factors, function(f) min(table(f)), numeric(1))
  ordered <- factors[order(rarest)]
  cell <- if (length(ordered) == 1L) ordered[[1L]]
          else interaction(ordered, lex.order = TRUE, drop = TRUE)
  as.integer(cell) - 1L
}

# Sentences naming each factor level that is missing from some training part.
pwb_cmp_fold_notes <- function(factors, ids, k) {
  notes <- character(0)
  for (fn in names(factors)) {
    f <- factors[[fn]]
    counts <- table(f)
    for (lev in names(counts)) {
      at <- f == lev
      if (counts[[lev]] == 1L) {
        notes <- c(notes, sprintf(paste0("level %s of %s has 1 row: the fold holding it has no ",
                                         "training row of that level to predict it from"),
                                  lev, fn))
        next
      }
      for (r in seq_len(ncol(ids))) {
        only <- unique(ids[at, r])
        if (length(only) == 1L)
          notes <- c(notes, sprintf(paste0("all %d rows of level %s of %s are in fold %d of ",
                                           "repeat %d: that training part lacks the level"),
                                    counts[[lev]], lev, fn, only, r))
      }
    }
  }
  notes
}

# groups = NULL, a column name of data, or one value per row of data: the group of each row.
pwb_cmp_groups <- function(groups, data) {
  if (is.null(groups)) return(NULL)
  if (is.character(groups) && length(groups) == 1L && nrow(data) != 1L) {
    if (!groups %in% names(data))
      stop(sprintf("`groups` names no column of `data`: \"%s\"", groups), call. = FALSE)
    groups <- data[[groups]]
  }
  if (!is.atomic(groups) && !is.factor(groups))
    stop("`groups` must be NULL, a column name of `data` or one value per row", call. = FALSE)
  if (length(groups) != nrow(data))
    stop(sprintf("`groups` needs one value per row of `data` (%d), not %d", nrow(data),
                 length(groups)), call. = FALSE)
  if (anyNA(groups)) {
    bad <- which(is.na(groups))
    stop(sprintf("`groups` is missing at %s %s: give every row a group", pwb_plural(length(bad),
                 "row"), pwb_format_rows(bad)), call. = FALSE)
  }
  as.character(groups)
}

# How each row of a data frame is named to the user: its row names where it has its own, else
# its position.
pwb_row_labels <- function(data) {
  if (.row_names_info(data) < 0L) as.character(seq_len(nrow(data))) else rownames(data)
}

# A message naming rows of a training part by position ("at rows 21, 27") rewritten to name
# the user's rows (`labels`: the label of each training row, in order).
pwb_cmp_name_rows <- function(msg, labels) {
  m <- gregexpr("\\brows? [0-9]+(, [0-9]+)*", msg, perl = TRUE)
  regmatches(msg, m) <- lapply(regmatches(msg, m), function(hits) {
    vapply(hits, function(h) {
      word <- sub(" .*", "", h)
      num <- as.integer(strsplit(sub("^rows? ", "", h), ", ", fixed = TRUE)[[1L]])
      if (any(num < 1L | num > length(labels))) return(h)
      paste(word, paste(labels[num], collapse = ", "))
    }, character(1))
  })
  msg
}
