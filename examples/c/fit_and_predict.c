/* A C99 program using powerback end to end: estimate the response's power, fit the model on the
 * transformed scale, predict new rows in original units with intervals, and save the transforms
 * as a portable spec for another program (or R's read_transforms()) to apply identically.
 *
 *   fit_and_predict SPEC_PATH
 *
 * The data are invented here: y = ((1 + 0.5 (2 + 0.8 x + e)))^2, i.e. a square-root scale on which
 * the model is linear with normal-looking errors e. Exit status 0 when every step succeeds and
 * the results pass the sanity checks printed with them.
 *
 * Cautions: on the transformed scale the coefficients describe changes of sqrt-like units, not
 * of y; the back-transformed fit is a median of y, and a mean needs the correction shown below;
 * and these numbers inform, but do not replace, domain standards and professional judgement. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "powerback.h"

#define N 120
#define NEW 3

static int failed(const char *what) {
  fprintf(stderr, "%s failed: %s\n", what, pwb_last_error());
  return 1;
}

/* A small deterministic generator (a linear congruential step) and a sum of uniforms that is
 * close to normal: enough for invented example data. */
static unsigned long state = 12345u;
static double uniform(void) {
  state = (state * 1103515245u + 12345u) % 2147483648u;
  return (double)state / 2147483648.0;
}
static double noise(void) {
  double s = 0.0;
  int k;
  for (k = 0; k < 12; ++k) s += uniform();
  return (s - 6.0) * 0.3;
}

int main(int argc, char **argv) {
  double x[N], y[N], xnew[NEW] = {1.0, 5.0, 9.0};
  double fit[NEW], lwr[NEW], upr[NEW], mean[NEW];
  unsigned flags[NEW];
  pwb_lambda_options lopt;
  pwb_lambda_result lam;
  pwb_transform_spec ts;
  pwb_transform *response = NULL;
  pwb_model *model = NULL;
  pwb_model_info info;
  pwb_predict_options popt;
  pwb_spec *spec = NULL, *back = NULL;
  double coef[2], se[2];
  size_t i, count = 0;

  if (argc != 2) {
    fprintf(stderr, "usage: fit_and_predict SPEC_PATH\n");
    return 2;
  }
  for (i = 0; i < N; ++i) {
    double z;
    x[i] = 10.0 * uniform();
    z = 2.0 + 0.8 * x[i] + noise();
    y[i] = pow(1.0 + 0.5 * z, 2.0); /* inverse of Box-Cox with lambda 0.5 */
  }

  /* 1. The response's power given the predictor, with its likelihood-ratio interval. */
  pwb_lambda_options_init(&lopt);
  pwb_lambda_result_init(&lam);
  if (pwb_estimate_response_lambda(y, x, N, 1, PWB_BOX_COX, &lopt, &lam) != PWB_OK)
    return failed("pwb_estimate_response_lambda");
  printf("lambda %.4f, 95%% interval [%.4f, %.4f], convenient %g%s%s\n", lam.lambda,
         lam.conf_low, lam.conf_high, lam.convenient, lam.at_bound ? " (at a search bound)" : "",
         lam.converged ? "" : " (not converged)");
  if (!lam.converged || lam.at_bound || !(lam.conf_low < 0.5 && 0.5 < lam.conf_high)) {
    fprintf(stderr, "the interval should cover the power 0.5 the data were made with\n");
    return 1;
  }

  /* 2. Fit on the scale of the convenient power. */
  pwb_transform_spec_init(&ts);
  ts.family = PWB_BOX_COX;
  ts.lambda = lam.convenient;
  if (pwb_transform_new(&ts, &response) != PWB_OK) return failed("pwb_transform_new");
  {
    /* Text comes back like snprintf: cut to the buffer (always NUL-terminated), full length in
     * need; buf = NULL with cap 0 would ask the length alone. */
    char text[80];
    size_t need = 0;
    if (pwb_transform_describe(response, 3, text, sizeof text, &need) != PWB_OK)
      return failed("pwb_transform_describe");
    printf("response transform: %s%s\n", text, need < sizeof text ? "" : "...");
  }
  {
    pwb_model_options mopt;
    pwb_model_options_init(&mopt);
    mopt.estimated_parameters = 1; /* lambda came from these data */
    if (pwb_model_fit(y, x, N, 1, response, &mopt, &model) != PWB_OK) return failed("pwb_model_fit");
  }
  info.struct_size = sizeof info;
  if (pwb_model_get_info(model, &info) != PWB_OK) return failed("pwb_model_get_info");
  if (pwb_model_coefficients(model, coef, se, NULL, 2) != PWB_OK)
    return failed("pwb_model_coefficients");
  printf("transformed scale: intercept %.4f (se %.4f), slope %.4f (se %.4f), sigma %.4f on %lu df\n",
         coef[0], se[0], coef[1], se[1], info.sigma, (unsigned long)info.df_residual);
  /* the data were made with intercept 2 and slope 0.8: within 4 standard errors */
  if (fabs(coef[0] - 2.0) > 4.0 * se[0] || fabs(coef[1] - 0.8) > 4.0 * se[1]) {
    fprintf(stderr, "the coefficients are far from those the data were made with\n");
    return 1;
  }

  /* 3. Predict in original units: median with a 90% prediction interval, and a mean. */
  pwb_predict_options_init(&popt);
  popt.interval = PWB_INTERVAL_PREDICTION;
  popt.level = 0.90;
  if (pwb_model_predict(model, xnew, NEW, 1, &popt, fit, lwr, upr, flags) != PWB_OK)
    return failed("pwb_model_predict");
  popt.interval = PWB_INTERVAL_NONE;
  popt.center = PWB_CENTER_MEAN;
  popt.mean_method = PWB_MEAN_SMEARING;
  if (pwb_model_predict(model, xnew, NEW, 1, &popt, mean, NULL, NULL, NULL) != PWB_OK)
    return failed("pwb_model_predict (mean)");
  for (i = 0; i < NEW; ++i) {
    printf("x = %g: median %.3f, 90%% prediction interval [%.3f, %.3f], mean %.3f%s\n", xnew[i],
           fit[i], lwr[i], upr[i], mean[i], flags[i] ? " (flagged)" : "");
    /* a right-skewed y: the interval is asymmetric about the median and the mean exceeds it */
    if (!(lwr[i] < fit[i] && fit[i] < upr[i] && fit[i] < mean[i] && upr[i] - fit[i] > fit[i] - lwr[i])) {
      fprintf(stderr, "unexpected prediction at x = %g\n", xnew[i]);
      return 1;
    }
  }

  /* 4. Save the response transform as a spec and read it back. */
  if (pwb_spec_new(&spec) != PWB_OK || pwb_spec_add_transform(spec, "y", response) != PWB_OK)
    return failed("building the spec");
  if (pwb_spec_write_file(spec, argv[1]) != PWB_OK) return failed("pwb_spec_write_file");
  if (pwb_spec_read_file(argv[1], &back) != PWB_OK || pwb_spec_count(back, &count) != PWB_OK ||
      count != 1)
    return failed("reading the spec back");
  printf("wrote %s\n", argv[1]);

  pwb_spec_free(back);
  pwb_spec_free(spec);
  pwb_model_free(model);
  pwb_transform_free(response);
  return 0;
}
