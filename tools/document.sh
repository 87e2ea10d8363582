#!/usr/bin/env bash
# Regenerate the R package's generated files: src/RcppExports.cpp, R/RcppExports.R (from the
# Rcpp attributes of the glue), NAMESPACE and man/ (from roxygen comments).
#   tools/document.sh [PKGDIR]     (default: rpkg/ of this checkout)
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
pkg=${1:-$root/rpkg}
Rscript --vanilla -e '
  pkg <- commandArgs(TRUE)[1]
  Rcpp::compileAttributes(pkg)
  suppressMessages(roxygen2::roxygenise(pkg, load_code = "source"))
' "$pkg"
