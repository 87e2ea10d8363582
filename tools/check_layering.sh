#!/usr/bin/env bash
# The one-way layering, checked on every #include:
#   core/      includes nothing of the C ABI (powerback.h, capi_*) and nothing of R or Rcpp;
#   capi/src/  includes nothing of R or Rcpp;
#   rpkg/src/  glue files include only powerback.h, the glue's own headers (glue_*.h), R and
#              Rcpp headers (R.h, Rinternals.h, R_ext/..., Rcpp*.h) and the C/C++ standard library.
# Prints every offending line and exits 1 when there is one.
#   tools/check_layering.sh [root]      check a source tree (default: this repository)
#   tools/check_layering.sh --self-test check that planted violations are caught
set -euo pipefail

check_tree() {
  local root=$1 bad=0 f line inc
  # R or Rcpp headers: R.h, Rinternals.h, Rmath.h, Rdefines.h, R_ext/..., Rcpp..., RcppEigen...
  local r_re='^(R\.h|Rinternals\.h|Rmath\.h|Rdefines\.h|Rembedded\.h|Rversion\.h|Rconfig\.h|R_ext/.*|Rcpp.*)$'
  report() { echo "layering: $1: $2 ($3)"; bad=1; }
  includes() {  # "file<TAB>header" for every #include in the files given
    grep -HE '^[[:space:]]*#[[:space:]]*include[[:space:]]*[<"]' "$@" 2>/dev/null |
      sed -E 's/^([^:]*):[[:space:]]*#[[:space:]]*include[[:space:]]*[<"]([^>"]*)[>"].*/\1\t\2/'
  }
  mapfile -t core_files < <(find "$root/core" -type f \( -name '*.cpp' -o -name '*.hpp' -o -name '*.h' \) | sort)
  if [ ${#core_files[@]} -gt 0 ]; then
    while IFS=$'\t' read -r f inc; do
      if [[ $inc == powerback.h || $inc == capi_* || $inc == */capi_* ]]; then
        report "$f" "$inc" "the core must not know the C ABI"
      elif [[ $inc =~ $r_re ]]; then
        report "$f" "$inc" "the core must not know R"
      fi
    done < <(includes "${core_files[@]}")
  fi
  mapfile -t capi_files < <(find "$root/capi/src" -type f \( -name '*.cpp' -o -name '*.hpp' -o -name '*.h' \) | sort)
  if [ ${#capi_files[@]} -gt 0 ]; then
    while IFS=$'\t' read -r f inc; do
      if [[ $inc =~ $r_re ]]; then report "$f" "$inc" "the C ABI must not know R"; fi
    done < <(includes "${capi_files[@]}")
  fi
  # The glue: rpkg/src itself, without the synced copies of core and capi (pwb/, pwb_*.cpp).
  mapfile -t glue_files < <(find "$root/rpkg/src" -maxdepth 1 -type f \( -name '*.cpp' -o -name '*.h' -o -name '*.hpp' \) ! -name 'pwb_*' | sort)
  if [ ${#glue_files[@]} -gt 0 ]; then
    while IFS=$'\t' read -r f inc; do
      if [[ $inc == powerback.h || $inc =~ ^glue_[A-Za-z0-9_]*\.h$ || $inc =~ $r_re ]]; then continue; fi
      # The standard library: <cmath>, <vector> (no extension, no directory) and the C headers.
      if [[ $inc =~ ^[a-z_]+$ ]]; then continue; fi
      if [[ $inc =~ ^(assert|ctype|errno|float|limits|math|stdarg|stddef|stdint|stdio|stdlib|string)\.h$ ]]; then continue; fi
      report "$f" "$inc" "the glue reaches the library only through powerback.h"
    done < <(includes "${glue_files[@]}")
  fi
  return $bad
}

self_test() {
  local tmp rc=0 out
  tmp=$(mktemp -d)
  trap 'rm -rf "$tmp"' RETURN
  mkdir -p "$tmp/core/src" "$tmp/capi/src" "$tmp/rpkg/src/pwb"
  printf '#include <cmath>\n#include "powerback/errors.hpp"\n' >"$tmp/core/src/ok.cpp"
  printf '#include "powerback.h"\n#include <Rcpp.h>\n#include <vector>\n' >"$tmp/rpkg/src/glue_ok.cpp"
  printf '#include "powerback/errors.hpp"\n' >"$tmp/rpkg/src/pwb_copy.cpp"   # a synced copy: ignored
  printf '#include "capi_internal.hpp"\n' >"$tmp/capi/src/ok.cpp"
  check_tree "$tmp" >/dev/null || { echo "self-test: a clean tree was rejected"; return 1; }
  local planted=(
    "core/src/a.cpp|#include \"powerback.h\""
    "core/src/b.cpp|#include \"capi_internal.hpp\""
    "core/src/c.cpp|#include <Rinternals.h>"
    "capi/src/d.cpp|#include <Rcpp.h>"
    "capi/src/e.cpp|#include <R_ext/Print.h>"
    "rpkg/src/glue_f.cpp|#include \"powerback/model.hpp\""
    "rpkg/src/glue_g.cpp|#include <Eigen/Dense>"
    "rpkg/src/glue_h.cpp|  #  include \"capi_internal.hpp\""
  )
  local p file text
  for p in "${planted[@]}"; do
    file=${p%%|*}
    text=${p#*|}
    printf '%s\n' "$text" >"$tmp/$file"
    if out=$(check_tree "$tmp"); then
      echo "self-test: not caught: $file: $text"; rc=1
    elif ! grep -q "$file" <<<"$out"; then
      echo "self-test: wrong file reported for $file: $out"; rc=1
    fi
    rm -f "$tmp/$file"
  done
  [ $rc -eq 0 ] && echo "self-test: ${#planted[@]} planted violations caught, the clean tree passes"
  return $rc
}

if [ "${1:-}" = "--self-test" ]; then
  self_test
else
  root=${1:-$(cd "$(dirname "$0")/.." && pwd)}
  if check_tree "$root"; then echo "layering: core, capi/src and rpkg/src include only what their layer may"; else exit 1; fi
fi
