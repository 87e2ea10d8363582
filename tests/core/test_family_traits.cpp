// The family table agrees with the formulas: every row's domain, range limit and log scale
// describe what the forward map and its inverse actually do.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>
#include <vector>

#include "powerback/transform.hpp"

using namespace powerback;

namespace {

std::vector<double> lambdas_of(const FamilyTraits& t) {
  if (!t.has_lambda) return {math::kNaN};
  std::vector<double> out = {-3, -1.5, -1, -0.5, 0.5, 1, 1.5, 2, 2.5, 3};
  if (t.family != Family::Power) out.push_back(0.0);
  return out;
}

// Points of the domain: its finite ends (when closed) and values inside on either side of 0.
std::vector<double> domain_points(const FamilyDomain& d) {
  std::vector<double> out;
  for (double v : {-50.0, -2.0, -0.3, 0.0, 0.2, 0.5, 0.9, 1.0, 3.0, 40.0})
    if ((v > d.lower || (d.lower_closed && v == d.lower)) && v < d.upper) out.push_back(v);
  return out;
}

}  // namespace

TEST_CASE("each row of the family table is the row of its enumerator", "[family_traits]") {
  for (int i = 0; i < kFamilyCount; ++i) {
    const FamilyTraits& t = kFamilyTraits[i];
    CHECK(static_cast<int>(t.family) == i);
    CHECK(family_from_name(t.name) == t.family);
    CHECK(std::string(family_name(t.family)) == t.name);
  }
  // Which families carry a lambda, as the public contract lists them.
  CHECK(family_traits(Family::BoxCox).has_lambda);
  CHECK(family_traits(Family::YeoJohnson).has_lambda);
  CHECK(family_traits(Family::Power).has_lambda);
  CHECK_FALSE(family_traits(Family::Log).has_lambda);
}

TEST_CASE("domain rows: forward values exist inside, outside is refused", "[family_traits]") {
  for (const FamilyTraits& t : kFamilyTraits) {
    for (double l : lambdas_of(t)) {
      INFO(t.name << " lambda " << l);
      const FamilyDomain d = t.domain(l);
      for (double v : domain_points(d)) {
        INFO("v = " << v);
        CHECK(math::in_domain(t.family, v, l));
        const double z = math::forward(t.family, v, l);
        // Power with lambda < 0 and the reciprocal map v -> 0+ to -Inf; only finite z are checked.
        if (std::isfinite(z)) CHECK(math::in_range(t.family, z, l));
      }
      if (std::isfinite(d.lower)) {
        CHECK(math::in_domain(t.family, d.lower, l) == d.lower_closed);
        CHECK_FALSE(math::in_domain(t.family, d.lower - 0.5, l));
      }
      if (std::isfinite(d.upper)) CHECK_FALSE(math::in_domain(t.family, d.upper, l));
    }
  }
}

TEST_CASE("range rows: the boundary separates z the inverse takes from z it refuses",
          "[family_traits]") {
  for (const FamilyTraits& t : kFamilyTraits) {
    for (double l : lambdas_of(t)) {
      INFO(t.name << " lambda " << l);
      const RangeLimit r = t.range(l);
      if (!r.limited) {
        for (double z : {-30.0, -1.0, 0.0, 1.0, 30.0}) CHECK(math::in_range(t.family, z, l));
        continue;
      }
      // 1e-6 relative (or absolute near 0) is far beyond the last-bit disagreement of the two
      // forms of the boundary test, and close enough to be on the right side of it.
      const double step = 1e-6 * std::max(1.0, std::fabs(r.z));
      const double inside = r.beyond_is_above ? r.z - step : r.z + step;
      const double beyond = r.beyond_is_above ? r.z + step : r.z - step;
      CHECK(math::in_range(t.family, inside, l));
      CHECK_FALSE(math::in_range(t.family, beyond, l));
      CHECK(math::in_range(t.family, r.z, l) == r.boundary_valid);
      // Towards the boundary the inverse tends to the recorded limit of v.
      const double v = math::inverse(t.family, inside, l);
      if (r.v == 0.0) CHECK(std::fabs(v) < 0.1);  // (lambda step)^(1/lambda) <= 0.015 for lambda <= 3
      else CHECK(std::fabs(v) > 10.0);          // about 70 at the mildest pole here (-1/3)
      if (std::isinf(r.v)) CHECK(std::signbit(v) == std::signbit(r.v));
      CHECK((r.pole != 0.0) == std::isinf(r.v));
    }
  }
}

TEST_CASE("the normal-theory mean diverges exactly where the header says", "[family_traits]") {
  // powerback.h, pwb_predict_options_init: Box-Cox and Yeo-Johnson with -1 <= lambda < 0,
  // Yeo-Johnson with 2 < lambda <= 3, reciprocal, power with -1 <= lambda < 0.
  auto diverges = [](Family f, double l) { return normal_mean_diverges(family_traits(f).range(l)); };
  CHECK(diverges(Family::BoxCox, -1.0));
  CHECK(diverges(Family::BoxCox, -0.5));
  CHECK_FALSE(diverges(Family::BoxCox, -1.5));
  CHECK_FALSE(diverges(Family::BoxCox, 0.5));
  CHECK(diverges(Family::YeoJohnson, -0.5));
  CHECK(diverges(Family::YeoJohnson, 3.0));
  CHECK_FALSE(diverges(Family::YeoJohnson, 3.5));
  CHECK_FALSE(diverges(Family::YeoJohnson, 1.0));
  CHECK(diverges(Family::Reciprocal, math::kNaN));
  CHECK(diverges(Family::Power, -1.0));
  CHECK_FALSE(diverges(Family::Power, -2.0));
  CHECK_FALSE(diverges(Family::Sqrt, math::kNaN));
}

TEST_CASE("log-scale rows are the families whose inverse is exp(a z)", "[family_traits]") {
  for (const FamilyTraits& t : kFamilyTraits) {
    for (double l : lambdas_of(t)) {
      INFO(t.name << " lambda " << l);
      const double a = t.log_scale(l);
      if (a > 0.0)  // exp(a z) at z = 0.7; 1e-14 relative is a few ulps of either side
        CHECK(math::inverse(t.family, 0.7, l) == Approx(std::exp(a * 0.7)).epsilon(1e-14));
    }
  }
  CHECK(family_traits(Family::Log10).log_scale(math::kNaN) == Approx(std::log(10.0)).epsilon(1e-15));
  CHECK(family_traits(Family::BoxCox).log_scale(0.0) == 1.0);
  CHECK(family_traits(Family::BoxCox).log_scale(0.5) == 0.0);
}
