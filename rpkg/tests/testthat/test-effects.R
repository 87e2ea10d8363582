# effect_table(): effects on the original-scale median, checked against base R by hand.

trees_loglog <- function()
  lm_transformed(Volume ~ Girth + Height, datasets::trees, response = new_transform("log"),
                 predictors = list(Girth = new_transform("log"), Height = new_transform("log")))

test_that("log-log: percent changes and elasticities match lm and confint.lm", {
  et <- effect_table(trees_loglog())
  expect_s3_class(et, "pwb_effects")
  # Reference: base R lm / confint.lm on log(Volume) ~ log(Girth) + log(Height) (datasets::trees).
  ref <- lm(log(Volume) ~ log(Girth) + log(Height), data = datasets::trees)
  ci <- confint(ref)
  for (v in c("Girth", "Height")) {
    nm <- sprintf("log(%s)", v)
    pc <- et[et$term == v & et$measure == "percent", ]
    el <- et[et$term == v & et$measure == "elasticity", ]
    expect_equal(nrow(pc), 1L)
    # 1e-10: the same least-squares coefficients, computed by QR in both (rounding only).
    expect_equal(pc$estimate, 100 * (exp(coef(ref)[[nm]]) - 1), tolerance = 1e-10)
    expect_equal(c(pc$lower, pc$upper), unname(100 * (exp(ci[nm, ]) - 1)), tolerance = 1e-10)
    expect_equal(el$estimate, coef(ref)[[nm]], tolerance = 1e-10)
    expect_equal(c(el$lower, el$upper), unname(ci[nm, ]), tolerance = 1e-10)
  }
  expect_match(et$effect[et$measure == "percent"][1], "per unit of log")
})

test_that("a log response with an untransformed predictor and a factor gives percent per unit / level", {
  d <- datasets::mtcars
  d$cyl <- factor(d$cyl)
  m <- lm_transformed(mpg ~ wt + cyl, d, response = new_transform("log"))
  et <- effect_table(m)
  ref <- lm(log(mpg) ~ wt + cyl, data = d)  # base R lm on the log response
  ci <- confint(ref)
  for (nm in c("wt", "cyl6", "cyl8")) {
    row <- et[et$term == nm, ]
    expect_equal(row$estimate, 100 * (exp(coef(ref)[[nm]]) - 1), tolerance = 1e-10)
    expect_equal(c(row$lower, row$upper), unname(100 * (exp(ci[nm, ]) - 1)), tolerance = 1e-10)
  }
  expect_equal(et$effect[et$term == "cyl8"], "8 vs 4")
})

test_that("a non-log power gives the change in the median with a by-hand delta-method interval", {
  m <- lm_transformed(Volume ~ Girth + Height, datasets::trees,
                      response = new_transform("box-cox", lambda = 0.5))
  et <- effect_table(m, level = 0.9)
  row <- et[et$term == "Girth", ]
  # By hand: lm on z = (Volume^0.5 - 1) / 0.5 (base R), median (1 + z / 2)^2, Girth from its
  # quartiles, Height at its median; gradient of the change by central finite differences.
  z <- (datasets::trees$Volume^0.5 - 1) / 0.5
  ref <- lm(z ~ Girth + Height, data = datasets::trees)
  q <- unname(quantile(datasets::trees$Girth, c(0.25, 0.75)))
  h <- median(datasets::trees$Height)
  x0 <- c(1, q[1], h)
  x1 <- c(1, q[2], h)
  med <- function(b, x) (1 + sum(x * b) / 2)^2
  change <- function(b) med(b, x1) - med(b, x0)
  b <- coef(ref)
  grad <- vapply(1:3, function(j) {
    e <- replace(numeric(3), j, 1e-6)
    (change(b + e) - change(b - e)) / 2e-6
  }, 0)
  se <- sqrt(drop(t(grad) %*% vcov(ref) %*% grad))
  tq <- qt(0.95, df.residual(ref))
  # 1e-7: central differences with step 1e-6 on a quadratic are exact up to rounding
  # (~1e-16 / 1e-6 = 1e-10 relative in the gradient).
  expect_equal(row$estimate, change(b), tolerance = 1e-10)
  expect_equal(row$se, se, tolerance = 1e-7)
  expect_equal(c(row$lower, row$upper), change(b) + c(-1, 1) * tq * se, tolerance = 1e-7)
  expect_equal(row$median_from, med(b, x0), tolerance = 1e-10)
  # Stated values replace the quartiles.
  et2 <- effect_table(m, values = list(Girth = c(10, 15)))
  x0[2] <- 10
  x1[2] <- 15
  expect_equal(et2$estimate[et2$term == "Girth"], change(b), tolerance = 1e-10)
  expect_match(et2$effect[et2$term == "Girth"], "from 10 to 15")
})

test_that("print fits 80 columns and markdown gives a table", {
  et <- effect_table(trees_loglog())
  out <- capture.output(print(et))
  expect_true(all(nchar(out) <= 80))
  expect_true(any(grepl("Girth", out)))
  md <- format(et, format = "markdown")
  expect_match(md[1], "^\\| term \\| effect \\|")
  expect_match(md[2], "^\\|---")
  expect_length(md, nrow(et) + 2L)
})

test_that("bad input is explained", {
  m <- lm_transformed(Volume ~ Girth + Height, datasets::trees,
                      response = new_transform("box-cox", lambda = 0.5),
                      predictors = list(Girth = new_transform("sqrt")))
  expect_error(effect_table(m, per = "unit"), "values = list\\(Girth = c\\(")
  expect_error(effect_table(m, values = list(Girth = 3)), "two numbers")
  expect_error(effect_table(m, values = list(Width = c(1, 2))), "not among the model's predictors")
  expect_error(effect_table(lm(Volume ~ Girth, datasets::trees)), "pwb_model")
})
