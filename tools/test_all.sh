#!/usr/bin/env bash
# Run every test of powerback: build the C++ core and C ABI, run ctest (Catch2 tests, the C99
# header program, the exported-symbol check, fixture provenance checks, the layering check),
# run the C++ and C tests again in a second tree built with AddressSanitizer and
# UndefinedBehaviorSanitizer (build-asan), run each libFuzzer target briefly when clang is
# present, then build the R package and run R CMD check --as-cran on the tarball (which runs
# the testthat suite).
# Fails on any test failure and on any R CMD check ERROR or WARNING.
#
#   tools/test_all.sh            build tree in ./build (override with PWB_BUILD_DIR)
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
cd "$root"
bash tools/setup.sh

build=${PWB_BUILD_DIR:-$root/build}
jobs=$(nproc 2>/dev/null || echo 2)
export MAKEFLAGS="-j$jobs"

mkdir -p "$build"
echo "== C++ core and C ABI (cmake + ctest)"
# ccache, where the machine has it, makes the three builds below (plain, sanitized, fuzz) cheap to
# repeat; without it the compilers run directly.
launcher=()
if command -v ccache >/dev/null; then launcher=(-DCMAKE_CXX_COMPILER_LAUNCHER=ccache -DCMAKE_C_COMPILER_LAUNCHER=ccache); fi
cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DPWB_WARNINGS_AS_ERRORS=ON "${launcher[@]}" >"$build/cmake.log" 2>&1 \
  || { cat "$build/cmake.log"; exit 1; }
cmake --build "$build" -j "$jobs" >"$build/build.log" 2>&1 || { tail -n 60 "$build/build.log"; exit 1; }
set +e
(cd "$build" && ctest --output-on-failure -j "$jobs") | tee "$build/ctest.log"
ctest_rc=${PIPESTATUS[0]}
set -e

# The same C++ and C tests built with AddressSanitizer and UndefinedBehaviorSanitizer, in a
# second tree (only the test programs are built; the R package and install tests are not).
echo "== Sanitizers: ctest of the C++ and C tests under -DPWB_SANITIZE=address,undefined"
asan=${PWB_ASAN_BUILD_DIR:-$root/build-asan}
mkdir -p "$asan"
san_rc=0
# Warnings are gated by the plain build above; under the sanitizers GCC 12 raises false
# -Wmaybe-uninitialized warnings inside libstdc++'s <regex> (used by Catch2), so not as errors here.
cmake -S "$root" -B "$asan" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DPWB_WARNINGS_AS_ERRORS=OFF \
  -DPWB_SANITIZE=address,undefined "${launcher[@]}" >"$asan/cmake.log" 2>&1 || { cat "$asan/cmake.log"; san_rc=1; }
if [ "$san_rc" -eq 0 ]; then
  cmake --build "$asan" -j "$jobs" --target pwb_core_tests pwb_capi_tests pwb_c99_header_check \
    pwb_cxx11_header_check pwb_cxx17_header_check pwb_example_c >"$asan/build.log" 2>&1 \
    || { tail -n 60 "$asan/build.log"; san_rc=1; }
fi
if [ "$san_rc" -eq 0 ]; then
  set +e
  (cd "$asan" && ASAN_OPTIONS=detect_leaks=1 UBSAN_OPTIONS=print_stacktrace=1 \
     ctest --output-on-failure -j "$jobs" -R '^(core|capi|c|example)\.' -E '^example\.(python|r_)') | tee "$asan/ctest.log"
  san_rc=${PIPESTATUS[0]}
  set -e
fi

# libFuzzer targets (clang only; skipped with a note without it): a short run of each.
echo "== Fuzz smoke run (tests/fuzz, ${PWB_FUZZ_SECONDS:-20} s per target)"
set +e
bash tools/fuzz_smoke.sh "${PWB_FUZZ_SECONDS:-20}"
fuzz_rc=$?
set -e

echo "== R package (R CMD build + R CMD check --as-cran)"
rdir="$build/rpkg"
tarball=$(tools/build_rpkg.sh "$rdir" | tail -n 1)
export _R_CHECK_CRAN_INCOMING_=false _R_CHECK_CRAN_INCOMING_REMOTE_=false
export _R_CHECK_FUTURE_FILE_TIMESTAMPS_=false _R_CHECK_SYSTEM_CLOCK_=false
set +e
(cd "$rdir" && R CMD check --as-cran --no-manual "$tarball" >"$rdir/check.out" 2>&1)
check_rc=$?
set -e
cat "$rdir/check.out"
checkdir="$rdir/powerback.Rcheck"
status_line=$(grep -E '^Status:' "$checkdir/00check.log" | tail -n 1 || true)
testthat_line=$(grep -hE '^\[ FAIL [0-9]+ \| WARN [0-9]+ \| SKIP [0-9]+ \| PASS [0-9]+ \]' \
  "$checkdir"/tests/testthat.Rout* 2>/dev/null | tail -n 1 || true)
[ -f "$checkdir/tests/testthat.Rout.fail" ] && tail -n 80 "$checkdir/tests/testthat.Rout.fail"

# The R -> Python chain: the reference files the Python example checks against are what the
# freshly checked R package writes now (skipped by ctest above, when no package was installed).
echo "== R reference of the Python example, with the package R CMD check installed"
ref_rc=0
if [ -d "$checkdir/powerback" ]; then
  cmake "$build" -DPWB_R_LIBS="$checkdir" >/dev/null
  (cd "$build" && ctest --output-on-failure -R '^example\.r_reference_reproduces$') | tee "$build/ctest-rref.log" || ref_rc=1
  grep -q "100% tests passed" "$build/ctest-rref.log" || ref_rc=1
  if grep -q "(Skipped)" "$build/ctest-rref.log"; then ref_rc=1; fi
else
  echo "no installed package under $checkdir"; ref_rc=1
fi

# One closing line over both suites.
c_total=$(sed -nE 's/.* tests failed out of ([0-9]+).*/\1/p' "$build/ctest.log" | tail -n 1)
c_failed=$(sed -nE 's/.*, ([0-9]+) tests failed out of.*/\1/p' "$build/ctest.log" | tail -n 1)
t_fail=$(sed -nE 's/^\[ FAIL ([0-9]+) .*/\1/p' <<<"$testthat_line")
t_pass=$(sed -nE 's/.* PASS ([0-9]+) \]/\1/p' <<<"$testthat_line")
c_total=${c_total:-0}; c_failed=${c_failed:-0}; t_fail=${t_fail:-0}; t_pass=${t_pass:-0}
echo
echo "ctest: $((c_total - c_failed)) of $c_total passed; testthat: $testthat_line; R CMD check: $status_line"
rc=0
[ "$ctest_rc" -eq 0 ] || { echo "FAILED: ctest"; rc=1; }
[ "$san_rc" -eq 0 ] || { echo "FAILED: ctest under the sanitizers ($asan/ctest.log)"; rc=1; }
[ "$fuzz_rc" -eq 0 ] || { echo "FAILED: the fuzz smoke run"; rc=1; }
[ "$ref_rc" -eq 0 ] || { echo "FAILED: the R reference of the Python example"; rc=1; c_failed=$((c_failed + 1)); }
[ "$check_rc" -eq 0 ] || { echo "FAILED: R CMD check exited $check_rc"; rc=1; }
[ -n "$status_line" ] || { echo "FAILED: no R CMD check status"; rc=1; }
if grep -qE 'WARNING|ERROR' <<<"$status_line"; then echo "FAILED: R CMD check reported $status_line"; rc=1; fi
[ -n "$testthat_line" ] || { echo "FAILED: no testthat summary"; rc=1; }
[ "$t_fail" -eq 0 ] || rc=1
echo "$((c_total - c_failed + t_pass)) passed, $((c_failed + t_fail)) failed"
exit $rc
