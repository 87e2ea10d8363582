#!/usr/bin/env bash
# The main job on the bundled demo data: install what is missing, build and install the R
# package (with its vignette) into a private library (out/Rlib), then run the demo report.
#   tools/demo.sh [OUTDIR]      (default: ./out)
# The package is rebuilt only when its sources changed since the last install (a stamp of their
# hash is kept in OUTDIR), and a lock left behind by an interrupted install is cleared.
# Afterwards: R_LIBS=OUTDIR/Rlib R, then library(powerback); vignette("powerback").
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
cd "$root"
bash tools/setup.sh >/dev/null
out=${1:-$root/out}
mkdir -p "$out/Rlib"
out=$(cd "$out" && pwd)
export MAKEFLAGS="-j$(nproc 2>/dev/null || echo 2)"

# One demo at a time per OUTDIR: while this lock is held, no other install of ours runs there,
# so an install lock found in the library is stale (a run was interrupted) and can be removed.
exec 9>"$out/.demo.lock"
if ! flock -n 9; then
  echo "demo: another tools/demo.sh is using $out; waiting for it" >&2
  flock 9
fi
if [ -e "$out/Rlib/00LOCK-powerback" ]; then
  echo "demo: removing a stale install lock left by an interrupted run" >&2
  rm -rf "$out/Rlib/00LOCK-powerback"
fi

# Everything the installed package is built from (tracked and untracked files, not ignored ones).
source_hash() {
  git -C "$root" ls-files -z --cached --others --exclude-standard -- \
      rpkg core capi vignettes-data tools/build_rpkg.sh tools/sync_rpkg_sources.sh \
      tools/document.sh |
    sort -z | xargs -0 sha256sum 2>/dev/null | sha256sum | cut -d' ' -f1
}
stamp="$out/Rlib/.powerback-source-hash"
want=$(source_hash)
if [ -f "$stamp" ] && [ "$(cat "$stamp")" = "$want" ] && [ -d "$out/Rlib/powerback" ]; then
  echo "demo: sources unchanged since the last install; reusing $out/Rlib/powerback" >&2
else
  rm -f "$stamp"
  echo "demo: building and installing the package with its vignette (a few minutes)" >&2
  tarball=$(tools/build_rpkg.sh "$out/rbuild" | tail -n 1)
  R CMD INSTALL --no-test-load -l "$out/Rlib" "$tarball" >"$out/install.log" 2>&1 \
    || { tail -n 40 "$out/install.log"; exit 1; }
  echo "$want" >"$stamp"
fi
R_LIBS="$out/Rlib" Rscript --vanilla tools/demo.R "$out"
