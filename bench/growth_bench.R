# Growth of every R entry point's time with n: each call timed at n = 1e4, 1e5, 1e6 (or the
# sizes given) on the same kind of data, and the growth exponent fitted as the slope of log time
# on log n. Not part of the tests.
#   R_LIBS=<lib with powerback> Rscript bench/growth_bench.R [n ...]   (default 1e4 1e5 1e6)
#   PWB_GROWTH_SKIP="compare_transforms,..."  leaves named entry points out.
# Data: lognormal y, 10 lognormal predictors and a 5-level factor (as compare_bench.R). Times
# are this process's CPU seconds (user + system; the machine may be shared, so elapsed time
# would count other programs' turns), the fastest of 3 runs below 1e6 and one run at 1e6.
# predict() takes 1000 new rows whatever n is (its time should not grow at all); the smearing
# row predicts all n training rows with a Box-Cox 0.25 response (the residual-tree path), so
# there n_new = n_train = n. Calls faster than the clock's millisecond are repeated 20 times.
suppressPackageStartupMessages(library(powerback))
args <- commandArgs(trailingOnly = TRUE)
ns <- if (length(args)) as.numeric(args) else c(1e4, 1e5, 1e6)
skip <- strsplit(Sys.getenv("PWB_GROWTH_SKIP"), ",", fixed = TRUE)[[1L]]

here <- dirname(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE)[1L]))
source(file.path(here, "compare_data.R"))
cpu <- function(f) {
  gc()
  t0 <- proc.time()
  f()
  t1 <- proc.time() - t0
  t1[["user.self"]] + t1[["sys.self"]]
}
fml <- stats::reformulate(c(paste0("x", 1:10), "f"), "y")
fixed_p <- list(x1 = new_transform("log"), x2 = new_transform("log"))
nd <- sim(1000, seed = 2)

calls <- list(
  estimate_response_lambda = function(d, m) estimate_response_lambda(fml, d),
  lm_transformed_estimate = function(d, m) lm_transformed(fml, d),
  lm_transformed_fixed = function(d, m) lm_transformed(fml, d, response = new_transform("log"),
                                                       predictors = fixed_p),
  predict_1000_median_pi = function(d, m) predict(m$est, nd, interval = "prediction"),
  predict_1000_mean_pi = function(d, m) predict(m$est, nd, interval = "prediction",
                                                center = "mean"),
  smearing_n_by_n = function(d, m) predict(m$bc, d, center = "mean", mean_method = "smearing"),
  lambda_influence = function(d, m) lambda_influence(fml, d),
  compare_transforms = function(d, m) compare_transforms(fml, d, folds = 5, seed = 1,
                                                         progress = FALSE),
  box_tidwell = function(d, m) box_tidwell(fml, d),
  residual_checks = function(d, m) residual_checks(m$est),
  screen_skew = function(d, m) screen_skew(d)
)
calls <- calls[setdiff(names(calls), skip)]
# calls too quick for the clock's millisecond are repeated and their mean taken
inner <- c(predict_1000_median_pi = 20L, predict_1000_mean_pi = 20L)

tab <- matrix(NA_real_, length(calls), length(ns), dimnames = list(names(calls), format(ns)))
for (j in seq_along(ns)) {
  d <- sim(ns[j])
  models <- list(est = lm_transformed(fml, d),
                 bc = lm_transformed(fml, d, response = new_transform("box-cox", lambda = 0.25)))
  reps <- if (ns[j] >= 1e6) 1L else 3L
  for (nm in names(calls)) {
    k <- if (nm %in% names(inner)) inner[[nm]] else 1L
    one <- function() for (i in seq_len(k)) calls[[nm]](d, models)
    tab[nm, j] <- min(vapply(seq_len(reps), function(i) cpu(one), numeric(1))) / k
    cat(sprintf("n = %g  %-26s %9.3f s\n", ns[j], nm, tab[nm, j]))
  }
  rm(d, models)
}
slope <- function(t) unname(stats::coef(stats::lm(log(t) ~ log(ns)))[2L])
out <- data.frame(entry_point = rownames(tab), tab, check.names = FALSE,
                  exponent = apply(tab, 1L, function(t) round(slope(pmax(t, 1e-3)), 2)))
rownames(out) <- NULL
cat("\nCPU seconds and growth exponent (slope of log time on log n; target <= 1.15):\n")
print(out, row.names = FALSE)
