#!/usr/bin/env bash
# Build the libFuzzer targets of tests/fuzz with clang (ASan + UBSan) and run each one for a
# short time on its seed corpus (tests/fuzz/corpus/<name>). Fails on any crash, sanitizer report
# or broken invariant; the reproducer is left in the work directory and named in the output.
# Without clang and its libFuzzer runtime it says so and exits 0 (nothing to run).
#
#   tools/fuzz_smoke.sh [seconds per target, default 20]
#   PWB_FUZZ_BUILD_DIR   build tree (default ./build-fuzz)
# New inputs the fuzzer finds go to a scratch directory, never into the committed corpus.
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
secs=${1:-20}
build=${PWB_FUZZ_BUILD_DIR:-$root/build-fuzz}
cc=$(command -v clang || true)
cxx=$(command -v clang++ || true)
if [ -z "$cc" ] || [ -z "$cxx" ]; then
  echo "fuzz: clang not found; skipping the fuzz smoke run (tools/setup.sh installs it)"
  exit 0
fi
probe=$(mktemp -d)
trap 'rm -rf "$probe"' EXIT
printf '#include <stddef.h>\n#include <stdint.h>\nint LLVMFuzzerTestOneInput(const uint8_t *d, size_t n) { (void)d; (void)n; return 0; }\n' >"$probe/p.c"
if ! "$cc" -fsanitize=fuzzer,address,undefined "$probe/p.c" -o "$probe/p" 2>/dev/null; then
  echo "fuzz: clang has no libFuzzer/ASan runtime (Debian: libclang-rt-dev); skipping"
  exit 0
fi

launcher=()
if command -v ccache >/dev/null; then launcher=(-DCMAKE_CXX_COMPILER_LAUNCHER=ccache -DCMAKE_C_COMPILER_LAUNCHER=ccache); fi
jobs=$(nproc 2>/dev/null || echo 2)
mkdir -p "$build"
CC=$cc CXX=$cxx cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DPWB_BUILD_FUZZ=ON \
  -DPWB_BUILD_TESTS=OFF -DPWB_SANITIZE=fuzzer-no-link,address,undefined "${launcher[@]}" \
  >"$build/cmake.log" 2>&1 || { cat "$build/cmake.log"; exit 1; }
cmake --build "$build" -j "$jobs" --target pwb_fuzz >"$build/build.log" 2>&1 || { tail -n 60 "$build/build.log"; exit 1; }

export ASAN_OPTIONS=detect_leaks=1:abort_on_error=1
export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
# Two steps per target. First every committed input (seeds and regression-* reproducers) is
# replayed: deterministic, and a failure fails the run. Then the fuzzer explores for `secs`
# seconds: what it finds depends on chance, so a finding is reported loudly with its reproducer
# but does not fail the run (set PWB_FUZZ_STRICT=1 to make it fail); a fixed finding joins the
# corpus as a regression-* file and from then on is checked by the replay.
strict=${PWB_FUZZ_STRICT:-0}
rc=0
for target in spec transform estimators model compare summary; do
  work="$build/fuzz-work/$target"
  rm -rf "$work"
  mkdir -p "$work/new"
  log="$work/log.txt"
  exe="$build/tests/fuzz/fuzz_$target"
  corpus="$root/tests/fuzz/corpus/$target"
  if ! (cd "$work" && "$exe" -runs=0 -timeout=20 -rss_limit_mb=2048 "$corpus" >"$work/replay.txt" 2>&1); then
    echo "fuzz_$target: FAILED on a committed input (log in $work/replay.txt)"
    grep -E 'ERROR|invariant broken|runtime error|SUMMARY|Test unit written' "$work/replay.txt" | head -n 20 || true
    rc=1
    continue
  fi
  if (cd "$work" && "$exe" -max_total_time="$secs" -timeout=20 \
        -rss_limit_mb=2048 -print_final_stats=1 "$work/new" "$corpus" >"$log" 2>&1); then
    runs=$(sed -nE 's/^stat::number_of_executed_units: *([0-9]+)/\1/p' "$log" | tail -n 1)
    rate=$(sed -nE 's/^stat::average_exec_per_sec: *([0-9]+)/\1/p' "$log" | tail -n 1)
    echo "fuzz_$target: corpus replayed; ${runs:-?} inputs run in ${secs}s (${rate:-?}/s), no failure"
  else
    echo "fuzz_$target: FINDING while exploring (reproducer and log in $work)"
    grep -E 'ERROR|invariant broken|runtime error|SUMMARY|Test unit written' "$log" | head -n 20 || true
    [ "$strict" = 1 ] && rc=1
  fi
done
exit $rc
