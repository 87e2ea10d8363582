// powerback/errors.hpp — the exceptions the core throws.
//
// Every failure the core reports is a powerback::Error carrying one ErrorCode; the C ABI maps each
// code one-to-one onto a pwb_status. Errors about particular elements (out of domain, non-finite)
// also carry how many elements were affected and the first few of their 0-based indices, so each
// front end can phrase rows in its own convention (R speaks 1-based rows).
#pragma once

#include <cstddef>
#include <stdexcept>
#include <string>
#include <vector>

namespace powerback {

enum class ErrorCode {
  Argument = 1,   // a bad argument: wrong size, NaN parameter, unknown name, bad option
  Domain,         // a value outside the domain (or an inverse outside the range) of a transform
  NonFinite,      // NaN or infinite input where finite values are needed
  Singular,       // a design that cannot be fitted (too few rows for its rank, all aliased)
  Convergence,    // an iterative method did not converge
  Parse,          // malformed text input
  Memory,         // an allocation failed or a size would overflow
  Internal,       // a bug: an invariant failed
  Cancelled       // the caller's cancellation check asked the computation to stop
};

class Error : public std::runtime_error {
 public:
  Error(ErrorCode code, const std::string& message) : std::runtime_error(message), code_(code) {}
  ErrorCode code() const noexcept { return code_; }

 private:
  ErrorCode code_;
};

// How many of the offending indices an error keeps and prints.
constexpr std::size_t kMaxReportedIndices = 8;

// An error about particular elements of an input vector.
class IndexedError : public Error {
 public:
  IndexedError(ErrorCode code, const std::string& message, std::size_t count,
               std::vector<std::size_t> first_indices)
      : Error(code, message), count_(count), first_(std::move(first_indices)) {}
  std::size_t count() const noexcept { return count_; }
  const std::vector<std::size_t>& first_indices() const noexcept { return first_; }

 private:
  std::size_t count_;
  std::vector<std::size_t> first_;
};

// "3, 16, 87" (with "..." when count exceeds the listed indices), each index plus `base`.
std::string format_indices(const std::vector<std::size_t>& first, std::size_t count,
                           std::size_t base = 0);

// Throws IndexedError(Domain) naming the rows (0-based) whose weight is negative or not finite,
// with the remedy; the check shared by the model fits on whole data.
void require_model_weights(const double* w, std::size_t n);

// Throws Error(Argument, message) unless cond holds.
inline void require(bool cond, const std::string& message) {
  if (!cond) throw Error(ErrorCode::Argument, message);
}

}  // namespace powerback
