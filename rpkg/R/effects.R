#' Effects of a transformed linear model in original units
#'
#' Reads each predictor of a [lm_transformed()] model as an effect on the median of the
#' response in its own units, with confidence intervals.
#'
#' With the response modelled on a transformed scale, a coefficient is an effect on that scale.
#' Mapped back, the fit is the median of the response (not its mean), so every effect here is
#' an effect on the median:
#' * **log response** (log, log10 or Box-Cox with power 0, without shift or reflection): a
#'   predictor change multiplies the median by the same factor whatever the other variables
#'   are, so the table gives the percent change `100 * (exp(b) - 1)` per unit of an
#'   untransformed predictor, per level of a factor (against its reference level), per unit of
#'   `log(x)` for a log-transformed predictor, with the interval endpoints of `b` mapped the same
#'   way. For a log-log pair it adds the elasticity (the percent change of the median per
#'   percent change of the predictor, equal to the coefficient for natural logs).
#' * **other powers**: the effect depends on where it is taken, so the table gives the change
#'   in the median between two values of each predictor (by default its lower and upper
#'   quartiles in the data; each level against the reference level for factors) with the other
#'   variables at their medians and reference levels, and a delta-method interval.
#' A predictor transformed by anything but a log has no constant per-unit effect under a log
#' response either; it gets the percent change between its two values.
#'
#' The numbers are computed by the library: percent changes and elasticities from the
#' coefficients and their t intervals (residual degrees of freedom), changes in the median from
#' the two design rows with a delta-method standard error. A transform changes what the model
#' estimates; these effects describe the median, and they inform rather than replace the
#' judgement of the field.
#'
#' @param model a `pwb_model` from [lm_transformed()].
#' @param values a named list giving, for numeric predictors, the two values to compare
#'   (`list(flow = c(10, 20))`); the default is each predictor's quartiles.
#' @param at a named list of values at which the other variables are held (default: medians of
#'   numeric variables, reference levels of factors).
#' @param per `"auto"` (default) or `"unit"`: with `"unit"` every numeric predictor gets its
#'   effect per unit (from its held value to one more), which is only defined for untransformed
#'   predictors.
#' @param level confidence level of the intervals.
#' @param x a `pwb_effects` table.
#' @param format `"plain"` (default) or `"markdown"` (a table ready for a report).
#' @param digits significant digits shown.
#' @param ... unused.
#' @return A data frame of class `pwb_effects` with one row per effect: `term`, `effect` (what
#'   is compared), `measure` (`"percent"`, `"elasticity"` or `"change"`, the last in the
#'   response's units), `estimate`, `se`, `lower`, `upper`, and for changes the medians
#'   `median_from`, `median_to`. `format()` gives the printed lines (`format = "markdown"`: a
#'   Markdown table); `print()` adds a header and the values the other variables are held at.
#' @examples
#' m <- lm_transformed(Volume ~ Girth + Height, trees, response = new_transform("log"),
#'                     predictors = list(Girth = new_transform("log"),
#'                                       Height = new_transform("log")))
#' effect_table(m)
#' print(effect_table(m), format = "markdown")
#' m2 <- lm_transformed(Volume ~ Girth + Height, trees,
#'                      response = new_transform("box-cox", lambda = 0.5))
#' effect_table(m2, values = list(Girth = c(10, 15)))
#' @export
effect_table <- function(model, values = NULL, at = NULL, per = c("auto", "unit"),
                         level = 0.95, ...) {
  if (!inherits(model, "pwb_model"))
    stop("`model` must be a pwb_model from lm_transformed()", call. = FALSE)
  per <- pwb_match_choice(per, "per")
  pwb_check_level(level)
  pwb_check_named_list(values, "values")
  pwb_check_named_list(at, "at")
  unknown <- setdiff(c(names(values), names(at)), model$xvars)
  if (length(unknown))
    stop(sprintf("%s not among the model's predictors (%s)",
                 paste0("`", unknown, "`", collapse = ", "),
                 paste0("`", model$xvars, "`", collapse = ", ")), call. = FALSE)
  xlev <- model$xlevels
  base <- pwb_effect_base(model, at)
  log_resp <- pwb_log_type(model$response)
  mm <- stats::model.matrix(model)
  intercept <- ncol(mm) > 0L && colnames(mm)[1L] == "(Intercept)"
  rows_of <- function(v, a, b) {
    nd <- base[rep(1L, 2L), , drop = FALSE]
    nd[[v]] <- if (v %in% names(xlev)) factor(c(a, b), levels = xlev[[v]]) else c(a, b)
    X <- pwb_prepare_newdata(model, nd, "error")$X
    if (intercept) X <- cbind(1, X)
    X
  }
  spec <- list()  # one entry per effect: term, effect text, measure, and what to compute
  for (v in model$xvars) {
    tr <- model$predictors[[v]]
    if (v %in% names(xlev)) {
      ref <- xlev[[v]][1L]
      for (lv in xlev[[v]][-1L]) {
        R <- rows_of(v, ref, lv)
        spec[[length(spec) + 1L]] <- list(term = paste0(v, lv), effect = sprintf("%s vs %s", lv, ref),
                                          rows = R, measure = if (log_resp) "percent" else "change")
      }
      next
    }
    if (!is.numeric(base[[v]])) next
    linear <- is.null(tr) || identical(tr$family, "identity") && tr$shift == 0 && !isTRUE(tr$reflect)
    if (per == "unit" && !linear)
      stop(sprintf(paste0("`%s` enters the model as %s, so its effect per unit of %s depends on ",
                          "where the unit is taken; pass the two values to compare, e.g. ",
                          "values = list(%s = c(%s, %s)), or use per = \"auto\""),
                   v, pwb_transform_label(tr, v), v, v,
                   format(signif(stats::quantile(model$data[[v]], 0.25, na.rm = TRUE), 3)),
                   format(signif(stats::quantile(model$data[[v]], 0.75, na.rm = TRUE), 3))),
           call. = FALSE)
    x0 <- base[[v]]
    if (!is.null(values[[v]])) {
      ab <- values[[v]]
      if (!is.numeric(ab) || length(ab) != 2L || anyNA(ab))
        stop(sprintf("`values$%s` must be two numbers (from, to)", v), call. = FALSE)
    } else if (per == "unit" || (log_resp && linear)) {
      ab <- c(x0, x0 + 1)
    } else if (log_resp && pwb_log_type(tr)) {
      ab <- c(x0, x0 * if (identical(tr$family, "log10")) 10 else exp(1))
    } else {
      ab <- unname(stats::quantile(model$data[[v]], c(0.25, 0.75), na.rm = TRUE))
    }
    R <- rows_of(v, ab[1L], ab[2L])
    per_unit_log <- log_resp && is.null(values[[v]]) && per == "auto" && !linear && pwb_log_type(tr)
    text <- if (is.null(values[[v]]) && (per == "unit" || (log_resp && linear))) "per unit" else
      if (per_unit_log) sprintf("per unit of %s(%s)", tr$family, v) else
        sprintf("from %s to %s", format(signif(ab[1L], 4)), format(signif(ab[2L], 4)))
    spec[[length(spec) + 1L]] <- list(term = v, effect = text, rows = R,
                                      measure = if (log_resp) "percent" else "change")
    if (per_unit_log) {
      j <- pwb_unit_column(R[2L, ] - R[1L, ])
      if (!is.na(j))
        spec[[length(spec) + 1L]] <- list(term = v, effect = sprintf("%% per %% of %s", v),
                                          column = j - 1L, transform = unclass(tr),
                                          measure = "elasticity")
    }
  }
  if (!length(spec)) stop("the model has no predictors to report effects for", call. = FALSE)
  meas <- vapply(spec, `[[`, "", "measure")
  k <- ncol(mm)
  pick <- function(m) spec[meas == m]
  contr <- pwb_stack(lapply(pick("percent"), function(s) s$rows[2L, ] - s$rows[1L, ]), k)
  r0 <- pwb_stack(lapply(pick("change"), function(s) s$rows[1L, ]), k)
  r1 <- pwb_stack(lapply(pick("change"), function(s) s$rows[2L, ]), k)
  el <- pick("elasticity")
  res <- rpwb_model_effects(pwb_handle(model), level, contr, as.integer(vapply(el, `[[`, 0L, "column")),
                            lapply(el, `[[`, "transform"), r0, r1)
  vals <- matrix(NA_real_, length(spec), 6L)
  vals[meas == "percent", ] <- res$percent
  vals[meas == "elasticity", ] <- res$elasticity
  vals[meas == "change", ] <- res$change
  out <- data.frame(term = vapply(spec, `[[`, "", "term"), effect = vapply(spec, `[[`, "", "effect"),
                    measure = meas, estimate = vals[, 1L], se = vals[, 2L], lower = vals[, 3L],
                    upper = vals[, 4L], median_from = vals[, 5L], median_to = vals[, 6L],
                    stringsAsFactors = FALSE)
  held <- vapply(names(base), function(v) format(base[[v]][1L], digits = 4), "")
  structure(out, class = c("pwb_effects", "data.frame"), level = level,
            response = pwb_transform_label(model$response, model$yname), held = held)
}

# One row of held values: medians of numeric variables, reference levels of factors, or `at`.
pwb_effect_base <- function(model, at) {
  xlev <- model$xlevels
  base <- lapply(model$xvars, function(v) {
    if (!is.null(at[[v]])) return(at[[v]][1L])
    if (v %in% names(xlev)) return(factor(xlev[[v]][1L], levels = xlev[[v]]))
    x <- model$data[[v]]
    if (is.numeric(x)) stats::median(x, na.rm = TRUE) else x[!is.na(x)][1L]
  })
  names(base) <- model$xvars
  as.data.frame(base, stringsAsFactors = FALSE, optional = TRUE)
}

pwb_log_type <- function(tr) {
  !is.null(tr) && (tr$family %in% c("log", "log10") ||
                     (identical(tr$family, "box-cox") && isTRUE(tr$lambda == 0))) &&
    tr$shift == 0 && !isTRUE(tr$reflect)
}


# The design column a contrast moves by one, alone (NA when it moves several).
pwb_unit_column <- function(d) {
  j <- which(abs(d) > 1e-8)
  if (length(j) == 1L && abs(d[j] - 1) < 1e-8) j else NA_integer_
}

pwb_stack <- function(rows, k) {
  if (!length(rows)) return(matrix(0, 0L, k))
  do.call(rbind, rows)
}

#' @rdname effect_table
#' @export
format.pwb_effects <- function(x, format = c("plain", "markdown"), digits = 3, ...) {
  format <- pwb_match_choice(format, "format")
  num <- function(v) vapply(v, function(u) if (is.na(u)) "NA" else format(signif(u, digits)), "")
  unit <- ifelse(x$measure == "percent", "%", "")
  tab <- data.frame(term = x$term, effect = x$effect,
                    measure = c(percent = "%", elasticity = "elast.", change = "change")[x$measure],
                    estimate = paste0(num(x$estimate), unit),
                    interval = paste0("[", num(x$lower), ", ", num(x$upper), "]"),
                    stringsAsFactors = FALSE)
  names(tab)[5L] <- sprintf("%g%% interval", 100 * attr(x, "level"))
  if (format == "markdown") {
    esc <- function(s) gsub("|", "\\|", s, fixed = TRUE)
    lines <- c(paste0("| ", paste(names(tab), collapse = " | "), " |"),
               paste0("|", paste(rep("---", ncol(tab)), collapse = "|"), "|"))
    for (i in seq_len(nrow(tab))) lines <- c(lines, paste0("| ", paste(esc(unlist(tab[i, ])), collapse = " | "), " |"))
    return(lines)
  }
  tab$term <- substr(tab$term, 1L, 14L)
  tab$effect <- substr(tab$effect, 1L, 24L)
  utils::capture.output(print(tab, row.names = FALSE, right = FALSE))
}

#' @rdname effect_table
#' @export
print.pwb_effects <- function(x, format = c("plain", "markdown"), digits = 3, ...) {
  format <- pwb_match_choice(format, "format")
  width <- min(getOption("width"), 80L)
  cat(strwrap(sprintf("Effects on the median of the response (model on %s):", attr(x, "response")),
              width = width), sep = "\n")
  if (format == "markdown") cat("\n")
  cat(format.pwb_effects(x, format = format, digits = digits), sep = "\n")
  held <- attr(x, "held")
  notes <- c(sprintf("Other variables held at: %s.", paste(names(held), held, sep = " = ", collapse = ", ")),
             "Effects are on the median; a back-transformed mean needs a correction.")
  cat("\n")
  cat(strwrap(notes, width = width), sep = "\n")
  invisible(x)
}
