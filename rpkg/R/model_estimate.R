# The response power of lm_transformed(response = "estimate") from the model's own design: the
# design built for the fit is handed to the library once, instead of estimate_response_lambda()
# building the model frame and the model matrix a second time.

# A pwb_lambda equal to estimate_response_lambda(formula, tdata, ...) on the same rows, or NULL
# when that call must be made instead: a model without intercept, a design with an aliased
# column (whose names that call works out) or any error (whose message names rows there).
pwb_lambda_on_design <- function(design, formula, family, level, range, w) {
  if (!isTRUE(design$intercept)) return(NULL)
  # the predictors are the columns of the full design D after its intercept column
  res <- rpwb_estimate_response_lambda(design$y, design$D, family, range[1L], range[2L], level,
                                       101L, if (is.null(w)) NULL else as.double(w), 1L)
  if (!is.null(res$error) || res$n_aliased > 0) return(NULL)
  tt <- design$terms
  out <- pwb_new_lambda(res, family, level, range, deparse1(attr(tt, "variables")[[2L]]),
                        deparse1(tt[[3L]]), NULL)
  out$rank <- as.integer(res$rank)
  out$aliased <- character(0)
  out$weighted <- !is.null(w)
  out
}
