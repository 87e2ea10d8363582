#!/usr/bin/env bash
# Many responses against one design through R: 40 responses at n = 1e5, p = 10 against one
# response, measured in one run; prints the ratio. Not part of the tests.
#   bash bench/run_many_responses_bench.sh [BUILDDIR] [n p q reps]   (default build/rdev; 1e5 10 40 3)
# Installs the package with tools/dev_rtest.sh's build into BUILDDIR/Rlib first when it is not
# there.
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
build=${1:-$root/build/rdev}
shift || true
. "$root/bench/ensure_rlib.sh"
R_LIBS="$build/Rlib" Rscript --vanilla "$root/bench/many_responses_bench.R" "$@"
