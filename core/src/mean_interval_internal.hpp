// Pieces shared by the delta-method and bootstrap intervals for the original-scale mean
// (mean_interval.cpp, mean_interval_bootstrap.cpp). Private to the core.
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <memory>
#include <vector>

#include "powerback/mean_interval.hpp"
#include "powerback/smearing.hpp"

namespace powerback {
namespace detail {

// The mean m(mu) of one model (smearing over given residuals, or normal with a given sigma) and
// its derivatives, built once for many rows.
class MeanEvaluator {
 public:
  MeanEvaluator(const Transform& t, MeanMethod method, const double* resid, std::size_t n,
                double sigma);
  // The mean alone (original units); bounded as backtransform.hpp reports it.
  BackValue mean(double mu) const;
  MeanDerivatives at(double mu) const;
  // log-family scale a (1 or ln 10) when the inverse is exponential, else 0.
  double exp_scale() const { return a_; }

 private:
  double normal_at(double mu, double s) const;
  const Transform& t_;
  MeanMethod method_;
  std::unique_ptr<Smearing> smear_;
  double sigma_;
  double a_ = 0;          // exponential families: v = exp(a z)
  double sign_ = 1;       // dx/dv: -1 when the transform reflects
  bool identity_ = false;
};

// The design rows [1 x] (intercept column when the model has one) of new data; rows with a
// non-finite entry are zero and marked in missing.
Eigen::MatrixXd mean_design_rows(const Model& model, const double* Xnew, std::size_t m,
                                 std::size_t p, std::vector<char>& missing);

// Output index of each row (0..G-1) and the rows of each output; validates group ids.
struct Grouping {
  std::vector<std::size_t> of_row;
  std::vector<std::vector<std::size_t>> rows;
};
Grouping make_grouping(std::size_t m, const std::size_t* group, std::size_t n_groups);

// The model's coefficients with aliased ones set to 0 (they contribute nothing to a fit).
Eigen::VectorXd usable_coefficients(const Eigen::VectorXd& coef);

// The residual parts of the smearing mean's delta variance, per output k with rows K. With
// r_i the smearing residuals, D_i the rows of the fitted (weighted) design and
// u_i = (1/|K|) sum_{j in K} T^{-1}(mu_j + r_i):
//   s2[k]    sample variance of u_i over i;
//   cov[k]   sample covariance of u_i with r_i;
//   w.row(k) (1/(n |K|)) sum_i sum_{j in K} (T^{-1})'(mu_j + r_i) D_i, the part of the gradient
//            that flows through the residuals r_i = z_i - D_i'b.
// mean_slope[k]: mean over K of dm/dmu (used for w past kMeanDirectPairs).
struct ResidualTerms {
  std::vector<double> s2, cov;
  Eigen::MatrixXd w;
};
ResidualTerms residual_terms(const Model& model, const MeanEvaluator& ev, const Grouping& g,
                             const std::vector<double>& mu, const std::vector<char>& missing,
                             const std::vector<double>& mean_slope);

// Standard normal quantile for a two-sided interval at `level`.
double z_quantile(double level);

}  // namespace detail
}  // namespace powerback
