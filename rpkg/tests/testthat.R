library(testthat)
library(powerback)

test_check("powerback")
