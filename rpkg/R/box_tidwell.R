#' Box-Tidwell powers of positive predictors
#'
#' Estimates the powers \eqn{\alpha_j} that make the model
#' \eqn{y = b_0 + \sum_j b_j x_j^{\alpha_j} + \ldots + e} linear in each positive predictor
#' \eqn{x_j}, by the iteration of Box and Tidwell (1962): starting from \eqn{\alpha = 1}, the
#' power is updated by \eqn{g_j / b_j}, where \eqn{b_j} is the coefficient of
#' \eqn{x_j^{\alpha_j}} and \eqn{g_j} that of the added column \eqn{x_j^{\alpha_j} \log x_j},
#' until every power changes by less than `tol` (or `max_iter` updates are made: then
#' `converged` is `FALSE`). Other terms of the formula stay in the model as they are.
#'
#' For each variable the score test of power 1 is the t statistic of the added column
#' \eqn{x_j \log x_j} in the model with every Box-Tidwell variable linear (one added column at
#' a time); a small p-value says the straight line in \eqn{x_j} misses curvature. Standard errors
#' come from the linearised fit at the final powers, so the intervals are Wald intervals.
#'
#' The advice for each variable (column `suggest`) leaves it linear when the score test does not
#' reject power 1 at level `1 - level` or the interval holds 1; otherwise it takes the convenient
#' power inside the interval (of \eqn{-2, -1, -1/2, -1/3, 0, 1/3, 1/2, 1, 2} the one nearest the
#' estimate, as for the response's power; the estimate rounded to 2 decimals when none is
#' inside), as `"log"` when that power is 0. The advice and the intervals are computed by the
#' compiled core. `transforms` holds the advice as `pwb_transform` objects (`"identity"` for
#' linear); feed them to `lm_transformed()` through its `predictors` argument.
#'
#' With `weights`, every fit is weighted least squares (precision weights, as in [stats::lm()]);
#' a weight of 0 leaves its row out.
#'
#' Cautions: a power of a predictor changes what its coefficient means (an effect per unit of
#' \eqn{x^\alpha}, not per unit of \eqn{x}); the estimate is only as good as the rest of the
#' model; and the result informs, but does not replace, domain knowledge and professional
#' judgement about the form of the relationship.
#'
#' @param object a model formula (with `data`) or a fitted `lm`.
#' @param data a data frame with the variables of the formula (for an `lm`, taken from its call
#'   when `NULL`). Rows with missing values are handled by the usual `na.action`.
#' @param weights optional precision weights (finite, at least 0), evaluated in `data` as in
#'   [stats::lm()]. A weighted `lm` given as `object` brings its own.
#' @param subset optional expression selecting rows of `data`, as in [stats::lm()].
#' @param vars names of the predictors whose powers are estimated; each must enter the formula
#'   as a plain term and be positive. `NULL` takes every numeric plain-term predictor.
#' @param max_iter the most updates of the powers.
#' @param tol convergence tolerance on the change of the powers.
#' @param level confidence level of the Wald intervals.
#' @return An object of class `pwb_box_tidwell`: a list with `table` (one row per variable:
#'   `variable`, `power`, `se`, `conf_low`, `conf_high`, `score_t`, `score_p`, `advice`
#'   (`"linear"`, `"log"` or `"power"`), `suggested` (the advised power: 1, 0 or the convenient
#'   power), `transform`),
#'   `transforms` (named list of `pwb_transform`), `iterations`, `converged`, `max_iter`, `tol`,
#'   `last_change`, `history` (powers after each update, one column per update, the first all 1),
#'   `score_df`, `n` (rows used), `level`, `weighted` and `formula`.
#' @references Box, G. E. P. and Tidwell, P. W. (1962). Transformation of the independent
#'   variables. Technometrics 4, 531-550.
#' @examples
#' river <- river_data()
#' # is flow linear on the log scale of the load? (its power comes out near 0: use its log)
#' bt <- box_tidwell(log(sediment_t_day) ~ flow_m3s + rain72_mm + forest_pct + season, river,
#'                   vars = c("flow_m3s", "forest_pct"))
#' bt
#' bt$transforms$flow_m3s
#' @export
box_tidwell <- function(object, data = NULL, vars = NULL, weights = NULL, subset = NULL,
                        max_iter = 50L, tol = 1e-6, level = 0.95) {
  pwb_check_level(level)
  max_iter <- pwb_check_whole(max_iter, "max_iter", 1L)
  pwb_check_positive(tol, "tol")
  fr <- pwb_weighted_frame(object, data, substitute(weights), substitute(subset), parent.frame(),
                           "box_tidwell")
  X <- fr$X
  labels <- attr(fr$terms, "term.labels")
  plain <- labels[vapply(labels, function(v) v %in% names(fr$mf) && is.numeric(fr$mf[[v]]) &&
                                               !is.matrix(fr$mf[[v]]), logical(1))]
  if (is.null(vars)) {
    vars <- plain
    if (length(vars) == 0L)
      stop("the formula has no numeric plain-term predictor for Box-Tidwell powers", call. = FALSE)
  }
  if (!is.character(vars) || anyNA(vars) || length(vars) == 0L)
    stop("`vars` must name predictors of the formula", call. = FALSE)
  bad <- setdiff(vars, plain)
  if (length(bad) > 0L)
    stop(sprintf("`vars` must name numeric predictors entering the formula as plain terms; not: %s",
                 paste(bad, collapse = ", ")), call. = FALSE)
  used <- if (is.null(fr$weights)) rep(TRUE, length(fr$y)) else fr$weights > 0
  for (v in vars) {
    nonpos <- which(fr$mf[[v]] <= 0 & used)
    if (length(nonpos) > 0L)
      stop(sprintf(paste0("Box-Tidwell powers need positive values: `%s` has %d %s <= 0, at %s %s:",
                          " shift it (e.g. %s + c with c > %s) or leave it out of `vars`"),
                   v, length(nonpos), pwb_plural(length(nonpos), "value"),
                   pwb_plural(length(nonpos), "row"), pwb_format_labels(fr$labels[nonpos]), v,
                   format(-min(fr$mf[[v]][used]), digits = 4)), call. = FALSE)
  }
  fac <- attr(fr$terms, "factors")
  shared <- vars[vapply(vars, function(v) sum(fac[v, ] != 0) > 1L, logical(1))]
  if (length(shared) > 0L)
    stop(sprintf(paste0("%s also %s in another term (an interaction): Box-Tidwell powers need ",
                        "each variable in one plain term only"),
                 paste0("`", shared, "`", collapse = ", "),
                 if (length(shared) == 1L) "appears" else "appear"), call. = FALSE)
  Z <- X[, setdiff(colnames(X), vars), drop = FALSE]
  res <- rpwb_box_tidwell(fr$y, Z, X[, vars, drop = FALSE], as.integer(max_iter), tol, level,
                          fr$weights)
  transforms <- lapply(seq_along(vars), function(j) {
    switch(res$advice[j], linear = new_transform("identity"), log = new_transform("log"),
           new_transform("power", lambda = res$suggested[j]))
  })
  names(transforms) <- vars
  table <- data.frame(variable = vars, power = res$alpha, se = res$se, conf_low = res$conf_low,
                      conf_high = res$conf_high, score_t = res$score_t, score_p = res$score_p,
                      advice = res$advice, suggested = res$suggested,
                      transform = vapply(transforms, format, character(1)),
                      stringsAsFactors = FALSE)
  rownames(table) <- NULL
  history <- res$history[, seq_len(res$iterations + 1L), drop = FALSE]
  history <- history[, colSums(is.na(history)) == 0L, drop = FALSE]
  dimnames(history) <- list(vars, paste0("update", seq_len(ncol(history)) - 1L))
  structure(list(table = table, transforms = transforms, iterations = res$iterations,
                 converged = res$converged, max_iter = as.integer(max_iter), tol = tol,
                 last_change = res$last_change, history = history, score_df = res$score_df,
                 n = as.integer(res$n), level = level, weighted = !is.null(fr$weights),
                 formula = stats::formula(fr$terms)),
            class = "pwb_box_tidwell")
}

#' @export
print.pwb_box_tidwell <- function(x, digits = 4, ...) {
  cat(strwrap(paste0("<pwb_box_tidwell> Box-Tidwell powers for ", deparse1(x$formula),
                     " (n = ", x$n, ")"), width = getOption("width"), exdent = 2), sep = "\n")
  tab <- x$table
  num <- c("power", "se", "conf_low", "conf_high", "score_t")
  tab[num] <- lapply(tab[num], signif, digits = digits)
  tab$score_p <- format.pval(tab$score_p, digits = 3)
  tab$suggest <- ifelse(tab$advice == "linear", "none (linear)",
                        ifelse(tab$advice == "log", "log",
                               sprintf("power(%s)", signif(tab$suggested, digits))))
  tab$advice <- tab$suggested <- tab$transform <- NULL
  names(tab)[names(tab) == "conf_low"] <- sprintf("lower %g%%", 100 * x$level)
  names(tab)[names(tab) == "conf_high"] <- sprintf("upper %g%%", 100 * x$level)
  print(tab, row.names = FALSE, ...)
  cat(sprintf("score test of power 1: t on %g df%s; ", x$score_df,
              if (isTRUE(x$weighted)) " (weighted fits)" else ""))
  if (x$converged) {
    cat(sprintf("converged in %d updates (tol %g)\n", x$iterations, x$tol))
  } else {
    cat(sprintf("NOT converged after %d updates (last change %.3g, tol %g): treat the powers as rough\n",
                x$iterations, x$last_change, x$tol))
  }
  cat(sprintf("suggest: none if the score test does not reject at %g or 1 is in the interval\n",
              1 - x$level))
  cat("A power changes what a coefficient means; judge the result with knowledge of the data.\n")
  invisible(x)
}

#' @export
coef.pwb_box_tidwell <- function(object, ...) stats::setNames(object$table$power, object$table$variable)
