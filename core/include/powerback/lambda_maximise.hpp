// powerback/lambda_maximise.hpp — the one maximiser of a lambda profile over a search range.
//
// Brent's minimiser on the negated profile, to half the mantissa (the profile is flat to second
// order at its maximum, so a maximum cannot be located more tightly than about 1.5e-8 relative).
// Brent never evaluates the ends of the range, so when its answer lies within a few of its own
// steps of an end, the end itself is evaluated and kept when it is at least as high; such an answer is
// flagged at_bound. The leave-one-out estimates of influence.hpp go through this function; the
// full-data search of lambda_search.cpp and the chunked summaries' search call it too, and both
// take their likelihood-ratio interval from likelihood_interval below.
#pragma once

#include <functional>

namespace powerback {

struct ProfileMaximum {
  double lambda = 0.0;     // the maximiser
  double loglik = 0.0;     // the profile there
  bool at_bound = false;   // lambda is at, or within the edge tolerance of, lower or upper
  bool converged = false;  // Brent met its tolerance within its iteration limit
};

// Maximises loglik over [lower, upper] (lower < upper, both finite; not checked here: callers
// validate their options first). loglik is called O(40) times.
ProfileMaximum maximise_profile(const std::function<double(double)>& loglik, double lower,
                                double upper);

struct ProfileInterval {
  double low = 0.0, high = 0.0;  // the interval's ends
  bool low_open = false;         // the profile stays above the cut down to lower (low = lower)
  bool high_open = false;        // likewise up to upper
  bool converged = false;        // both root searches met their tolerance
};

// The likelihood-ratio interval around a maximum (lhat, lmax) of loglik over [lower, upper]:
// the lambdas whose profile lies within chi2_1(level) / 2 of lmax. A quadratic through values
// near lhat predicts each end; the search probes just inside and outside it, widens
// geometrically until the profile falls below the cut or the range ends (an open side), then
// solves on the bracket with Boost's TOMS 748 root finder.
ProfileInterval likelihood_interval(const std::function<double(double)>& loglik, double lhat, double lmax,
                                    double level, double lower, double upper);

}  // namespace powerback
