# Influence measures of pwb_model on the transformed scale: hatvalues, cooks.distance,
# rstandard, rstudent, from the core model's leverages and residuals.

#' Influence measures of a transformed linear model
#'
#' Leverages, Cook's distances and standardized and studentized residuals of the fit on the
#' transformed scale, as [stats::hatvalues()], [stats::cooks.distance()], [stats::rstandard()]
#' and [stats::rstudent()] give them for an `lm`: with weights, the weighted residuals
#' \eqn{\sqrt{w_i} e_i} and the leverages of the weighted design are used, and rows of zero
#' weight are left out (as `lm` leaves them out); `na.exclude` pads with `NA`. With
#' \eqn{h_i} the leverage, \eqn{r_i = \sqrt{w_i} e_i}, \eqn{s} sigma and \eqn{p} the rank:
#' standardized \eqn{r_i / (s\sqrt{1 - h_i})}; Cook's distance
#' \eqn{(r_i / (s (1 - h_i)))^2 h_i / p}; studentized \eqn{r_i / (s_{(i)}\sqrt{1 - h_i})} with
#' \eqn{s_{(i)}^2 = (RSS - r_i^2/(1 - h_i)) / (df - 1)} (Belsley, Kuh and Welsch 1980, ch. 2).
#'
#' @param model a `pwb_model` from [lm_transformed()].
#' @param ... unused.
#' @return A named numeric vector, one value per row used (padded under `na.exclude`).
#' @examples
#' m <- lm_transformed(Volume ~ Girth + Height, trees, response = new_transform("log"))
#' head(hatvalues(m))
#' head(cooks.distance(m))
#' head(rstandard(m))
#' head(rstudent(m))
#' @name pwb_model_influence
NULL

# list(h, r, keep) over the rows of positive weight: leverages and weighted residuals.
pwb_influence_parts <- function(model) {
  h <- model$leverages
  r <- model$residuals
  w <- stats::model.weights(model$frame)
  keep <- if (is.null(w)) rep(TRUE, length(r)) else w > 0
  if (!is.null(w)) r <- r * sqrt(w)
  nm <- row.names(model$frame)
  h[h > 1 - 10 * .Machine$double.eps] <- 1  # as lm.influence rounds leverages of one
  list(h = stats::setNames(h, nm)[keep], r = stats::setNames(r, nm)[keep])
}

pwb_influence_out <- function(model, v) {
  if (is.null(stats::model.weights(model$frame)) || all(stats::model.weights(model$frame) > 0))
    return(stats::naresid(model$na.action, v))
  v
}

#' @rdname pwb_model_influence
#' @export
hatvalues.pwb_model <- function(model, ...) {
  h <- pwb_influence_out(model, pwb_influence_parts(model)$h)
  h[is.na(h)] <- 0  # rows left out by na.exclude have leverage 0, as lm.influence gives them
  h
}

#' @rdname pwb_model_influence
#' @export
rstandard.pwb_model <- function(model, ...) {
  p <- pwb_influence_parts(model)
  out <- p$r / (model$sigma * sqrt(1 - p$h))
  out[is.infinite(out)] <- NaN
  pwb_influence_out(model, out)
}

#' @rdname pwb_model_influence
#' @export
cooks.distance.pwb_model <- function(model, ...) {
  p <- pwb_influence_parts(model)
  pwb_influence_out(model, (p$r / (model$sigma * (1 - p$h)))^2 * p$h / model$rank)
}

#' @rdname pwb_model_influence
#' @export
rstudent.pwb_model <- function(model, ...) {
  p <- pwb_influence_parts(model)
  df <- model$df_residual
  s_i <- sqrt((model$rss - p$r^2 / (1 - p$h)) / (df - 1))
  out <- p$r / (s_i * sqrt(1 - p$h))
  out[is.infinite(out)] <- NaN
  pwb_influence_out(model, out)
}
