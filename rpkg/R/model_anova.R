#' Analysis of variance of transformed linear models
#'
#' With one model: the sequential (type I) F tests of its terms on the transformed scale, as
#' [stats::anova()] gives them for an `lm` fitted to the transformed columns (weighted sums of
#' squares when weighted). Each term's sum of squares is the drop in the residual sum of
#' squares when it is added after the terms before it; the core fits the nested models.
#'
#' With several models: F tests between nested models fitted to the same rows with the same
#' response transform (the residual variance of the largest model is the denominator, as
#' `anova.lm` does). Models whose responses are transformed differently have residual sums of
#' squares on different scales, so no F test compares them: that is an error pointing to
#' `logLik()`/`AIC()` (original scale, Jacobian included) and [compare_transforms()].
#'
#' @param object a `pwb_model` from [lm_transformed()].
#' @param ... further `pwb_model`s to compare with `object`.
#' @return An object of class `anova` (a data frame), as `anova.lm` returns.
#' @examples
#' m <- lm_transformed(Volume ~ Girth + Height, trees, response = new_transform("log"),
#'                     predictors = list(Girth = new_transform("log")))
#' anova(m)
#' anova(update(m, . ~ . - Height), m)
#' @export
anova.pwb_model <- function(object, ...) {
  others <- list(...)
  if (length(others)) return(pwb_anova_models(c(list(object), others)))
  handle <- pwb_handle(object)
  X <- stats::model.matrix(object)
  assign <- object$assign
  labels <- attr(object$terms, "term.labels")
  intercept <- colnames(X)[1L] == "(Intercept)"
  Xp <- if (intercept) X[, -1L, drop = FALSE] else X
  ap <- if (intercept) assign[-1L] else assign
  w <- stats::model.weights(object$frame)
  y <- object$y
  z <- object$z
  spec <- pwb_spec_or_null(object$response)
  # Residual sum of squares and rank of the model with the first j terms.
  fit_rss <- function(j) {
    cols <- which(ap <= j)
    if (!intercept && !length(cols)) {
      ww <- if (is.null(w)) 1 else w
      return(c(rss = sum(ww * z^2), rank = 0))
    }
    h <- rpwb_model_new(y, Xp[, cols, drop = FALSE], intercept, spec, 0L, w)
    s <- rpwb_model_summary(h)
    c(rss = s$rss, rank = s$rank)
  }
  steps <- lapply(seq_along(labels) - 1L, fit_rss)
  steps[[length(labels) + 1L]] <- c(rss = object$rss, rank = object$rank)
  rss <- vapply(steps, `[[`, numeric(1), "rss")
  rank <- vapply(steps, `[[`, numeric(1), "rank")
  df <- diff(rank)
  ss <- -diff(rss)
  keep <- df > 0
  dfr <- object$df_residual
  ms <- ss / df
  resms <- object$rss / dfr
  fval <- ms / resms
  tab <- data.frame(Df = c(df[keep], dfr), `Sum Sq` = c(ss[keep], object$rss),
                    `Mean Sq` = c(ms[keep], resms),
                    `F value` = c(fval[keep], NA),
                    `Pr(>F)` = c(stats::pf(fval[keep], df[keep], dfr, lower.tail = FALSE), NA),
                    check.names = FALSE, row.names = c(labels[keep], "Residuals"))
  structure(tab, heading = c("Analysis of Variance Table (transformed scale)\n",
                             paste0("Response: ", format(object$response, name = object$yname))),
            class = c("anova", "data.frame"))
}

pwb_anova_models <- function(models) {
  if (!all(vapply(models, inherits, logical(1), "pwb_model")))
    stop("every model given to anova() must be a pwb_model from lm_transformed()", call. = FALSE)
  r0 <- models[[1L]]
  for (m in models[-1L]) {
    if (!identical(m$yname, r0$yname) ||
        !identical(pwb_spec_or_null(m$response), pwb_spec_or_null(r0$response)))
      stop(sprintf(paste0("the models transform the response differently (%s: %s; %s: %s), so ",
                          "their residual sums of squares are on different scales and no F test ",
                          "compares them: compare logLik() or AIC() (original scale, Jacobian ",
                          "included) or use compare_transforms()"),
                   r0$yname, format(r0$response), m$yname, format(m$response)), call. = FALSE)
    if (m$nobs != r0$nobs)
      stop(sprintf("the models were fitted to different numbers of rows (%d and %d)",
                   as.integer(r0$nobs), as.integer(m$nobs)), call. = FALSE)
  }
  resdf <- vapply(models, function(m) as.numeric(m$df_residual), numeric(1))
  resdev <- vapply(models, function(m) m$rss, numeric(1))
  big <- order(resdf)[1L]
  scale <- resdev[big] / resdf[big]
  df <- c(NA, -diff(resdf))
  ss <- c(NA, -diff(resdev))
  fval <- ss / df / scale
  p <- stats::pf(fval, abs(df), resdf[big], lower.tail = FALSE)
  ok <- !is.na(df) & df != 0
  fval[!ok] <- NA
  p[!ok] <- NA
  tab <- data.frame(Res.Df = resdf, RSS = resdev, Df = df, `Sum of Sq` = ss, F = fval,
                    `Pr(>F)` = p, check.names = FALSE)
  forms <- vapply(models, function(m) deparse1(m$formula), character(1))
  structure(tab, heading = c("Analysis of Variance Table (transformed scale)\n",
                             paste0("Model ", seq_along(models), ": ", forms, collapse = "\n")),
            class = c("anova", "data.frame"))
}
