// Response lambdas of many responses with one factorisation of their shared design (see
// lambda_many.hpp): every response prepared, one pass over the design's rows for its R, then the
// responses in groups, each group gathering its binned sums in one pass over the design's rows
// and searching its responses; the groups run on the caller's threads.
#include "powerback/lambda_many.hpp"

#include <algorithm>
#include <memory>
#include <utility>

#include "lambda_internal.hpp"
#include "powerback/cancel.hpp"
#include "powerback/parallel.hpp"

namespace powerback {

namespace detail {

void LambdaProfile::feed_design_rows(LambdaProfile* const* group, std::size_t count) const {
  const std::size_t n = n_all_, p = p_;
  const auto feed = [&](std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& x) {
    for (std::size_t j = 0; j < count; ++j)
      if (group[j] && group[j]->binned_) group[j]->binned_->add_predictor_rows(r0, x);
  };
  if (w_.size() == 0) {
    // Unweighted: factor_tall's blocks of [1 X], whose predictor columns are X's rows, read in
    // place.
    for (std::size_t r0 = 0; r0 < n; r0 += kTallBlockRows) {
      poll_cancel();
      const std::size_t rows = std::min(kTallBlockRows, n - r0);
      const Eigen::Map<const Eigen::MatrixXd, 0, Eigen::OuterStride<>> x(
          X_ ? X_ + r0 : nullptr, static_cast<Eigen::Index>(rows), static_cast<Eigen::Index>(p),
          Eigen::OuterStride<>(static_cast<Eigen::Index>(n)));
      feed(r0, x);
    }
    return;
  }
  // Weighted: the used rows scaled by sqrt(w), as factor_design copies them, one block at a time.
  const std::size_t nu = static_cast<std::size_t>(t_.size());
  Eigen::MatrixXd x;
  for (std::size_t r0 = 0; r0 < nu; r0 += kTallBlockRows) {
    poll_cancel();
    const std::size_t rows = std::min(kTallBlockRows, nu - r0);
    x.resize(static_cast<Eigen::Index>(rows), static_cast<Eigen::Index>(p));
    for (std::size_t c = 0; c < p; ++c) {
      const double* xc = X_ + c * n;
      double* dc = x.col(static_cast<Eigen::Index>(c)).data();
      for (std::size_t i = 0; i < rows; ++i) {
        const std::size_t r = r0 + i;
        dc[i] = root_w_(static_cast<Eigen::Index>(r)) * xc[rows_.empty() ? r : rows_[r]];
      }
    }
    feed(r0, x);
  }
}

}  // namespace detail

namespace {

std::string column_name(std::size_t j) { return "Y column " + std::to_string(j) + " (0-based)"; }

// An error that belongs to one response (kept in its outcome) rather than to the shared inputs
// (rethrown): the weights are shared, and a cancellation stops everything.
bool shared_failure(const Error& e) {
  if (e.code() == ErrorCode::Cancelled) return true;
  const auto* rows = dynamic_cast<const LambdaRowsError*>(&e);
  return rows && rows->input() != LambdaInput::Response;
}

void record(const Error& e, ResponseLambdaOutcome& out) {
  out.ok = false;
  out.code = e.code();
  out.message = e.what();
  if (const auto* rows = dynamic_cast<const IndexedError*>(&e)) {
    out.count = rows->count();
    out.first_rows = rows->first_indices();
  }
  if (const auto* rows = dynamic_cast<const LambdaRowsError*>(&e)) out.input = rows->input();
}

}  // namespace

std::vector<ResponseLambdaOutcome> estimate_response_lambdas(const double* Y, std::size_t n,
                                                             std::size_t q, const double* X,
                                                             std::size_t p, Family family,
                                                             const LambdaOptions& opt,
                                                             std::size_t curve_points,
                                                             unsigned threads) {
  detail::check_lambda_options(opt);
  require(q > 0, "Y has no columns: give at least one response");
  require(Y != nullptr || n == 0, "Y is NULL");
  require(curve_points != 1, "a profile curve needs at least 2 points (or 0 for none)");
  std::vector<ResponseLambdaOutcome> out(q);
  std::vector<std::unique_ptr<detail::LambdaProfile>> prof(q);

  // Each response checked and prepared (logarithms, bins); every item writes its own slots.
  parallel_for(q, threads, 1, [&](std::size_t begin, std::size_t end) {
    for (std::size_t j = begin; j < end; ++j) {
      try {
        prof[j].reset(new detail::LambdaProfile(Y + j * n, X, n, p, family, column_name(j),
                                                opt.weights, detail::LambdaProfile::DeferDesign{}));
      } catch (const Error& e) {
        if (shared_failure(e)) throw;
        record(e, out[j]);
      }
    }
  });
  // Raw pointers for the groups below: NULL where a response failed.
  std::vector<detail::LambdaProfile*> live(q, nullptr);
  detail::LambdaProfile* first = nullptr;
  for (std::size_t j = 0; j < q; ++j) {
    live[j] = prof[j].get();
    if (!first) first = live[j];
  }
  if (!first) return out;  // every response failed on its own values

  // One pass over the design for its R and rank, shared by every response.
  const TallFactor f = first->factor_design(DesignBlockVisitor{});
  for (detail::LambdaProfile* pr : live)
    if (pr) pr->adopt_design(f, "Y");

  // Then the responses in groups: a group's binned sums gathered in one more pass over the
  // design's rows (each block once for the whole group, while it is in cache), then its
  // searches. One group on one thread; with more, about four groups per thread balance the load.
  const std::size_t grain =
      threads <= 1 ? q : std::max<std::size_t>(1, q / (4 * static_cast<std::size_t>(threads)));
  parallel_for(q, threads, grain, [&](std::size_t begin, std::size_t end) {
    // The design's rows come through one of the group's own profiles (each shares X and the
    // weights): another group's may be released meanwhile.
    detail::LambdaProfile* source = nullptr;
    for (std::size_t j = begin; j < end && !source; ++j)
      if (live[j] && live[j]->gathers_design_rows()) source = live[j];
    if (source) source->feed_design_rows(&live[begin], end - begin);
    for (std::size_t j = begin; j < end; ++j) {
      if (!live[j]) continue;
      poll_cancel();
      try {
        out[j].estimate = detail::estimate_on_profile(*live[j], opt, curve_points, &out[j].grid,
                                                      &out[j].loglik);
        out[j].ok = true;
      } catch (const Error& e) {
        if (shared_failure(e)) throw;
        record(e, out[j]);
      }
      live[j] = nullptr;
      prof[j].reset();  // its prepared data are no longer needed
    }
  });
  return out;
}

}  // namespace powerback
