# Generate the invented river-monitoring demo data of powerback.
#
# Everything here is made up: a fictional catchment with twelve monitoring stations (ST01..ST12),
# no real river, agency or measurement. The generating truth is known, so a demo can check that
# the package recovers it:
#
#   log(sediment) = -1.2 + 1.25 log(flow) + 0.018 rain72 - 0.025 forest
#                   + season effect + station effect + N(0, 0.5^2)
#
# so the response's Box-Cox power is 0 (log), flow enters on the log scale, rain72 and forest
# enter linearly. Run from the repository root:
#
#   Rscript vignettes-data/make_river_data.R
#
# It writes vignettes-data/river_fit.csv (480 rows, for fitting) and vignettes-data/river_new.csv
# (60 rows, for prediction, with the observed response for checking coverage).
set.seed(20261202)

stations <- sprintf("ST%02d", 1:12)
seasons <- c("winter", "spring", "summer", "autumn")
season_sed <- c(winter = 0.30, spring = 0.45, summer = -0.35, autumn = 0)
season_flow <- c(winter = 0.35, spring = 0.55, summer = -0.60, autumn = 0)
station_flow <- exp(runif(12, log(2), log(60)))        # median flow, m3/s
station_forest <- 100 * rbeta(12, 6, 1.4)               # percent forest cover, left-skewed
station_sed <- rnorm(12, 0, 0.25)                       # unexplained station differences
truth <- c(intercept = -1.2, log_flow = 1.25, rain72 = 0.018, forest = -0.025, sigma = 0.5)

simulate <- function(per_station) {
  st <- rep(seq_along(stations), each = per_station)
  n <- length(st)
  season <- factor(sample(seasons, n, replace = TRUE), levels = seasons)
  flow <- exp(log(station_flow[st]) + season_flow[as.character(season)] + rnorm(n, 0, 0.7))
  rain <- ifelse(runif(n) < 0.4, 0, rgamma(n, shape = 0.9, rate = 1 / 12))
  forest <- pmin(99.5, pmax(1, station_forest[st] + rnorm(n, 0, 2)))
  eta <- truth[["intercept"]] + truth[["log_flow"]] * log(flow) + truth[["rain72"]] * rain +
    truth[["forest"]] * forest + season_sed[as.character(season)] + station_sed[st]
  sediment <- exp(eta + rnorm(n, 0, truth[["sigma"]]))
  data.frame(station = factor(stations[st], levels = stations), season = season,
             flow_m3s = signif(flow, 5), rain72_mm = round(rain, 1),
             forest_pct = round(forest, 1), sediment_t_day = signif(sediment, 5))
}

fit <- simulate(40)
new <- simulate(5)
here <- if (dir.exists("vignettes-data")) "vignettes-data" else "."
utils::write.csv(fit, file.path(here, "river_fit.csv"), row.names = FALSE)
utils::write.csv(new, file.path(here, "river_new.csv"), row.names = FALSE)
cat("wrote", nrow(fit), "fitting rows and", nrow(new), "prediction rows to", here, "\n")
