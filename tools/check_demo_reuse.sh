#!/usr/bin/env bash
# Checks tools/demo.sh's reuse of an installed package and its recovery from a stale install
# lock: runs the demo into a fresh OUTDIR (a full build, a few minutes), plants the lock an
# interrupted install leaves, runs it again and requires the second run to remove the lock, to
# reuse the install (no rebuild) and to leave vignette("powerback") available.
#   tools/check_demo_reuse.sh [OUTDIR]     (default: a new temporary directory)
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
out=${1:-$(mktemp -d)}
fail() { echo "check_demo_reuse: FAIL: $*" >&2; exit 1; }
bash "$root/tools/demo.sh" "$out" >"$out/first.log" 2>&1 || fail "first run failed (see $out/first.log)"
mkdir -p "$out/Rlib/00LOCK-powerback"
bash "$root/tools/demo.sh" "$out" >"$out/second.log" 2>&1 || fail "second run failed (see $out/second.log)"
grep -q "removing a stale install lock" "$out/second.log" || fail "the stale lock was not reported"
[ ! -e "$out/Rlib/00LOCK-powerback" ] || fail "the stale lock is still there"
grep -q "sources unchanged since the last install" "$out/second.log" || fail "the package was rebuilt"
R_LIBS="$out/Rlib" Rscript -e 'v <- vignette("powerback", package = "powerback");
  stopifnot(nzchar(v$PDF), file.exists(file.path(v$Dir, "doc", v$PDF)))' \
  || fail "vignette(\"powerback\") is not installed"
echo "check_demo_reuse: ok ($out)"
