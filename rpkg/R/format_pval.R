# Number styles of the printed output. One p-value style everywhere, following base R's
# format.pval() conventions (values below `eps` as "<eps"), with each value formatted on its own
# so a column never gets trailing zeros ("0.07216", not "0.0721600") and never mixes fixed and
# scientific notation (the smallest shown value is written in fixed notation too).

# p-values as text: `digits` significant digits, "<0.0001" below eps, `na` for NA.
pwb_format_pval <- function(p, digits = 2L, eps = 1e-4, na = "NA") {
  p <- as.double(p)
  out <- rep(na, length(p))
  ok <- !is.na(p)
  small <- ok & p < eps
  out[small] <- paste0("<", pwb_format_fixed(eps))
  big <- ok & !small
  out[big] <- vapply(p[big], function(v) pwb_format_fixed(signif(v, digits)), character(1))
  out
}

# Other statistics as text: `digits` significant digits each, no trailing zeros, scientific
# notation only for magnitudes beyond 1e-4 .. 1e6 (as R's own print does); `na` for NA.
pwb_format_num <- function(v, digits = 3L, na = "NA") {
  v <- as.double(v)
  vapply(v, function(a) {
    if (is.na(a)) return(na)
    if (!is.finite(a)) return(if (a > 0) "Inf" else "-Inf")
    a <- signif(a, digits)
    if (a != 0 && (abs(a) < 1e-4 || abs(a) >= 1e6))
      return(formatC(a, digits = digits, format = "g", drop0trailing = TRUE))
    pwb_format_fixed(a)
  }, character(1))
}

# A number in fixed notation with exactly the digits it has (no trailing zeros).
pwb_format_fixed <- function(a) {
  format(a, scientific = FALSE, digits = 15L, drop0trailing = TRUE, trim = TRUE)
}
