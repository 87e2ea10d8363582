// powerback/screen.hpp — the skewness screen of one variable: moments, Shapiro-Wilk, the ladder
// recommendation and the maximum-likelihood alternative, each with the normality after it.
//
// For the ladder see powerback/ladder.hpp. The ML alternative is Box-Cox when every value is
// positive and Yeo-Johnson otherwise, with lambda-hat and its likelihood-ratio interval from
// estimate_lambda (powerback/lambda.hpp); the statistics after it use the convenient lambda, the
// value the screen recommends.
#pragma once

#include <cstddef>
#include <string>

#include "powerback/ladder.hpp"
#include "powerback/lambda.hpp"
#include "powerback/normality.hpp"
#include "powerback/transform.hpp"

namespace powerback {

struct ScreenOptions {
  double level = 0.95;               // confidence level of the lambda interval
  double lower = -3.0, upper = 3.0;  // search range of lambda
};

// Skewness and Shapiro-Wilk of a variable after a transform.
struct AfterTransform {
  double skewness = 0.0;  // G1 of the transformed values (NaN when undefined)
  ShapiroWilk sw;
};

struct VariableScreen {
  std::size_t n = 0;
  // false when there are fewer than 3 values or all are identical: only n, moments and note
  // are then meaningful.
  bool usable = false;
  std::string note;        // why not usable; or why the ML alternative is missing; else ""
  Moments moments;
  ShapiroWilk sw;          // before any transform
  LadderAdvice ladder;
  AfterTransform after_ladder;   // equals the "before" figures when the ladder says none
  bool ml_done = false;    // false when estimate_lambda failed (the reason is in note)
  LambdaEstimate ml;
  TransformSpec ml_spec;   // box-cox or yeo-johnson with lambda = ml.convenient
  AfterTransform after_ml;
};

// Screens one variable of n finite values (remove missing values first; NaN or infinite values
// throw IndexedError(NonFinite)). Throws Error(Argument) for level outside (0, 1) or
// lower >= upper; a variable that cannot be screened is reported through usable and note.
VariableScreen screen_variable(const double* x, std::size_t n, const ScreenOptions& opt = {});

}  // namespace powerback
