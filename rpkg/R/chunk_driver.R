# The whole chunked job: passes over the chunks (on a parallel cluster when given), merges on
# the calling session.

#' Estimate the response power, fit and check a model over chunks of data
#'
#' Runs the work of [estimate_response_lambda()], [lm_transformed()] and [residual_checks()] over
#' data that do not fit in one R session: a list of data frames, or of anything a `reader`
#' function turns into one (file paths, database queries). Each pass maps the chunks to small
#' summaries (see [chunk_summaries]) and merges them here; with a `parallel` cluster (`cl`, e.g.
#' from `parallel::makePSOCKcluster()`, possibly spanning several hosts) the chunks are read and
#' summarised on its workers, so only summaries travel.
#'
#' The passes: (1) the response power (when `response = "estimate"`), plus one or two grid passes
#' when the binned sums cannot serve the whole range; (2) the fit at the chosen transform (the
#' convenient power, as [lm_transformed()] chooses it); (3) the residual checks and the residual
#' sums for smearing means. Every chunk is therefore read two to four times; a `reader` should
#' return the same rows each time.
#'
#' Predictors enter as the formula writes them (e.g. `log(flow)`); only the response is
#' transformed. A transform changes what the model estimates, a back-transformed fit is a median
#' (use `center = "mean"` in [predict.pwb_chunked_fit()] for means), and the results inform rather
#' than replace domain standards and judgement.
#'
#' @param formula a two-sided formula, the response a column name.
#' @param chunks a list of data frames, or a vector or list of anything `reader` reads (e.g. file
#'   paths).
#' @param reader `NULL` when `chunks` holds data frames, else a function of one chunk returning
#'   a data frame (e.g. `function(path) read.csv(path)`); it runs on the cluster's workers.
#' @param family `"box-cox"` or `"yeo-johnson"`.
#' @param response `"estimate"` (the ML power, then its convenient value), `"none"`, or a
#'   `pwb_transform`.
#' @param weights optional name of a column of precision weights.
#' @param levels optional named list of complete factor level sets (see [chunk_design()]); other
#'   levels are taken from the first chunk.
#' @param range,level the lambda search range and the interval's level.
#' @param cl optional cluster from the `parallel` package; the workers need powerback
#'   installed (the calling session's library paths are passed on).
#' @param design optional `pwb_chunk_design`, instead of one built from the first chunk.
#' @return A `pwb_chunked_fit` (see [predict.pwb_chunked_fit()]) with `$lambda` (a `pwb_lambda`,
#'   or `NULL` when the response was not estimated) and `$checks` (a `pwb_checks`).
#' @examples
#' river <- river_data()
#' parts <- split(river, rep(1:4, length.out = nrow(river)))
#' f <- fit_chunked(sediment_t_day ~ log(flow_m3s) + rain72_mm + season, parts)
#' f
#' predict(f, head(river), interval = "prediction")
#' \donttest{
#' cl <- parallel::makePSOCKcluster(2)
#' f2 <- fit_chunked(sediment_t_day ~ log(flow_m3s) + rain72_mm + season, parts, cl = cl)
#' parallel::stopCluster(cl)
#' all.equal(coef(f), coef(f2))
#' }
#' @export
fit_chunked <- function(formula, chunks, reader = NULL, family = c("box-cox", "yeo-johnson"),
                        response = "estimate", weights = NULL, levels = NULL, range = c(-3, 3),
                        level = 0.95, cl = NULL, design = NULL) {
  family <- pwb_match_choice(family, "family")
  pwb_lambda_check_args(range, level)
  if (!is.list(chunks) && !is.atomic(chunks)) stop("`chunks` must be a list or a vector", call. = FALSE)
  if (is.data.frame(chunks)) chunks <- list(chunks)
  if (!length(chunks)) stop("`chunks` is empty", call. = FALSE)
  if (!is.null(reader) && !is.function(reader)) stop("`reader` must be a function or NULL", call. = FALSE)
  if (is.null(reader) && !all(vapply(chunks, is.data.frame, logical(1))))
    stop("`chunks` must be data frames, or give a `reader` that turns each chunk into one", call. = FALSE)
  if (!is.null(cl) && !inherits(cl, "cluster")) stop("`cl` must be a cluster from the parallel package", call. = FALSE)
  labels <- pwb_chunk_labels(chunks)
  if (is.null(design)) {
    first <- if (is.null(reader)) chunks[[1L]] else reader(chunks[[1L]])
    design <- chunk_design(formula, first, levels = levels, weights = weights)
  }
  pwb_check_design(design)
  if (!is.null(cl)) pwb_cluster_setup(cl)
  jobs <- lapply(seq_along(chunks), function(i) list(chunk = chunks[[i]], label = labels[[i]]))
  run <- function(task, args) {
    parts <- pwb_chunk_map(jobs, task, reader, design, args, cl)
    merge_summaries(parts)
  }
  lam <- NULL
  if (identical(response, "estimate")) {
    s <- run("lambda", list(family = family))
    lam <- finish_lambda(s, range, level)
    for (k in 1:3) {
      if (!isTRUE(lam$needs_pass)) break
      pass <- run("grid", list(summary = s, grid = lam$pass_grid))
      lam <- finish_lambda(s, range, level, pass = pass)
    }
    if (isTRUE(lam$needs_pass)) stop("the grid passes did not settle the estimate", call. = FALSE)
    response <- lam
  }
  fit_s <- run("fit", list(response = response))
  out <- finish_fit(fit_s)
  checks <- run("checks", list(fit = fit_s))
  out$checks <- finish_checks(checks)
  out$smearing <- checks$bytes
  out$lambda <- lam
  out$call <- match.call()
  out$chunks <- length(chunks)
  out
}

pwb_chunk_labels <- function(chunks) {
  nm <- names(chunks)
  lab <- if (is.character(chunks)) basename(chunks) else as.character(seq_along(chunks))
  if (!is.null(nm)) lab[nzchar(nm)] <- nm[nzchar(nm)]
  as.list(lab)
}

# The workers find powerback where this session does.
pwb_cluster_setup <- function(cl) {
  setup <- function(paths) {
    .libPaths(unique(c(paths, .libPaths())))
    requireNamespace("powerback", quietly = TRUE)
  }
  environment(setup) <- globalenv()
  ok <- unlist(parallel::clusterCall(cl, setup, .libPaths()))
  if (!all(ok)) stop("powerback cannot be loaded on every worker of `cl`: install it there", call. = FALSE)
}

pwb_chunk_map <- function(jobs, task, reader, design, args, cl) {
  if (is.null(cl)) return(lapply(jobs, pwb_chunk_task, task = task, reader = reader, design = design, args = args))
  parallel::parLapply(cl, jobs, pwb_chunk_task, task = task, reader = reader, design = design, args = args)
}

# One chunk's summary for one pass; runs on a worker when there is a cluster.
pwb_chunk_task <- function(job, task, reader, design, args) {
  data <- if (is.null(reader)) job$chunk else reader(job$chunk)
  switch(task,
         lambda = lambda_summary(design, data, args$family, chunk = job$label),
         grid = lambda_grid_summary(args$summary, data, args$grid, chunk = job$label),
         fit = fit_summary(design, data, args$response, chunk = job$label),
         checks = checks_summary(args$fit, data, chunk = job$label))
}
