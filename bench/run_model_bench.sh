#!/usr/bin/env bash
# Model benchmark (fit, predict, object size against lm on the transformed data), one run.
#   bash bench/run_model_bench.sh RLIB [n] [m]   RLIB: a library where powerback is installed
#   (e.g. build/rdev/Rlib after tools/dev_rtest.sh build/rdev).
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
lib=${1:?usage: bench/run_model_bench.sh RLIB [n] [m]}
R_LIBS="$lib" Rscript --vanilla "$here/model_bench.R" "${2:-1000000}" "${3:-100000}"
