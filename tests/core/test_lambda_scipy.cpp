// Univariate lambda estimation against scipy.stats (fixture made by
// tests/fixtures/make_scipy_lambda.py: boxcox_llf, yeojohnson_llf, boxcox(x, alpha=0.05),
// yeojohnson(x)).
#include <catch2/catch.hpp>

#include <cmath>
#include <map>
#include <string>
#include <vector>

#include "fixture_csv.hpp"
#include "powerback/lambda.hpp"

using namespace powerback;

namespace {

struct Sample {
  Family family;
  std::vector<double> x;
};

std::map<std::string, Sample> load_samples() {
  std::map<std::string, Sample> s;
  for (const auto& r : pwbtest::read_csv("scipy_lambda_samples.csv")) {
    Sample& smp = s[r[0]];
    smp.family = r[1] == "box-cox" ? Family::BoxCox : Family::YeoJohnson;
    smp.x.push_back(std::stod(r[2]));
  }
  return s;
}

// scipy's llf omits the constant -n/2 (log(2 pi) + 1) of the normal log-likelihood.
double scipy_offset(std::size_t n) {
  return -0.5 * static_cast<double>(n) * (std::log(2.0 * M_PI) + 1.0);
}

}  // namespace

TEST_CASE("profile log-likelihood equals scipy llf plus the normal constant", "[lambda][scipy]") {
  const auto samples = load_samples();
  int checked = 0;
  for (const auto& r : pwbtest::read_csv("scipy_lambda.csv")) {
    if (r[2] != "llf") continue;
    const Sample& s = samples.at(r[0]);
    const double lam = std::stod(r[3]);
    const std::vector<double> l = lambda_profile(s.x.data(), s.x.size(), s.family, &lam, 1);
    const double want = std::stod(r[4]) + scipy_offset(s.x.size());
    INFO(r[0] << " lambda " << lam);
    // 1e-9 relative: both are the same closed form evaluated in double precision.
    CHECK(l[0] == Approx(want).epsilon(1e-9));
    ++checked;
  }
  CHECK(checked == 48);
}

TEST_CASE("ML lambda and interval equal scipy boxcox and yeojohnson", "[lambda][scipy]") {
  const auto samples = load_samples();
  std::map<std::string, std::map<std::string, double>> ref;
  for (const auto& r : pwbtest::read_csv("scipy_lambda.csv"))
    if (r[2] != "llf") ref[r[0]][r[2]] = std::stod(r[3]);
  REQUIRE(ref.size() == 6);
  for (const auto& kv : ref) {
    const Sample& s = samples.at(kv.first);
    const LambdaEstimate e = estimate_lambda(s.x.data(), s.x.size(), s.family);
    INFO(kv.first);
    CHECK(e.converged);
    CHECK_FALSE(e.at_bound);
    CHECK(e.n == s.x.size());
    // 1e-6 absolute: both maximisers stop at about 1.5e-8 relative in lambda; the profile is
    // flat at the maximum, so the located points differ by more than the root searches do.
    CHECK(e.lambda == Approx(kv.second.at("mle")).margin(1e-6));
    if (kv.second.count("ci_low")) {
      // 1e-7: scipy's brentq and our TOMS 748 both solve the same smooth equation tightly; the
      // cut level depends on lambda-hat only to second order.
      CHECK(e.conf_low == Approx(kv.second.at("ci_low")).margin(1e-7));
      CHECK(e.conf_high == Approx(kv.second.at("ci_high")).margin(1e-7));
    }
    // The estimate is a maximum of the profile: both neighbours are lower.
    const double around[] = {e.lambda - 1e-3, e.lambda + 1e-3};
    const auto l = lambda_profile(s.x.data(), s.x.size(), s.family, around, 2);
    CHECK(l[0] < e.loglik);
    CHECK(l[1] < e.loglik);
  }
}
