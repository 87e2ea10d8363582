#!/usr/bin/env bash
# compare_transforms() against a by-hand base-R k-fold loop, measured in one run; prints the
# ratio at each n and the growth exponents. Not part of the tests.
#   bash bench/run_compare_bench.sh [BUILDDIR] [n ...]   (default build/rdev; n = 1e4 3e4)
# Installs the package with tools/dev_rtest.sh's build into BUILDDIR/Rlib first when it is not
# there. n = 1e6 takes a few CPU minutes on each side.
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
build=${1:-$root/build/rdev}
shift || true
. "$root/bench/ensure_rlib.sh"
R_LIBS="$build/Rlib" Rscript --vanilla "$root/bench/compare_bench.R" "$@"
