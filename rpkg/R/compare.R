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
#' Model alternatives: a named element holding a base R `family` object (e.g.
#' `gamma_log = Gamma(link = "log")`, `qpois_log = quasipoisson(link = "log")` for counts and
#' non-negative loads with zeros, `gauss_log = gaussian(link = "log")`) is a generalized linear
#' model of the untransformed response, fitted with [stats::glm.fit()] on each training part and
#' scored in the same folds and the same original-unit table: its held-out predictions are the
#' fitted means (as `predict(glm(...), newdata, type = "response")`). Its prediction interval is
#' a plug-in one from the fitted distribution: Gamma quantiles with shape 1/dispersion (the
#' Pearson dispersion `summary.glm()` reports), normal quantiles for `gaussian`, Poisson
#' quantiles for `poisson`; quasi families (and families without base R quantiles) define no
#' distribution, so their coverage and width are `NA` (not available) and `kinds` says so. A
#' family the data do not fit (zeros for Gamma) is a failure of that candidate, kept in
#' `failures`. Caution: a GLM models the mean of the response, while a transformed model's
#' back-transformed fit is a median; the main scores (`rmse_median`, ...) of a GLM score its
#' fitted mean, so read the comparison with that difference in mind (`rmse_mean` compares
#' means with means).
#'
#' Weights and subsets follow [stats::lm()]: `subset` chooses rows before `na.action`;
#' `weights` are precision weights that travel with their rows into the folds, are passed to
#' each training fit (`lm_transformed(weights =)`; a GLM's prior weights, as `glm(weights =)`
#' uses them), and weight the held-out scores (weighted means of squared and absolute errors,
#' weighted \eqn{R^2} and coverage). Prediction intervals are those of a new row of weight 1. A
#' zero weight makes a row count for nothing; a negative or non-finite weight is an error that
#' names the rows.
#'
#' Held-out scores per fold, in original units, each from the held-out rows where it is
#' defined: `rmse`, `mae` and `r2` (\eqn{1 - SSE/SST}, SST about the mean of the held-out
#' responses) for the back-transformed median (`_median`) and the smearing mean (`_mean`) need a
#' finite prediction; `coverage` of the prediction interval at `level` counts an infinite
#' endpoint (a back-transform whose range is unbounded) as covering on its side; the interval's
#' width is summarised by its median (`width_median`) and the share of unbounded intervals
#' (`unbounded`), because one unbounded interval makes a mean width infinite. A held-out row the
#' fitted transform cannot take (e.g. outside a log's domain) or a back-transform beyond its
#' range gives a non-finite point prediction: it is counted in `n_nonfinite` and leaves that
#' fold's point scores unscored (`NA`), never silently dropped.
#'
#' Ranking: candidates whose every fold was scored are ranked by `rmse_median`; a candidate
#' with a failed or unscored fold is marked unranked and printed apart, because its mean over
#' the remaining folds is not comparable with the others'.
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
#' With `stratify = TRUE` (the default) the folds are stratified by the model's factors, so
#' every factor level with at least 2 rows appears in every training part (a level seen in one
#' fold only would make that fold's predictions fail); with several factors this is achieved for
#' the one with the rarest level and checked for the others, and `fold_notes` (printed) says
#' where it could not be achieved. `groups` makes grouped folds instead: all rows of a group
#' (a site, patient or station) share a fold, so a group is never both learned from and
#' predicted. Your own fold ids can be given as `folds`.
#'
#' Failures are kept, not hidden: a candidate that fails in a fold (for instance a Box-Cox
#' response with a non-positive value in that training part) is recorded with its message in
#' `failures`, rows named as rows of `data` (its row names where it has them), and the other
#' candidates are still scored. A fold whose training part is rank-deficient (an aliased column)
#' is reported in `failures` for every candidate and not scored, because predictions from such a
#' fit depend on which column was dropped.
#'
#' Work shared between folds: a candidate whose transforms are fixed (`"none"` and a named list
#' of `pwb_transform`) learns nothing from the rows, so its design and transformed response are
#' formed once for all rows, each fold's rows are factored once, and each training fit is
#' assembled from the other folds' factors: the same fit as [lm_transformed()] on the training
#' part, to rounding, at a cost that grows linearly in the rows. A fold where that fit could
#' differ (a factor level missing from the training part, an aliased column, a training value
#' outside a transform's domain) is fitted by [lm_transformed()] as before, and so is every fold
#' when the formula has terms computed from other rows (e.g. `poly()`, `scale()`) or the data
#' keep missing values.
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
#' @param folds the number of folds, at least 2 and at most the number of rows; or your own fold
#'   ids, one per row of `data` (any values: each distinct value is a fold; at least 2 folds).
#' @param repeats how many times the k-fold split is repeated with fresh shuffles (1 with your
#'   own fold ids).
#' @param seed a whole number fixing the folds, or `NULL`.
#' @param level the level of the prediction intervals (and of the power's interval).
#' @param progress show a text progress bar (by default in interactive sessions).
#' @param family the family of estimated response powers: `"box-cox"` or `"yeo-johnson"`.
#' @param groups `NULL`, the name of a column of `data`, or a vector with one value per row of
#'   `data`: grouped folds, all rows of a group in one fold.
#' @param stratify logical: stratify the folds by the model's factors (ignored with `groups` or
#'   your own fold ids).
#' @param weights `NULL`, a numeric column of `data` (by name, or an expression evaluated in
#'   `data` as in `lm()`) or a vector with one precision weight per row of `data`.
#' @param subset an optional vector choosing the rows of `data` to use (logical, row numbers or
#'   row names; an expression evaluated in `data` as in `lm()`).
#' @return An object of class `pwb_comparison`: a list with `summary` (one row per candidate:
#'   `rank` (`NA` for an unranked candidate), `ranked`, mean held-out scores over the scored
#'   folds, `width_median` (the median over folds) and `unbounded` (the mean share of unbounded
#'   intervals), their standard deviations `rmse_sd` and `r2_sd`, `folds_scored`,
#'   `folds_failed`, `folds_unscored`, `adj_r2_own_scale`, `aic`; ranked candidates first, by
#'   `rmse_median`), `folds` (one row per candidate, repeat and fold), `lambdas` (the transform
#'   of every variable learned in each training fold, with its power), `full` (the transforms
#'   learned from all rows), `failures`, `predictions` (every held-out prediction: candidate,
#'   repeat, fold, `row` of `data` and its `row_name`, `y`, `fit_median`, `fit_mean`, and the
#'   interval `lwr`, `upr`), `fold_ids` (one row per used row of `data`, one column per repeat),
#'   `fold_notes` (why a factor level misses a training part, if it does), `rows` (the rows of
#'   `data` used, after `na.action`), `seed`, `level`, `folds_k`, `repeats`, `fold_kind`
#'   (`"random"`, `"stratified"`, `"grouped"` or `"given"`), `formula`, `kinds` (one row per
#'   candidate: `kind` `"transform"` or `"GLM"`, the GLM's `model` and how its `interval` is
#'   made, or why there is none) and `weights` (the weights of the used rows, or `NULL`). For a
#'   GLM candidate `fit_median` and `fit_mean` in `predictions` both hold its fitted mean.
#' @examples
#' river <- river_data()
#' cmp <- compare_transforms(sediment_t_day ~ flow_m3s + rain72_mm + season, river,
#'                           candidates = list("none", "ml",
#'                                             logs = list(sediment_t_day = new_transform("log"),
#'                                                         flow_m3s = new_transform("log"))),
#'                           folds = 3, seed = 1, progress = FALSE)
#' cmp
#' plot(cmp)
#' # transforms against a Gamma GLM with a log link
#' cmp2 <- compare_transforms(mpg ~ wt + hp, mtcars,
#'                            candidates = list("none", "ml", gamma_log = Gamma(link = "log")),
#'                            folds = 4, seed = 3, progress = FALSE)
#' cmp2
#' @export
compare_transforms <- function(formula, data, candidates = c("none", "ladder", "ml"), folds = 5,
                               repeats = 1, seed = NULL, level = 0.95, progress = interactive(),
                               family = c("box-cox", "yeo-johnson"), groups = NULL,
                               stratify = TRUE, weights = NULL, subset = NULL) {
  family <- pwb_match_choice(family, "family")
  pwb_check_level(level)
  pwb_check_response_formula(formula)
  pwb_check_data_frame(data)
  pwb_check_flag(stratify, "stratify")
  given <- is.atomic(folds) && length(folds) > 1L
  if (given) {
    if (length(folds) != nrow(data))
      stop(sprintf("`folds` as fold ids needs one id per row of `data` (%d), not %d", nrow(data),
                   length(folds)), call. = FALSE)
    if (anyNA(folds)) stop("`folds` as fold ids must have no missing ids", call. = FALSE)
  } else {
    folds <- pwb_check_whole(folds, "folds", 2L)
  }
  repeats <- pwb_check_whole(repeats, "repeats", 1L)
  if (given && repeats > 1L)
    stop("your own fold ids make one split: use `repeats = 1`", call. = FALSE)
  pwb_check_seed(seed)
  learners <- pwb_cmp_learners(candidates)
  yname <- as.character(formula[[2L]])
  pwb_cmp_check_offset(formula, data)
  vars <- all.vars(formula)
  miss <- setdiff(vars, names(data))
  if (length(miss))
    stop(sprintf("`data` has no variable %s", paste0("`", miss, "`", collapse = ", ")),
         call. = FALSE)
  group_ids <- pwb_cmp_groups(groups, data)
  w_all <- pwb_cmp_weights(substitute(weights), data, parent.frame())
  keep <- pwb_cmp_subset(substitute(subset), data, parent.frame())
  used <- pwb_cmp_used_rows(data, vars, w_all, keep)
  rows <- used$rows
  dat <- used$dat
  w_used <- if (is.null(w_all)) NULL else w_all[rows]
  n <- nrow(dat)
  if (!given && n < folds)
    stop(sprintf("there are fewer usable rows (%d) than folds (%d): use fewer folds", n, folds),
         call. = FALSE)
  if (is.null(seed) && !given) seed <- floor(stats::runif(1L) * 2^31)
  split <- pwb_cmp_make_folds(formula, dat, rows, if (given) folds else NULL,
                              if (is.null(group_ids)) NULL else group_ids[rows],
                              if (given) NA_integer_ else folds, repeats, seed, stratify)
  fold_ids <- split$ids
  folds <- split$k
  labels <- pwb_row_labels(data)[rows]

  steps <- repeats * folds * length(learners)
  bar <- if (isTRUE(progress)) utils::txtProgressBar(min = 0, max = steps, style = 3)
  step <- 0L
  fold_rows <- lambda_rows <- fail_rows <- pred_rows <- list()
  # fixed candidates: one design for all rows, every fold fitted from one factor per fold
  fixed <- pwb_cmp_fixed_setup(learners, formula, dat, yname, level)
  for (r in seq_len(repeats)) {
    runs <- if (is.null(fixed)) list()
            else lapply(fixed$cands, pwb_cmp_fixed_run, fold = fold_ids[, r], k = folds,
                        level = level, w = w_used)
    for (k in seq_len(folds)) {
      test <- fold_ids[, r] == k
      train <- held_out <- NULL
      w_train <- if (is.null(w_used)) NULL else w_used[!test]
      w_test <- if (is.null(w_used)) NULL else w_used[test]
      for (cand in names(learners)) {
        one <- if (is.null(runs[[cand]])) NULL
               else pwb_cmp_fixed_fold(fixed$cands[[cand]], runs[[cand]], fixed$factors, test,
                                       k, as.double(dat[[yname]][test]), w_test)
        if (is.null(one)) {
          if (is.null(train)) {
            train <- dat[!test, , drop = FALSE]
            # positions in the training part: messages naming them are mapped to the user's rows
            rownames(train) <- NULL
            held_out <- dat[test, , drop = FALSE]
            rownames(held_out) <- NULL
          }
          one <- pwb_cmp_one_fold(learners[[cand]], formula, train, held_out, yname, family,
                                  level, w_train, w_test)
        }
        tag <- data.frame(candidate = cand, repeat_no = r, fold = k, stringsAsFactors = FALSE)
        if (is.null(one$error)) {
          fold_rows[[length(fold_rows) + 1L]] <- cbind(tag, one$scores)
          lambda_rows[[length(lambda_rows) + 1L]] <- cbind(tag[rep(1L, nrow(one$lambdas)), ],
                                                           one$lambdas)
          # candidate and row_name hold codes (into names(learners) and labels) until the
          # end: strings are made once for all pieces
          m <- sum(test)
          pred_rows[[length(pred_rows) + 1L]] <- c(list(candidate = rep(match(cand,
                                                                              names(learners)),
                                                                        m),
                                                        repeat_no = rep(r, m),
                                                        fold = rep(k, m), row = rows[test],
                                                        row_name = which(test)),
                                                   as.list(one$predictions))
        } else {
          part <- if (identical(one$part, "test")) test else !test
          msg <- pwb_cmp_name_rows(one$error, labels[part])
          fail_rows[[length(fail_rows) + 1L]] <- cbind(tag, message = msg,
                                                       stringsAsFactors = FALSE)
        }
        step <- step + 1L
        if (!is.null(bar)) utils::setTxtProgressBar(bar, step)
      }
    }
  }
  if (!is.null(bar)) close(bar)
  out <- pwb_cmp_assemble(learners, formula, dat, yname, family, level, fold_rows, lambda_rows,
                          fail_rows, fold_ids, rows, if (given) NA_real_ else seed, folds,
                          repeats, w_used)
  out$kinds <- pwb_cmp_kinds(learners)
  out$summary$kind <- out$kinds$kind[match(out$summary$candidate, out$kinds$candidate)]
  out$weights <- w_used
  out$fold_kind <- split$kind
  out$fold_notes <- split$notes
  out$predictions <- pwb_cmp_bind_columns(pred_rows)
  if (!is.null(out$predictions)) {
    out$predictions$candidate <- names(learners)[out$predictions$candidate]
    out$predictions$row_name <- labels[out$predictions$row_name]
  }
  out
}
