#' Residual plots of a transformed linear model
#'
#' Base-graphics panels on the transformed scale: residuals against fitted values, a normal
#' quantile-quantile plot, scale-location (square root of the absolute standardized residuals
#' against fitted values) and residuals against each numeric predictor as it entered the model
#' (after its transform). With `compare = TRUE` the residuals-vs-fitted and quantile plots of
#' the untransformed twin (the same formula fitted by `lm()` to the raw variables) are drawn
#' beside the model's, before on the left and after on the right.
#'
#' @param x a `pwb_model` from [lm_transformed()].
#' @param compare logical: draw the before/after comparison instead.
#' @param ... passed to [graphics::plot()] for every panel.
#' @return `x`, invisibly.
#' @examples
#' set.seed(5)
#' d <- data.frame(x = runif(80, 0, 3))
#' d$y <- exp(1 + 0.6 * d$x + rnorm(80, sd = 0.5))
#' m <- lm_transformed(y ~ x, d, response = new_transform("log"))
#' f <- file.path(tempdir(), "pwb_plot.png")
#' grDevices::png(f, width = 800, height = 800)
#' plot(m)
#' plot(m, compare = TRUE)
#' grDevices::dev.off()
#' @export
plot.pwb_model <- function(x, compare = FALSE, ...) {
  if (!is.logical(compare) || length(compare) != 1L || is.na(compare))
    stop("`compare` must be TRUE or FALSE", call. = FALSE)
  if (compare) return(invisible(pwb_plot_compare(x, ...)))
  preds <- pwb_numeric_model_predictors(x)
  panels <- 3L + length(preds)
  cols <- if (panels <= 4L) 2L else 3L
  op <- graphics::par(mfrow = c(ceiling(panels / cols), cols))
  on.exit(graphics::par(op))
  handle <- pwb_handle(x)
  r <- rpwb_model_vector(handle, 0L)
  f <- rpwb_model_vector(handle, 1L)
  lev <- rpwb_model_vector(handle, 2L)
  w <- stats::model.weights(x$frame)
  if (!is.null(w)) {
    # Weighted residuals (as plot.lm uses), rows of zero weight left out.
    keep <- w > 0
    r <- (r * sqrt(w))[keep]
    f <- f[keep]
    lev <- lev[keep]
  }
  pwb_panel_resid_fitted(f, r, "Residuals vs fitted (transformed scale)", ...)
  pwb_panel_qq(r, "Normal Q-Q of residuals", ...)
  s <- r / (x$sigma * sqrt(pmax(1 - lev, .Machine$double.eps)))
  graphics::plot(f, sqrt(abs(s)), xlab = "fitted (transformed scale)",
                 ylab = "sqrt(|standardized residual|)", main = "Scale-location", ...)
  pwb_smooth_line(f, sqrt(abs(s)))
  mf <- pwb_transform_columns(pwb_frame_variables(x$frame), x$predictors)
  if (!is.null(w)) mf <- mf[keep, , drop = FALSE]
  for (v in preds) {
    label <- if (v %in% names(x$predictors)) sprintf("%s (transformed)", v) else v
    graphics::plot(mf[[v]], r, xlab = label, ylab = "residual", main = paste("Residuals vs", v), ...)
    graphics::abline(h = 0, lty = 2)
    pwb_smooth_line(mf[[v]], r)
  }
  invisible(x)
}

pwb_numeric_model_predictors <- function(x) {
  mf <- x$frame
  x$xvars[vapply(x$xvars, function(v) v %in% names(mf) && is.numeric(mf[[v]]), logical(1))]
}

pwb_plot_compare <- function(x, ...) {
  twin <- pwb_untransformed_twin(x)
  op <- graphics::par(mfrow = c(2L, 2L))
  on.exit(graphics::par(op))
  pwb_panel_resid_fitted(stats::fitted(twin), stats::residuals(twin),
                         "Before: residuals vs fitted", ...)
  handle <- pwb_handle(x)
  r <- rpwb_model_vector(handle, 0L)
  f <- rpwb_model_vector(handle, 1L)
  pwb_panel_resid_fitted(f, r, "After: residuals vs fitted", ...)
  pwb_panel_qq(stats::residuals(twin), "Before: normal Q-Q", ...)
  pwb_panel_qq(r, "After: normal Q-Q", ...)
  x
}

pwb_panel_resid_fitted <- function(f, r, main, ...) {
  graphics::plot(f, r, xlab = "fitted", ylab = "residual", main = main, ...)
  graphics::abline(h = 0, lty = 2)
  pwb_smooth_line(f, r)
}

pwb_panel_qq <- function(r, main, ...) {
  r <- r[!is.na(r)]  # rows padded by na.exclude have no residual
  q <- stats::qqnorm(r, main = main, plot.it = FALSE)
  graphics::plot(q$x, q$y, xlab = "normal quantile", ylab = "residual", main = main, ...)
  # Line through the quartiles (common practice for Q-Q reference lines).
  qy <- stats::quantile(r, c(0.25, 0.75), names = FALSE)
  qx <- stats::qnorm(c(0.25, 0.75))
  slope <- diff(qy) / diff(qx)
  graphics::abline(a = qy[1L] - slope * qx[1L], b = slope, lty = 2)
}

pwb_smooth_line <- function(x, y) {
  ok <- is.finite(x) & is.finite(y)
  if (sum(ok) >= 3L && length(unique(x[ok])) >= 3L)
    graphics::lines(stats::lowess(x[ok], y[ok]), col = "red")
}
