#' Leave-one-out influence on the response's power
#'
#' For each row, the maximum-likelihood power \eqn{\hat\lambda_{(i)}} of the response estimated
#' without that row, its change from the full-data \eqn{\hat\lambda}, and a flag for rows whose
#' deletion moves \eqn{\hat\lambda} outside the full-data profile-likelihood interval. A choice of
#' transform that rests on one or two rows deserves a second look at those rows.
#'
#' The design is factored once. At each trial power the residuals \eqn{e} of the full fit give
#' every leave-one-out residual sum of squares through the deletion identity
#' \eqn{RSS_{(i)} = RSS - e_i^2 / (1 - h_{ii})} (\eqn{h} the leverages), so no model is refitted;
#' the full-data profile and the residuals are interpolated on a window around
#' \eqn{\hat\lambda} shared by all rows (rows that move the estimate beyond it are solved on
#' the exact profile), so the cost grows linearly with the number of rows and the results equal
#' refitting without each row to the search's tolerance.
#'
#' With `weights` (precision weights, as in [stats::lm()]) the profile is the weighted one: the
#' weighted residual sum of squares with the unweighted Jacobian of the transform, so that at a
#' fixed power it equals `logLik()` of the weighted `lm` on the transformed scale plus the
#' Jacobian. Rows of weight 0 are left out (as `lm` does) and do not appear in `rows`.
#'
#' Cautions: a transform changes what the model estimates; back-transformed means need a
#' correction; and a flagged row is a prompt to check the data and the model, not a reason to
#' drop it. The results inform, but do not replace, domain standards and professional judgement.
#'
#' @param object a `pwb_model` from [lm_transformed()] (its predictors as transformed, and its
#'   response family when the response power was estimated), a fitted `lm`, or a formula (with
#'   `data`).
#' @param data a data frame, needed when `object` is a formula.
#' @param weights optional precision weights (finite, at least 0), evaluated in `data` as in
#'   [stats::lm()]. A weighted `lm` given as `object` brings its own.
#' @param subset optional expression selecting rows of `data`, as in [stats::lm()].
#' @param family `"box-cox"` (positive responses) or `"yeo-johnson"`. For a `pwb_model` whose
#'   response power was estimated, its family is used.
#' @param range the search range of the power.
#' @param level the level of the full-data interval.
#' @return An object of class `pwb_influence`: a list with `rows` (a data frame with `row`, the
#'   row of the data: its row name where the data have their own, else its position; `lambda`, the power without that row; `delta`, its change from the
#'   full-data power; `leverage`; `outside`, the flag; `at_bound`), and `lambda`, `conf_int`,
#'   `family`, `level`, `range`, `n` (rows used), `n_outside` and `weighted`.
#' @examples
#' river <- river_data()
#' inf <- lambda_influence(sediment_t_day ~ log(flow_m3s) + rain72_mm + season, river)
#' inf
#' plot(inf)
#' @export
lambda_influence <- function(object, data = NULL, family = c("box-cox", "yeo-johnson"),
                             range = c(-3, 3), level = 0.95, weights = NULL, subset = NULL) {
  family <- pwb_match_choice(family, "family")
  pwb_check_level(level)
  pwb_check_range(range)
  if (inherits(object, "pwb_model")) {
    if (!is.null(object$response_lambda)) family <- object$response_lambda$family
    fr <- pwb_model_influence_frame(object)
  } else {
    fr <- pwb_weighted_frame(object, data, substitute(weights), substitute(subset), parent.frame(),
                             "lambda_influence")
  }
  used <- if (is.null(fr$weights)) rep(TRUE, length(fr$y)) else fr$weights > 0
  if (family == "box-cox" && any(fr$y <= 0 & used)) {
    bad <- which(fr$y <= 0 & used)
    stop(sprintf(paste0("box-cox needs a positive response: `%s` has %d %s <= 0, at %s %s: ",
                        "use family = \"yeo-johnson\""), fr$yname, length(bad),
                 pwb_plural(length(bad), "value"), pwb_plural(length(bad), "row"),
                 pwb_format_labels(fr$labels[bad])), call. = FALSE)
  }
  res <- rpwb_lambda_influence(fr$y, fr$X, family, range[1L], range[2L], level, fr$weights)
  rows <- data.frame(row = fr$labels, lambda = res$loo_lambda, delta = res$loo_lambda - res$lambda,
                     leverage = res$leverage, outside = res$outside == 1L,
                     at_bound = res$loo_at_bound == 1L, stringsAsFactors = FALSE)[used, , drop = FALSE]
  rownames(rows) <- NULL
  structure(list(rows = rows, lambda = res$lambda, conf_int = res$conf_int, family = family,
                 level = level, range = range, n = sum(used), n_outside = res$n_outside,
                 yname = fr$yname, at_bound = res$at_bound, weighted = !is.null(fr$weights)),
            class = "pwb_influence")
}

#' @export
print.pwb_influence <- function(x, n = 5L, ...) {
  cat(sprintf("<pwb_influence> leave-one-out %s power of `%s` (n = %d%s)\n", x$family, x$yname,
              x$n, if (isTRUE(x$weighted)) ", weighted" else ""))
  cat(sprintf("full data: lambda = %.4g, %g%% interval [%.4g, %.4g]%s\n", x$lambda,
              100 * x$level, x$conf_int[1L], x$conf_int[2L],
              if (isTRUE(x$at_bound)) " (at the search bound)" else ""))
  r <- x$rows
  k <- sum(r$outside)
  cat(sprintf("%d %s whose deletion moves lambda outside the interval%s\n", k,
              pwb_plural(k, "row"), if (k > 0L) paste0(": ", pwb_format_labels(r$row[r$outside])) else ""))
  if (any(r$at_bound))
    cat(sprintf("%d leave-one-out estimates at the search bound\n", sum(r$at_bound)))
  top <- utils::head(r[order(-abs(r$delta)), ], n)
  top[c("lambda", "delta", "leverage")] <- lapply(top[c("lambda", "delta", "leverage")], signif, 4)
  cat("largest changes:\n")
  print(top, row.names = FALSE)
  invisible(x)
}

#' @export
plot.pwb_influence <- function(x, ...) {
  r <- x$rows
  old <- graphics::par(mfrow = c(1, 2))
  on.exit(graphics::par(old))
  col <- ifelse(r$outside, "red", "black")
  lim <- x$conf_int - x$lambda
  named <- is.character(r$row)
  pos <- if (named) seq_len(nrow(r)) else r$row
  graphics::plot(pos, r$delta, type = "h", col = col, xlab = "row",
                 ylab = expression(Delta * hat(lambda)), main = "change of lambda by row",
                 xaxt = if (named) "n" else "s", ...)
  if (named) graphics::axis(1, at = pos, labels = r$row, las = 2, cex.axis = 0.6, tick = FALSE)
  graphics::abline(h = c(0, lim), lty = c(1, 2, 2), col = "grey50")
  graphics::plot(r$leverage, r$delta, col = col, pch = 19, xlab = "leverage",
                 ylab = expression(Delta * hat(lambda)), main = "change vs leverage", ...)
  graphics::abline(h = c(0, lim), lty = c(1, 2, 2), col = "grey50")
  # name the rows that move lambda most (and every flagged row)
  top <- unique(c(which(r$outside), utils::head(order(-abs(r$delta)), 3L)))
  if (length(top) > 0L)
    graphics::text(r$leverage[top], r$delta[top], labels = r$row[top], pos = 3, cex = 0.7)
  invisible(x)
}

# The response, design and weights of a pwb_model as its core fit saw them (the stored frame with
# the predictor transforms applied: no refit). Rows are labelled by the data's row names, which
# are whole numbers (the rows' positions) when the data had none of its own.
pwb_model_influence_frame <- function(object) {
  design <- pwb_stored_design(object)
  if (!design$intercept)
    stop("lambda_influence() needs a model with an intercept", call. = FALSE)
  frame <- .subset2(object, "frame")
  rn <- rownames(frame)
  pos <- suppressWarnings(as.integer(rn))
  w <- stats::model.weights(frame)
  list(y = as.double(design$y), X = design$X, yname = .subset2(object, "yname"),
       labels = if (!anyNA(pos) && identical(as.character(pos), rn)) pos else rn,
       weights = if (is.null(w)) NULL else as.double(w))
}
