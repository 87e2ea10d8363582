// The layout of the opaque pwb_model handle, shared by the model and diagnostics entry points.
#pragma once

#include "powerback.h"
#include "powerback/model.hpp"

struct pwb_model {
  powerback::Model impl;
};
