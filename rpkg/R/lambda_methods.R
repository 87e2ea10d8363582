# Methods of pwb_lambda (from estimate_lambda() / estimate_response_lambda()) and as_transform().

pwb_lambda_family_label <- function(family) if (family == "box-cox") "Box-Cox" else "Yeo-Johnson"

#' Print, extract and recompute an estimated lambda
#'
#' `print()` shows the estimate, its profile-likelihood interval and the convenient value, with
#' notes on edges and convergence (wrapped to `getOption("width")`). `coef()` gives
#' \eqn{\hat\lambda}. `confint()` gives the profile-likelihood interval at `level`: the stored
#' one at the level of the estimate; at another level it is recomputed from the profile kept in
#' the object (the set of \eqn{\lambda} whose profile log-likelihood lies within
#' \eqn{\chi^2_1(level)/2} of the maximum), by a cubic spline through the stored profile points.
#' A side whose cut lies beyond the stored profile is open: its end is `NA`, with a warning.
#'
#' @param x,object a `pwb_lambda` from [estimate_lambda()] or [estimate_response_lambda()].
#' @param digits significant digits.
#' @param parm unused (there is one parameter, `lambda`).
#' @param level the confidence level.
#' @param ... unused.
#' @return `print()`: `x`, invisibly; `coef()`: a named number; `confint()`: a one-row matrix
#'   with the interval's ends.
#' @examples
#' fit <- estimate_lambda(trees$Volume)
#' fit
#' coef(fit)
#' confint(fit)
#' confint(fit, level = 0.9)
#' @export
print.pwb_lambda <- function(x, digits = 3, ...) {
  what <- if (is.null(x$predictors)) sprintf("`%s`", x$variable)
          else sprintf("`%s` given %s", x$variable, x$predictors)
  pwb_cat_wrap(sprintf("<pwb_lambda> %s lambda for %s (n = %d)",
                       pwb_lambda_family_label(x$family), what, x$n))
  f <- function(v) pwb_format_num(v, digits)
  pwb_cat_wrap(sprintf("estimate %s   %g%% interval [%s, %s]   convenient %s", f(x$lambda),
                       100 * x$level, f(x$conf_int[1L]), f(x$conf_int[2L]),
                       format(x$convenient)), indent = 2L, exdent = 4L)
  pwb_cat_wrap(sprintf("log-likelihood at the estimate (original scale): %s",
                       format(x$loglik, digits = 6)), indent = 2L, exdent = 4L)
  notes <- character(0)
  if (x$at_bound)
    notes <- c(notes, sprintf("the estimate sits at the edge of the search range [%g, %g]",
                              x$range[1L], x$range[2L]))
  if (x$low_open) notes <- c(notes, "the interval is open below: it reaches the range's lower end")
  if (x$high_open) notes <- c(notes, "the interval is open above: it reaches the range's upper end")
  if (!x$converged) notes <- c(notes, "the search did not converge: treat the numbers with care")
  if (length(x$aliased))
    notes <- c(notes, sprintf("aliased predictor columns dropped (as lm does): %s",
                              paste(x$aliased, collapse = ", ")))
  if (!is.null(x$na_action))
    notes <- c(notes, sprintf("%d %s with missing values omitted", length(x$na_action),
                              pwb_plural(length(x$na_action), "row")))
  for (nt in notes) pwb_cat_wrap("note: ", nt, indent = 2L, exdent = 4L)
  pwb_cat_wrap("A transform changes what a model estimates; back-transformed means need a ",
               "correction.", indent = 2L, exdent = 2L)
  invisible(x)
}

#' @rdname print.pwb_lambda
#' @export
coef.pwb_lambda <- function(object, ...) c(lambda = object$lambda)

#' @rdname print.pwb_lambda
#' @export
confint.pwb_lambda <- function(object, parm, level = object$level, ...) {
  pwb_check_level(level)
  ci <- if (isTRUE(all.equal(level, object$level))) object$conf_int
        else pwb_lambda_profile_interval(object, level)
  a <- (1 - level) / 2
  pct <- paste(format(100 * c(a, 1 - a), trim = TRUE, scientific = FALSE, digits = 3), "%")
  matrix(ci, nrow = 1L, dimnames = list("lambda", pct))
}

# The interval at `level` from the stored profile: where a cubic spline through the profile
# points crosses the cut, on each side of the estimate.
pwb_lambda_profile_interval <- function(object, level) {
  pr <- object$profile
  ok <- is.finite(pr$lambda) & is.finite(pr$loglik)
  pr <- pr[ok, , drop = FALSE]
  pr <- pr[order(pr$lambda), , drop = FALSE]
  if (nrow(pr) < 4L)
    stop("the stored profile has too few points to recompute the interval: estimate again ",
         sprintf("with `level = %g`", level), call. = FALSE)
  cut <- object$loglik - stats::qchisq(level, 1) / 2
  sp <- stats::splinefun(pr$lambda, pr$loglik, method = "fmm")
  g <- function(l) sp(l) - cut
  side <- function(lo, hi, which) {
    if (!(lo < hi) || g(lo) * g(hi) > 0) {
      warning(sprintf(paste0("the %s end of the %g%% interval lies beyond the stored profile ",
                             "(%g to %g): it is NA; estimate again with a wider `range`"),
                      which, 100 * level, min(pr$lambda), max(pr$lambda)), call. = FALSE)
      return(NA_real_)
    }
    stats::uniroot(g, c(lo, hi), tol = 1e-10)$root
  }
  est <- min(max(object$lambda, min(pr$lambda)), max(pr$lambda))
  c(side(min(pr$lambda), est, "lower"), side(est, max(pr$lambda), "upper"))
}

#' Plot the profile log-likelihood of lambda
#'
#' Draws the profile log-likelihood along \eqn{\lambda}, the cut that defines the confidence
#' interval (a dashed horizontal line), the interval's endpoints (dotted vertical lines), the
#' estimate (filled point) and the convenient value (open point, labelled).
#'
#' @param x a `pwb_lambda` from [estimate_lambda()] or [estimate_response_lambda()].
#' @param main the title; by default the family and the variable (with the model's predictors),
#'   drawn smaller when it would not fit the figure's width.
#' @param ... further graphical arguments passed to [graphics::plot()].
#' @return `x`, invisibly.
#' @examples
#' river <- river_data()
#' fit <- estimate_response_lambda(sediment_t_day ~ log(flow_m3s) + rain72_mm + season, river)
#' f <- file.path(tempdir(), "lambda-profile.png")
#' grDevices::png(f)
#' plot(fit)
#' grDevices::dev.off()
#' unlink(f)
#' @export
plot.pwb_lambda <- function(x, main = NULL, ...) {
  pr <- x$profile
  cut <- x$loglik - stats::qchisq(x$level, 1) / 2
  graphics::plot(pr$lambda, pr$loglik, type = "l", xlab = "lambda",
                 ylab = "profile log-likelihood", main = "", ...)
  if (is.null(main)) {
    lab <- if (is.null(x$predictors)) x$variable else paste(x$variable, "~", x$predictors)
    main <- sprintf("%s: %s", pwb_lambda_family_label(x$family), lab)
  }
  # A long model formula: shrink the title (down to 60%) to the room the figure leaves it; it is
  # centred over the plot region, so the room is twice the nearer figure edge's distance.
  cex <- graphics::par("cex.main")
  w <- graphics::strwidth(main, units = "figure", cex = cex * graphics::par("cex"),
                          font = graphics::par("font.main"))
  centre <- mean(graphics::par("plt")[1:2])
  room <- 0.96 * 2 * min(centre, 1 - centre)
  if (is.finite(w) && w > room) cex <- max(0.6 * cex, cex * room / w)
  graphics::title(main = main, cex.main = cex)
  graphics::abline(h = cut, lty = 2, col = "grey40")
  graphics::abline(v = x$conf_int, lty = 3, col = "grey40")
  graphics::points(x$lambda, x$loglik, pch = 19)
  if (x$convenient >= min(pr$lambda) && x$convenient <= max(pr$lambda)) {
    lc <- stats::approx(pr$lambda, pr$loglik, xout = x$convenient)$y
    graphics::points(x$convenient, lc, pch = 1, cex = 1.6)
    graphics::text(x$convenient, lc, labels = format(x$convenient), pos = 1)
  }
  graphics::mtext(sprintf("%g%% interval [%.3g, %.3g]", 100 * x$level, x$conf_int[1L],
                          x$conf_int[2L]), side = 3, line = 0.25, cex = 0.8)
  invisible(x)
}

#' Turn an estimated lambda into a transform
#'
#' @param x a `pwb_lambda` (from [estimate_lambda()] or [estimate_response_lambda()]), or a
#'   `pwb_transform`, which is returned as it is.
#' @param which `"convenient"` (default) uses the convenient \eqn{\lambda}; `"estimate"` uses
#'   \eqn{\hat\lambda} itself.
#' @param ... unused.
#' @return A `pwb_transform` of the estimate's family (see [new_transform()]).
#' @examples
#' river <- river_data()
#' fit <- estimate_lambda(river$sediment_t_day)
#' as_transform(fit)
#' as_transform(fit, "estimate")
#' @export
as_transform <- function(x, which = c("convenient", "estimate"), ...) UseMethod("as_transform")

#' @rdname as_transform
#' @export
as_transform.pwb_lambda <- function(x, which = c("convenient", "estimate"), ...) {
  which <- pwb_match_choice(which, "which")
  new_transform(x$family, lambda = if (which == "convenient") x$convenient else x$lambda)
}

#' @rdname as_transform
#' @export
as_transform.pwb_transform <- function(x, which = c("convenient", "estimate"), ...) x

#' @rdname as_transform
#' @export
as_transform.default <- function(x, which = c("convenient", "estimate"), ...) {
  stop("`x` must be a pwb_lambda (estimate_lambda(), estimate_response_lambda()) or a ",
       "pwb_transform", call. = FALSE)
}
