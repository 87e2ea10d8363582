#!/usr/bin/env bash
# The smearing mean with n_new = n_train = 1e6 (target <= 2 s per family), and its ratio to the
# pairwise mean (timed on 100 rows, scaled). Not part of the tests.
#   bash bench/run_smearing_bench.sh [BUILDDIR] [n]   (defaults /tmp/pwb-bench, 1000000)
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=${1:-/tmp/pwb-bench}
cmake -S "$here" -B "$build" -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build "$build" -j2 --target smearing_bench >/dev/null
# The load beside the figures: on a shared machine the wall-clock times inflate with it.
if command -v uptime >/dev/null; then echo "before: $(uptime)"; fi
"$build/smearing_bench" "${2:-1000000}"
if command -v uptime >/dev/null; then echo "after: $(uptime)"; fi
