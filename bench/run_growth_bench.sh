#!/usr/bin/env bash
# Growth exponents of the R entry points (bench/growth_bench.R), one run. Not part of the tests.
#   bash bench/run_growth_bench.sh [BUILDDIR] [n ...]   (default build/rdev; n = 1e4 1e5 1e6)
# Installs the package with tools/build_rpkg.sh into BUILDDIR/Rlib first when it is not there.
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
build=${1:-$root/build/rdev}
shift || true
. "$root/bench/ensure_rlib.sh"
uptime
R_LIBS="$build/Rlib" Rscript --vanilla "$root/bench/growth_bench.R" "$@"
uptime
