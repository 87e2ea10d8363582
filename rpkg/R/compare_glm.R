# Generalized linear model candidates of compare_transforms(): a base R `family` object fitted
# with stats::glm.fit() on the training part's own model frame, predicting the held-out rows'
# means as predict.glm(type = "response") does, with plug-in prediction intervals where the
# family defines a distribution.

# "Gamma(log)" for Gamma(link = "log").
pwb_cmp_glm_label <- function(fam) sprintf("%s(%s)", fam$family, fam$link)

# How the prediction interval of a family is made, or why there is none.
pwb_cmp_glm_interval_kind <- function(fam) {
  switch(fam$family,
         Gamma = "Gamma quantiles, shape 1/dispersion",
         gaussian = "normal quantiles, sd sqrt(dispersion)",
         poisson = "Poisson quantiles",
         quasipoisson = ,
         quasibinomial = ,
         quasi = "none: a quasi-likelihood defines no distribution",
         sprintf("none: no quantiles are set up for the %s family", fam$family))
}

# A learner fitting the family on a training part: returns a pwb_cmp_glm_fit. The weights w
# (NULL or one per training row) are glm's prior weights.
pwb_cmp_glm_learner <- function(fam, name) {
  if (!is.function(fam$linkinv) || !is.function(fam$variance))
    stop(sprintf("candidate `%s` is not a complete family object: write e.g. Gamma(link = \"log\")",
                 name), call. = FALSE)
  learner <- function(train, formula, yname, family, level, w = NULL)
    pwb_cmp_glm_fit(fam, formula, train, yname, w)
  attr(learner, "kind") <- "glm"
  attr(learner, "family") <- fam
  learner
}

# The response values a family accepts, checked before fitting so the failure names the rows
# (positions in the training part; the caller maps them to rows of the data).
pwb_cmp_glm_check_y <- function(fam, y, yname) {
  lab <- pwb_cmp_glm_label(fam)
  bad <- switch(fam$family,
                Gamma = , inverse.gaussian = which(y <= 0),
                poisson = , quasipoisson = which(y < 0),
                integer(0))
  if (!length(bad)) return(invisible())
  need <- if (fam$family %in% c("Gamma", "inverse.gaussian")) "y > 0" else "y >= 0"
  remedy <- if (need == "y > 0") "use quasipoisson(link = \"log\") or a transform candidate"
            else "use a transform candidate (e.g. Yeo-Johnson)"
  stop(sprintf("%s needs %s; `%s` has %d %s %s at %s %s: %s", lab, need, yname, length(bad),
               pwb_plural(length(bad), "value"), if (need == "y > 0") "<= 0" else "< 0",
               pwb_plural(length(bad), "row"), pwb_format_rows(bad), remedy), call. = FALSE)
}

pwb_cmp_glm_fit <- function(fam, formula, train, yname, w) {
  mf <- stats::model.frame(formula, train, na.action = stats::na.fail)
  tt <- attr(mf, "terms")
  y <- as.double(stats::model.response(mf))
  pwb_cmp_glm_check_y(fam, y, yname)
  X <- stats::model.matrix(tt, mf)
  # non-convergence becomes this candidate's failure (below), not a stray warning
  fit <- withCallingHandlers(
    stats::glm.fit(X, y, weights = w, family = fam),
    warning = function(wn) {
      if (grepl("did not converge", conditionMessage(wn), fixed = TRUE))
        invokeRestart("muffleWarning")
    })
  if (!fit$converged)
    stop(sprintf("the %s fit did not converge in %d iterations", pwb_cmp_glm_label(fam),
                 fit$iter), call. = FALSE)
  # the dispersion as summary.glm() estimates it (Pearson), 1 for poisson and binomial
  phi <- if (fam$family %in% c("poisson", "binomial")) 1
         else if (fit$df.residual > 0) {
           ok <- fit$weights > 0
           sum((fit$weights * fit$residuals^2)[ok]) / fit$df.residual
         } else NaN
  structure(list(coefficients = fit$coefficients, family = fam, terms = tt,
                 xlevels = stats::.getXlevels(tt, mf), contrasts = attr(X, "contrasts"),
                 dispersion = phi, aic = fit$aic, n = length(y), yname = yname),
            class = "pwb_cmp_glm_fit")
}

# Held-out means (as predict.glm(type = "response")) and plug-in prediction intervals (NULL
# ends where the family defines no distribution). The interval ignores the uncertainty in the
# fitted mean.
pwb_cmp_glm_predict <- function(model, test, level) {
  tt <- stats::delete.response(model$terms)
  mf <- stats::model.frame(tt, test, xlev = model$xlevels, na.action = stats::na.pass)
  X <- stats::model.matrix(tt, mf, contrasts.arg = model$contrasts)
  b <- model$coefficients
  aliased <- is.na(b)
  eta <- drop(X[, !aliased, drop = FALSE] %*% b[!aliased])
  mu <- model$family$linkinv(eta)
  a <- (1 - level) / 2
  phi <- model$dispersion
  ends <- switch(model$family$family,
                 Gamma = {
                   shape <- 1 / phi
                   list(stats::qgamma(a, shape = shape, rate = shape / mu),
                        stats::qgamma(1 - a, shape = shape, rate = shape / mu))
                 },
                 gaussian = {
                   half <- stats::qnorm(1 - a) * sqrt(phi)
                   list(mu - half, mu + half)
                 },
                 poisson = list(stats::qpois(a, mu), stats::qpois(1 - a, mu)),
                 NULL)
  list(fit = mu, lwr = ends[[1L]], upr = ends[[2L]])
}

# One row per variable for the $lambdas table: the response's mean is modelled, not transformed.
pwb_cmp_glm_lambdas <- function(model) {
  data.frame(variable = model$yname, role = "response", family = "glm", lambda = NA_real_,
             lambda_estimate = NA_real_,
             transform = sprintf("mean of %s by a %s GLM", model$yname,
                                 pwb_cmp_glm_label(model$family)),
             stringsAsFactors = FALSE, row.names = NULL)
}

# The print lines saying which kind each candidate is.
pwb_cmp_kind_lines <- function(kinds) {
  if (is.null(kinds) || !any(kinds$kind == "GLM")) return(character(0))
  tr <- kinds$candidate[kinds$kind == "transform"]
  out <- if (length(tr)) sprintf("Transform candidates: %s.", paste(tr, collapse = ", "))
  g <- kinds[kinds$kind == "GLM", , drop = FALSE]
  c(out, sprintf("GLM candidate %s: %s, interval: %s.", g$candidate, g$model, g$interval),
    paste0("A GLM models the mean, so its rmse, mae and r2 score its fitted mean, while a ",
           "transform candidate's back-transformed fit is a median; GLM intervals are plug-in ",
           "(the fitted mean's uncertainty is ignored)."))
}
