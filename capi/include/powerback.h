/*
 * powerback.h — the stable C interface of powerback.
 *
 * powerback transforms variables for linear regression: the transform families, maximum-likelihood
 * estimation of their powers, models fitted on the transformed scale and predictions mapped back
 * to original units. This header is the only way other languages (and powerback's own R package)
 * reach the C++ core.
 *
 * Conventions that hold for every function below unless its comment says otherwise:
 *   - Every name has the prefix pwb_ (macros PWB_). The header is C99 and also compiles as C++.
 *   - Functions that can fail return a pwb_status. PWB_OK is 0. On failure, pwb_last_error()
 *     gives a message for the calling thread; outputs are then unspecified unless documented.
 *   - Objects are opaque handles created by pwb_X_new and released by pwb_X_free; free functions
 *     accept NULL and do nothing with it.
 *   - Every struct passed in or out starts with `size_t struct_size`, which the caller sets to
 *     sizeof(the struct) (the _init functions do it). A struct_size smaller than this version's
 *     struct gives PWB_ERR_ARGUMENT; a larger one (from a newer header) is accepted.
 *   - Arrays are owned by the caller: inputs are read, outputs are written, neither is kept after
 *     the call returns. An array of length 0 may be NULL.
 *   - Indices in messages are 0-based.
 *   - No C++ exception and no longjmp ever leaves a function of this header.
 *   - Thread safety: distinct handles may be used from distinct threads at once. One handle may
 *     be read (apply, invert, get_spec) from several threads at once; it is never modified after
 *     creation. pwb_last_error() is per thread.
 */
#ifndef POWERBACK_H
#define POWERBACK_H

#include <stddef.h>

#ifdef __cplusplus
extern "C" {
#endif

#if defined(PWB_BUILDING_LIBRARY) && (defined(__GNUC__) || defined(__clang__))
#define PWB_API __attribute__((visibility("default")))
#else
#define PWB_API
#endif

/* ------------------------------------------------------------------------------------------ */
/* Version                                                                                    */
/* ------------------------------------------------------------------------------------------ */

#define PWB_VERSION_MAJOR 0
#define PWB_VERSION_MINOR 1
#define PWB_VERSION_PATCH 0
/* MAJOR * 10000 + MINOR * 100 + PATCH, e.g. 100 for 0.1.0. */
#define PWB_VERSION_NUMBER (PWB_VERSION_MAJOR * 10000 + PWB_VERSION_MINOR * 100 + PWB_VERSION_PATCH)

/* The library's version as PWB_VERSION_NUMBER computes it; compare with the macro to detect a
 * header/library mismatch. Never fails; thread-safe. */
PWB_API unsigned pwb_version_number(void);

/* The library's version as "MAJOR.MINOR.PATCH". A static string: never NULL, never freed. */
PWB_API const char *pwb_version_string(void);

/* ------------------------------------------------------------------------------------------ */
/* Status and errors                                                                          */
/* ------------------------------------------------------------------------------------------ */

typedef enum pwb_status {
  PWB_OK = 0,
  PWB_ERR_ARGUMENT,    /* a NULL pointer, bad size, unknown name, out-of-range option */
  PWB_ERR_DOMAIN,      /* a value outside a transform's domain (or an inverse outside its range) */
  PWB_ERR_NONFINITE,   /* NaN or infinite input */
  PWB_ERR_SINGULAR,    /* a design that cannot be fitted */
  PWB_ERR_CONVERGENCE, /* an iterative method failed to converge */
  PWB_ERR_PARSE,       /* malformed text */
  PWB_ERR_MEMORY,      /* allocation failure or size overflow */
  PWB_ERR_INTERNAL,    /* a bug in powerback: please report it with the message */
  PWB_ERR_CANCELLED    /* the calling thread's interrupt check (pwb_set_interrupt_check) said stop */
} pwb_status;

/* The enumerator's name, e.g. "PWB_ERR_DOMAIN"; "PWB_UNKNOWN_STATUS" for other values.
 * A static string; thread-safe. */
PWB_API const char *pwb_status_name(pwb_status s);

/* The message of the last failing call made by this thread, or "" when the last call that
 * returns a pwb_status succeeded. Never NULL. The string stays valid until this thread's next
 * powerback call; copy it to keep it. */
PWB_API const char *pwb_last_error(void);

/* A caller's check, polled between the steps of long computations (rank detection over many
 * columns, lambda searches, leave-one-out passes): return nonzero to stop. It receives the
 * `user` pointer given to pwb_set_interrupt_check. It runs on the calling thread, inside the
 * library call; it must return normally (no longjmp out of it, no C++ exception) and should be
 * quick, since it may be called many times per second. */
typedef int (*pwb_interrupt_check)(void *user);

/* Installs check (with its user pointer) for the calling thread; NULL removes it. Other threads
 * are not affected. While one is installed, a long computation whose check returns nonzero stops
 * at the next step and its function returns PWB_ERR_CANCELLED (outputs unspecified, handles
 * passed in unchanged, nothing leaked). The library keeps `user` but never dereferences it.
 * Never fails; thread-safe (each thread has its own check). */
PWB_API void pwb_set_interrupt_check(pwb_interrupt_check check, void *user);

/* ------------------------------------------------------------------------------------------ */
/* Transform families                                                                         */
/* ------------------------------------------------------------------------------------------ */

/* Every family is increasing in its argument v; reciprocal is -1/v for that reason, and power
 * is sign(v)|v|^lambda for lambda > 0 and -v^lambda (v > 0) for lambda < 0. */
typedef enum pwb_family {
  PWB_IDENTITY = 0,
  PWB_BOX_COX,     /* (v^lambda - 1)/lambda, log v at lambda = 0; v > 0 */
  PWB_YEO_JOHNSON, /* Yeo & Johnson (2000); any real v */
  PWB_LOG,         /* natural log; v > 0 */
  PWB_LOG10,       /* v > 0 */
  PWB_SQRT,        /* v > 0 */
  PWB_RECIPROCAL,  /* -1/v; v > 0 */
  PWB_POWER,       /* lambda != 0 */
  PWB_ASINH,       /* any real v */
  PWB_LOGIT        /* log(v/(1-v)); 0 < v < 1 */
} pwb_family;

/* The family's name as the R package and the text spec spell it ("box-cox", "yeo-johnson", ...);
 * "unknown" for other values. A static string; thread-safe. */
PWB_API const char *pwb_family_name(pwb_family f);

/* Looks up a family by that name (exact, lower case). Returns PWB_ERR_ARGUMENT (listing the
 * known names) when it is none, or when name or out is NULL. */
PWB_API pwb_status pwb_family_from_name(const char *name, pwb_family *out);

/* ------------------------------------------------------------------------------------------ */
/* Transforms: reflect -> shift -> family                                                     */
/* ------------------------------------------------------------------------------------------ */

/* v = (reflect ? pivot - x : x) + shift;  z = family(v; lambda).
 * lambda is used by PWB_BOX_COX, PWB_YEO_JOHNSON and PWB_POWER and ignored (reported as NaN)
 * for the others; pivot is used only when reflect is non-zero (reported as NaN otherwise). */
typedef struct pwb_transform_spec {
  size_t struct_size; /* sizeof(pwb_transform_spec) */
  pwb_family family;
  double lambda;
  double shift;
  int reflect;
  double pivot;
} pwb_transform_spec;

/* Sets struct_size and the identity transform (lambda NaN, shift 0, no reflection, pivot NaN).
 * NULL is ignored. Thread-safe. */
PWB_API void pwb_transform_spec_init(pwb_transform_spec *spec);

typedef struct pwb_transform pwb_transform; /* opaque; immutable once made */

/* Makes a transform from spec (copied; spec is not kept). On success *out owns a new handle the
 * caller releases with pwb_transform_free. Errors: PWB_ERR_ARGUMENT for NULL spec or out, a
 * struct_size too small, an unknown family, a non-finite lambda for a family that uses one,
 * power with lambda 0, a non-finite shift, reflect without a finite pivot. *out is NULL on
 * failure. */
PWB_API pwb_status pwb_transform_new(const pwb_transform_spec *spec, pwb_transform **out);

/* Releases t. NULL is fine. Not to be called while another thread uses t. */
PWB_API void pwb_transform_free(pwb_transform *t);

/* Copies t's constants into *spec, whose struct_size the caller sets first. Unused constants
 * are NaN. Errors: PWB_ERR_ARGUMENT for NULL arguments or a struct_size too small. */
PWB_API pwb_status pwb_transform_get_spec(const pwb_transform *t, pwb_transform_spec *spec);

/* out[i] = transform of x[i], i < n. out may be the same array as x. Every element that can be
 * mapped is written. An element that cannot is set to NaN, and then the call returns
 * PWB_ERR_NONFINITE (some x[i] is NaN or infinite; checked first) or PWB_ERR_DOMAIN (some v is
 * outside the family's domain, or a finite x[i] overflows: its v or its transform is beyond the
 * largest double, e.g. Box-Cox lambda = 2 at 1e300), with the count and first indices in
 * pwb_last_error(). PWB_ERR_ARGUMENT for a NULL t, or NULL x or out with n > 0. */
PWB_API pwb_status pwb_transform_apply(const pwb_transform *t, const double *x, size_t n,
                                       double *out);

/* out[i] = inverse transform of z[i], so that apply(invert(z)) = z. Same rules as
 * pwb_transform_apply; PWB_ERR_DOMAIN here means z[i] lies outside the family's range (for
 * Box-Cox with lambda != 0 the inverse needs 1 + lambda z > 0) or that its inverse overflows.
 * Accuracy: invert(apply(x)) returns x to a relative error of about 2^-53 |z| / |v f'(v)|, a few
 * units in the last place for most transforms; it grows where the family flattens out, e.g.
 * Box-Cox with lambda = -2 keeps about 1e-4 relative at v = 1e6, and from v ~ 1e8 on every value
 * rounds to the limit z = -1/lambda, which the inverse refuses with a message saying the
 * precision is exhausted. */
PWB_API pwb_status pwb_transform_invert(const pwb_transform *t, const double *z, size_t n,
                                        double *out);

/* out[i] = log |d transform / dx| at x[i]: the Jacobian term a likelihood on the transformed
 * scale adds per observation. Same rules as pwb_transform_apply, with one boundary: where the
 * derivative is zero or unbounded (v = 0 for PWB_POWER with lambda != 1) out[i] is -Inf and the
 * call still returns PWB_OK. A likelihood holding such a term is not comparable with others
 * (the density of v has no finite value there); -Inf makes it rank last, never first. */
PWB_API pwb_status pwb_transform_log_derivative(const pwb_transform *t, const double *x, size_t n,
                                                double *out);

/* One line of text about t: which = 0, what it needs of its input ("box-cox needs v > 0, where
 * v = x + shift"); 1, what it needs of the values it inverts; 2, the usual remedy for input
 * outside the domain; 3, the transform itself ("box-cox(lambda = 0.5) of (x + 1)"); 4, the
 * remedy for values outside the range (for Box-Cox with lambda < 0 it explains that a value at
 * the limit -1/lambda means the precision of the original values is exhausted). Writes at most cap bytes including the terminating NUL into buf (buf may be NULL when
 * cap is 0) and stores the full length (without NUL) in *needed when needed is not NULL, like
 * snprintf. Errors: PWB_ERR_ARGUMENT for a NULL t or a which other than 0 to 4. */
PWB_API pwb_status pwb_transform_describe(const pwb_transform *t, int which, char *buf, size_t cap,
                                          size_t *needed);

/* ------------------------------------------------------------------------------------------ */
/* Estimating lambda: univariate and response-given-predictors, profiles                      */
/* ------------------------------------------------------------------------------------------ */

/* Options of the lambda estimators. Initialise with pwb_lambda_options_init, then change fields.
 * lower < upper (both finite) is the search range of lambda; level in (0, 1) is the level of the
 * likelihood-ratio confidence interval. */
typedef struct pwb_lambda_options {
  size_t struct_size; /* sizeof(pwb_lambda_options) */
  double lower, upper; /* search range, default -3, 3 */
  double level;        /* CI level, default 0.95 */
} pwb_lambda_options;

/* Sets struct_size and the defaults (-3, 3, 0.95). NULL is ignored. Thread-safe. */
PWB_API void pwb_lambda_options_init(pwb_lambda_options *opt);

/* The result of a lambda estimate. lambda maximises the profile log-likelihood
 *   l(lambda) = -n/2 (log(2 pi) + 1 + log(RSS(lambda) / n)) + sum log |d psi(v; lambda) / dv|
 * over [lower, upper] (RSS about the mean, or about the least-squares fit in the response case);
 * loglik is l(lambda), on the original scale of the data. [conf_low, conf_high] holds the lambdas
 * whose profile lies within chi2_1(level) / 2 of the maximum. A side whose profile never drops
 * that far inside the range is open: its endpoint is the range edge and low_open / high_open is
 * 1 (a flat profile is a flag, not an error). at_bound is 1 when lambda sits at a range edge;
 * converged is 0 when the maximiser or a root search ran out of iterations. convenient is the
 * value of {-2, -1, -0.5, 0, 0.5, 1, 2} nearest lambda inside the interval (ties: the smaller),
 * or lambda rounded to 2 decimals when none lies inside. rank (intercept included) and
 * n_aliased (design columns dropped as aliased) are 0 for the univariate estimator. */
typedef struct pwb_lambda_result {
  size_t struct_size; /* sizeof(pwb_lambda_result) */
  double lambda, conf_low, conf_high, convenient, loglik;
  int at_bound, converged;
  size_t n;           /* observations used */
  int low_open, high_open;
  size_t rank, n_aliased;
} pwb_lambda_result;

/* Sets struct_size and every other field to 0 (NaN for the doubles). NULL is ignored. */
PWB_API void pwb_lambda_result_init(pwb_lambda_result *res);

/* Maximum-likelihood lambda of one variable under a normal model for psi(x; lambda), with its
 * likelihood-ratio interval. x: n values (read only). family: PWB_BOX_COX (needs x > 0) or
 * PWB_YEO_JOHNSON (any finite x). opt may be NULL (defaults). out: caller-owned, struct_size set.
 * Errors: PWB_ERR_NONFINITE (NaN/Inf in x; count and first indices in the message),
 * PWB_ERR_DOMAIN (x <= 0 with Box-Cox; count and first indices, suggests Yeo-Johnson or a shift),
 * PWB_ERR_ARGUMENT (NULL pointers, another family, fewer than 3 values, a constant x,
 * lower >= upper, level outside (0, 1), a small struct_size). Thread-safe (no shared state). */
PWB_API pwb_status pwb_estimate_lambda(const double *x, size_t n, pwb_family family,
                                       const pwb_lambda_options *opt, pwb_lambda_result *out);

/* Maximum-likelihood lambda of the response y given predictors: psi(y; lambda) = [1 X] b + e with
 * normal e. X: n-by-p, column-major, no intercept column (one is added); p may be 0. The design
 * is factored once, in one pass over its rows (a Householder QR taken block by block; aliased
 * columns dropped as R's lm does, their count in out->n_aliased), and each lambda costs one
 * projection of the transformed y. Errors as
 * pwb_estimate_lambda for y, plus PWB_ERR_NONFINITE for non-finite X (first row and column
 * named) and PWB_ERR_SINGULAR when n <= rank + 1. Thread-safe. */
PWB_API pwb_status pwb_estimate_response_lambda(const double *y, const double *X, size_t n,
                                                size_t p, pwb_family family,
                                                const pwb_lambda_options *opt,
                                                pwb_lambda_result *out);

/* The profile log-likelihood of lambda at each of n_grid caller-chosen values grid[k] (finite),
 * written to loglik_out[k] (caller-owned, n_grid doubles). The univariate form takes x as
 * pwb_estimate_lambda does; the response form takes y and X as pwb_estimate_response_lambda.
 * Same errors as those; PWB_ERR_ARGUMENT for a non-finite grid value. Thread-safe. */
PWB_API pwb_status pwb_lambda_profile(const double *x, size_t n, pwb_family family,
                                      const double *grid, size_t n_grid, double *loglik_out);
PWB_API pwb_status pwb_response_lambda_profile(const double *y, const double *X, size_t n,
                                               size_t p, pwb_family family, const double *grid,
                                               size_t n_grid, double *loglik_out);

/* An estimate and its profile curve for plotting in one call (one factorisation of the design).
 * As pwb_estimate_lambda / pwb_estimate_response_lambda, then n_grid (>= 2) equally spaced
 * lambdas spanning the interval with a margin of max(0.1, 1.5 times its width) on each side, clipped
 * to [lower, upper], go to grid_out and their profile log-likelihoods to loglik_out (both
 * caller-owned, n_grid doubles). n_grid = 101 is a good default. Thread-safe. */
PWB_API pwb_status pwb_estimate_lambda_curve(const double *x, size_t n, pwb_family family,
                                             const pwb_lambda_options *opt, pwb_lambda_result *out,
                                             size_t n_grid, double *grid_out, double *loglik_out);
PWB_API pwb_status pwb_estimate_response_lambda_curve(const double *y, const double *X, size_t n,
                                                      size_t p, pwb_family family,
                                                      const pwb_lambda_options *opt,
                                                      pwb_lambda_result *out, size_t n_grid,
                                                      double *grid_out, double *loglik_out);

/* The convenient lambda of the rule above for an estimate lambda and interval [lo, hi]. Never
 * fails; NaN input gives NaN. Thread-safe. */
PWB_API double pwb_convenient_lambda(double lambda, double lo, double hi);

/* @@PWB_SECTION_ESTIMATION@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* Screening variables: skewness, kurtosis, Shapiro-Wilk, the ladder of powers                */
/* ------------------------------------------------------------------------------------------ */

/* Shapiro-Wilk W test of normality for one sample, by Royston's algorithm AS R94 (Applied
 * Statistics 44, 1995), valid for 3 <= n <= 5000. Outside that range, or when every value is the
 * same, the test is not computed: computed = 0, w and p_value are NaN and note says why. */
typedef struct pwb_normality_result {
  size_t struct_size; /* sizeof(pwb_normality_result) */
  double w;           /* the statistic, 0 < W <= 1; NaN when not computed */
  double p_value;     /* small values speak against normality; NaN when not computed */
  size_t n;           /* values tested */
  int computed;       /* 1 when w and p_value are set */
  const char *note;   /* why not computed ("" when computed): a static string, never NULL */
} pwb_normality_result;

/* Sets struct_size and marks the result not computed (NaN statistics, note ""). */
PWB_API void pwb_normality_result_init(pwb_normality_result *out);

/* Shapiro-Wilk W and p-value of x[0..n-1] (any order) into *out, whose struct_size the caller
 * sets first. n outside 3..5000 or a constant sample is not an error: see computed and note.
 * Errors: PWB_ERR_NONFINITE when some x[i] is NaN or infinite (count and first indices in
 * pwb_last_error(); remove missing values first); PWB_ERR_ARGUMENT for NULL out, NULL x with
 * n > 0, or a struct_size too small. Thread-safe. */
PWB_API pwb_status pwb_shapiro_wilk(const double *x, size_t n, pwb_normality_result *out);

/* Sample moments: mean, standard deviation (divisor n - 1), the adjusted Fisher-Pearson
 * skewness G1 with SE = sqrt(6n(n-1)/((n-2)(n+1)(n+3))) and z = G1/SE, and the excess kurtosis
 * G2 with SE = sqrt(24n(n-1)^2/((n-3)(n-2)(n+3)(n+5))) and z = G2/SE. Statistics that are
 * undefined (G1 for n < 3 or a constant sample, G2 for n < 4) are NaN. */
typedef struct pwb_moments {
  size_t struct_size; /* sizeof(pwb_moments) */
  size_t n;
  double mean, sd;
  double skewness, skewness_se, skewness_z;
  double kurtosis, kurtosis_se, kurtosis_z;
} pwb_moments;

/* Sets struct_size and every statistic to NaN (n = 0). */
PWB_API void pwb_moments_init(pwb_moments *out);

/* The moments of x[0..n-1] into *out (struct_size set by the caller). n = 0 gives NaN
 * statistics. Errors as pwb_shapiro_wilk. Thread-safe. */
PWB_API pwb_status pwb_sample_moments(const double *x, size_t n, pwb_moments *out);

/* The steps of the ladder of powers. */
typedef enum pwb_ladder_step {
  PWB_LADDER_NONE = 0,   /* not skewed by the rule: identity */
  PWB_LADDER_SQRT,       /* moderate skew */
  PWB_LADDER_LOG10,      /* substantial skew */
  PWB_LADDER_RECIPROCAL  /* severe skew (reciprocal is -1/v, increasing) */
} pwb_ladder_step;

/* How the ladder reached its recommendation. */
typedef struct pwb_ladder_info {
  size_t struct_size;   /* sizeof(pwb_ladder_info) */
  pwb_ladder_step step;
  int skewed;           /* 1 when the rule judged the variable skewed */
  int by_size;          /* 1: judged by |G1| > 0.5 (n >= 300); 0: by |z| > 3.29 (n < 300) */
  double skewness;      /* G1 */
  double skewness_z;    /* G1 / SE(G1) */
  size_t n;
} pwb_ladder_info;

/* Sets struct_size, step PWB_LADDER_NONE and the rest to zero / NaN. */
PWB_API void pwb_ladder_info_init(pwb_ladder_info *info);

/* The rule-based ladder recommendation for x[0..n-1]. Skewed when |z| > 3.29 for n < 300 (the
 * conservative cut of applied multivariate statistics texts such as Tabachnick & Fidell), or
 * when |G1| > 0.5 for n >= 300 (common practice); then by |G1|: <= 1 square root, <= 2 log10,
 * above 2 reciprocal (common practice). Negative skew reflects about pivot = max + 1 first;
 * otherwise a minimum <= 0 is shifted to 1. Writes the transform to *spec (struct_size set by the
 * caller; identity when no step is needed), which stores pivot and shift so that new data get the
 * same transform, and, when info is not NULL, the reasoning to *info. Errors: PWB_ERR_NONFINITE
 * for NaN or infinite x; PWB_ERR_ARGUMENT for n < 3, a constant x, NULL spec, NULL x with n > 0
 * or a struct_size too small. Thread-safe. */
PWB_API pwb_status pwb_ladder_recommend(const double *x, size_t n, pwb_transform_spec *spec,
                                        pwb_ladder_info *info);

/* Options of the variable screen. */
typedef struct pwb_screen_options {
  size_t struct_size; /* sizeof(pwb_screen_options) */
  double level;       /* confidence level of the lambda interval, default 0.95 */
  double lower, upper;/* lambda search range, default -3, 3 */
} pwb_screen_options;

/* Sets struct_size and the defaults. */
PWB_API void pwb_screen_options_init(pwb_screen_options *opt);

/* The screen of one variable. "sw" fields are Shapiro-Wilk W and p (NaN when not computed; then
 * the matching *_note says why: a static string, never NULL, "" when computed). When usable is 0
 * (fewer than 3 values, or all identical) only n, the moments and note are meaningful. */
typedef struct pwb_screen_result {
  size_t struct_size; /* sizeof(pwb_screen_result) */
  size_t n;
  int usable;
  double mean, sd, skewness, skewness_se, skewness_z, kurtosis, kurtosis_se, kurtosis_z;
  double sw_w, sw_p;             /* before any transform */
  const char *sw_note;
  /* the ladder: its transform (identity when none), step, and the figures after it */
  pwb_transform_spec ladder;
  pwb_ladder_step ladder_step;
  int ladder_by_size;
  double ladder_skewness, ladder_sw_w, ladder_sw_p;
  const char *ladder_sw_note;
  /* the ML alternative: box-cox when every value is positive, else yeo-johnson; ml holds the
   * family with lambda = ml_convenient, and the figures after it use that transform */
  int ml_done;                   /* 0 when the estimate failed; note says why */
  pwb_transform_spec ml;
  double ml_lambda, ml_conf_low, ml_conf_high, ml_convenient, ml_loglik;
  int ml_at_bound, ml_converged, ml_low_open, ml_high_open;
  double ml_skewness, ml_sw_w, ml_sw_p;
  const char *ml_sw_note;
  char note[256];                /* why not usable, or why ml_done is 0; "" otherwise */
} pwb_screen_result;

/* Sets struct_size (and the nested specs' struct_size), usable = 0 and NaN figures. */
PWB_API void pwb_screen_result_init(pwb_screen_result *out);

/* Screens x[0..n-1] (finite values; remove missing values first): moments, Shapiro-Wilk, the
 * ladder recommendation and the ML alternative, with skewness and Shapiro-Wilk after each. opt
 * may be NULL (defaults). A variable that cannot be screened is not an error (usable = 0).
 * Errors: PWB_ERR_NONFINITE for NaN or infinite x (count and first indices in pwb_last_error());
 * PWB_ERR_ARGUMENT for NULL out, NULL x with n > 0, a struct_size too small, level outside
 * (0, 1) or lower >= upper. Thread-safe. */
PWB_API pwb_status pwb_screen_variable(const double *x, size_t n, const pwb_screen_options *opt,
                                       pwb_screen_result *out);

/* @@PWB_SECTION_SCREEN@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* Models on the transformed scale: fit, predict in original units                            */
/* ------------------------------------------------------------------------------------------ */

/* A linear model fitted on the transformed scale: z = T(y) regressed on [1 X] by least squares
 * (Householder QR; a column is aliased, coefficient NaN, when it depends on the columns before
 * it, as R's lm decides). Coefficients, standard errors, sigma-hat, residuals, fitted values and
 * leverages are on the transformed scale; the log-likelihood is on the original scale of y
 * (normal log-likelihood of z at the MLE variance plus sum log |dT/dy|), so AIC compares models
 * with different response transforms of the same y. Immutable once fitted; it may be read from
 * several threads at once. */
typedef struct pwb_model pwb_model; /* opaque */

typedef struct pwb_model_options {
  size_t struct_size;          /* sizeof(pwb_model_options) */
  int intercept;               /* add an intercept column (default 1) */
  size_t estimated_parameters; /* transform parameters estimated from these data, added to the
                                  log-likelihood's degrees of freedom (default 0; 1 when the
                                  response lambda was estimated) */
} pwb_model_options;

/* Sets struct_size and the defaults (intercept 1, estimated_parameters 0). NULL is ignored. */
PWB_API void pwb_model_options_init(pwb_model_options *opt);

/* Fits the model. y: n raw responses (original units); X: n-by-p predictors, column-major,
 * without an intercept column (X may be NULL when p is 0); response: the transform T of y, or
 * NULL for none (it is copied; the caller may free it afterwards); opt may be NULL (defaults).
 * On success *out owns a new handle the caller releases with pwb_model_free; on failure *out is
 * NULL. Errors: PWB_ERR_ARGUMENT for NULL y or out, n == 0, a struct_size too small;
 * PWB_ERR_NONFINITE for non-finite X or y (the first row and column named, 0-based);
 * PWB_ERR_DOMAIN when T cannot be applied to some y (count and first rows in the message);
 * PWB_ERR_SINGULAR when every column is zero or no residual degrees of freedom remain.
 * Thread-safe (touches only its arguments). */
PWB_API pwb_status pwb_model_fit(const double *y, const double *X, size_t n, size_t p,
                                 const pwb_transform *response, const pwb_model_options *opt,
                                 pwb_model **out);

/* Releases m. NULL is fine. Not to be called while another thread uses m. */
PWB_API void pwb_model_free(pwb_model *m);

typedef struct pwb_model_info {
  size_t struct_size;  /* sizeof(pwb_model_info), set by the caller */
  size_t n;            /* rows */
  size_t columns;      /* design columns including the intercept (the coefficient count) */
  size_t rank;         /* columns not aliased */
  size_t df_residual;  /* n - rank */
  int intercept;       /* 1 when the design has an intercept column first */
  double sigma;        /* residual standard error sqrt(RSS / df_residual), transformed scale */
  double rss;          /* residual sum of squares, transformed scale */
  double loglik;       /* original-scale log-likelihood (Jacobian of T included) */
  double loglik_df;    /* rank + 1 + estimated_parameters */
  double jacobian;     /* sum over rows of log |dT/dy| (0 for no transform) */
} pwb_model_info;

/* Fills *info. Errors: PWB_ERR_ARGUMENT for NULL arguments or a struct_size too small. */
PWB_API pwb_status pwb_model_get_info(const pwb_model *m, pwb_model_info *info);

/* Copies the coefficients, their standard errors and aliasing (1 = aliased, coefficient and SE
 * NaN) into caller arrays of length `columns` (intercept first when present). Any of coef, se,
 * aliased may be NULL to skip it. Errors: PWB_ERR_ARGUMENT for a NULL m or a columns other
 * than pwb_model_info.columns. */
PWB_API pwb_status pwb_model_coefficients(const pwb_model *m, double *coef, double *se,
                                          int *aliased, size_t columns);

/* Per-row vectors of the fit (length n, caller-owned): which = PWB_MODEL_RESIDUALS (z - fitted),
 * PWB_MODEL_FITTED (transformed scale), PWB_MODEL_LEVERAGES (hat-matrix diagonal),
 * PWB_MODEL_TRANSFORMED_RESPONSE (z). Errors: PWB_ERR_ARGUMENT for a NULL m or out, an unknown
 * which, or an n other than the model's. */
typedef enum pwb_model_vector {
  PWB_MODEL_RESIDUALS = 0,
  PWB_MODEL_FITTED,
  PWB_MODEL_LEVERAGES,
  PWB_MODEL_TRANSFORMED_RESPONSE
} pwb_model_vector;
PWB_API pwb_status pwb_model_vector_get(const pwb_model *m, pwb_model_vector which, double *out,
                                        size_t n);

typedef enum pwb_interval {
  PWB_INTERVAL_NONE = 0,
  PWB_INTERVAL_CONFIDENCE, /* for the center of z; mapped back it covers the MEDIAN of y */
  PWB_INTERVAL_PREDICTION  /* for a new observation of z, and so of y */
} pwb_interval;
typedef enum pwb_center {
  PWB_CENTER_MEDIAN = 0, /* T^{-1}(x'b): the median of y when the errors are symmetric */
  PWB_CENTER_MEAN        /* an estimate of E[y], by mean_method */
} pwb_center;
typedef enum pwb_mean_method {
  PWB_MEAN_SMEARING = 0, /* Duan (1983): mean over training residuals e_j of T^{-1}(x'b + e_j) */
  PWB_MEAN_NORMAL        /* E[T^{-1}(Z)], Z ~ N(x'b, sigma^2): exp(mu + sigma^2/2) for log
                            (and its log10 analogue), Gauss-Hermite quadrature otherwise */
} pwb_mean_method;

typedef struct pwb_predict_options {
  size_t struct_size;          /* sizeof(pwb_predict_options) */
  double level;                /* interval level in (0, 1); default 0.95 */
  pwb_interval interval;       /* default PWB_INTERVAL_NONE */
  pwb_center center;           /* default PWB_CENTER_MEDIAN */
  pwb_mean_method mean_method; /* default PWB_MEAN_SMEARING */
  int transformed_scale;       /* 1: report on the transformed scale, no back-transform (0) */
} pwb_predict_options;

/* Sets struct_size and the defaults above. NULL is ignored. */
PWB_API void pwb_predict_options_init(pwb_predict_options *opt);

/* Flags of a predicted row (bits of flags[i]). */
#define PWB_PRED_BOUNDED 1u /* fit or an endpoint lay beyond the range of T's inverse and was
                               set to its limit (0 or +Inf of the family's argument, mapped
                               through the shift and reflection), or overflowed */
#define PWB_PRED_MISSING 2u /* the row of Xnew had a NaN or infinite entry; outputs are NaN */

/* Predicts `rows` new rows. Xnew: rows-by-p, column-major, the same p columns as the fit's X
 * (NULL allowed when rows or p is 0). Writes fit[i] always, lwr[i]/upr[i] (lower <= upper; NaN when
 * interval is PWB_INTERVAL_NONE) when those pointers are not NULL, flags[i] when flags is not
 * NULL. Intervals are formed on the transformed scale with Student t quantiles (df_residual)
 * and their endpoints mapped through T's inverse, swapped when T reflects; they are intervals
 * for the median (confidence) or for a new observation (prediction) whatever `center` is. opt
 * may be NULL (defaults). Errors: PWB_ERR_ARGUMENT for a NULL m or fit, p other than the fit's,
 * a level outside (0, 1), unknown enum values, a struct_size too small. Thread-safe for one m. */
PWB_API pwb_status pwb_model_predict(const pwb_model *m, const double *Xnew, size_t rows, size_t p,
                                     const pwb_predict_options *opt, double *fit, double *lwr,
                                     double *upr, unsigned *flags);

/* @@PWB_SECTION_MODEL@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* Residual diagnostics                                                                       */
/* ------------------------------------------------------------------------------------------ */

/* Checks of a fitted model's residuals, on the transformed scale where its errors are modelled.
 * A part that cannot be computed has NaN fields (and, for Shapiro-Wilk, sw_computed = 0).
 *   Shapiro-Wilk W and p of the residuals; their sample skewness.
 *   Koenker's studentized Breusch-Pagan: n R^2 of the squared residuals regressed on the model's
 *     regressors and an intercept, chi-square with bp_df = the regressors besides the intercept
 *     (rank - 1 for a model with one) degrees of freedom (Breusch & Pagan 1979, Koenker 1981).
 *     NaN when the model has no regressor besides the intercept.
 *   Ramsey's RESET: F test of adding fitted^2 and fitted^3, reset_df1 (normally 2) and
 *     reset_df2 = n - rank - reset_df1 degrees of freedom (Ramsey 1969). */
typedef struct pwb_residual_checks {
  size_t struct_size; /* sizeof(pwb_residual_checks), set by the caller (or _init) */
  size_t n;
  double sw_statistic, sw_p;
  int sw_computed;
  double skewness;
  double bp_statistic, bp_df, bp_p;
  double reset_f, reset_df1, reset_df2, reset_p;
} pwb_residual_checks;

/* Sets struct_size and every value to NaN / 0. NULL is ignored. */
PWB_API void pwb_residual_checks_init(pwb_residual_checks *out);

/* Computes the checks of m into *out. Errors: PWB_ERR_ARGUMENT for NULL arguments or a
 * struct_size too small. Thread-safe for one m. */
PWB_API pwb_status pwb_model_residual_checks(const pwb_model *m, pwb_residual_checks *out);

/* Why Shapiro-Wilk was not computed (or a caveat about it), "" when there is nothing to say;
 * written like snprintf into buf (cap bytes with the NUL; buf may be NULL when cap is 0), full
 * length in *needed when not NULL. Errors: PWB_ERR_ARGUMENT for a NULL m. */
PWB_API pwb_status pwb_model_residual_checks_note(const pwb_model *m, char *buf, size_t cap,
                                                  size_t *needed);

/* @@PWB_SECTION_DIAGNOSTICS@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* Comparing transforms: cross-validation, lambda influence, Box-Tidwell                      */
/* ------------------------------------------------------------------------------------------ */

/* Options of pwb_box_tidwell. */
typedef struct pwb_box_tidwell_options {
  size_t struct_size;   /* sizeof(pwb_box_tidwell_options) */
  int max_iter;         /* iterations of the power update; default 50 */
  double tol;           /* converged when every power changes by less than tol; default 1e-6 */
  double max_abs_power; /* a power beyond +-this stops the iteration (not converged); default 20 */
} pwb_box_tidwell_options;

/* Sets struct_size and the defaults. NULL is ignored. */
PWB_API void pwb_box_tidwell_options_init(pwb_box_tidwell_options *opt);

/* Summary of a pwb_box_tidwell run. */
typedef struct pwb_box_tidwell_result {
  size_t struct_size; /* sizeof(pwb_box_tidwell_result) */
  int iterations;     /* updates made */
  int converged;      /* 1 when the last change was below tol, else 0 */
  double last_change; /* the largest change of a power in the last update */
  double score_df;    /* residual degrees of freedom of the score-test fits */
  size_t n;           /* rows used */
} pwb_box_tidwell_result;

/* Box & Tidwell (1962) powers a_j of the m positive predictors X in
 *   y = b0 + sum_j b_j X_j^(a_j) + Z c + e,
 * iterated from a_j = 1 by the linearised update until every power changes by less than tol.
 * y: n values. Z: n-by-q other predictors, column-major, no intercept column (one is added);
 * NULL when q is 0. X: n-by-m, column-major, every value > 0.
 * Outputs (caller-owned, m values each): alpha (the powers), se (their standard errors from the
 * linearised fit at the final powers), score_t and score_p (t statistic and two-sided p-value of
 * the added column X_j log X_j in the fit with every X linear: the test of power 1). score_t and
 * score_p may be NULL. history may be NULL or hold m * (max_iter + 1) values (max_iter from
 * opt, 50 when opt is NULL): column k
 * (history[k*m + j]) holds the powers after k updates (column 0 is all 1), NaN after the last.
 * Non-convergence is reported in out->converged, not as an error; the powers are then the last
 * finite iterate. Errors: PWB_ERR_ARGUMENT (NULL pointers, m == 0, n too small for the fit,
 * bad options or struct_size); PWB_ERR_NONFINITE and PWB_ERR_DOMAIN (a non-finite value, or an X
 * value <= 0: the message names the 0-based column of X, the count and the first rows);
 * PWB_ERR_SINGULAR (a variable aliased with the others or with a zero coefficient).
 * Thread-safe: reads only its arguments. */
PWB_API pwb_status pwb_box_tidwell(const double *y, const double *Z, size_t n, size_t q,
                                   const double *X, size_t m, const pwb_box_tidwell_options *opt,
                                   double *alpha, double *se, double *score_t, double *score_p,
                                   double *history, pwb_box_tidwell_result *out);

/* Options of pwb_lambda_influence. */
typedef struct pwb_influence_options {
  size_t struct_size; /* sizeof(pwb_influence_options) */
  pwb_family family;  /* PWB_BOX_COX (default) or PWB_YEO_JOHNSON */
  double lower, upper; /* lambda search range; default -3, 3 */
  double level;       /* level of the full-data likelihood-ratio interval; default 0.95 */
} pwb_influence_options;

/* Sets struct_size and the defaults. NULL is ignored. */
PWB_API void pwb_influence_options_init(pwb_influence_options *opt);

/* The full-data estimate that pwb_lambda_influence compares against. */
typedef struct pwb_influence_summary {
  size_t struct_size;  /* sizeof(pwb_influence_summary) */
  double lambda;       /* lambda-hat from every row */
  double conf_low, conf_high; /* its likelihood-ratio interval at opt->level */
  double loglik;       /* profile log-likelihood at lambda-hat (original scale) */
  int at_bound;        /* 1 when lambda-hat is at a range end */
  int converged;       /* 1 when the full-data searches met their tolerances */
  size_t n;            /* rows */
  size_t n_outside;    /* rows whose deletion moves lambda-hat outside [conf_low, conf_high] */
  size_t n_loo_at_bound; /* rows whose leave-one-out lambda-hat is at a range end */
} pwb_influence_summary;

/* Leave-one-out maximum-likelihood lambda of the response y given predictors X (n-by-p,
 * column-major, no intercept column; NULL when p is 0): for each row i, the lambda-hat of the
 * data without row i. The design is factored once; each row's residual sum of squares comes
 * from the full fit by the deletion identity RSS - e_i^2 / (1 - h_ii), so no design is refitted.
 * Outputs (caller-owned, n values each; any may be NULL to skip it): loo_lambda, leverage (h_ii),
 * outside (1 when loo_lambda[i] lies outside the full-data interval), at_bound (1 when
 * loo_lambda[i] is at a range end). Errors: as for the full estimate (PWB_ERR_NONFINITE,
 * PWB_ERR_DOMAIN with count and first rows, PWB_ERR_ARGUMENT for bad options or NULL y, summary),
 * and PWB_ERR_SINGULAR when fewer than rank + 3 rows leave no residual degrees of freedom once
 * a row is out. Thread-safe: reads only its arguments. */
PWB_API pwb_status pwb_lambda_influence(const double *y, const double *X, size_t n, size_t p,
                                        const pwb_influence_options *opt,
                                        pwb_influence_summary *summary, double *loo_lambda,
                                        double *leverage, int *outside, int *at_bound);

/* Repeated k-fold assignment for cross-validation: fold[r * n + i] (1..folds) is the fold of row
 * i in repeat r, for r < repeats. Each repeat shuffles the rows with a generator seeded from seed
 * and r, and deals them in turn to the folds, so fold sizes differ by at most one. The same seed
 * gives the same folds on every platform. fold: caller-owned, n * repeats values.
 * Errors: PWB_ERR_ARGUMENT for a NULL fold, folds < 2, repeats < 1, or fewer rows than folds
 * (n < folds). Thread-safe. */
PWB_API pwb_status pwb_cv_folds(size_t n, int folds, int repeats, unsigned long long seed,
                                int *fold);

/* Scores of predictions of held-out rows, in the units of y. */
typedef struct pwb_holdout_scores {
  size_t struct_size; /* sizeof(pwb_holdout_scores) */
  double rmse;        /* sqrt(mean (y - fit)^2) */
  double mae;         /* mean |y - fit| */
  double r2;          /* 1 - SSE / SST, SST about the mean of these y; NaN when y is constant */
  double coverage;    /* share of rows with lwr <= y <= upr; NaN without an interval */
  double mean_width;  /* mean (upr - lwr); NaN without an interval */
  size_t n;           /* rows scored */
  size_t n_nonfinite; /* rows whose fit or interval end is not finite (the scores then are not
                         finite either: such rows are never dropped) */
} pwb_holdout_scores;

/* Scores n held-out responses y against predictions fit and, when both are given, the interval
 * [lwr, upr] (lwr and upr may both be NULL). All arrays caller-owned, n values. Errors:
 * PWB_ERR_ARGUMENT for n == 0, NULL y, fit or out, only one interval end, a struct_size too
 * small; PWB_ERR_NONFINITE for a non-finite y (count and first rows named). Thread-safe. */
PWB_API pwb_status pwb_holdout_score(const double *y, const double *fit, const double *lwr,
                                     const double *upr, size_t n, pwb_holdout_scores *out);

/* @@PWB_SECTION_COMPARE@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* The portable text spec of transforms and models                                            */
/* ------------------------------------------------------------------------------------------ */

/* A spec is an ordered set of named transforms that can be written as portable text
 * ("powerback-spec 1", described in docs/spec-format.md) and read back, in any language that
 * can call this library, to apply exactly the same transforms. Numbers are written as C99
 * hexadecimal floating constants (e.g. 0x1.8p+1), so every value reads back bit for bit.
 *
 * Limits that bound what a reader allocates, whatever the input: PWB_SPEC_MAX_BYTES of text,
 * PWB_SPEC_MAX_LINE bytes per line, PWB_SPEC_MAX_RECORDS transforms, PWB_SPEC_MAX_NAME bytes per
 * name. Names are non-empty UTF-8 without NUL bytes and distinct within a spec.
 *
 * Thread safety: a spec handle is changed only by pwb_spec_add_transform and
 * pwb_spec_set_model; other calls only read it, so one handle may be read from several threads
 * at once, but not while one thread changes it. Distinct handles are independent. */
#define PWB_SPEC_FORMAT_VERSION 1
#define PWB_SPEC_MAX_BYTES 16777216u
#define PWB_SPEC_MAX_LINE 4096u
#define PWB_SPEC_MAX_RECORDS 65536u
#define PWB_SPEC_MAX_NAME 256u

typedef struct pwb_spec pwb_spec; /* opaque */

/* Makes an empty spec. On success *out owns a new handle the caller releases with
 * pwb_spec_free; *out is NULL on failure. Errors: PWB_ERR_ARGUMENT for a NULL out,
 * PWB_ERR_MEMORY. */
PWB_API pwb_status pwb_spec_new(pwb_spec **out);

/* Releases s. NULL is fine. Not to be called while another thread uses s. */
PWB_API void pwb_spec_free(pwb_spec *s);

/* Appends a copy of transform t under name (a NUL-terminated UTF-8 string, copied; neither name
 * nor t is kept). Errors: PWB_ERR_ARGUMENT for a NULL argument, an empty name, a name longer
 * than PWB_SPEC_MAX_NAME bytes or not valid UTF-8, or a name the spec already holds;
 * PWB_ERR_MEMORY past PWB_SPEC_MAX_RECORDS transforms. On failure s is unchanged. */
PWB_API pwb_status pwb_spec_add_transform(pwb_spec *s, const char *name, const pwb_transform *t);

/* Stores the number of transforms in *count. Errors: PWB_ERR_ARGUMENT for NULL arguments. */
PWB_API pwb_status pwb_spec_count(const pwb_spec *s, size_t *count);

/* The name of transform i (0-based, in the order of the text), copied like snprintf: at most cap
 * bytes including the terminating NUL go to buf (which may be NULL when cap is 0), and the full
 * length without NUL is stored in *needed when needed is not NULL. Names may hold any UTF-8
 * text, including spaces and quotes. Errors: PWB_ERR_ARGUMENT for a NULL s or i >= count. */
PWB_API pwb_status pwb_spec_name(const pwb_spec *s, size_t i, char *buf, size_t cap,
                                 size_t *needed);

/* Stores in *index the position of the transform called name (exact, byte-wise match).
 * Errors: PWB_ERR_ARGUMENT for NULL arguments or when no transform has that name. */
PWB_API pwb_status pwb_spec_find(const pwb_spec *s, const char *name, size_t *index);

/* Makes a new transform handle equal to transform i of s. On success *out owns it (release with
 * pwb_transform_free; it does not depend on s, which may be freed first); *out is NULL on
 * failure. Errors: PWB_ERR_ARGUMENT for NULL arguments or i >= count. */
PWB_API pwb_status pwb_spec_transform(const pwb_spec *s, size_t i, pwb_transform **out);

/* Writes s as text into buf. The full length without NUL is stored in *needed when needed is
 * not NULL. Call with buf = NULL and cap = 0 to learn the size; then pass a buffer of at least
 * *needed + 1 bytes, which receives the whole text and a terminating NUL. Unlike snprintf, a
 * buffer too small is an error (PWB_ERR_ARGUMENT; buf then holds "" when cap > 0), so a
 * truncated spec is never produced. Errors: PWB_ERR_ARGUMENT for a NULL s, a NULL buf with
 * cap > 0, or a buffer too small. */
PWB_API pwb_status pwb_spec_write(const pwb_spec *s, char *buf, size_t cap, size_t *needed);

/* Writes s as text to the file at path (created or replaced; the path is passed to the C
 * library as is). Errors: PWB_ERR_ARGUMENT for NULL arguments or a file that cannot be opened or
 * written (the message names the path and the reason). */
PWB_API pwb_status pwb_spec_write_file(const pwb_spec *s, const char *path);

/* Parses len bytes of text (need not be NUL-terminated; NULL only when len is 0). On success
 * *out owns a new spec handle (release with pwb_spec_free); *out is NULL on failure. The reader
 * is strict: PWB_ERR_PARSE, with "spec line L, column C: ..." in pwb_last_error(), for a first
 * line other than "powerback-spec 1" (a newer version is named in the message), unknown records
 * or keys, repeated or missing keys, malformed or out-of-range numbers, NaN or infinite values,
 * bad escapes, NUL bytes or invalid UTF-8 anywhere, lines longer than PWB_SPEC_MAX_LINE, more
 * than PWB_SPEC_MAX_RECORDS transforms, input beyond PWB_SPEC_MAX_BYTES, a missing "end" line or
 * final newline (a truncated file), anything after the end line, and transforms the library
 * would reject (e.g. power with lambda 0). PWB_ERR_ARGUMENT for a NULL out or NULL text with
 * len > 0. */
PWB_API pwb_status pwb_spec_read(const char *text, size_t len, pwb_spec **out);

/* Reads and parses the file at path, as pwb_spec_read does; a file larger than
 * PWB_SPEC_MAX_BYTES is rejected (PWB_ERR_PARSE) after reading at most 64 KiB beyond the limit.
 * Errors as pwb_spec_read, plus PWB_ERR_ARGUMENT for a NULL path or a file that cannot be
 * opened (the message names the path and the reason). */
PWB_API pwb_status pwb_spec_read_file(const char *path, pwb_spec **out);

/* Model records. A spec may also hold one fitted model (see docs/spec-format.md): the response's
 * name, the coefficients in design order (intercept first when there is one) with their names,
 * the residual standard deviation sigma and the residual degrees of freedom df. The transforms of
 * the response and predictors are stored as ordinary transforms. PWB_SPEC_MAX_COEFFICIENTS bounds
 * the number of coefficients. Thread safety as for the rest of the section: pwb_spec_set_model
 * changes s and must not run while another thread uses s. */
#define PWB_SPEC_MAX_COEFFICIENTS 65536u

/* Attaches a model record to s, replacing any earlier one. response and names[0..ncoef-1] are
 * NUL-terminated UTF-8 names (copied; the same rules as transform names, and the coefficient
 * names distinct); coef[0..ncoef-1] the values (copied), NaN marking an aliased coefficient
 * (written NA); sigma finite and >= 0, or NaN when not available (e.g. df = 0). names and coef
 * may be NULL only when ncoef is 0. Errors: PWB_ERR_ARGUMENT for a NULL s or response, NULL
 * arrays with ncoef > 0, a NULL names[j], an invalid or repeated name, an infinite coefficient,
 * a negative or infinite sigma; PWB_ERR_MEMORY when ncoef exceeds PWB_SPEC_MAX_COEFFICIENTS. On
 * failure s is unchanged. */
PWB_API pwb_status pwb_spec_set_model(pwb_spec *s, const char *response, const char *const *names,
                                      const double *coef, size_t ncoef, double sigma, size_t df);

/* Stores 1 in *has when s holds a model record, else 0. Errors: PWB_ERR_ARGUMENT for NULL
 * arguments. */
PWB_API pwb_status pwb_spec_has_model(const pwb_spec *s, int *has);

/* Stores the model's number of coefficients, sigma (NaN when not available) and residual degrees
 * of freedom in those of ncoef, sigma and df that are not NULL. Errors: PWB_ERR_ARGUMENT for a
 * NULL s or a spec without a model record. */
PWB_API pwb_status pwb_spec_model_info(const pwb_spec *s, size_t *ncoef, double *sigma,
                                       size_t *df);

/* The model's response name, copied like pwb_spec_name (snprintf-like into buf of cap bytes; the
 * full length in *needed when needed is not NULL). Errors: PWB_ERR_ARGUMENT for a NULL s or a
 * spec without a model record. */
PWB_API pwb_status pwb_spec_model_response(const pwb_spec *s, char *buf, size_t cap,
                                           size_t *needed);

/* The name of coefficient j (0-based, design order), copied like pwb_spec_name. Errors:
 * PWB_ERR_ARGUMENT for a NULL s, a spec without a model record, or j >= the coefficient count. */
PWB_API pwb_status pwb_spec_model_coef_name(const pwb_spec *s, size_t j, char *buf, size_t cap,
                                            size_t *needed);

/* Copies the model's ncoef coefficients into the caller's coef (NaN for an aliased one). ncoef
 * must equal the count from pwb_spec_model_info. Errors: PWB_ERR_ARGUMENT for a NULL s, a spec
 * without a model record, a different ncoef, or a NULL coef with ncoef > 0. */
PWB_API pwb_status pwb_spec_model_coefficients(const pwb_spec *s, double *coef, size_t ncoef);

/* @@PWB_SECTION_SPEC@@ (declarations of this section go above this line) */




#ifdef __cplusplus
}
#endif

#endif /* POWERBACK_H */
