#!/usr/bin/env bash
# Copy the C++ core, the C ABI, the shared test fixtures and the demo data into an R package tree, so that
# R CMD build / INSTALL find every source inside the package. The copies are generated, never
# committed (see .gitignore), and are replaced whole on every run, so they cannot drift.
#
#   tools/sync_rpkg_sources.sh [PKGDIR]     (default: rpkg/ of this checkout)
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
pkg=${1:-$root/rpkg}

rm -rf "$pkg/src/pwb" "$pkg"/src/pwb_*.cpp "$pkg/tests/testthat/fixtures" "$pkg/inst/extdata"
mkdir -p "$pkg/src/pwb/core/include" "$pkg/src/pwb/capi/include" "$pkg/src/pwb/capi/src" \
         "$pkg/tests/testthat/fixtures" "$pkg/inst/extdata"

cp -R "$root/core/include/powerback" "$pkg/src/pwb/core/include/"
# The core's private headers (core/src/*.hpp) go on the same include path.
cp "$root"/core/src/*.hpp "$pkg/src/pwb/core/include/" 2>/dev/null || true
cp "$root/capi/include/powerback.h" "$pkg/src/pwb/capi/include/"
cp "$root"/capi/src/*.hpp "$pkg/src/pwb/capi/src/" 2>/dev/null || true
# R compiles only the top level of src/, so the sources are flattened with a prefix.
for f in "$root"/core/src/*.cpp; do cp "$f" "$pkg/src/pwb_core_$(basename "$f")"; done
for f in "$root"/capi/src/*.cpp; do cp "$f" "$pkg/src/pwb_capi_$(basename "$f")"; done
cp "$root"/tests/fixtures/*.csv "$pkg/tests/testthat/fixtures/"
# The invented demo data ships with the package (examples, vignette, river_data()).
cp "$root"/vignettes-data/river_*.csv "$pkg/inst/extdata/"
echo "synced core, capi, fixtures and demo data into $pkg"
