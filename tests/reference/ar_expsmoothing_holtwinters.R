# Full-precision cross-check of check-values.md section 8 (8a, 8b, 8c) with R's stats::HoltWinters,
# an implementation independent of ours, seeded with the states named in check-values.md.
# (check-values.md prints 6 decimals; this gives the 1e-9 comparison its digits.)
# Run: Rscript tests/reference/ar_expsmoothing_holtwinters.R > tests/reference/ar_expsmoothing_holtwinters.csv
y <- c(60, 62, 65, 70, 95, 110, 80, 63, 64, 68, 74, 99, 115, 83,
       66, 68, 70, 77, 103, 118, 88, 70, 71, 74, 80, 106, 122, 90)
fmt <- function(v) formatC(v, digits = 16, format = "e")
out <- function(case, what, t, v) cat(sprintf("%s,%s,%d,%s\n", case, what, t, fmt(v)))
cat("case,what,t,value\n")
# 8a: SES alpha = 0.3, l0 = 60; R filters from t = 2 with l = y1 = 60 (same as l0 here).
a <- HoltWinters(ts(y), alpha = 0.3, beta = FALSE, gamma = FALSE, l.start = 60)
fa <- as.numeric(a$fitted[, "xhat"])
for (i in seq_along(fa)) out("8a", "fitted", i + 1, fa[i])
out("8a", "level", 28, coef(a)[["a"]])
# 8b: Holt alpha = 0.3, beta = 0.1 seeded with the states after t = 2 (l = 61.769, b = 0.9799,
# exact in decimal: l1 = 60.7, b1 = 0.97, l2 = 0.3*62 + 0.7*61.67).
b <- HoltWinters(ts(y), alpha = 0.3, beta = 0.1, gamma = FALSE, l.start = 61.769, b.start = 0.9799)
fb <- as.numeric(b$fitted[, "xhat"])
for (i in seq_along(fb)) out("8b", "fitted", i + 2, fb[i])
out("8b", "level", 28, coef(b)[["a"]]); out("8b", "trend", 28, coef(b)[["b"]])
pb <- as.numeric(predict(b, 7))
for (h in 1:7) out("8b", "forecast", h, pb[h])
# 8c: Holt-Winters additive; R's gamma gR = g / (1 - a) = 0.2 / 0.7 with the ETS states after t = 7.
c7 <- HoltWinters(ts(y, frequency = 7), alpha = 0.3, beta = 0.1, gamma = 0.2 / 0.7,
                  seasonal = "additive", l.start = 75.4139097264791, b.start = -0.253274420981035,
                  s.start = c(-20.1, -18.167, -15.20889, -10.2319463, 14.758872679,
                              29.75967978393, 14.1674543638631))
fc <- as.numeric(c7$fitted[, "xhat"])
for (i in seq_along(fc)) out("8c", "fitted", i + 7, fc[i])
out("8c", "level", 28, coef(c7)[["a"]]); out("8c", "trend", 28, coef(c7)[["b"]])
for (j in 1:7) out("8c", "season", j, coef(c7)[[paste0("s", j)]])
pc <- as.numeric(predict(c7, 7))
for (h in 1:7) out("8c", "forecast", h, pc[h])
