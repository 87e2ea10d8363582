// One copy of a core Moments into the C ABI's structs that report them (pwb_moments and the
// variable screen's result), by the names pwb_moments gives them.
#pragma once

#include "powerback/normality.hpp"

namespace powerback {
namespace capi {

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
