# Methods of pwb_lambda (from estimate_lambda() / estimate_response_lambda()) and as_transform().

pwb_lambda_family_label <- function(family) if (family == "box-cox") "Box-Cox" else "Yeo-Johnson"

#' @export
print.pwb_lambda <- function(x, digits = 3, ...) {
  what <- if (is.null(x$predictors)) sprintf("`%s`", x$variable)
          else sprintf("`%s` given %s", x$variable, x$predictors)
  cat(sprintf("<pwb_lambda> %s lambda for %s (n = %d)\n", pwb_lambda_family_label(x$family),
              what, x$n))
  f <- function(v) formatC(v, digits = digits, format = "fg", flag = "#")
  cat(sprintf("  estimate %s   %g%% interval [%s, %s]   convenient %s\n", f(x$lambda),
              100 * x$level, f(x$conf_int[1L]), f(x$conf_int[2L]), format(x$convenient)))
  cat(sprintf("  log-likelihood at the estimate (original scale): %s\n",
              format(x$loglik, digits = 6)))
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
  for (nt in notes) cat("  note:", nt, "\n")
  cat("  A transform changes what a model estimates; back-transformed means need a correction.\n")
  invisible(x)
}

#' @export
coef.pwb_lambda <- function(object, ...) c(lambda = object$lambda)

#' @export
confint.pwb_lambda <- function(object, parm, level = object$level, ...) {
  if (!isTRUE(all.equal(level, object$level)))
    stop(sprintf(paste0("this interval was computed at level %g; estimate again with ",
                        "`level = %g` for another level"), object$level, level), call. = FALSE)
  a <- (1 - object$level) / 2
  pct <- paste(format(100 * c(a, 1 - a), trim = TRUE, scientific = FALSE, digits = 3), "%")
  matrix(object$conf_int, nrow = 1L, dimnames = list("lambda", pct))
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
  which <- match.arg(which)
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
