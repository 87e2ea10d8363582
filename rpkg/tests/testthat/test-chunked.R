# Chunked summaries and the driver against the one-pass functions on the same rows.

chunked_data <- function(n = 6000, seed = 11) {
  set.seed(seed)
  d <- data.frame(x1 = rnorm(n), x2 = runif(n, 1, 5),
                  site = factor(sample(c("a", "b", "c"), n, TRUE), levels = c("a", "b", "c")))
  d$y <- (3 + 0.5 * d$x1 + 0.3 * log(d$x2) + c(a = 0, b = 0.4, c = -0.3)[as.character(d$site)] +
          0.4 * rnorm(n))^2
  d$w <- ifelse(seq_len(n) %% 7 == 0, 0, 0.5 + (seq_len(n) %% 3))
  d
}

test_that("merged lambda summaries equal estimate_response_lambda", {
  d <- chunked_data()
  f <- y ~ x1 + log(x2) + site
  des <- chunk_design(f, d[1:500, ])
  parts <- split(d, rep(1:5, times = c(1, 1999, 0, 3000, 1000))[seq_len(nrow(d))])
  s <- do.call(c, lapply(names(parts), function(k) lambda_summary(des, parts[[k]], chunk = k)))
  lam <- finish_lambda(s)
  one <- estimate_response_lambda(f, d)
  expect_s3_class(lam, "pwb_lambda")
  # The documented contract: 1e-7 in lambda-hat, 1e-9 at the interval's ends.
  expect_lt(abs(lam$lambda - one$lambda), 1e-7)
  expect_lt(max(abs(lam$conf_int - one$conf_int)), 1e-9)
  expect_equal(lam$loglik, one$loglik, tolerance = 1e-10)
  expect_equal(lam$n, nrow(d))
  expect_equal(lam$convenient, one$convenient)
  expect_equal(nrow(lam$profile), 101L)
  # Summaries are plain R data: a trip through serialize() changes nothing.
  s2 <- unserialize(serialize(s, NULL))
  expect_identical(finish_lambda(s2)$lambda, lam$lambda)
})

test_that("a chunked fit equals lm_transformed and residual_checks", {
  d <- chunked_data()
  f <- y ~ x1 + log(x2) + site
  parts <- split(d, rep(1:4, length.out = nrow(d)))
  cf <- fit_chunked(f, parts)
  m <- lm_transformed(f, d)
  expect_s3_class(cf, "pwb_chunked_fit")
  expect_equal(cf$lambda$convenient, m$response_lambda$convenient)
  # Householder QRs of the same rows in other blocks: 1e-9 relative.
  expect_equal(coef(cf), coef(m), tolerance = 1e-9)
  expect_equal(unname(cf$se), unname(m$se), tolerance = 1e-9)
  expect_equal(sigma(cf), m$sigma, tolerance = 1e-9)
  expect_equal(as.numeric(logLik(cf)), as.numeric(logLik(m)), tolerance = 1e-9)
  expect_equal(attr(logLik(cf), "df"), attr(logLik(m), "df"))
  # vcov against base R's vcov.lm of the transformed fit.
  expect_equal(unname(vcov(cf)), unname(stats::vcov(m$lm)), tolerance = 1e-8)
  ck <- residual_checks(m)
  expect_equal(cf$checks$breusch_pagan$statistic, ck$breusch_pagan$statistic, tolerance = 1e-8)
  expect_equal(cf$checks$reset$statistic, ck$reset$statistic, tolerance = 1e-8)
  expect_equal(cf$checks$skewness, ck$skewness, tolerance = 1e-8)
  # Predictions: medians and intervals as predict.pwb_model; smearing means from binned sums
  # (quadratic per bin of width sigma/128: relative error below 1e-8).
  nd <- d[c(3, 50, 700), ]
  for (iv in c("confidence", "prediction")) {
    got <- predict(cf, nd, interval = iv)
    want <- predict(m, nd, interval = iv)
    expect_equal(got$fit, want$fit, tolerance = 1e-9)
    expect_equal(got$lwr, want$lwr, tolerance = 1e-9)
    expect_equal(got$upr, want$upr, tolerance = 1e-9)
  }
  expect_equal(predict(cf, nd, center = "mean")$fit, predict(m, nd, center = "mean")$fit, tolerance = 1e-8)
  expect_output(print(cf), "pwb_chunked_fit")
})

test_that("the driver on a 2-worker PSOCK cluster gives the one-pass answers", {
  skip_on_cran()
  cl <- tryCatch(parallel::makePSOCKcluster(2L), error = function(e) NULL)
  if (is.null(cl)) skip("PSOCK workers cannot start here")
  on.exit(parallel::stopCluster(cl), add = TRUE)
  d <- chunked_data(4000, 12)
  dir <- tempfile("chunks")
  dir.create(dir)
  on.exit(unlink(dir, recursive = TRUE), add = TRUE)
  files <- file.path(dir, sprintf("part%d.csv", 1:4))
  rows <- split(seq_len(nrow(d)), rep(1:4, each = 1000))
  for (i in 1:4) utils::write.csv(d[rows[[i]], ], files[i], row.names = FALSE)
  reader <- function(path) {
    x <- utils::read.csv(path)
    x$site <- factor(x$site, levels = c("a", "b", "c"))
    x
  }
  f <- y ~ x1 + log(x2) + site
  cf <- fit_chunked(f, files, reader = reader, cl = cl, weights = "w")
  # write.csv keeps 15 significant digits: compare with the data as read back.
  back <- do.call(rbind, lapply(files, reader))
  one <- estimate_response_lambda(f, back)
  expect_equal(cf$n, sum(back$w > 0))
  expect_true(abs(cf$lambda$lambda - one$lambda) < 0.2)  # weighted vs unweighted: close, not equal
  # The weighted fit against base R's weighted lm on the transformed response.
  z <- apply_transform(cf$response, back$y)
  wl <- stats::lm(z ~ x1 + log(x2) + site, data = back, weights = w)
  expect_equal(unname(coef(cf)), unname(coef(wl)), tolerance = 1e-9)
  expect_equal(sigma(cf), stats::sigma(wl), tolerance = 1e-9)
  # logLik.lm (weighted) plus the Jacobian sum of log|T'(y)| over the rows with w > 0.
  jac <- sum(log(abs(back$y[back$w > 0]^(cf$response$lambda - 1))))
  expect_equal(as.numeric(logLik(cf)), as.numeric(stats::logLik(wl)) + jac, tolerance = 1e-9)
  # Unweighted over the cluster: the same as one pass.
  cu <- fit_chunked(f, files, reader = reader, cl = cl)
  expect_lt(abs(cu$lambda$lambda - one$lambda), 1e-7)
  expect_equal(coef(cu), coef(lm_transformed(f, back)), tolerance = 1e-9)
})

test_that("a level outside the design's set names the level and the chunk", {
  d <- chunked_data(600)
  des <- chunk_design(y ~ x1 + site, droplevels(d[d$site != "c", ]))
  expect_error(lambda_summary(des, d, chunk = "part7.csv"),
               "chunk part7.csv: `site` has level \"c\" not in the design's set")
  des2 <- chunk_design(y ~ x1 + site, droplevels(d[d$site == "a", ]), levels = list(site = c("a", "b", "c")))
  expect_equal(des2$coef_names, c("(Intercept)", "x1", "siteb", "sitec"))
  expect_error(chunk_design(y ~ x1 + site, d, levels = list(site = c("a", "b"))), "misses \"c\"")
  expect_error(chunk_design(y ~ x1, d, levels = list(x9 = "a")), "`x9`")
  bad <- d
  bad$y[c(5, 9)] <- -1
  expect_error(lambda_summary(chunk_design(y ~ x1, d), bad, chunk = "3"),
               "chunk 3: Box-Cox needs y > 0; 2 values <= 0 at rows 5, 9")
})

test_that("data-dependent terms keep the first chunk's constants", {
  d <- chunked_data(3000, 13)
  f <- y ~ poly(x1, 2) + scale(x2)
  des <- chunk_design(f, d)
  parts <- split(d, rep(1:3, length.out = nrow(d)))
  s <- do.call(c, lapply(parts, function(p) fit_summary(des, p)))
  fit <- finish_fit(s)
  # poly() and scale() evaluated once on all rows: base R's lm on the same data.
  expect_equal(unname(coef(fit)), unname(coef(stats::lm(f, d))), tolerance = 1e-9)
})

test_that("corrupted or mismatched summaries are clear errors", {
  d <- chunked_data(800)
  des <- chunk_design(y ~ x1, d)
  s <- lambda_summary(des, d)
  cut <- s
  cut$bytes <- cut$bytes[-length(cut$bytes)]
  expect_error(finish_lambda(cut), "checksum|truncated")
  flip <- s
  flip$bytes[40] <- as.raw(bitwXor(as.integer(flip$bytes[40]), 4L))
  expect_error(finish_lambda(flip), "cannot read a lambda summary")
  expect_error(c(s, fit_summary(des, d)), "different kinds")
  expect_error(c(s, lambda_summary(chunk_design(y ~ x2, d), d)), "different designs")
  expect_error(finish_fit(s), "pwb_fit_summary")
})

test_that("a range beyond the bins takes grid passes and matches one pass", {
  d <- chunked_data(3000, 14)
  f <- y ~ x1
  cf <- fit_chunked(f, split(d, rep(1:2, length.out = nrow(d))), range = c(-6, 6))
  one <- estimate_response_lambda(f, d, range = c(-6, 6))
  expect_true(cf$lambda$from_grid)
  # The fallback's documented accuracy: about 1e-6.
  expect_lt(abs(cf$lambda$lambda - one$lambda), 2e-6)
  expect_lt(max(abs(cf$lambda$conf_int - one$conf_int)), 2e-6)
})

test_that("Yeo-Johnson responses of both signs, and a fixed transform, match one pass", {
  set.seed(15)
  d <- data.frame(x = rnorm(2500), g = factor(sample(c("u", "v"), 2500, TRUE)))
  d$y <- 1.5 * d$x + (d$g == "v") + rnorm(2500)
  f <- y ~ x + g
  # Chunks sorted by y: most hold values of one sign only.
  parts <- split(d[order(d$y), ], rep(1:5, each = 500))
  cf <- fit_chunked(f, parts, family = "yeo-johnson", levels = list(g = c("u", "v")))
  one <- estimate_response_lambda(f, d, family = "yeo-johnson")
  expect_lt(abs(cf$lambda$lambda - one$lambda), 1e-7)
  expect_lt(max(abs(cf$lambda$conf_int - one$conf_int)), 1e-9)
  m <- lm_transformed(f, d, family = "yeo-johnson")
  expect_equal(coef(cf), coef(m), tolerance = 1e-9)
  expect_equal(as.numeric(logLik(cf)), as.numeric(logLik(m)), tolerance = 1e-9)
  # A fixed transform: no lambda pass; base R's lm on the transformed response.
  tr <- new_transform("yeo-johnson", lambda = 0.8)
  cfix <- fit_chunked(f, parts, response = tr)
  expect_null(cfix$lambda)
  z <- apply_transform(tr, d$y)
  expect_equal(unname(coef(cfix)), unname(coef(stats::lm(z ~ x + g, data = d))), tolerance = 1e-9)
})
