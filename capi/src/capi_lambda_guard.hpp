// The lambda entry points' guard (defined in capi_lambda.cpp) for other sources of the C ABI:
// capi::guarded, plus the rows of a LambdaRowsError kept for pwb_lambda_error_rows.
#pragma once

#include <functional>

#include "powerback.h"

namespace powerback {
namespace capi {

pwb_status lambda_guarded_call(const std::function<void()>& body) noexcept;

}  // namespace capi
}  // namespace powerback
