#!/usr/bin/env bash
# Lambda estimation benchmarks, measured in one run; prints the ratios. Not part of the tests.
#   bash bench/run_lambda_bench.sh [BUILDDIR]   (default /tmp/pwb-bench)
# 1. response lambda + 95% interval, n = 1e6, p = 10, against (a) one least-squares fit of the
#    same design in the same process (the library's LeastSquares, and the cheaper Q-less fit)
#    and (b) the by-hand base-R way (optimize + uniroot over lm.fit refits) on all 1e6 rows
#    (about 40 s; PWB_BYHAND_ROWS=100000 times it on the first 1e5 rows and scales linearly,
#    since each refit is O(n p^2)).
# 2. univariate Box-Cox lambda + 95% interval, n = 1e7, against scipy.stats.boxcox(x, alpha=0.05).
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=${1:-/tmp/pwb-bench}
cmake -S "$here" -B "$build" -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build "$build" -j2 >/dev/null
data=$(mktemp -d)
trap 'rm -rf "$data"' EXIT
val() { sed -n "s/^$1=//p" <<<"$2"; }

r1=$("$build/lambda_response_bench" "$data/resp.bin" 1000000 10)
echo "$r1"
byhand_rows=${PWB_BYHAND_ROWS:-1000000}   # rows the by-hand way is timed on (fewer: scaled up)
r2=$(Rscript "$here/lambda_response_byhand.R" "$data/resp.bin" 1000000 10 "$byhand_rows")
echo "$r2"
u1=$("$build/lambda_univariate_bench" "$data/uni.bin" 10000000)
echo "$u1"
u2=$(/usr/bin/python3 "$here/lambda_univariate_scipy.py" "$data/uni.bin")
echo "$u2"

t_fit=$(val one_fit_seconds "$r1"); t_lam=$(val response_lambda_ci_seconds "$r1")
t_qless=$(val qless_fit_seconds "$r1")
t_hand=$(val byhand_seconds "$r2"); t_uni=$(val univariate_lambda_ci_seconds "$u1")
t_sp=$(val scipy_seconds "$u2")
awk -v f="$t_fit" -v q="$t_qless" -v l="$t_lam" -v h="$t_hand" -v u="$t_uni" -v s="$t_sp" -v k="$((1000000 / byhand_rows))" 'BEGIN {
  printf "\nresponse lambda+CI / one least-squares fit      = %.2f  (target <= 2)\n", l / f
  printf "response lambda+CI / one Q-less fit             = %.2f  (target <= 2)\n", l / q
  if (k == 1) printf "by-hand base R (all rows) / powerback           = %.1f  (target >= 100)\n", h / l
  else printf "by-hand base R (scaled x%d to n=1e6) / powerback = %.1f  (target >= 100)\n", k, h * k / l
  printf "scipy boxcox(alpha=0.05) / powerback univariate  = %.1f  (target >= 30)\n", s / u
}'

# 3. (PWB_R_BENCH=1) the R front end against lm() on the same data, in one process, n = 1e6,
#    p = 10 + a 5-level factor (lambda_r_bench.R); then peak resident memory at n = 1e7 of
#    building the data, lm(formula), estimate_response_lambda(formula) and lm_transformed(formula)
#    (response power estimated, and a fixed log response), each in a fresh
#    process under /usr/bin/time -v (lambda_r_memory.R). Needs powerback installed where R finds
#    it (e.g. R_LIBS=build/rdev/Rlib after tools/dev_rtest.sh).
if [ "${PWB_R_BENCH:-0}" = 1 ]; then
  Rscript "$here/lambda_r_bench.R" 1000000 3
  for what in ${PWB_MEMORY_WHAT:-data lm lambda model model_fixed}; do
    /usr/bin/time -v Rscript "$here/lambda_r_memory.R" "$what" 10000000 2>&1 |
      sed -n -e 's/^\t*Maximum resident set size (kbytes): /'"$what"'_peak_kb=/p' -e '/_seconds=/p'
  done
fi
