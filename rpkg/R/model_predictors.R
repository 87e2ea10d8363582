# Transforms of the predictors for lm_transformed(): none, a named list given by the caller, the
# ladder or marginal maximum-likelihood powers of skewed predictors (screen_skew()), or
# maximum-likelihood powers for linearity (box_tidwell()).

# Named list of pwb_transform for the predictors. `vars_df`: the raw variables of the rows used.
pwb_choose_predictor_transforms <- function(predictors, vars_df, formula, xvars, yname,
                                            response, level, w) {
  if (is.null(predictors)) return(list())
  numeric_x <- xvars[vapply(xvars, function(v) is.numeric(vars_df[[v]]) &&
                                               !is.matrix(vars_df[[v]]), logical(1))]
  if (is.character(predictors) && length(predictors) == 1L &&
      predictors %in% c("ladder", "marginal"))
    return(pwb_auto_predictor_transforms(predictors, vars_df, numeric_x, level))
  if (identical(predictors, "ml"))
    return(pwb_linearity_transforms(vars_df, formula, numeric_x, yname, response, level, w))
  if (!is.list(predictors) || is.null(names(predictors)) || any(!nzchar(names(predictors))))
    stop("`predictors` must be NULL, \"ladder\", \"ml\", \"marginal\" or a named list of pwb_transform",
         call. = FALSE)
  for (v in names(predictors)) {
    if (!inherits(predictors[[v]], "pwb_transform"))
      stop(sprintf("`predictors$%s` must be a pwb_transform made by new_transform()", v),
           call. = FALSE)
    if (!v %in% xvars)
      stop(sprintf("`predictors` names `%s`, which is not a predictor of the formula", v),
           call. = FALSE)
    if (!is.numeric(vars_df[[v]]))
      stop(sprintf("`%s` is not numeric and cannot be transformed", v), call. = FALSE)
  }
  predictors
}

# "ladder" or "marginal" transforms of the numeric predictors that screen_skew() finds skewed
# (its ladder step is not "none"); the others stay as they are.
pwb_auto_predictor_transforms <- function(how, data, vars, level) {
  if (!length(vars)) return(list())
  s <- screen_skew(data, vars = vars, level = level)
  step <- s$table$ladder
  skewed <- s$table$variable[!is.na(step) & step != "none"]
  trs <- if (how == "ladder") s$ladder[skewed] else s$ml[skewed]
  trs[!vapply(trs, is.null, logical(1))]
}

# Box-Tidwell powers for linearity of every positive numeric predictor that enters the formula
# as a plain term and in no other term; its suggested transform is used, and none where it
# suggests none (an identity, or a power of 1).
pwb_linearity_transforms <- function(vars_df, formula, numeric_x, yname, response, level, w) {
  tt <- stats::terms(formula)
  labels <- attr(tt, "term.labels")
  fac <- attr(tt, "factors")
  eligible <- numeric_x[vapply(numeric_x, function(v) {
    v %in% labels && v %in% rownames(fac) && sum(fac[v, ] != 0) == 1L &&
      all(vars_df[[v]] > 0)
  }, logical(1))]
  if (!length(eligible)) return(list())
  d <- vars_df
  if (inherits(response, "pwb_transform"))
    d[[yname]] <- pwb_map_values(response, d[[yname]], yname, "error", inverse = FALSE)
  else if (inherits(response, "pwb_lambda"))
    d[[yname]] <- pwb_map_values(as_transform(response, "convenient"), d[[yname]], yname,
                                 "error", inverse = FALSE)
  args <- list(formula, data = d, vars = eligible, level = level)
  if (!is.null(w)) args$weights <- w
  bt <- do.call(box_tidwell, args)
  trs <- bt$transforms
  none <- vapply(trs, function(t) is.null(t) || identical(t$family, "identity") ||
                   (identical(t$family, "power") && isTRUE(all.equal(t$lambda, 1))),
                 logical(1))
  trs[!none]
}
