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
  PWB_ERR_INTERNAL     /* a bug in powerback: please report it with the message */
} pwb_status;

/* The enumerator's name, e.g. "PWB_ERR_DOMAIN"; "PWB_UNKNOWN_STATUS" for other values.
 * A static string; thread-safe. */
PWB_API const char *pwb_status_name(pwb_status s);

/* The message of the last failing call made by this thread, or "" when the last call that
 * returns a pwb_status succeeded. Never NULL. The string stays valid until this thread's next
 * powerback call; copy it to keep it. */
PWB_API const char *pwb_last_error(void);

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

/* Sets struct_size and the identity transform (lambda NaN, shift 0, no reflection). */
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
 * outside the family's domain), with the count and first indices in pwb_last_error().
 * PWB_ERR_ARGUMENT for a NULL t, or NULL x or out with n > 0. */
PWB_API pwb_status pwb_transform_apply(const pwb_transform *t, const double *x, size_t n,
                                       double *out);

/* out[i] = inverse transform of z[i], so that apply(invert(z)) = z. Same rules as
 * pwb_transform_apply; PWB_ERR_DOMAIN here means z[i] lies outside the family's range (for
 * Box-Cox with lambda != 0 the inverse needs 1 + lambda z > 0). */
PWB_API pwb_status pwb_transform_invert(const pwb_transform *t, const double *z, size_t n,
                                        double *out);

/* out[i] = log |d transform / dx| at x[i]: the Jacobian term a likelihood on the transformed
 * scale adds per observation. Same rules as pwb_transform_apply. */
PWB_API pwb_status pwb_transform_log_derivative(const pwb_transform *t, const double *x, size_t n,
                                                double *out);

/* One line of text about t: which = 0, what it needs of its input ("box-cox needs v > 0, where
 * v = x + shift"); 1, what it needs of the values it inverts; 2, the usual remedy for input
 * outside the domain; 3, the transform itself ("box-cox(lambda = 0.5) of (x + 1)"). Writes at most cap bytes including the terminating NUL into buf (buf may be NULL when
 * cap is 0) and stores the full length (without NUL) in *needed when needed is not NULL, like
 * snprintf. Errors: PWB_ERR_ARGUMENT for a NULL t or a which other than 0 to 3. */
PWB_API pwb_status pwb_transform_describe(const pwb_transform *t, int which, char *buf, size_t cap,
                                          size_t *needed);

/* ------------------------------------------------------------------------------------------ */
/* Estimating lambda: univariate and response-given-predictors, profiles                      */
/* ------------------------------------------------------------------------------------------ */

/* @@PWB_SECTION_ESTIMATION@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* Screening variables: skewness, kurtosis, Shapiro-Wilk, the ladder of powers                */
/* ------------------------------------------------------------------------------------------ */

/* @@PWB_SECTION_SCREEN@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* Models on the transformed scale: fit, predict in original units                            */
/* ------------------------------------------------------------------------------------------ */

/* @@PWB_SECTION_MODEL@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* Residual diagnostics                                                                       */
/* ------------------------------------------------------------------------------------------ */

/* @@PWB_SECTION_DIAGNOSTICS@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* Comparing transforms: cross-validation, lambda influence, Box-Tidwell                      */
/* ------------------------------------------------------------------------------------------ */

/* @@PWB_SECTION_COMPARE@@ (declarations of this section go above this line) */



/* ------------------------------------------------------------------------------------------ */
/* The portable text spec of transforms and models                                            */
/* ------------------------------------------------------------------------------------------ */

/* @@PWB_SECTION_SPEC@@ (declarations of this section go above this line) */




#ifdef __cplusplus
}
#endif

#endif /* POWERBACK_H */
