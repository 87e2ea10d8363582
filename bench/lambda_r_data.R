# Shared data for the R-level lambda benchmarks: lognormal y, 10 skewed predictors and a 5-level
# factor (n rows, seeded). Sourced by lambda_r_bench.R and lambda_r_memory.R.
pwb_bench_data <- function(n, seed = 1) {
  set.seed(seed)
  X <- matrix(rlnorm(n * 10, sdlog = 0.6), n, 10, dimnames = list(NULL, paste0("x", 1:10)))
  d <- as.data.frame(X)
  d$g <- factor(sample(letters[1:5], n, TRUE))
  eta <- 0.5 + drop(log(X) %*% seq(0.3, -0.3, length.out = 10)) + 0.2 * as.integer(d$g)
  d$y <- exp(eta + rnorm(n, sd = 0.5))
  d
}
pwb_bench_formula <- y ~ x1 + x2 + x3 + x4 + x5 + x6 + x7 + x8 + x9 + x10 + g
