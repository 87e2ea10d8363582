#' Compare transforms by leak-free cross-validation in original units
#'
#' Judging a transform by \eqn{R^2} on the transformed scale is unfair (the \eqn{R^2} of
#' \eqn{\sqrt{y}} and of \eqn{y} measure different things), and so is choosing \eqn{\lambda},
#' shifts or reflection pivots on all rows before cross-validating (the held-out rows then
#' helped choose the transform). `compare_transforms()` learns every data-dependent constant of
#' each candidate inside each training fold only, fits [lm_transformed()] there, predicts the
#' held-out rows with [predict.pwb_model()] and scores the predictions in the response's original
#' units.
#'
#' Candidates: `"none"` (no transform); `"ladder"` (the ladder-of-powers step that
#' [screen_skew()] proposes for a skewed response, and `predictors = "ladder"`); `"ml"` (the
#' maximum-likelihood power of the response given the predictors, `response = "estimate"`, and
#' `predictors = "ml"`); and your own, given as named elements of a list: either a named list of
#' fixed `pwb_transform` objects keyed by variable (the response's name for the response), or a
#' function of the training data frame that returns such a list. A list may mix all kinds, e.g.
#' `list("none", "ml", logy = list(y = new_transform("log")))`.
#'
#' Held-out scores per fold, in original units: `rmse`, `mae` and `r2` (\eqn{1 - SSE/SST}, SST
#' about the mean of the held-out responses) for the back-transformed median (`_median`) and
#' the smearing mean (`_mean`); `coverage` and `width` of the prediction interval at `level`.
#' A held-out row the fitted transform cannot take (e.g. outside a log's domain) or a
#' back-transform beyond its range gives a non-finite prediction: it is counted in
#' `n_nonfinite` and makes that fold's scores `NA`, never silently dropped.
#'
#' In-sample extras (each candidate fitted once on all rows): `adj_r2_own_scale`, the adjusted
#' \eqn{R^2} on each candidate's own transformed scale, NOT comparable across candidates; and
#' `aic`, from the original-scale log-likelihood (Jacobian included), which is comparable. Its
#' parameter count includes the response power only where [lm_transformed()] estimated it (the
#' `"ml"` candidate); a power learned by your own function counts as fixed, which flatters it.
#'
#' Folds come from `seed` through the package's own generator, so the same seed gives the same
#' folds on every platform and R's random-number state is left exactly as it was. With
#' `seed = NULL` a seed is drawn from R's generator (advancing it) and stored in the result.
#'
#' Failures are kept, not hidden: a candidate that fails in a fold (for instance a Box-Cox
#' response with a non-positive value in that training part) is recorded with its message in
#' `failures` and the other candidates are still scored. A fold whose training part is
#' rank-deficient (an aliased column) is reported in `failures` for every candidate and not
#' scored, because predictions from such a fit depend on which column was dropped.
#'
#' Cautions: a transform changes what the model estimates; back-transformed means need a
#' correction (compare the `_median` and `_mean` scores); and the ranking informs, but does not
#' replace, domain standards and professional judgement.
#'
#' @param formula a two-sided formula of raw variables, as for [lm_transformed()].
#' @param data a data frame. Rows with missing values in the formula's variables follow
#'   `getOption("na.action")` (by default they are omitted before the folds are made).
#' @param candidates a character vector of built-in names, or a list of built-in names and named
#'   user candidates (see Details).
#' @param folds the number of folds, at least 2 and at most the number of rows.
#' @param repeats how many times the k-fold split is repeated with fresh shuffles.
#' @param seed a whole number fixing the folds, or `NULL`.
#' @param level the level of the prediction intervals (and of the power's interval).
#' @param progress show a text progress bar (by default in interactive sessions).
#' @param family the family of estimated response powers: `"box-cox"` or `"yeo-johnson"`.
#' @return An object of class `pwb_comparison`: a list with `summary` (one row per candidate:
#'   mean held-out scores over the scored folds, their standard deviations `rmse_sd` and
#'   `r2_sd`, `folds_scored`, `folds_failed`, `adj_r2_own_scale`, `aic`, ranked by
#'   `rmse_median`), `folds` (one row per candidate, repeat and fold), `lambdas` (the transform
#'   of every variable learned in each training fold, with its power), `full` (the transforms
#'   learned from all rows), `failures`, `predictions` (every held-out prediction: candidate,
#'   repeat, fold, `row` of `data`, `y`, `fit_median`, `fit_mean`, and the interval `lwr`,
#'   `upr`), `fold_ids` (one row per used row of `data`, one column per repeat), `rows` (the
#'   rows of `data` used, after `na.action`), `seed`, `level`, `folds_k`, `repeats` and
#'   `formula`.
#' @examples
#' river <- river_data()
#' cmp <- compare_transforms(sediment_t_day ~ flow_m3s + rain72_mm + season, river,
#'                           candidates = list("none", "ml",
#'                                             logs = list(sediment_t_day = new_transform("log"),
#'                                                         flow_m3s = new_transform("log"))),
#'                           folds = 3, seed = 1, progress = FALSE)
#' cmp
#' plot(cmp)
#' @export
compare_transforms <- function(formula, data, candidates = c("none", "ladder", "ml"), folds = 5,
                               repeats = 1, seed = NULL, level = 0.95, progress = interactive(),
                               family = c("box-cox", "yeo-johnson")) {
  family <- match.arg(family)
  pwb_cmp_check_level(level)
  if (!inherits(formula, "formula") || length(formula) != 3L || !is.symbol(formula[[2L]]))
    stop("`formula` must be a two-sided formula with a variable name on the left, e.g. y ~ x",
         call. = FALSE)
  if (!is.data.frame(data)) stop("`data` must be a data frame", call. = FALSE)
  whole <- function(v, what, lo) {
    if (!is.numeric(v) || length(v) != 1L || is.na(v) || v != round(v) || v < lo)
      stop(sprintf("`%s` must be a whole number >= %d", what, lo), call. = FALSE)
    as.integer(v)
  }
  folds <- whole(folds, "folds", 2L)
  repeats <- whole(repeats, "repeats", 1L)
  if (!is.null(seed) && (!is.numeric(seed) || length(seed) != 1L || is.na(seed) || seed < 0 ||
                         seed != round(seed) || seed >= 2^53))
    stop("`seed` must be NULL or a whole number >= 0", call. = FALSE)
  learners <- pwb_cmp_learners(candidates)
  yname <- as.character(formula[[2L]])
  vars <- all.vars(formula)
  miss <- setdiff(vars, names(data))
  if (length(miss))
    stop(sprintf("`data` has no variable %s", paste0("`", miss, "`", collapse = ", ")),
         call. = FALSE)
  mf <- stats::model.frame(stats::reformulate(vars), data)
  rows <- match(rownames(mf), rownames(data))
  dat <- data[rows, vars, drop = FALSE]
  n <- nrow(dat)
  if (n < folds)
    stop(sprintf("there are fewer usable rows (%d) than folds (%d): use fewer folds", n, folds),
         call. = FALSE)
  if (is.null(seed)) seed <- floor(stats::runif(1L) * 2^31)
  fold_ids <- rpwb_cv_folds(n, folds, repeats, seed)

  steps <- repeats * folds * length(learners)
  bar <- if (isTRUE(progress)) utils::txtProgressBar(min = 0, max = steps, style = 3)
  step <- 0L
  fold_rows <- lambda_rows <- fail_rows <- pred_rows <- list()
  for (r in seq_len(repeats)) {
    for (k in seq_len(folds)) {
      test <- fold_ids[, r] == k
      train <- dat[!test, , drop = FALSE]
      for (cand in names(learners)) {
        one <- pwb_cmp_one_fold(learners[[cand]], formula, train, dat[test, , drop = FALSE],
                                yname, family, level)
        tag <- data.frame(candidate = cand, repeat_no = r, fold = k, stringsAsFactors = FALSE)
        if (is.null(one$error)) {
          fold_rows[[length(fold_rows) + 1L]] <- cbind(tag, one$scores)
          lambda_rows[[length(lambda_rows) + 1L]] <- cbind(tag[rep(1L, nrow(one$lambdas)), ],
                                                           one$lambdas)
          pred_rows[[length(pred_rows) + 1L]] <- cbind(tag[rep(1L, sum(test)), ],
                                                       row = rows[test], one$predictions)
        } else {
          fail_rows[[length(fail_rows) + 1L]] <- cbind(tag, message = one$error)
        }
        step <- step + 1L
        if (!is.null(bar)) utils::setTxtProgressBar(bar, step)
      }
    }
  }
  if (!is.null(bar)) close(bar)
  out <- pwb_cmp_assemble(learners, formula, dat, yname, family, level, fold_rows, lambda_rows,
                          fail_rows, fold_ids, rows, seed, folds, repeats)
  out$predictions <- if (length(pred_rows)) do.call(rbind, pred_rows)
  if (!is.null(out$predictions)) rownames(out$predictions) <- NULL
  out
}
