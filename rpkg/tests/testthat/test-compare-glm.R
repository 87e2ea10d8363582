# GLM candidates in compare_transforms(): fitted per training part, scored in the same folds.

sim_glm <- function(n, seed) {
  set.seed(seed)
  d <- data.frame(x = runif(n, 1, 10), g = factor(rep(c("a", "b", "c"), length.out = n)))
  mu <- exp(0.3 + 0.15 * d$x + c(0, 0.3, -0.2)[as.integer(d$g)])
  d$y <- rgamma(n, shape = 4, rate = 4 / mu)
  d
}

test_that("GLM held-out predictions equal predict.glm fitted by hand on each training fold", {
  d <- sim_glm(90, 1)
  cands <- list("none", gamma_log = Gamma(link = "log"), qp_log = quasipoisson(link = "log"),
                gauss_log = gaussian(link = "log"))
  cmp <- compare_transforms(y ~ x + g, d, candidates = cands, folds = 3, seed = 5,
                            progress = FALSE)
  expect_equal(nrow(cmp$failures), 0L)
  for (k in 1:3) {
    test <- cmp$fold_ids[, 1] == k
    tr <- d[!test, ]
    te <- d[test, ]
    for (nm in c("gamma_log", "qp_log", "gauss_log")) {
      # base R glm() and predict.glm(type = "response") on the training fold
      fit <- glm(y ~ x + g, family = cands[[nm]], data = tr)
      by_hand <- unname(predict(fit, te, type = "response"))
      p <- cmp$predictions[cmp$predictions$candidate == nm & cmp$predictions$fold == k, ]
      # glm.fit runs the same IRLS iterations from the same start as glm(): agreement to
      # ~1e-14, so 1e-10 leaves room for a different BLAS
      expect_equal(p$fit_mean, by_hand, tolerance = 1e-10)
      expect_equal(p$fit_median, by_hand, tolerance = 1e-10)
      row <- cmp$folds[cmp$folds$candidate == nm & cmp$folds$fold == k, ]
      # scores of predictions equal to 1e-10: equal to 1e-9
      expect_equal(row$rmse_median, sqrt(mean((te$y - by_hand)^2)), tolerance = 1e-9)
      expect_equal(row$r2_mean, 1 - sum((te$y - by_hand)^2) / sum((te$y - mean(te$y))^2),
                   tolerance = 1e-9)
      if (nm == "gamma_log") {
        # plug-in Gamma interval: shape 1/dispersion with summary.glm()'s dispersion, base R
        # qgamma()
        shape <- 1 / summary(fit)$dispersion
        lwr <- qgamma(0.025, shape = shape, rate = shape / by_hand)
        upr <- qgamma(0.975, shape = shape, rate = shape / by_hand)
        expect_equal(p$lwr, lwr, tolerance = 1e-10)
        expect_equal(p$upr, upr, tolerance = 1e-10)
        expect_equal(row$coverage, mean(te$y >= lwr & te$y <= upr))
      }
      if (nm == "gauss_log") {
        half <- qnorm(0.975) * sqrt(summary(fit)$dispersion)
        expect_equal(p$upr - p$lwr, rep(2 * half, nrow(te)), tolerance = 1e-10)
      }
      if (nm == "qp_log") {
        expect_true(all(is.na(p$lwr)))
        expect_true(is.na(row$coverage))
      }
    }
  }
  # in-sample AIC of the Gamma candidate: base R AIC() of glm on all rows (the same fit: 1e-10)
  s <- cmp$summary
  expect_equal(s$aic[s$candidate == "gamma_log"],
               AIC(glm(y ~ x + g, family = Gamma(link = "log"), data = d)), tolerance = 1e-10)
  expect_true(is.na(s$aic[s$candidate == "qp_log"]))
  # a quasi family without an interval is still ranked by its point scores
  expect_true(s$ranked[s$candidate == "qp_log"])
  expect_equal(s$kind[s$candidate == "gamma_log"], "GLM")
  expect_equal(s$kind[s$candidate == "none"], "transform")
  expect_match(cmp$kinds$interval[cmp$kinds$candidate == "qp_log"], "quasi-likelihood")
  out <- capture.output(print(cmp))
  expect_true(any(grepl("GLM candidate gamma_log: Gamma(log)", out, fixed = TRUE)))
  expect_true(any(grepl("Transform candidates: none", out, fixed = TRUE)))
  expect_true(all(nchar(out) <= 80L))
})

test_that("a family the data do not fit is a per-candidate failure naming rows", {
  d <- sim_glm(40, 2)
  d$y[c(5, 30)] <- 0
  cmp <- compare_transforms(y ~ x, d, candidates = list("none", gamma_log = Gamma(link = "log"),
                                                          qp = quasipoisson(link = "log")),
                            folds = 4, seed = 1, progress = FALSE)
  f <- cmp$failures[cmp$failures$candidate == "gamma_log", ]
  # each of the two zeros lies in three of the four training parts (or both in the same fold)
  expect_gte(nrow(f), 3L)
  expect_true(all(grepl("Gamma(log) needs y > 0", f$message, fixed = TRUE)))
  # positions in the training part are rewritten as rows of the data
  expect_true(all(grepl("at rows? (5|30)(, 30)?:", f$message)))
  expect_false(cmp$summary$ranked[cmp$summary$candidate == "gamma_log"])
  expect_true(all(cmp$summary$ranked[cmp$summary$candidate != "gamma_log"]))
  expect_equal(sum(cmp$failures$candidate != "gamma_log"), 0L)
  expect_match(cmp$full$gamma_log$error, "needs y > 0")
})

test_that("bad GLM candidates are refused clearly", {
  d <- sim_glm(30, 3)
  expect_error(compare_transforms(y ~ x, d, candidates = list(Gamma(link = "log")),
                                  progress = FALSE, seed = 1),
               "candidate 1 needs a name")
  bad <- structure(list(family = "odd", link = "log"), class = "family")
  expect_error(compare_transforms(y ~ x, d, candidates = list(odd = bad), progress = FALSE,
                                  seed = 1), "not a complete family object")
})
