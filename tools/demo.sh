#!/usr/bin/env bash
# The main job on the bundled demo data: install what is missing, build and install the R
# package into a private library (out/Rlib), then run the demo report.
#   tools/demo.sh [OUTDIR]      (default: ./out)
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
cd "$root"
bash tools/setup.sh >/dev/null
out=${1:-$root/out}
mkdir -p "$out/Rlib"
out=$(cd "$out" && pwd)
export MAKEFLAGS="-j$(nproc 2>/dev/null || echo 2)"
tarball=$(tools/build_rpkg.sh "$out/rbuild" --no-build-vignettes | tail -n 1)
R CMD INSTALL --no-test-load -l "$out/Rlib" "$tarball" >"$out/install.log" 2>&1 \
  || { tail -n 40 "$out/install.log"; exit 1; }
R_LIBS="$out/Rlib" Rscript --vanilla tools/demo.R "$out"
