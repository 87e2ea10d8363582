# Draws `code` into a null PDF device with the display list on and returns the recorded calls:
# list(name = the graphics routine, e.g. "C_plotXY", args = its arguments), in drawing order.
recorded_calls <- function(code) {
  grDevices::pdf(NULL)
  on.exit(grDevices::dev.off())
  grDevices::dev.control("enable")
  force(code)
  dl <- grDevices::recordPlot()[[1L]]
  lapply(dl, function(e) list(name = e[[2L]][[1L]]$name, args = as.list(e[[2L]])[-1L]))
}

# The (x, y) of every points/lines call (C_plotXY) among recorded calls.
recorded_xy <- function(calls) {
  xy <- Filter(function(e) identical(e$name, "C_plotXY"), calls)
  lapply(xy, function(e) list(x = e$args[[1L]]$x, y = e$args[[1L]]$y))
}
