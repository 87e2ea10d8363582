#!/usr/bin/env bash
# Build the R package tarball from a staged copy of rpkg/, so the working tree stays clean:
# stage rpkg/, sync core + capi sources into it, regenerate Rcpp exports and roxygen output,
# then R CMD build. Prints the tarball's path on its last line.
#   tools/build_rpkg.sh OUTDIR [--no-build-vignettes]
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
out=${1:?usage: tools/build_rpkg.sh OUTDIR}
shift
mkdir -p "$out"
out=$(cd "$out" && pwd)
stage="$out/stage/powerback"
rm -rf "$out/stage"
mkdir -p "$out/stage"
cp -R "$root/rpkg" "$stage"
rm -rf "$stage"/src/*.o "$stage"/src/*.so
"$root/tools/sync_rpkg_sources.sh" "$stage" >/dev/null
"$root/tools/document.sh" "$stage" >/dev/null
(cd "$out" && R CMD build "$@" "$stage" >"$out/build.log" 2>&1) || { cat "$out/build.log"; exit 1; }
ls -1 "$out"/powerback_*.tar.gz | tail -n 1
