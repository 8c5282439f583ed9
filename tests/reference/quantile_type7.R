# Reference values for tests/core/test_quantile.cpp: R's quantile(type = 7) (Hyndman & Fan 1996,
# definition 7). Produced with R 4.2.2 (Debian package r-base-core 4.2.2):
#   Rscript tests/reference/quantile_type7.R
# Each line: sample name, probability, quantile printed with 17 significant digits.
samples <- list(
  four = c(1, 2, 3, 4),
  unsorted = c(12, 3, 7, 7, 25, 0, 18, 4, 9),
  single = c(42),
  pair = c(-5, 5),
  decimals = c(0.5, 2.25, -1.75, 3.125, 10, 7.5, 7.5),
  leads = c(rep(0, 3), rep(2, 4), rep(5, 1), rep(14, 6), rep(40, 2)),
  # Lead times per room-night of the hand-made set in tests/core/test_bookingwindow.cpp.
  window_all = c(0, 0, 1, 1, 3, 6, 6, 6, 25, 70, 70, 70, 70, 231, 231),
  window_flex = c(0, 0, 3, 25, 70, 70, 70, 70),
  window_corp = c(1, 1, 6, 6, 6, 231, 231),
  # Reference-night values of the hand-made band in tests/core/test_comparablenights.cpp.
  band_rooms_d0 = c(3, 4, 0, 1),
  band_rooms_d1 = c(3, 4, 0, 0),
  band_rooms_d2 = c(2, 0, 0, 5),
  band_pct_d1 = c(100, 100, 0),
  band_pct_d2 = c(200 / 3, 0, 500)
)
probs <- c(0, 0.1, 0.25, 0.5, 0.75, 0.9, 1)
for (name in names(samples)) {
  q <- quantile(samples[[name]], probs, type = 7, names = FALSE)
  for (i in seq_along(probs))
    cat(sprintf("%s %s %s\n", name, format(probs[i]), format(q[i], digits = 17)))
}
