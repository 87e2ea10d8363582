# Intervals for the original-scale mean: predict(interval = "confidence", center = "mean").
# Documented in predict.pwb_model (predict_model.R); numbers come from the core through
# pwb_model_predict_mean_interval.

# Checks the arguments, builds the design and the groups, calls the glue and formats the result:
# one row per row of `newdata`, or per group of `by`.
pwb_predict_mean_interval <- function(object, newdata, level, type, mean_method, mean_interval,
                                      R, seed, by, invalid, se.fit) {
  if (type == "transformed")
    stop(paste0("an interval for the original-scale mean needs type = \"response\"; on the ",
                "transformed scale use center = \"median\", whose confidence interval covers ",
                "the mean of the transformed response"), call. = FALSE)
  boot <- mean_interval == "bootstrap"
  if (!is.numeric(R) || length(R) != 1L || is.na(R) || R != round(R) || R < 10 || R > 1e7)
    stop("`R` (bootstrap replicates) must be a whole number from 10 to 1e7, e.g. 999",
         call. = FALSE)
  if (is.null(seed)) {
    # Drawn from R's own stream, so set.seed() makes the bootstrap reproducible too.
    seed <- if (boot) sample.int(.Machine$integer.max, 1L) else 1
  } else if (!is.numeric(seed) || length(seed) != 1L || is.na(seed) || seed != round(seed) ||
             seed < 0 || seed >= 2^53) {
    stop("`seed` must be NULL or one whole number from 0 to 2^53 - 1", call. = FALSE)
  }
  train <- is.null(newdata)
  nd <- if (train) pwb_frame_variables(object$frame) else newdata
  prep <- pwb_prepare_newdata(object, nd, invalid)
  groups <- if (is.null(by)) NULL else pwb_mean_groups(by, nd)
  res <- rpwb_model_mean_interval(pwb_handle(object), prep$X,
                                  if (is.null(groups)) NULL else groups$ids,
                                  if (is.null(groups)) 0L else nrow(groups$columns), level,
                                  match(mean_method, c("smearing", "normal")) - 1L,
                                  as.integer(boot), as.integer(R), as.numeric(seed))
  bounded <- bitwAnd(res$flags, 1L) > 0L
  if (is.null(groups)) {
    out <- data.frame(fit = res$fit, lwr = res$lwr, upr = res$upr, bounded = bounded,
                      invalid = rep(FALSE, length(res$fit)))
    out$invalid[prep$invalid_rows] <- TRUE
    se <- res$se
    if (train && inherits(object$na.action, "exclude")) {
      out <- pwb_pad_excluded(out, object$na.action)
      se <- stats::napredict(object$na.action, se)
    } else {
      out <- pwb_copy_row_names(out, nd)  # predict_model.R
    }
    names(se) <- row.names(out)
  } else {
    n_rows <- tabulate(groups$ids, nbins = nrow(groups$columns))
    out <- cbind(groups$columns,
                 data.frame(fit = res$fit, lwr = res$lwr, upr = res$upr, n = n_rows,
                            bounded = bounded))
    se <- res$se
  }
  if (!se.fit) return(out)
  list(fit = out, se.fit = se, df = object$df_residual, residual.scale = object$sigma)
}

# Group ids (1-based, in order of first appearance) and one row of group values per group.
# `by`: a character vector naming variables of `data`, or a factor (any non-character vector)
# or a list of vectors, with one value per row.
pwb_mean_groups <- function(by, data) {
  if (is.character(by)) {
    absent <- setdiff(by, names(data))
    if (length(absent))
      stop(sprintf("`by` names %s not in `newdata`; its variables are %s",
                   paste0("`", absent, "`", collapse = ", "),
                   paste0("`", names(data), "`", collapse = ", ")), call. = FALSE)
    vals <- data[by]
  } else if (is.list(by)) {
    vals <- as.data.frame(by, stringsAsFactors = FALSE, optional = TRUE)
    if (is.null(names(by)) || any(!nzchar(names(by))))
      names(vals) <- paste0("group", seq_along(by))
  } else if (is.atomic(by)) {
    vals <- data.frame(group = by, stringsAsFactors = FALSE)
  } else {
    stop("`by` must name variables of `newdata` or give one group value per row", call. = FALSE)
  }
  if (nrow(vals) != nrow(data))
    stop(sprintf("`by` has %d values but `newdata` has %d rows", nrow(vals), nrow(data)),
         call. = FALSE)
  if (nrow(vals) == 0L)
    return(list(ids = integer(), columns = vals))
  key <- do.call(paste, c(lapply(vals, as.character), sep = "\r"))
  first <- !duplicated(key)
  cols <- vals[first, , drop = FALSE]
  row.names(cols) <- NULL
  list(ids = match(key, key[first]), columns = cols)
}
