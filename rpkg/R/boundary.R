# Rows at the boundary of the response transform's domain, said in words wherever the
# original-scale log-likelihood is shown or used.
#
# A power response (the square root among them) maps y = 0 without trouble, but its derivative
# there is unbounded (lambda < 1) or zero (lambda > 1): the log-Jacobian of such a row is -Inf,
# so the log-likelihood is -Inf and AIC is Inf. The number is right (the model ranks last on
# AIC, never first) but it compares nothing, and a bare -Inf does not say why.

# Row names of the model frame whose response has an infinite log-derivative (the core's
# log |dT/dy|, read through the C ABI); empty when the log-likelihood is finite.
pwb_boundary_rows <- function(object) {
  if (is.null(object$loglik) || !identical(object$loglik, -Inf) || is.null(object$frame) ||
      is.null(object$response))
    return(character(0))
  y <- as.double(object$frame[[object$yname]])
  d <- rpwb_transform_map(unclass(object$response), y, 2L)$value
  hit <- !is.na(d) & d == -Inf
  w <- stats::model.weights(object$frame)
  if (!is.null(w)) hit <- hit & w > 0
  rn <- row.names(object$frame)
  if (is.null(rn)) as.character(which(hit)) else rn[hit]
}

# The sentence for print(), summary(), logLik() and the comparison; NULL when there is nothing
# to say. `rows` are from pwb_boundary_rows().
pwb_boundary_note <- function(rows, yname = "y") {
  k <- length(rows)
  if (k == 0L) return(NULL)
  shown <- paste(utils::head(rows, 6L), collapse = ", ")
  if (k > 6L) shown <- paste0(shown, ", ...")
  sprintf(paste0("%d %s (%s %s) %s at the boundary of the response transform's domain, ",
                 "where its derivative is zero or unbounded (such as %s = 0 under a power ",
                 "other than 1): the log-Jacobian there is -Inf, so the log-likelihood (-Inf) ",
                 "and AIC (Inf) are not comparable with other models'. Shift the response ",
                 "(e.g. %s + a small constant) or use Yeo-Johnson."),
          k, pwb_plural(k, "row"), pwb_plural(k, "row"), shown, if (k == 1L) "lies" else "lie",
          yname, yname)
}
