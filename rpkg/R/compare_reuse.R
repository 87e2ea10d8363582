# Candidates whose transforms are fixed ("none", or a named list of pwb_transform) learn nothing
# from the rows, so their design and transformed response are formed once for all rows and every
# fold is fitted by the core from one factor per fold (pwb_cv_fixed_predict): the cost of the
# comparison then grows linearly in the rows. A fold the core cannot fit exactly as
# lm_transformed() would fit its training part (a factor level missing from it, aliased
# columns, no residual degrees of freedom, a training value outside a transform's domain, an
# overflowing prediction) is refitted by the per-fold path, so failures read as they always did.

# Whether fixed candidates reuse the fold factors (the per-fold path stays callable for checks).
pwb_cmp_state <- new.env(parent = emptyenv())
pwb_cmp_state$reuse <- TRUE
pwb_cmp_state$served <- 0L  # folds served from the fold factors since the package loaded

# Evaluates expr with the reuse switched on or off, restoring the setting afterwards.
pwb_cmp_with_reuse <- function(reuse, expr) {
  old <- pwb_cmp_state$reuse
  on.exit(pwb_cmp_state$reuse <- old)
  pwb_cmp_state$reuse <- isTRUE(reuse)
  force(expr)
}

# A learner of fixed transforms `trs` (names = variables; list() for none).
pwb_cmp_fixed_learner <- function(trs, learner) {
  attr(learner, "fixed") <- trs
  learner
}

# TRUE when every variable of the formula is a name, or a call of row-by-row arithmetic,
# log/exp/sqrt/abs or factor() on names and numbers: the design of all rows then holds each
# row's design row as a fit on any part would build it. Terms whose values depend on the other
# rows (poly(), scale(), splines, I(x - mean(x))) keep the per-fold path.
pwb_cmp_rowwise_formula <- function(formula) {
  ok_fun <- c("log", "log2", "log10", "log1p", "exp", "expm1", "sqrt", "abs", "factor",
              "as.factor", "I", "(", "+", "-", "*", "/", "^")
  ok <- function(e) {
    if (is.symbol(e)) return(TRUE)
    if (is.numeric(e) && length(e) == 1L) return(TRUE)
    if (!is.call(e) || !is.symbol(e[[1L]]) || !as.character(e[[1L]]) %in% ok_fun) return(FALSE)
    all(vapply(as.list(e)[-1L], ok, logical(1)))
  }
  vars <- as.list(attr(stats::terms(formula), "variables"))[-1L]
  all(vapply(vars, ok, logical(1)))
}

# For each fixed candidate, what the core needs for every row (raw y, the design of the
# transformed predictors with NA where a transform cannot take a value, intercept, response
# spec) and the transforms table of its folds; plus the model's factors (for the per-fold check
# that every level is in the training part). NULL when nothing can be reused.
pwb_cmp_fixed_setup <- function(learners, formula, dat, yname, level) {
  fixed <- Filter(function(l) !is.null(attr(l, "fixed")), learners)
  if (!isTRUE(pwb_cmp_state$reuse) || !length(fixed) || anyNA(dat) ||
      !pwb_cmp_rowwise_formula(formula))
    return(NULL)
  vars_df <- dat
  rownames(vars_df) <- NULL
  # the training parts' frames drop unused levels, as lm does; levels unused by every row go
  vars_df[] <- lapply(vars_df, function(v) if (is.factor(v)) droplevels(v) else v)
  xvars <- intersect(setdiff(all.vars(formula[[3L]]), yname), names(vars_df))
  cands <- lapply(fixed, function(l) {
    tryCatch(pwb_cmp_fixed_design(attr(l, "fixed"), formula, vars_df, xvars, yname, level),
             error = function(e) NULL)
  })
  cands <- cands[!vapply(cands, is.null, logical(1))]
  if (!length(cands)) return(NULL)
  list(cands = cands, factors = pwb_cmp_factors(formula, dat))
}

pwb_cmp_fixed_design <- function(trs, formula, vars_df, xvars, yname, level) {
  resp <- if (is.null(trs[[yname]])) new_transform("identity") else trs[[yname]]
  preds <- trs[setdiff(names(trs), yname)]
  ptrs <- pwb_choose_predictor_transforms(if (length(preds)) preds else NULL, vars_df, formula,
                                          xvars, yname, resp, level, NULL)
  tdata <- vars_df
  for (v in names(ptrs)) {
    z <- pwb_map_values(ptrs[[v]], vars_df[[v]], v, "na", inverse = FALSE)
    attr(z, "invalid_rows") <- NULL
    tdata[[v]] <- z
  }
  design <- pwb_model_design(list(formula = formula, contrasts = NULL), tdata)
  if (nrow(design$X) != nrow(vars_df) || length(design$y) != nrow(vars_df)) return(NULL)
  list(y = design$y, X = design$X, intercept = design$intercept,
       spec = pwb_spec_or_null(resp),
       lambdas = pwb_cmp_lambdas(list(response = resp, predictors = ptrs,
                                      response_lambda = NULL), yname))
}

# The core's held-out predictions of every row for one candidate and one split (fold ids 1..k);
# NULL when the core refuses (the per-fold path then reports why).
pwb_cmp_fixed_run <- function(cand, fold, k, level, w) {
  tryCatch(rpwb_cv_fixed_predict(cand$y, cand$X, cand$intercept, cand$spec,
                                 as.integer(fold), as.integer(k), level,
                                 if (is.null(w)) NULL else as.double(w)),
           error = function(e) NULL)
}

# One fold of a fixed candidate from the core's run, as pwb_cmp_one_fold() returns it; NULL when
# the fold must be refitted by the per-fold path.
pwb_cmp_fixed_fold <- function(cand, run, factors, test, k, y, w_test) {
  if (is.null(run) || run$status[k] != 0L) return(NULL)
  # an overflowing prediction warns in predict.pwb_model(): the per-fold path says so
  if (any(bitwAnd(run$flags[test], 4L) > 0L)) return(NULL)
  for (f in factors) if (any(tabulate(f[!test], nlevels(f)) == 0L)) return(NULL)
  pwb_cmp_state$served <- pwb_cmp_state$served + 1L
  pm <- list(fit_median = run$median[test], fit_mean = run$mean[test], lwr = run$lwr[test],
             upr = run$upr[test])
  pwb_cmp_scored(pm, y, w_test, cand$lambdas)
}
