// The lambda entry points' guard (defined in capi_lambda.cpp) for other sources of the C ABI:
// capi::guarded, plus the rows of a LambdaRowsError kept for pwb_lambda_error_rows.
#pragma once

#include <functional>

#include "powerback.h"
#include "powerback/lambda.hpp"

namespace powerback {
namespace capi {

pwb_status lambda_guarded_call(const std::function<void()>& body) noexcept;

// The search settings of a caller's pwb_lambda_options (defaults for NULL). A struct ending
// before `weights` comes from a header older than the weights, which then count as absent; the
// fields appended after them are read where they are used. Throws Error(Argument) for a
// struct_size too small for the first fields.
LambdaOptions lambda_options_of(const pwb_lambda_options* opt);

}  // namespace capi
}  // namespace powerback
