#!/usr/bin/env bash
# Quick R loop for developers: build the package from a staged copy, install it into a private
# library and run the testthat files whose names match FILTER (all when omitted). Faster than
# R CMD check; tools/test_all.sh remains the full gate.
#   tools/dev_rtest.sh BUILDDIR [FILTER]
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
out=${1:?usage: tools/dev_rtest.sh BUILDDIR [FILTER]}
filter=${2:-}
mkdir -p "$out/Rlib"
out=$(cd "$out" && pwd)
export MAKEFLAGS="-j$(nproc 2>/dev/null || echo 2)"
tarball=$("$root/tools/build_rpkg.sh" "$out/rpkg" --no-build-vignettes | tail -n 1)
R CMD INSTALL --no-test-load -l "$out/Rlib" "$tarball" >"$out/install.log" 2>&1 \
  || { tail -n 60 "$out/install.log"; exit 1; }
cd "$out/rpkg/stage/powerback/tests/testthat"
R_LIBS="$out/Rlib" Rscript --vanilla -e '
  f <- commandArgs(TRUE)[1]
  res <- testthat::test_dir(".", filter = if (nzchar(f)) f else NULL, package = "powerback",
                            load_package = "installed", stop_on_failure = FALSE)
  df <- as.data.frame(res)
  cat(sprintf("\n%d passed, %d failed\n", sum(df$passed), sum(df$failed) + sum(df$error)))
  if (sum(df$failed) + sum(df$error) > 0) quit(status = 1)
' "$filter"
