# Fixtures shared with the C++ tests are copied into tests/testthat/fixtures by
# tools/sync_rpkg_sources.sh; their provenance is in the repository's tests/fixtures/.
fixture_path <- function(name) test_path("fixtures", name)
