#!/usr/bin/env bash
# Install, from Debian's archive, whatever this machine lacks to build and test powerback.
# Does nothing (and needs no network) when every package is already present.
set -euo pipefail

packages=(
  cmake g++ make pkg-config
  libeigen3-dev libboost-math-dev catch2
  r-base-dev r-cran-rcpp r-cran-rcppeigen r-cran-bh
  r-cran-testthat r-cran-roxygen2 r-cran-knitr r-cran-rmarkdown
  pandoc qpdf
  python3 python3-scipy python3-numpy
  clang libclang-rt-dev
)

missing=()
for p in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$p")
  fi
done

if [ "${#missing[@]}" -eq 0 ]; then
  echo "setup: all ${#packages[@]} packages present"
  exit 0
fi

echo "setup: installing ${missing[*]}"
sudo_cmd=""
if [ "$(id -u)" -ne 0 ]; then sudo_cmd="sudo"; fi
export DEBIAN_FRONTEND=noninteractive
$sudo_cmd apt-get update -qq
$sudo_cmd apt-get install -y -qq --no-install-recommends "${missing[@]}"
echo "setup: done"
