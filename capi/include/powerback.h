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
 *     sizeof(the struct) (the _init functions do it). Fields appended in a later version are
 *     listed as such beside the struct; a struct_size that ends before such a field leaves it at
 *     its default. A struct_size smaller than the struct's first version gives PWB_ERR_ARGUMENT;
 *     a larger one (from a newer header) is accepted. The _init functions write this version's
 *     whole struct, so a program calls them only on structs declared by this header (within one
 *     SONAME the structs do not change; see the stability note).
 *   - Arrays are owned by the caller: inputs are read, outputs are written, neither is kept after
 *     the call returns. An array of length 0 may be NULL.
 *   - Indices in messages are 0-based.
 *   - No C++ exception and no longjmp ever leaves a function of this header.
 *   - Thread safety: distinct handles may be used from distinct threads at once. One handle may
 *     be read (apply, invert, get_spec) from several threads at once; it is never modified after
 *     creation. pwb_last_error() is per thread.
 *
 * Text. Every function that hands back text it composes (descriptions, notes, names, spec text)
 * takes `char *buf, size_t cap, size_t *needed` and copies like snprintf:
 *   - *needed (when needed is not NULL) receives the full length in bytes, without the NUL;
 *   - at most cap bytes, the NUL included, are written to buf, so the text is cut at cap - 1
 *     bytes and is always NUL-terminated when cap > 0;
 *   - buf = NULL with cap = 0 asks only the length (call again with cap >= *needed + 1); a NULL
 *     buf with cap > 0 is PWB_ERR_ARGUMENT.
 * Truncation is not an error: the text is complete exactly when *needed < cap. The deliberate
 * exceptions return `const char *` to text the library owns, never NULL and never freed: the
 * constant names and notes (pwb_version_string, pwb_status_name, pwb_family_name and the
 * `const char *` note fields of the normality and screen results, all static), and
 * pwb_last_error (per thread, valid until the thread's next powerback call). One legacy field,
 * pwb_screen_result.note, is a fixed char[256] (a copy cut to fit); pwb_screen_variable_with_note
 * gives the whole note by the rule above. Byte buffers are not text: the serialize functions of
 * the summaries write all or nothing (a cap below the size is PWB_ERR_ARGUMENT), since a cut
 * summary is of no use.
 *
 * Parameter order. The handle or the data first (each data array followed by its sizes: x, n
 * or y, X, n, p), then the family where it is a parameter, then the settings of the call (an
 * options struct, NULL for the defaults, or the weights and grid of a profile), then the
 * outputs (a result struct, then caller-owned arrays and their sizes). The family is a
 * parameter of the functions that estimate the power of one family from data: the estimators
 * fixed by the contract (pwb_estimate_lambda, pwb_estimate_response_lambda) and their profile,
 * curve, leave-one-out (pwb_estimate_response_lambda_loo) and summary
 * (pwb_lambda_summary_create) relatives. Everywhere else the family travels as a field of a
 * pwb_transform_spec (or inside a transform handle made from one). Two older entry points that
 * break the rule stay, deprecated: pwb_lambda_influence (family in its options struct) and
 * pwb_lambda_summary_new (family before the size).
 *
 * Stability. Stable: the version, status and error functions, the families, transforms, the
 * lambda estimators with their profiles and curves, the screen, the model (fit, getters,
 * predict, covariance, residual checks) and the text spec. From 0.2 on their signatures and
 * meanings change only through a new function, the old one kept working as deprecated until the
 * next major version; their structs grow only at the end under the struct_size rule.
 * Provisional (may change in any minor version while the major version is 0): the summaries of
 * chunked data (pwb_lambda_summary_*, pwb_lambda_pass_*, pwb_fit_summary_*, pwb_fit_checks_*),
 * the effects (pwb_model_effect_*), Box-Tidwell and leave-one-out influence, the
 * cross-validation helpers and their fast paths (pwb_cv_*, pwb_holdout_*), and the newest
 * additions in every section: functions for many responses at once and mean intervals in
 * predictions. Any change of either kind moves PWB_VERSION_MINOR (and, before 1.0, the SONAME).
 */
#ifndef POWERBACK_H
#define POWERBACK_H

#include <stddef.h>

#ifdef __cplusplus
extern "C" {
#endif

/* PWB_API marks the exported functions. The library's own build defines PWB_BUILDING; a program
 * that links a static build of the library defines PWB_STATIC (the CMake target does both as
 * needed). On Windows it is __declspec(dllexport) when building the DLL and
 * __declspec(dllimport) when using it; elsewhere the default visibility, so that a build with
 * hidden visibility exports exactly these functions. */
#if defined(_WIN32) || defined(__CYGWIN__)
#if defined(PWB_STATIC)
#define PWB_API
#elif defined(PWB_BUILDING)
#define PWB_API __declspec(dllexport)
#else
#define PWB_API __declspec(dllimport)
#endif
#elif defined(PWB_BUILDING) && (defined(__GNUC__) || defined(__clang__))
#define PWB_API __attribute__((visibility("default")))
#else
#define PWB_API
#endif

/* ------------------------------------------------------------------------------------------ */
/* Version                                                                                    */
/* ------------------------------------------------------------------------------------------ */

#define PWB_VERSION_MAJOR 0
#define PWB_VERSION_MINOR 2
#define PWB_VERSION_PATCH 0
/* MAJOR * 10000 + MINOR * 100 + PATCH, e.g. 200 for 0.2.0. While MAJOR is 0 a new MINOR may
 * change the binary interface, so the shared library's SONAME carries both (libpowerback.so.0.2);
 * from 1.0 on it carries MAJOR only. */
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
  PWB_SQRT,        /* v >= 0 */
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
 * the limit -1/lambda means the precision of the original values is exhausted). The text is
 * copied into buf by the text rule at the top of this header. Errors: PWB_ERR_ARGUMENT for a
 * NULL t, a which other than 0 to 4, or a NULL buf with cap > 0. */
PWB_API pwb_status pwb_transform_describe(const pwb_transform *t, int which, char *buf, size_t cap,
                                          size_t *needed);

/* ------------------------------------------------------------------------------------------ */
/* Estimating lambda: univariate and response-given-predictors, profiles                      */
/* ------------------------------------------------------------------------------------------ */

/* Options of the lambda estimators. Initialise with pwb_lambda_options_init, then change fields.
 * lower < upper (both finite, |lower|, |upper| <= 100) is the search range of lambda (beyond
 * +-100 a power follows only the most extreme values: such a range is PWB_ERR_ARGUMENT); level in
 * (0, 1) is the level of the likelihood-ratio confidence interval.
 * weights (appended in 0.1; a struct_size that ends before it means NULL): NULL for equal
 * weights, or n precision weights (variance sigma^2 / w_i, as R's lm), read during the call only
 * and never kept. A weight of 0 drops its row (not counted in n, not in the Jacobian, its values
 * not checked); negative weights are PWB_ERR_ARGUMENT and NaN/Inf ones PWB_ERR_NONFINITE (rows in
 * pwb_lambda_error_rows). With weights the profile below uses the weighted residual sum of
 * squares RSS_w = sum w_i e_i^2 and gains 1/2 sum log w_i, so that at a fixed lambda it equals
 * the weighted normal log-likelihood of the transformed fit (R's logLik of a weighted lm) plus
 * the unweighted Jacobian. The binned fast path serves weighted data too (weighted bin sums).
 * aliased_out, aliased_cap (appended in 0.2; a struct_size that ends before aliased_cap means
 * NULL, 0): an optional caller-owned array of aliased_cap size_t that the response estimators
 * (pwb_estimate_response_lambda, pwb_estimate_response_lambda_curve and
 * pwb_estimate_response_lambdas) fill with the indices of the design columns dropped as aliased
 * (0 = the intercept, 1..p = X's columns), in increasing order; their count is the result's
 * n_aliased. When aliased_cap < n_aliased only the first aliased_cap indices are written (the
 * count still says how many there are; p + 1 always suffices). Nothing is written when the call
 * fails, nor by the univariate estimators. aliased_out may be NULL only when aliased_cap is 0
 * (else PWB_ERR_ARGUMENT).
 * threads (appended in 0.2; a struct_size that ends before it means 1): how many threads
 * pwb_estimate_response_lambdas may use, the calling one included; 0 and 1 both mean the calling
 * thread only (the default). The other estimators ignore it. Results are the same bit for bit
 * for every value. */
typedef struct pwb_lambda_options {
  size_t struct_size; /* sizeof(pwb_lambda_options) */
  double lower, upper; /* search range, default -3, 3 */
  double level;        /* CI level, default 0.95 */
  const double *weights; /* NULL (default) or n precision weights >= 0 */
  size_t *aliased_out;   /* NULL (default) or aliased_cap caller-owned slots */
  size_t aliased_cap;    /* 0 (default) */
  size_t threads;        /* 1 (default): the calling thread only */
} pwb_lambda_options;

/* Sets struct_size and the defaults (-3, 3, 0.95, no weights, no aliased-column output, one
 * thread). NULL is ignored. Thread-safe. */
PWB_API void pwb_lambda_options_init(pwb_lambda_options *opt);

/* The result of a lambda estimate. lambda maximises the profile log-likelihood
 *   l(lambda) = -n/2 (log(2 pi) + 1 + log(RSS(lambda) / n)) + sum log |d psi(v; lambda) / dv|
 * over [lower, upper] (RSS about the mean, or about the least-squares fit in the response case);
 * loglik is l(lambda), on the original scale of the data. [conf_low, conf_high] holds the lambdas
 * whose profile lies within chi2_1(level) / 2 of the maximum. A side whose profile never drops
 * that far inside the range is open: its endpoint is the range edge and low_open / high_open is
 * 1 (a flat profile is a flag, not an error). at_bound is 1 when lambda lies within a few of
 * the maximiser's steps (relative 3e-8 each) of a range edge, however wide the range;
 * converged is 0 when the maximiser or a root search ran out of iterations. convenient is the
 * value of {-2, -1, -1/2, -1/3, 0, 1/3, 1/2, 1, 2} nearest lambda inside the interval (ties: the
 * smaller), or lambda rounded to 2 decimals when none lies inside. rank (intercept included) and
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
 * lower >= upper, a bound beyond +-100, level outside (0, 1), negative weights, a small
 * struct_size). The rows behind a NONFINITE, DOMAIN or negative-weight error are also available
 * as numbers from pwb_lambda_error_rows. opt->weights is honoured. Thread-safe (no shared
 * state). */
PWB_API pwb_status pwb_estimate_lambda(const double *x, size_t n, pwb_family family,
                                       const pwb_lambda_options *opt, pwb_lambda_result *out);

/* Maximum-likelihood lambda of the response y given predictors: psi(y; lambda) = [1 X] b + e with
 * normal e. X: n-by-p, column-major, no intercept column (one is added); p may be 0. The design
 * is factored once, in one pass over its rows (a Householder QR taken block by block; aliased
 * columns dropped as R's lm does, their count in out->n_aliased), and each lambda costs one
 * projection of the transformed y. With opt->weights the rows of positive weight, scaled by
 * sqrt(w), are factored (a copy of them lives during the call). Errors as
 * pwb_estimate_lambda for y, plus PWB_ERR_NONFINITE for non-finite X (the rows in
 * pwb_lambda_error_rows), PWB_ERR_SINGULAR when n <= rank + 1, and PWB_ERR_SINGULAR when the
 * predictors fit the transformed y exactly at lambda-hat (1 - R^2 < 1e-12: the likelihood has no
 * maximum there, and any estimate or interval would be arbitrary). Thread-safe. */
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

/* Weighted forms of the two profile functions above: weights as in pwb_lambda_options (NULL
 * for equal weights; n values otherwise). The grid values the binned series cannot serve are
 * evaluated together, in one pass over the rows for the whole grid. Errors and thread-safety
 * as pwb_lambda_profile / pwb_response_lambda_profile. */
PWB_API pwb_status pwb_lambda_profile_weighted(const double *x, size_t n, pwb_family family,
                                               const double *weights, const double *grid,
                                               size_t n_grid, double *loglik_out);
PWB_API pwb_status pwb_response_lambda_profile_weighted(const double *y, const double *X,
                                                        size_t n, size_t p, pwb_family family,
                                                        const double *weights, const double *grid,
                                                        size_t n_grid, double *loglik_out);

/* Which input the rows of a failed lambda call belong to. */
typedef enum pwb_lambda_input {
  PWB_LAMBDA_INPUT_NONE = -1,  /* the last failure was not about particular rows */
  PWB_LAMBDA_INPUT_RESPONSE = 0, /* y (or x, univariate) */
  PWB_LAMBDA_INPUT_PREDICTORS = 1, /* a row of X with a non-finite value */
  PWB_LAMBDA_INPUT_WEIGHTS = 2 /* a negative or non-finite weight */
} pwb_lambda_input;

/* The rows behind this thread's last failing lambda call (the estimators, profiles and curves
 * above), as numbers, so that a front end can name them in its own convention without scanning
 * the data again. Returns how many rows were at fault (0 when the last lambda call succeeded or
 * its failure was not about rows); writes the first min(that count, cap, 8) of them, 0-based in
 * the caller's numbering and ascending, to rows (may be NULL when cap is 0) and the input they
 * belong to to *input (may be NULL). The pwb_status of that call says what was wrong (NONFINITE,
 * DOMAIN for Box-Cox's y <= 0, ARGUMENT for negative weights). Never fails; per thread. */
PWB_API size_t pwb_lambda_error_rows(size_t *rows, size_t cap, int *input);

/* Response lambdas of q responses against ONE shared design, each as
 * pwb_estimate_response_lambda_curve would give it alone (the same numbers to rounding), with the
 * design [1 X] read and factored once: one blocked pass over X's rows builds its R and decides
 * its rank while every response's binned sums are gathered; then each response is searched on
 * its own. Y: n-by-q, column-major (column j is response j); X: n-by-p as for
 * pwb_estimate_response_lambda; opt as there (the weights are shared by every response; the
 * aliased columns of the shared design go to opt->aliased_out once, when at least one response
 * was estimated). All inputs are read during the call only.
 * out: caller-owned array of q pwb_lambda_result. Set each element's struct_size (e.g. with
 *   pwb_lambda_result_init on each); the array's stride is taken as out[0].struct_size, so every
 *   element must carry the same value (at least sizeof(pwb_lambda_result) of this header).
 * status_out: caller-owned array of q pwb_status, or NULL: PWB_OK where out[j] was written, else
 *   the status of response j's failure.
 * n_grid: 0 for no profile curves (grid_out and loglik_out may then be NULL), else >= 2 and
 *   grid_out, loglik_out caller-owned arrays of q * n_grid doubles: response j's curve (as
 *   pwb_estimate_response_lambda_curve's) at offsets j * n_grid; NaN for a failed response.
 * Failures of one response (PWB_ERR_DOMAIN for values <= 0 under Box-Cox, PWB_ERR_NONFINITE,
 *   PWB_ERR_ARGUMENT for a constant column or fewer than 3 usable values, PWB_ERR_SINGULAR for an
 *   exact fit) do not stop the others: every other response is written, and the call returns the
 *   status of the FIRST failing response, whose message (naming it "Y column j (0-based)") is
 *   this thread's pwb_last_error() text and whose rows are in pwb_lambda_error_rows(). For the
 *   message of a later failing response, call pwb_estimate_response_lambda on that column.
 * Failures of the shared inputs (NULL pointers, q == 0, n_grid == 1, bad options or weights,
 *   non-finite X, n <= rank + 1, an element's struct_size too small or unequal) stop the call:
 *   nothing is written to out, every status_out[j] (when given) is set to the returned status.
 * Returns PWB_OK when every response was estimated. Thread-safe (no shared state; the error
 * text and rows are per thread).
 * Threads: with opt->threads > 1 the responses are prepared, gathered and searched on up to that
 *   many threads started for the call and joined before it returns (the calling thread among
 *   them); every output, status and message is the same as with one thread. Only the calling
 *   thread asks the check installed with pwb_set_interrupt_check (so a check that calls into an
 *   interpreter stays on that interpreter's thread); the other threads stop at their next
 *   step when it says stop, and the call returns PWB_ERR_CANCELLED. The inputs must not change
 *   during the call. */
PWB_API pwb_status pwb_estimate_response_lambdas(const double *Y, size_t n, size_t q,
                                                 const double *X, size_t p, pwb_family family,
                                                 const pwb_lambda_options *opt,
                                                 pwb_lambda_result *out, pwb_status *status_out,
                                                 size_t n_grid, double *grid_out,
                                                 double *loglik_out);

/* End of section: estimating lambda (add new declarations above). */



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

/* The thresholds of the ladder rule pwb_ladder_recommend applies, as the library holds them, so
 * that front ends report them without copying the numbers. */
typedef struct pwb_ladder_rule {
  size_t struct_size;    /* sizeof(pwb_ladder_rule) */
  size_t large_n;        /* from this n on, skew is judged by |G1|, below it by |z| (300) */
  double z_cut;          /* |z| above this is skewed when n < large_n (3.29) */
  double size_cut;       /* |G1| above this is skewed when n >= large_n (0.5) */
  double log10_cut;      /* |G1| above this takes log10 instead of the square root (1) */
  double reciprocal_cut; /* |G1| above this takes the reciprocal instead of log10 (2) */
} pwb_ladder_rule;

/* Writes the ladder rule's thresholds to *out, whose struct_size the caller sets to
 * sizeof(pwb_ladder_rule). Errors: PWB_ERR_ARGUMENT for NULL out or a struct_size too small;
 * nothing else. Thread-safe (constants only). */
PWB_API pwb_status pwb_ladder_rule_get(pwb_ladder_rule *out);

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
  char note[256];                /* why not usable, or why ml_done is 0; "" otherwise. Cut to
                                    255 bytes: pwb_screen_variable_with_note gives it whole */
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

/* As pwb_screen_variable, and the whole note (out->note holds at most 255 bytes of it) copied
 * into buf by the text rule at the top of this header. Errors as pwb_screen_variable, and
 * PWB_ERR_ARGUMENT for a NULL buf with cap > 0. Thread-safe. */
PWB_API pwb_status pwb_screen_variable_with_note(const double *x, size_t n,
                                                 const pwb_screen_options *opt,
                                                 pwb_screen_result *out, char *buf, size_t cap,
                                                 size_t *needed);

/* End of section: screening variables (add new declarations above). */



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
  const double *weights;       /* n precision weights (variance sigma^2 / w_i, as R's lm), or
                                  NULL (default) for none. Each must be finite and >= 0; a zero
                                  weight drops the row from the fit (it keeps a fitted value and a
                                  residual, leverage 0). Read only during pwb_model_fit (copied).
                                  Absent (NULL) when struct_size does not reach this field. */
  int borrow_design;           /* 0 (default): X is copied and the caller may free it once
                                  pwb_model_fit returns. Nonzero: X is the FULL design, n-by-
                                  (p + 1) with a first column of ones when intercept is set
                                  (checked: PWB_ERR_ARGUMENT otherwise), n-by-p without (p still
                                  counts the predictors alone, as in pwb_model_predict), and an
                                  unweighted model reads it in place instead of keeping its own
                                  copy (n x columns doubles spared): X stays owned by the caller,
                                  who must keep it alive and unchanged until pwb_model_free of the
                                  handle. Reading the handle from several threads stays safe as
                                  long as nobody writes X. A weighted model keeps its own weighted
                                  rows and reads X only during pwb_model_fit. Results are the same
                                  bit for bit either way. Absent (0) when struct_size does not
                                  reach this field. */
} pwb_model_options;

/* Sets struct_size and the defaults (intercept 1, estimated_parameters 0, weights NULL,
 * borrow_design 0). NULL is ignored. */
PWB_API void pwb_model_options_init(pwb_model_options *opt);

/* Fits the model. y: n raw responses (original units); X: n-by-p predictors, column-major,
 * without an intercept column (X may be NULL when p is 0), or the full design read in place
 * when opt->borrow_design is set (see pwb_model_options); response: the transform T of y, or
 * NULL for none (it is copied; the caller may free it afterwards); opt may be NULL (defaults).
 * On success *out owns a new handle the caller releases with pwb_model_free; on failure *out is
 * NULL. Errors: PWB_ERR_ARGUMENT for NULL y or out, n == 0, a struct_size too small;
 * PWB_ERR_NONFINITE for non-finite X or y (the first row and column named, 0-based);
 * PWB_ERR_DOMAIN when T cannot be applied to some y (count and first rows in the message);
 * PWB_ERR_DOMAIN for negative or non-finite weights (count and first rows, 0-based);
 * PWB_ERR_SINGULAR when every column is zero, every weight is zero or no residual degrees of
 * freedom remain. With weights the fit is weighted least squares on the rows of positive
 * weight; sigma, rss (sum of w e^2), standard errors and the log-likelihood are those of R's lm
 * with the same weights (loglik: 1/2 sum log w - N/2 (log(2 pi) + 1 - log N + log rss) plus the
 * unweighted Jacobian, over the N rows of positive weight).
 * Thread-safe (touches only its arguments; a borrowed X is read again by later calls on the
 * handle, so it must not be written while the handle lives). */
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
  size_t nobs;         /* rows in the fit: those of positive weight (n when unweighted) */
  int weighted;        /* 1 when the model was fitted with weights */
} pwb_model_info;

/* Fills *info. Fields beyond the caller's struct_size are not written (a caller built against an
 * older header gets the fields it knows). Errors: PWB_ERR_ARGUMENT for NULL arguments or a
 * struct_size smaller than the first version of the struct (up to `jacobian`). */
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
  PWB_MEAN_NORMAL        /* E[T^{-1}(Z) | Z in range], Z ~ N(x'b, sigma^2) truncated to the
                            range of T^{-1}: exp(mu + sigma^2/2) for log (and its log10
                            analogue), adaptive quadrature otherwise; see tail_mass below */
} pwb_mean_method;

typedef struct pwb_predict_options {
  size_t struct_size;          /* sizeof(pwb_predict_options) */
  double level;                /* interval level in (0, 1); default 0.95 */
  pwb_interval interval;       /* default PWB_INTERVAL_NONE */
  pwb_center center;           /* default PWB_CENTER_MEDIAN */
  pwb_mean_method mean_method; /* default PWB_MEAN_SMEARING */
  int transformed_scale;       /* 1: report on the transformed scale, no back-transform (0) */
  double *tail_mass;           /* optional output, `rows` doubles (default NULL: not wanted) */
} pwb_predict_options;

/* Sets struct_size and the defaults above. NULL is ignored.
 *
 * The normal-theory mean (PWB_CENTER_MEAN with PWB_MEAN_NORMAL) is defined for every family
 * and lambda as the mean of T^{-1}(Z) with Z ~ N(x'b, sigma^2) truncated to the range of T^{-1}
 * (the whole line for log, log10, identity, asinh, logit, Yeo-Johnson with 0 <= lambda <= 2,
 * power with lambda > 0; a half-line otherwise, e.g. 1 + lambda z > 0 for Box-Cox). The
 * normal mass beyond the limit is cut off and the rest renormalised; when tail_mass is not
 * NULL, tail_mass[i] receives that mass for row i (0 without a limit), NaN for rows with a
 * missing predictor and for every row when the normal-theory mean is not requested. The mean
 * is +Inf (or -Inf) with PWB_PRED_BOUNDED where T^{-1} grows at the limit like
 * distance^p with p <= -1 (Box-Cox and Yeo-Johnson with -1 <= lambda < 0, Yeo-Johnson with
 * 2 < lambda <= 3, reciprocal, power with -1 <= lambda < 0): the truncated density is positive
 * at the limit and the integral diverges however small the mass beyond. tail_mass was
 * appended to the struct: a caller whose struct_size ends before it gets no tail masses. */
PWB_API void pwb_predict_options_init(pwb_predict_options *opt);

/* Flags of a predicted row (bits of flags[i]). */
#define PWB_PRED_BOUNDED 1u /* fit or an endpoint lay beyond the range of T's inverse and was
                               set to its limit (0 or +Inf of the family's argument, mapped
                               through the shift and reflection), or overflowed */
#define PWB_PRED_MISSING 2u /* the row of Xnew had a NaN or infinite entry; outputs are NaN */
#define PWB_PRED_OVERFLOW 4u /* every entry of the row was finite but x'b overflowed the double
                                range (a predictor or coefficient of extreme magnitude): fit,
                                lwr and upr are NaN; or only the interval's half-width
                                overflowed: lwr and upr are NaN, fit is kept */

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

/* Predicts at the model's own rows, as pwb_model_predict would with the training design, without
 * the caller rebuilding that design: fit/lwr/upr/flags as there, `rows` must equal
 * pwb_model_info.n. Rows of zero weight in a weighted model are not stored by the model: they
 * come back NaN with PWB_PRED_MISSING. Errors: as pwb_model_predict, and PWB_ERR_ARGUMENT for
 * another `rows`. Thread-safe for one m. */
PWB_API pwb_status pwb_model_predict_fitted(const pwb_model *m, const pwb_predict_options *opt,
                                            double *fit, double *lwr, double *upr,
                                            unsigned *flags, size_t rows);

/* The coefficient covariance sigma^2 (X'WX)^{-1} (W = I unweighted), columns-by-columns,
 * column-major, into the caller's array cov of columns * columns doubles (columns =
 * pwb_model_info.columns, intercept first); rows and columns of aliased coefficients are NaN (R's
 * vcov.lm gives NA there). Errors: PWB_ERR_ARGUMENT for a NULL m or cov, or a columns other than
 * the model's. Thread-safe for one m. */
PWB_API pwb_status pwb_model_covariance(const pwb_model *m, double *cov, size_t columns);

/* Standard errors of the transformed-scale fit x0'b at `rows` new rows (R's
 * predict.lm(se.fit = TRUE)): se[i] = sigma sqrt(x0' (X'WX)^{-1} x0). Xnew as in
 * pwb_model_predict (rows-by-p, column-major, without the intercept column); a row with a NaN
 * or infinite entry gets NaN. se: caller-owned, `rows` doubles. Errors: PWB_ERR_ARGUMENT for a
 * NULL m or se, or p other than the fit's. Thread-safe for one m. */
PWB_API pwb_status pwb_model_predict_se(const pwb_model *m, const double *Xnew, size_t rows,
                                        size_t p, double *se);

/* The residual checks of m (see pwb_model_residual_checks) and their Shapiro-Wilk note, computed
 * once: *out as pwb_model_residual_checks fills it, the note copied into buf by the text rule
 * at the top of this header. A weighted model is checked through its weighted regression: the
 * residuals sqrt(w) e and the design sqrt(w) [1 X] over the rows of positive weight. Errors:
 * PWB_ERR_ARGUMENT for a NULL m or out, a struct_size too small, or a NULL buf with cap > 0.
 * Thread-safe for one m. */
struct pwb_residual_checks;
PWB_API pwb_status pwb_model_residual_checks_with_note(const pwb_model *m,
                                                       struct pwb_residual_checks *out,
                                                       char *buf, size_t cap, size_t *needed);

/* Confidence intervals for the original-scale MEAN of y (not the median) at new rows, or for the
 * average of those means over groups of rows (e.g. one station and season). The mean is the
 * smearing or the normal-theory mean of pwb_predict_options (a back-transformed fit T^{-1}(x'b)
 * is a median and needs this correction to estimate a mean). Two methods:
 *   PWB_MEAN_INTERVAL_DELTA: first-order variance of the mean estimate, counting the
 *     coefficients' error (including its effect on the residuals the smearing mean averages), the
 *     residual average (smearing) or sigma-hat (normal theory, var sigma^2-hat = 2 sigma^4 / df);
 *     standard normal quantiles; formed on log(mean) and exponentiated when the mean is positive
 *     (else mean -+ z se, flag PWB_MEAN_LINEAR_SCALE). For the log family on an intercept-only
 *     model the normal-theory interval is the Cox interval for a lognormal mean.
 *   PWB_MEAN_INTERVAL_BOOTSTRAP: `replicates` residual-bootstrap refits on the fixed design
 *     (modified residuals e sqrt(n/df), centred), percentile interval (R's quantile type 7);
 *     deterministic for a given seed on every platform.
 * Both treat the response transform as KNOWN: when lambda was estimated from the same data its
 * uncertainty is not included. See core/include/powerback/mean_interval.hpp for the formulas,
 * the cost and the accuracy. */
typedef enum pwb_mean_interval_method {
  PWB_MEAN_INTERVAL_DELTA = 0,
  PWB_MEAN_INTERVAL_BOOTSTRAP
} pwb_mean_interval_method;

typedef struct pwb_mean_interval_options {
  size_t struct_size;              /* sizeof(pwb_mean_interval_options) */
  double level;                    /* interval level in (0, 1); default 0.95 */
  pwb_mean_method mean_method;     /* default PWB_MEAN_SMEARING */
  pwb_mean_interval_method method; /* default PWB_MEAN_INTERVAL_DELTA */
  size_t replicates;               /* bootstrap replicates, at least 10; default 999 */
  unsigned long long seed;         /* bootstrap seed; default 1 */
  const size_t *group;             /* NULL (each row is an output; default) or `rows` group ids
                                      in 0..n_groups-1, each used at least once; read only
                                      during the call */
  size_t n_groups;                 /* number of groups when group is not NULL; default 0 */
} pwb_mean_interval_options;

/* Sets struct_size and the defaults above. NULL is ignored. */
PWB_API void pwb_mean_interval_options_init(pwb_mean_interval_options *opt);

/* Flags of a mean interval (bits of flags[k], besides PWB_PRED_BOUNDED and PWB_PRED_MISSING,
 * which mark an output with a row at a range limit or with a missing predictor; a missing row
 * makes its whole output NaN). */
#define PWB_MEAN_LINEAR_SCALE 4u     /* the interval is mean -+ z se (mean not positive) */
#define PWB_MEAN_REPLICATE_FAILED 8u /* bootstrap: a replicate's mean was not finite; interval
                                        NaN */

/* Intervals for the original-scale mean. Xnew: rows-by-p, column-major, the fit's p predictor
 * columns (NULL allowed when rows or p is 0). `outputs` must be opt->n_groups when opt->group is
 * not NULL, else rows. Writes fit[k] (the mean estimate) always and, when the pointers are not
 * NULL, se[k] (delta: its standard error; bootstrap: the replicates' SD), lwr[k], upr[k] and
 * flags[k]; every array is caller-owned with `outputs` elements. opt may be NULL (defaults).
 * Errors: PWB_ERR_ARGUMENT for a NULL m or fit, p other than the fit's, a level outside (0, 1),
 * unknown enum values, a struct_size too small, a group id out of range or a group without
 * rows, a wrong `outputs`, fewer than 10 replicates or more than 2^26 replicates x outputs;
 * PWB_ERR_CANCELLED when the interrupt check stops the bootstrap. Thread-safe for one m. */
PWB_API pwb_status pwb_model_predict_mean_interval(const pwb_model *m, const double *Xnew,
                                                   size_t rows, size_t p,
                                                   const pwb_mean_interval_options *opt,
                                                   double *fit, double *se, double *lwr,
                                                   double *upr, unsigned *flags, size_t outputs);

/* End of section: models on the transformed scale (add new declarations above). */

/* ------------------------------------------------------------------------------------------ */
/* Effects in original units                                                                  */
/* ------------------------------------------------------------------------------------------ */

/* A model's coefficients read as effects on the original-scale median g(x'b), g = T^{-1}:
 * a percent change for a log-type response (log, log10, Box-Cox 0, without shift or
 * reflection), where moving the design by c multiplies the median by exp(a c'b) (a = 1, or
 * ln 10 for log10); an elasticity (a_y / a_x) b_j when the predictor column is log-type too; and
 * for any response the change g(x1'b) - g(x0'b) between two design rows with a delta-method
 * standard error (gradient g'(x1'b) x1 - g'(x0'b) x0, covariance sigma^2 (X'X)^{-1}).
 * Intervals use Student t quantiles with the residual df: percent-change endpoints are the t
 * interval of c'b mapped through 100 (exp(a .) - 1); the others are estimate -+ t se. Aliased
 * coefficients count as 0. All functions below only read m: thread-safe for one m. */
typedef struct pwb_effect {
  size_t struct_size; /* sizeof(pwb_effect), set by the caller (or _init) */
  double estimate;    /* the effect: percent, elasticity or change in the median */
  double se;          /* its standard error (delta method for the percent and the change) */
  double lower;       /* confidence interval at the requested level */
  double upper;
  double median0;     /* pwb_model_effect_median_change only: g(x0'b) and g(x1'b); else NaN */
  double median1;
} pwb_effect;

/* Sets struct_size and every value to NaN. NULL is ignored. */
PWB_API void pwb_effect_init(pwb_effect *out);

/* Percent change of the median for the design contrast `contrast` (length `columns`, intercept
 * first when the model has one; e.g. a unit vector for "per unit of column j", or x1 - x0).
 * Errors: PWB_ERR_ARGUMENT for NULL arguments, columns other than the model's, a level outside
 * (0, 1), a struct_size too small, or a response that is not log-type (the message says to use
 * pwb_model_effect_median_change). */
PWB_API pwb_status pwb_model_effect_percent(const pwb_model *m, const double *contrast,
                                            size_t columns, double level, pwb_effect *out);

/* Elasticity d log median / d log x of the variable behind design column `column` (0-based,
 * intercept included), whose transform is `predictor` (copied, not kept). Errors:
 * PWB_ERR_ARGUMENT for NULL arguments, a column out of range, a level outside (0, 1), or a
 * response or predictor that is not log-type. */
PWB_API pwb_status pwb_model_effect_elasticity(const pwb_model *m, size_t column,
                                               const pwb_transform *predictor, double level,
                                               pwb_effect *out);

/* Change in the median from design row x0 to x1 (each `columns` long, intercept included),
 * with its delta-method standard error and interval. A row whose fit lies beyond the range of
 * T^{-1} gives NaN estimate and se. Errors: PWB_ERR_ARGUMENT for NULL arguments, columns other
 * than the model's, a level outside (0, 1), a struct_size too small. */
PWB_API pwb_status pwb_model_effect_median_change(const pwb_model *m, const double *x0,
                                                  const double *x1, size_t columns, double level,
                                                  pwb_effect *out);

/* End of section: effects in original units (add new declarations above). */



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
 * copied into buf by the text rule at the top of this header. Errors: PWB_ERR_ARGUMENT for a
 * NULL m or a NULL buf with cap > 0. */
PWB_API pwb_status pwb_model_residual_checks_note(const pwb_model *m, char *buf, size_t cap,
                                                  size_t *needed);

/* End of section: residual diagnostics (add new declarations above). */



/* ------------------------------------------------------------------------------------------ */
/* Comparing transforms: cross-validation, lambda influence, Box-Tidwell                      */
/* ------------------------------------------------------------------------------------------ */

/* Options of pwb_box_tidwell. */
typedef struct pwb_box_tidwell_options {
  size_t struct_size;   /* sizeof(pwb_box_tidwell_options) */
  int max_iter;         /* iterations of the power update; default 50 */
  double tol;           /* converged when every power changes by less than tol; default 1e-6 */
  double max_abs_power; /* a power beyond +-this stops the iteration (not converged); default 20 */
  /* Fields below were appended in 0.2; a smaller struct_size leaves them at their defaults. */
  double level;          /* level of the Wald intervals; the advice tests at 1 - level; 0.95 */
  const double *weights; /* n precision weights >= 0 (a zero weight drops the row), or NULL */
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
  size_t n;           /* rows used (weight > 0) */
  /* Fields below were appended in 0.2 and are read by pwb_box_tidwell_fit only: caller-owned
   * output buffers, m values each unless said otherwise; any may be NULL to skip it. */
  double *alpha;      /* the powers */
  double *se;         /* their standard errors */
  double *conf_low;   /* Wald interval at opt->level: alpha -+ z se, z the normal quantile */
  double *conf_high;
  double *score_t;    /* score test of power 1: t statistic of X_j log X_j */
  double *score_p;    /* its two-sided p-value */
  int *advice;        /* PWB_BT_LINEAR, PWB_BT_LOG or PWB_BT_POWER (see pwb_box_tidwell_fit) */
  double *suggested;  /* the advised power: 1 (linear), 0 (log) or the convenient power */
  double *history;    /* m * (max_iter + 1) values: history[k*m + j] is power j after k updates */
} pwb_box_tidwell_result;

/* The advice of pwb_box_tidwell_fit for one variable. */
#define PWB_BT_LINEAR 0 /* leave the variable linear */
#define PWB_BT_LOG 1    /* take its log */
#define PWB_BT_POWER 2  /* raise it to the suggested power */

/* Box & Tidwell (1962) powers a_j of the m positive predictors X in
 *   y = b0 + sum_j b_j X_j^(a_j) + Z c + e,
 * iterated from a_j = 1 by the linearised update until every power changes by less than tol.
 * y: n values. Z: n-by-q other predictors, column-major, no intercept column (one is added);
 * NULL when q is 0. X: n-by-m, column-major, every value > 0 (rows of weight 0 excepted).
 * opt: NULL for the defaults. With opt->weights every fit is weighted least squares (precision
 * weights, as R's lm).
 * out: struct_size set; its summary fields are written, and its buffer fields (caller-owned;
 * each may be NULL) receive: alpha, se (from the linearised fit at the final powers), the Wald
 * interval conf_low/conf_high at opt->level, score_t and score_p (t statistic and two-sided
 * p-value of the added column X_j log X_j in the fit with every X linear: the test of power 1),
 * advice and suggested, and history (m * (max_iter + 1) values: column k holds the powers after
 * k updates, column 0 all 1, NaN after the last). The advice is PWB_BT_LINEAR (suggested 1) when
 * the score test does not reject at 1 - level or the interval holds 1; otherwise the convenient
 * power inside the interval (pwb_convenient_lambda's rule) as PWB_BT_LOG
 * when it is 0, else PWB_BT_POWER.
 * Non-convergence is reported in out->converged, not as an error; the powers are then the last
 * finite iterate. Errors: PWB_ERR_ARGUMENT (NULL y, X or out, m == 0, n too small for the fit,
 * bad options or struct_size); PWB_ERR_NONFINITE and PWB_ERR_DOMAIN (a non-finite value, an X
 * value <= 0, a negative weight: the message names the variable or the weights, the count and
 * the first rows); PWB_ERR_SINGULAR (a variable aliased with the others or with a zero
 * coefficient). Thread-safe: reads only its arguments. */
PWB_API pwb_status pwb_box_tidwell_fit(const double *y, const double *Z, size_t n, size_t q,
                                       const double *X, size_t m,
                                       const pwb_box_tidwell_options *opt,
                                       pwb_box_tidwell_result *out);

/* Deprecated since 0.2 (kept working for callers of 0.1; use pwb_box_tidwell_fit, whose options
 * and result structs replace this function's 13 parameters): the same run with the
 * outputs as separate arguments. alpha and se are required (m values each); score_t, score_p
 * and history may be NULL (history: m * (max_iter + 1) values, max_iter 50 when opt is NULL).
 * out needs only the 0.1 fields (its buffer fields are not read). Errors as pwb_box_tidwell_fit.
 * Thread-safe. */
PWB_API pwb_status pwb_box_tidwell(const double *y, const double *Z, size_t n, size_t q,
                                   const double *X, size_t m, const pwb_box_tidwell_options *opt,
                                   double *alpha, double *se, double *score_t, double *score_p,
                                   double *history, pwb_box_tidwell_result *out);

/* Options of pwb_estimate_response_lambda_loo (and the deprecated pwb_lambda_influence). */
typedef struct pwb_influence_options {
  size_t struct_size; /* sizeof(pwb_influence_options) */
  pwb_family family;  /* PWB_BOX_COX (default) or PWB_YEO_JOHNSON; read only by the deprecated
                         pwb_lambda_influence (pwb_estimate_response_lambda_loo takes it as
                         a parameter) */
  double lower, upper; /* lambda search range; default -3, 3 */
  double level;       /* level of the full-data likelihood-ratio interval; default 0.95 */
  /* Appended in 0.2; a smaller struct_size leaves it NULL. */
  const double *weights; /* n precision weights >= 0 (a zero weight drops the row), or NULL */
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
                       /* (counted by the core; equals the number of outside[i] == 1) */
  size_t n_loo_at_bound; /* rows whose leave-one-out lambda-hat is at a range end */
} pwb_influence_summary;

/* Deprecated since 0.2 (the family belongs among the parameters): use
 * pwb_estimate_response_lambda_loo, which takes it after p; this form reads opt->family.
 * Leave-one-out maximum-likelihood lambda of the response y given predictors X (n-by-p,
 * column-major, no intercept column; NULL when p is 0): for each row i, the lambda-hat of the
 * data without row i. The design is factored once; each row's profile is the full-data profile
 * corrected by the deletion identity RSS_(i) = RSS - e_i^2 / (1 - h_ii), with the full profile
 * and the residuals interpolated on a window around lambda-hat (rows whose maximum leaves the
 * window are solved on the exact profile), so the cost grows linearly in n and every answer is
 * the leave-one-out maximiser to the search's tolerance. With opt->weights the profile is the
 * weighted one (weighted residual sum of squares, unweighted Jacobian) and a zero-weight row is
 * not used (its loo_lambda is the full lambda-hat, its leverage 0).
 * Outputs (caller-owned, n values each; any may be NULL to skip it): loo_lambda, leverage (h_ii),
 * outside (1 when loo_lambda[i] lies outside the full-data interval), at_bound (1 when
 * loo_lambda[i] is at a range end). Errors: as for the full estimate (PWB_ERR_NONFINITE,
 * PWB_ERR_DOMAIN with count and first rows, for y and for the weights; PWB_ERR_ARGUMENT for bad
 * options or NULL y, summary), and PWB_ERR_SINGULAR when fewer than rank + 3 rows leave no
 * residual degrees of freedom once a row is out. Thread-safe: reads only its arguments. */
PWB_API pwb_status pwb_lambda_influence(const double *y, const double *X, size_t n, size_t p,
                                        const pwb_influence_options *opt,
                                        pwb_influence_summary *summary, double *loo_lambda,
                                        double *leverage, int *outside, int *at_bound);

/* Leave-one-out lambda with the family as a parameter, in the order of
 * pwb_estimate_response_lambda: the same computation, outputs and errors as
 * pwb_lambda_influence, whose opt->family is not read here (family: PWB_BOX_COX or
 * PWB_YEO_JOHNSON; another value is PWB_ERR_ARGUMENT). pwb_lambda_influence, which takes the
 * family from its options, is deprecated since 0.2 and kept working. Thread-safe. */
PWB_API pwb_status pwb_estimate_response_lambda_loo(const double *y, const double *X, size_t n,
                                                    size_t p, pwb_family family,
                                                    const pwb_influence_options *opt,
                                                    pwb_influence_summary *summary,
                                                    double *loo_lambda, double *leverage,
                                                    int *outside, int *at_bound);

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
  size_t n_nonfinite; /* rows whose fit is not finite: left out of rmse, mae and r2 and
                         counted here, never dropped silently */
  /* Fields below are filled only when struct_size covers them. */
  size_t n_point;         /* rows scored by rmse, mae and r2 (a finite fit) */
  size_t n_interval;      /* rows scored by coverage and the widths (neither end NaN) */
  double median_width;    /* median (upr - lwr) over those rows; Inf when most are unbounded */
  double share_unbounded; /* share of those rows whose interval has an infinite end */
} pwb_holdout_scores;

/* Scores n held-out responses y against predictions fit and, when both are given, the interval
 * [lwr, upr] (lwr and upr may both be NULL). Each statistic uses the rows where it is defined:
 * rmse, mae and r2 the rows with a finite fit (NaN when there are none); coverage and widths
 * the rows whose interval ends are not NaN. An infinite end (a back-transform whose range is
 * unbounded) still covers on its side; it makes mean_width infinite, so median_width and
 * share_unbounded describe such intervals. A struct_size that ends before n_point is accepted
 * (the fields it lacks are not written). All arrays caller-owned, n values. Errors:
 * PWB_ERR_ARGUMENT for n == 0, NULL y, fit or out, only one interval end, a struct_size too
 * small; PWB_ERR_NONFINITE for a non-finite y (count and first rows named). Thread-safe. */
PWB_API pwb_status pwb_holdout_score(const double *y, const double *fit, const double *lwr,
                                     const double *upr, size_t n, pwb_holdout_scores *out);

/* Options of pwb_holdout_score_opts. Initialise with pwb_holdout_options_init (no weights),
 * then change fields; fields appended later are absent (default) for a smaller struct_size. */
typedef struct pwb_holdout_options {
  size_t struct_size;     /* sizeof(pwb_holdout_options) */
  const double *weights;  /* NULL (unit weights), or n precision weights >= 0, caller-owned */
} pwb_holdout_options;

/* Sets every field of *opt to its default (no-op for NULL). Thread-safe. */
PWB_API void pwb_holdout_options_init(pwb_holdout_options *opt);

/* As pwb_holdout_score, with options (opt may be NULL: the defaults). With weights, every score
 * is a weighted mean over the rows where it is defined (rmse = sqrt(sum w e^2 / sum w), mae,
 * r2 about the weighted mean of y, coverage, mean_width, share_unbounded) and median_width is
 * the weighted median; a zero weight contributes nothing (the row is still counted in n,
 * n_point and n_interval) and a statistic whose rows weigh 0 in total is NaN. Unit weights give
 * pwb_holdout_score's scores. Errors: as pwb_holdout_score; PWB_ERR_NONFINITE for a non-finite
 * weight and PWB_ERR_DOMAIN for a negative one (count and first 0-based rows named);
 * PWB_ERR_ARGUMENT for an opt->struct_size too small. Thread-safe: reads only its arguments. */
PWB_API pwb_status pwb_holdout_score_opts(const double *y, const double *fit, const double *lwr,
                                          const double *upr, size_t n,
                                          const pwb_holdout_options *opt,
                                          pwb_holdout_scores *out);

/* Options of pwb_cv_folds_by. Initialise with pwb_cv_fold_options_init (5 folds, 1 repeat,
 * seed 0, neither strata nor groups), then change fields. */
typedef struct pwb_cv_fold_options {
  size_t struct_size;       /* sizeof(pwb_cv_fold_options) */
  int folds;                /* k >= 2 */
  int repeats;              /* >= 1 */
  unsigned long long seed;  /* the same seed gives the same folds on every platform */
  const int *strata;        /* NULL, or n stratum codes >= 0 (e.g. a factor's level numbers) */
  const int *groups;        /* NULL, or n group codes >= 0 (a site, patient, station, ...) */
} pwb_cv_fold_options;

/* Sets every field of *opt to its default (no-op for NULL). Thread-safe. */
PWB_API void pwb_cv_fold_options_init(pwb_cv_fold_options *opt);

/* Repeated k-fold assignment as pwb_cv_folds, stratified or grouped. With strata, each repeat's
 * shuffled rows are dealt stratum by stratum to consecutive folds, so a stratum of m rows lands
 * in min(m, folds) folds: every stratum with at least 2 rows keeps a row in every training part,
 * and fold sizes differ by at most one. With groups, all rows of a group share a fold: the
 * shuffled groups go, one by one, to the fold with the fewest rows so far. Without either, the
 * folds equal pwb_cv_folds' for the same seed. fold: caller-owned, n * repeats values.
 * Errors: PWB_ERR_ARGUMENT for NULL opt or fold, a struct_size too small, folds < 2,
 * repeats < 1, n < folds, a negative code, both strata and groups, or fewer groups than folds.
 * Thread-safe: reads only its arguments. */
PWB_API pwb_status pwb_cv_folds_by(size_t n, const pwb_cv_fold_options *opt, int *fold);

/* What became of one fold in pwb_cv_fixed_predict. */
typedef enum pwb_cv_fold_status {
  PWB_CV_FOLD_OK = 0,               /* fitted; its held-out rows are predicted */
  PWB_CV_FOLD_RANK_DEFICIENT = 1,   /* lm's rule drops a column of the training design */
  PWB_CV_FOLD_NO_RESIDUAL_DF = 2,   /* training rows of positive weight <= design columns */
  PWB_CV_FOLD_INVALID_TRAINING = 3  /* a training row has a non-finite predictor or a y the
                                       response transform cannot take, or no training row has a
                                       positive weight */
} pwb_cv_fold_status;

/* Options of pwb_cv_fixed_predict. Initialise with pwb_cv_fixed_options_init (intercept 1,
 * level 0.95, no weights), then change fields; fields appended later are absent (default) for
 * a smaller struct_size. */
typedef struct pwb_cv_fixed_options {
  size_t struct_size;     /* sizeof(pwb_cv_fixed_options) */
  int intercept;          /* add an intercept column (default 1) */
  double level;           /* level of the prediction intervals, in (0, 1) (default 0.95) */
  const double *weights;  /* NULL (default), or n precision weights >= 0, caller-owned, read
                             during the call only (as pwb_model_options.weights) */
} pwb_cv_fixed_options;

/* Sets every field of *opt to its default (no-op for NULL). Thread-safe. */
PWB_API void pwb_cv_fixed_options_init(pwb_cv_fixed_options *opt);

/* Where pwb_cv_fixed_predict writes. Every pointer is caller-owned and may be NULL (that output
 * is not written); the per-row arrays hold n values, the per-fold arrays `folds` values (fold j
 * at j - 1), coefficients folds * columns values (fold-major; columns = p + intercept). */
typedef struct pwb_cv_fixed_result {
  size_t struct_size;  /* sizeof(pwb_cv_fixed_result) */
  double *median;      /* per row: back-transformed median from the fit without the row's fold */
  double *mean;        /* per row: smearing mean from that fit */
  double *lower;       /* per row: prediction interval of a new row of weight 1, original units */
  double *upper;
  unsigned *flags;     /* per row: PWB_PRED_* bits of the median and its interval */
  int *fold_status;    /* per fold: a pwb_cv_fold_status */
  double *sigma;       /* per fold: sigma-hat of the training fit (NaN when not fitted) */
  size_t *df_residual; /* per fold: residual degrees of freedom (0 when not fitted) */
  double *coefficients; /* per fold: the training fit's coefficients (NaN when not fitted) */
} pwb_cv_fixed_result;

/* Cross-validated predictions of a linear model whose transforms are fixed (they learn nothing
 * from the rows): z = T(y) regressed on [1 X] in the training part of each fold of one k-fold
 * split, predicting the fold's rows, as pwb_model_fit on the training rows followed by
 * pwb_model_predict of the held-out rows would (median with its prediction interval at
 * opt->level, and the smearing mean), equal to rounding. Each fold's rows are factored once
 * (the Q-less R of their rows of [X z]) and each training fit is the QR of the other folds'
 * stacked R's, so the cost grows linearly in n and in the number of folds.
 * y: n raw responses; X: n-by-p predictors, column-major, no intercept column (a non-finite
 * entry marks a row whose predictor transform failed: predicted NaN with PWB_PRED_MISSING
 * when held out, and its fold's training parts are not fitted); response: T, or NULL for none
 * (read during the call only); fold: n ids in 1..folds, every fold non-empty; opt may be NULL.
 * A fold that cannot be fitted as pwb_model_fit would fit it unchanged (see
 * pwb_cv_fold_status) leaves its rows NaN: refit it with pwb_model_fit to get the error, or
 * the aliasing, in full. Errors: PWB_ERR_ARGUMENT for NULL y, fold or out, a NULL X with p > 0,
 * n == 0, folds < 2, a fold id outside 1..folds (row named, 0-based), an empty fold, a level
 * outside (0, 1), a struct_size too small; PWB_ERR_DOMAIN for negative or non-finite weights
 * (count and first 0-based rows); PWB_ERR_CANCELLED when the thread's cancellation check says
 * stop. On failure the outputs are unspecified. Thread-safe: reads only its arguments. */
PWB_API pwb_status pwb_cv_fixed_predict(const double *y, const double *X, size_t n, size_t p,
                                        const pwb_transform *response, const int *fold,
                                        int folds, const pwb_cv_fixed_options *opt,
                                        pwb_cv_fixed_result *out);

/* End of section: comparing transforms (add new declarations above). */



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

/* The name of transform i (0-based, in the order of the text), copied into buf by the text rule
 * at the top of this header. Names may hold any UTF-8 text, including spaces and quotes.
 * Errors: PWB_ERR_ARGUMENT for a NULL s, i >= count, or a NULL buf with cap > 0. */
PWB_API pwb_status pwb_spec_name(const pwb_spec *s, size_t i, char *buf, size_t cap,
                                 size_t *needed);

/* Stores in *index the position of the transform called name (exact, byte-wise match).
 * Errors: PWB_ERR_ARGUMENT for NULL arguments or when no transform has that name. */
PWB_API pwb_status pwb_spec_find(const pwb_spec *s, const char *name, size_t *index);

/* Makes a new transform handle equal to transform i of s. On success *out owns it (release with
 * pwb_transform_free; it does not depend on s, which may be freed first); *out is NULL on
 * failure. Errors: PWB_ERR_ARGUMENT for NULL arguments or i >= count. */
PWB_API pwb_status pwb_spec_transform(const pwb_spec *s, size_t i, pwb_transform **out);

/* Writes s as text into buf by the text rule at the top of this header (since 0.2; before, a
 * buffer too small was an error): call with buf = NULL and cap = 0 to learn the length, then
 * pass cap >= *needed + 1. A cut text is never a spec: it lacks the final "end" line, which
 * pwb_spec_read requires. Errors: PWB_ERR_ARGUMENT for a NULL s or a NULL buf with cap > 0. */
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

/* The model's response name, copied into buf by the text rule at the top of this header.
 * Errors: PWB_ERR_ARGUMENT for a NULL s, a spec without a model record, or a NULL buf with
 * cap > 0. */
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

/* End of section: the portable text spec (add new declarations above). */




/* ------------------------------------------------------------------------------------------ */
/* Summaries of chunked data: mergeable, serialisable, finished like one pass                 */
/* ------------------------------------------------------------------------------------------ */

/* For data read in chunks, held in several processes or on several machines. A summary takes
 * rows chunk by chunk, merges with the summaries of other chunks (in any order or tree), turns
 * into bytes and back (to send or store it) and finishes into the results of the one-pass
 * functions. Its size depends on p and on the response's spread, never on the number of rows.
 * Rows of a chunk: y[i] (i < rows); X column-major with leading dimension ld >= rows (column j of
 * row i at X[j * ld + i]; NULL when p is 0); weights NULL (all 1) or rows precision weights as
 * R's lm takes them (0 drops a row; negative or non-finite is an error). Row numbers in messages
 * are 0-based within the chunk. A failed add leaves the summary unchanged.
 * Bytes: a versioned format with a checksum; reading is strict and bounded, so corrupted or
 * truncated bytes give PWB_ERR_PARSE, never a crash. Serialize writes nothing and returns PWB_OK
 * when buf is NULL and cap is 0 (a size query: *needed gets the size); a cap below the size is
 * PWB_ERR_ARGUMENT. Thread safety: distinct handles from distinct threads; one handle is not to
 * be changed (add, merge) while another thread uses it.
 * Accuracy (see powerback/accumulate.hpp): any partition merged in any order finishes with
 * |lambda-hat - one pass| <= 1e-7 and interval ends within 1e-9 of pwb_estimate_response_lambda
 * on the same rows, unless the finish asks for a grid pass (below). */

typedef struct pwb_lambda_summary pwb_lambda_summary; /* opaque */

/* A new, empty summary for the response power of family PWB_BOX_COX or PWB_YEO_JOHNSON given p
 * predictors (an intercept is added). *out is released with pwb_lambda_summary_free.
 * Errors: PWB_ERR_ARGUMENT for another family, a NULL out, p >= 100000. Deprecated since 0.2:
 * use pwb_lambda_summary_create (p first, then the family). */
PWB_API pwb_status pwb_lambda_summary_new(pwb_family family, size_t p, pwb_lambda_summary **out);
/* The same with the size before the family, as the parameter order at the top of this header
 * has it; pwb_lambda_summary_new is deprecated since 0.2 and kept working. */
PWB_API pwb_status pwb_lambda_summary_create(size_t p, pwb_family family,
                                             pwb_lambda_summary **out);
/* Releases s. NULL is fine. */
PWB_API void pwb_lambda_summary_free(pwb_lambda_summary *s);
/* Adds a chunk (see above). Errors: PWB_ERR_NONFINITE (NaN/Inf in y or X, rows named),
 * PWB_ERR_DOMAIN (y <= 0 with Box-Cox, rows named), PWB_ERR_ARGUMENT (NULL arrays with rows > 0,
 * ld < rows, bad weights). */
PWB_API pwb_status pwb_lambda_summary_add(pwb_lambda_summary *s, const double *y, const double *X,
                                          size_t rows, size_t ld, const double *weights);
/* into := into merged with from (from unchanged; the two may be the same handle). Errors:
 * PWB_ERR_ARGUMENT for NULL handles or another family or p. */
PWB_API pwb_status pwb_lambda_summary_merge(pwb_lambda_summary *into, const pwb_lambda_summary *from);
/* The summary as bytes into buf (caller-owned, cap bytes); the size in *needed (not NULL). */
PWB_API pwb_status pwb_lambda_summary_serialize(const pwb_lambda_summary *s, unsigned char *buf,
                                                size_t cap, size_t *needed);
/* A summary from bytes (a new handle in *out, NULL on failure). PWB_ERR_PARSE for bytes that are
 * not an intact summary of this format version (message says what is wrong). */
PWB_API pwb_status pwb_lambda_summary_deserialize(const unsigned char *buf, size_t len,
                                                  pwb_lambda_summary **out);
/* Rows taken (weight > 0) and bins held; either pointer may be NULL. */
PWB_API pwb_status pwb_lambda_summary_count(const pwb_lambda_summary *s, size_t *n, size_t *bins);

/* Whether a finish needs one more pass over the rows, and over which lambdas. */
typedef struct pwb_summary_pass_info {
  size_t struct_size;  /* sizeof(pwb_summary_pass_info) */
  int needs_pass;      /* 1: out holds NaN (or a provisional estimate from a grid); run a
                          pwb_lambda_pass over pass_points equally spaced lambdas from
                          pass_lower to pass_upper and finish that */
  double pass_lower, pass_upper;
  size_t pass_points;
  int from_grid;       /* 1: the estimate comes from a grid pass (cubic spline through its values) */
} pwb_summary_pass_info;

/* Sets struct_size and zeros (NaN for the doubles). NULL is ignored. */
PWB_API void pwb_summary_pass_info_init(pwb_summary_pass_info *info);

/* Finishes s into *out (as pwb_estimate_response_lambda) and n_grid (>= 2) points of the profile
 * curve on the grid pwb_estimate_response_lambda_curve uses (grid_out, loglik_out caller-owned;
 * both may be NULL when n_grid is 0). opt may be NULL. When the binned sums cannot serve every
 * lambda of the range (|k| > 5, or a nearly exact fit), info->needs_pass is 1 and out's values
 * are NaN. Errors: PWB_ERR_ARGUMENT (no rows, fewer than 3, a constant y, bad options),
 * PWB_ERR_SINGULAR (n <= rank + 1). */
PWB_API pwb_status pwb_lambda_summary_finish(const pwb_lambda_summary *s, const pwb_lambda_options *opt,
                                             pwb_lambda_result *out, size_t n_grid, double *grid_out,
                                             double *loglik_out, pwb_summary_pass_info *info);

/* The second pass of the fallback: the profile at every lambda of a grid, in one pass. */
typedef struct pwb_lambda_pass pwb_lambda_pass; /* opaque */

/* A pass for summary s (finishable: it fixes the kept columns and the centring) over grid (n_grid
 * >= 4 equally spaced increasing lambdas, at most 1000). Released with pwb_lambda_pass_free. */
PWB_API pwb_status pwb_lambda_pass_new(const pwb_lambda_summary *s, const double *grid,
                                       size_t n_grid, pwb_lambda_pass **out);
PWB_API void pwb_lambda_pass_free(pwb_lambda_pass *pass);
/* As pwb_lambda_summary_add / _merge / _serialize / _deserialize. Merging needs passes made from
 * the same summary and grid. */
PWB_API pwb_status pwb_lambda_pass_add(pwb_lambda_pass *pass, const double *y, const double *X,
                                       size_t rows, size_t ld, const double *weights);
PWB_API pwb_status pwb_lambda_pass_merge(pwb_lambda_pass *into, const pwb_lambda_pass *from);
PWB_API pwb_status pwb_lambda_pass_serialize(const pwb_lambda_pass *pass, unsigned char *buf,
                                             size_t cap, size_t *needed);
PWB_API pwb_status pwb_lambda_pass_deserialize(const unsigned char *buf, size_t len,
                                               pwb_lambda_pass **out);
/* The grid's size. */
PWB_API pwb_status pwb_lambda_pass_grid_size(const pwb_lambda_pass *pass, size_t *n_grid);
/* The estimate from the pass and its summary s (the same rows: PWB_ERR_ARGUMENT when the row
 * counts differ); grid_out / loglik_out (n_grid = the pass's grid size) receive the grid and the
 * profile there. info->needs_pass is 1 when a narrower (or wider) grid should be passed over once
 * more; out then holds the provisional estimate. */
PWB_API pwb_status pwb_lambda_pass_finish(const pwb_lambda_pass *pass, const pwb_lambda_summary *s,
                                          const pwb_lambda_options *opt, pwb_lambda_result *out,
                                          size_t n_grid, double *grid_out, double *loglik_out,
                                          pwb_summary_pass_info *info);

/* A linear model at a fixed response transform, from chunks: z = T(y) on [1 X] by weighted least
 * squares, as pwb_model_fit. */
typedef struct pwb_fit_summary pwb_fit_summary; /* opaque */

/* A new summary for response transform `response` (copied; NULL for none) and p predictors;
 * estimated_parameters as in pwb_model_options. */
PWB_API pwb_status pwb_fit_summary_new(const pwb_transform *response, size_t p,
                                       size_t estimated_parameters, pwb_fit_summary **out);
PWB_API void pwb_fit_summary_free(pwb_fit_summary *s);
/* As pwb_lambda_summary_add; y values T cannot map are PWB_ERR_DOMAIN / PWB_ERR_NONFINITE. */
PWB_API pwb_status pwb_fit_summary_add(pwb_fit_summary *s, const double *y, const double *X,
                                       size_t rows, size_t ld, const double *weights);
PWB_API pwb_status pwb_fit_summary_merge(pwb_fit_summary *into, const pwb_fit_summary *from);
PWB_API pwb_status pwb_fit_summary_serialize(const pwb_fit_summary *s, unsigned char *buf,
                                             size_t cap, size_t *needed);
PWB_API pwb_status pwb_fit_summary_deserialize(const unsigned char *buf, size_t len,
                                               pwb_fit_summary **out);
/* The fit: *info as pwb_model_get_info (intercept 1); coef, se, aliased (columns = p + 1 values
 * each) and covariance (columns x columns, column-major, sigma^2 (X'WX)^-1, NaN where aliased);
 * any output may be NULL. Errors: PWB_ERR_ARGUMENT (no rows, columns other than p + 1),
 * PWB_ERR_SINGULAR (no residual degrees of freedom). */
PWB_API pwb_status pwb_fit_summary_finish(const pwb_fit_summary *s, pwb_model_info *info,
                                          double *coef, double *se, int *aliased,
                                          double *covariance, size_t columns);

/* The second pass of a fit: residual checks and binned residual sums for smearing means. */
typedef struct pwb_fit_checks pwb_fit_checks; /* opaque */

/* A pass for the finished fit s (its coefficients are fixed here). */
PWB_API pwb_status pwb_fit_checks_new(const pwb_fit_summary *s, pwb_fit_checks **out);
PWB_API void pwb_fit_checks_free(pwb_fit_checks *c);
PWB_API pwb_status pwb_fit_checks_add(pwb_fit_checks *c, const double *y, const double *X,
                                      size_t rows, size_t ld, const double *weights);
PWB_API pwb_status pwb_fit_checks_merge(pwb_fit_checks *into, const pwb_fit_checks *from);
PWB_API pwb_status pwb_fit_checks_serialize(const pwb_fit_checks *c, unsigned char *buf,
                                            size_t cap, size_t *needed);
PWB_API pwb_status pwb_fit_checks_deserialize(const unsigned char *buf, size_t len,
                                              pwb_fit_checks **out);
/* Koenker's Breusch-Pagan, RESET and the residuals' skewness into *out, as
 * pwb_model_residual_checks (Shapiro-Wilk needs every residual: sw_computed 0, NaN). Residuals
 * are sqrt(w) (z - x'b). */
PWB_API pwb_status pwb_fit_checks_finish(const pwb_fit_checks *c, pwb_residual_checks *out);
/* Smearing means (Duan 1983) at m linear predictors eta (transformed scale), from the binned
 * residual sums: mean_out[i] ~ mean over training residuals e of T^-1(eta[i] + e). */
PWB_API pwb_status pwb_fit_checks_smearing(const pwb_fit_checks *c, const double *eta, size_t m,
                                           double *mean_out);

/* End of section: summaries of chunked data (add new declarations above). */

#ifdef __cplusplus
}
#endif

#endif /* POWERBACK_H */
