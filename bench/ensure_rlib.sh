# Sourced by the R bench runners: installs the package with tools/dev_rtest.sh's build into
# $build/Rlib when it is not there yet. Needs $root (the checkout) and $build set.
if [ ! -d "$build/Rlib/powerback" ]; then
  mkdir -p "$build"
  tarball=$("$root/tools/build_rpkg.sh" "$build/rpkg" --no-build-vignettes | tail -n 1)
  R CMD INSTALL --no-test-load -l "$build/Rlib" "$tarball" >"$build/install.log" 2>&1
fi
