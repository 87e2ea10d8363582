# The candidates of compare_transforms() and the work done inside one training fold.

# A named list of learners: each a function(train, formula, yname, family, level, w) returning
# a fitted pwb_model (a transform candidate) or a pwb_cmp_glm_fit (a GLM candidate, attribute
# kind "glm"). w is NULL or the training rows' weights. Everything a learner learns comes from
# `train` (and its weights) only.
pwb_cmp_learners <- function(candidates) {
  if (is.character(candidates)) candidates <- as.list(candidates)
  if (!is.list(candidates) || length(candidates) == 0L)
    stop("`candidates` must be a character vector or a list of candidates", call. = FALSE)
  nm <- names(candidates)
  if (is.null(nm)) nm <- rep("", length(candidates))
  out <- list()
  for (i in seq_along(candidates)) {
    c1 <- candidates[[i]]
    if (is.character(c1) && length(c1) == 1L && !nzchar(nm[i])) nm[i] <- c1
    if (!nzchar(nm[i]))
      stop(sprintf("candidate %d needs a name: write list(name = ...)", i), call. = FALSE)
    out[[nm[i]]] <- pwb_cmp_learner(c1, nm[i])
  }
  if (anyDuplicated(nm))
    stop(sprintf("candidate names must differ; repeated: %s",
                 paste(unique(nm[duplicated(nm)]), collapse = ", ")), call. = FALSE)
  out
}

# lm_transformed() with the training weights when there are any (passed as values, so they
# need no lookup in the data).
pwb_cmp_lmt <- function(w, ...) {
  if (is.null(w)) lm_transformed(...) else do.call(lm_transformed, list(..., weights = w))
}

pwb_cmp_learner <- function(c1, name) {
  if (inherits(c1, "family")) return(pwb_cmp_glm_learner(c1, name))
  if (is.character(c1) && length(c1) == 1L) {
    if (c1 == "none")
      return(pwb_cmp_fixed_learner(list(), function(train, formula, yname, family, level,
                                                    w = NULL)
        pwb_cmp_lmt(w, formula, train, response = "none", level = level)))
    if (c1 == "ml")
      return(function(train, formula, yname, family, level, w = NULL)
        pwb_cmp_lmt(w, formula, train, response = "estimate", predictors = "ml",
                    family = family, level = level))
    if (c1 == "ladder")
      return(function(train, formula, yname, family, level, w = NULL) {
        s <- screen_skew(train, vars = yname, level = level)
        step <- s$table$ladder[1L]
        resp <- if (is.na(step) || step == "none" || is.null(s$ladder[[yname]])) "none"
                else s$ladder[[yname]]
        pwb_cmp_lmt(w, formula, train, response = resp, predictors = "ladder", level = level)
      })
    stop(sprintf("unknown candidate \"%s\": the built-in ones are \"none\", \"ladder\" and \"ml\"",
                 c1), call. = FALSE)
  }
  if (is.function(c1))
    return(function(train, formula, yname, family, level, w = NULL)
      pwb_cmp_fit_fixed(c1(train), name, formula, train, yname, level, w))
  if (is.list(c1)) {
    pwb_cmp_check_fixed(c1, name)
    return(pwb_cmp_fixed_learner(c1, function(train, formula, yname, family, level, w = NULL)
      pwb_cmp_fit_fixed(c1, name, formula, train, yname, level, w)))
  }
  stop(sprintf(paste0("candidate `%s` must be \"none\", \"ladder\", \"ml\", a named list of ",
                      "pwb_transform, a function returning one, or a family object such as ",
                      "Gamma(link = \"log\")"), name), call. = FALSE)
}

pwb_cmp_check_fixed <- function(trs, name) {
  ok <- is.list(trs) && (length(trs) == 0L || (!is.null(names(trs)) && all(nzchar(names(trs))) &&
          all(vapply(trs, inherits, logical(1), what = "pwb_transform"))))
  if (!ok)
    stop(sprintf("candidate `%s` must give a named list of pwb_transform (names = variables)",
                 name), call. = FALSE)
}

pwb_cmp_fit_fixed <- function(trs, name, formula, train, yname, level, w = NULL) {
  pwb_cmp_check_fixed(trs, name)
  resp <- if (is.null(trs[[yname]])) "none" else trs[[yname]]
  preds <- trs[setdiff(names(trs), yname)]
  pwb_cmp_lmt(w, formula, train, response = resp,
              predictors = if (length(preds)) preds else NULL, level = level)
}

# The kind of each learner: "transform" or "GLM", with the GLM's family and interval.
pwb_cmp_kinds <- function(learners) {
  rows <- lapply(names(learners), function(nm) {
    fam <- attr(learners[[nm]], "family")
    if (is.null(fam))
      return(data.frame(candidate = nm, kind = "transform", model = NA_character_,
                        interval = NA_character_, stringsAsFactors = FALSE))
    data.frame(candidate = nm, kind = "GLM", model = pwb_cmp_glm_label(fam),
               interval = pwb_cmp_glm_interval_kind(fam), stringsAsFactors = FALSE)
  })
  do.call(rbind, rows)
}

# One candidate in one fold: list(scores = one-row data frame, lambdas = data frame) or
# list(error = message, part = "test" when predicting the held-out rows failed). w_train and
# w_test: NULL or the weights of the training and held-out rows.
pwb_cmp_one_fold <- function(learner, formula, train, test, yname, family, level,
                             w_train = NULL, w_test = NULL) {
  model <- tryCatch(learner(train, formula, yname, family, level, w_train),
                    error = function(e) conditionMessage(e))
  if (is.character(model)) return(list(error = model))
  aliased <- pwb_cmp_aliased(model)
  if (any(aliased))
    return(list(error = sprintf(paste0("the training part is rank-deficient (aliased: %s): ",
                                       "fold not scored"),
                                paste(names(aliased)[aliased], collapse = ", "))))
  pm <- tryCatch(pwb_cmp_predict(model, test, level), error = function(e) conditionMessage(e))
  if (is.character(pm)) return(list(error = pm, part = "test"))
  pwb_cmp_scored(pm, as.double(test[[yname]]), w_test, pwb_cmp_lambdas(model, yname))
}

# The held-out scores of one fold from its predictions pm (fit_median, fit_mean, lwr, upr) of
# the responses y (weights w_test or NULL): list(scores, lambdas, predictions).
pwb_cmp_scored <- function(pm, y, w_test, lambdas) {
  w <- if (is.null(w_test)) NULL else as.double(w_test)
  has_iv <- !is.null(pm$lwr)
  s_med <- rpwb_holdout_score(y, as.double(pm$fit_median),
                              if (has_iv) as.double(pm$lwr), if (has_iv) as.double(pm$upr), w)
  s_mean <- rpwb_holdout_score(y, as.double(pm$fit_mean), NULL, NULL, w)
  # a fold's statistic is scored only when it is defined on every held-out row: a mean over the
  # rows that happen to have a prediction would flatter the candidate
  all_rows <- function(s, what) if (s[[what]] == length(y)) 1 else NA_real_
  pt_med <- all_rows(s_med, "n_point")
  pt_mean <- all_rows(s_mean, "n_point")
  iv <- all_rows(s_med, "n_interval")
  scores <- data.frame(
    n_test = length(y),
    rmse_median = pt_med * s_med[["rmse"]], mae_median = pt_med * s_med[["mae"]],
    r2_median = pt_med * s_med[["r2"]],
    rmse_mean = pt_mean * s_mean[["rmse"]], mae_mean = pt_mean * s_mean[["mae"]],
    r2_mean = pt_mean * s_mean[["r2"]],
    coverage = iv * s_med[["coverage"]], width_median = iv * s_med[["width_median"]],
    unbounded = iv * s_med[["unbounded"]],
    n_nonfinite = as.integer(max(s_med[["n_nonfinite"]], s_mean[["n_nonfinite"]])))
  na <- rep(NA_real_, length(y))
  preds <- data.frame(y = y, fit_median = pm$fit_median, fit_mean = pm$fit_mean,
                      lwr = if (has_iv) pm$lwr else na, upr = if (has_iv) pm$upr else na,
                      row.names = NULL)
  list(scores = scores, lambdas = lambdas, predictions = preds)
}

# Named logical: which coefficients a fit could not estimate.
pwb_cmp_aliased <- function(model) {
  if (inherits(model, "pwb_cmp_glm_fit")) return(is.na(model$coefficients))
  stats::setNames(as.logical(model$aliased), names(model$aliased))
}

# Held-out predictions in original units: fit_median (the back-transformed median; a GLM's
# fitted mean), fit_mean (the smearing mean; a GLM's fitted mean) and the prediction interval
# (lwr and upr NULL where there is none).
pwb_cmp_predict <- function(model, test, level) {
  if (inherits(model, "pwb_cmp_glm_fit")) {
    g <- pwb_cmp_glm_predict(model, test, level)
    return(list(fit_median = g$fit, fit_mean = g$fit, lwr = g$lwr, upr = g$upr))
  }
  med <- stats::predict(model, test, interval = "prediction", level = level,
                        center = "median", invalid = "na")
  mean <- stats::predict(model, test, center = "mean", mean_method = "smearing", invalid = "na")
  list(fit_median = med$fit, fit_mean = mean$fit, lwr = med$lwr, upr = med$upr)
}

# The transforms a fitted model learned: one row per transformed variable (the response first).
pwb_cmp_lambdas <- function(model, yname) {
  if (inherits(model, "pwb_cmp_glm_fit")) return(pwb_cmp_glm_lambdas(model))
  trs <- c(stats::setNames(list(model$response), yname), model$predictors)
  est <- if (is.null(model$response_lambda)) NA_real_ else model$response_lambda$lambda
  data.frame(variable = names(trs), role = c("response", rep("predictor", length(trs) - 1L)),
             family = vapply(trs, function(t) t$family, character(1)),
             lambda = vapply(trs, function(t) as.double(t$lambda), numeric(1)),
             lambda_estimate = c(est, rep(NA_real_, length(trs) - 1L)),
             transform = vapply(names(trs), function(v) pwb_cmp_describe(trs[[v]], v),
                                character(1)), stringsAsFactors = FALSE,
             row.names = NULL)
}

# The transform's one-line text naming the variable ("log of Volume").
pwb_cmp_describe <- function(tr, v) pwb_transform_label(tr, v)
