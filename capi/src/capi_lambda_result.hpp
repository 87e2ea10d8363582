// One copy of each core result that several C ABI structs report: a lambda estimate (the lambda
// estimators, the summaries, the screen's ML column, the influence summary) and sample moments
// (pwb_moments and the screen).
#pragma once

#include "powerback.h"
#include "powerback/lambda.hpp"
#include "powerback/normality.hpp"

namespace powerback {
namespace capi {

// The fields every struct reporting a lambda estimate shares, by the names pwb_lambda_result
// gives them: lambda, conf_low, conf_high, loglik, at_bound.
template <class T>
void put_lambda_estimate(const LambdaEstimate& e, T* out) {
  out->lambda = e.lambda;
  out->conf_low = e.conf_low;
  out->conf_high = e.conf_high;
  out->loglik = e.loglik;
  out->at_bound = e.at_bound ? 1 : 0;
}

// The search's outcome, by pwb_lambda_result's names: convenient, converged, low_open, high_open.
template <class T>
void put_lambda_outcome(const LambdaEstimate& e, T* out) {
  out->convenient = e.convenient;
  out->converged = e.converged ? 1 : 0;
  out->low_open = e.low_open ? 1 : 0;
  out->high_open = e.high_open ? 1 : 0;
}

// Every field of pwb_lambda_result (struct_size left as the caller set it).
inline void write_lambda_result(const LambdaEstimate& e, pwb_lambda_result* out) {
  put_lambda_estimate(e, out);
  put_lambda_outcome(e, out);
  out->n = e.n;
  out->rank = e.rank;
  out->n_aliased = e.aliased.size();
}

// A pwb_lambda_result holding e (for structs that keep the same figures under other names).
inline pwb_lambda_result lambda_result_of(const LambdaEstimate& e) {
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  write_lambda_result(e, &r);
  return r;
}

// The moments by the names pwb_moments gives them (n left to the caller: its type differs).
template <class T>
void put_moments(const Moments& m, T* out) {
  out->mean = m.mean;
  out->sd = m.sd;
  out->skewness = m.skewness;
  out->skewness_se = m.skewness_se;
  out->skewness_z = m.skewness_z;
  out->kurtosis = m.kurtosis;
  out->kurtosis_se = m.kurtosis_se;
  out->kurtosis_z = m.kurtosis_z;
}

}  // namespace capi
}  // namespace powerback
