# Shared data for the comparison and growth benchmarks (compare_bench.R, compare_fixed_bench.R,
# growth_bench.R): lognormal y, p lognormal predictors and a 5-level factor f (n rows, seeded).
sim <- function(n, p = 10, seed = 1) {
  set.seed(seed)
  X <- matrix(stats::rlnorm(n * p, 0, 0.6), n, p, dimnames = list(NULL, paste0("x", 1:p)))
  d <- as.data.frame(X)
  d$f <- factor(sample(letters[1:5], n, TRUE))
  d$y <- exp(0.5 + drop(log(X) %*% rep(0.1, p)) + 0.1 * as.integer(d$f) +
               stats::rnorm(n, sd = 0.4))
  d
}
