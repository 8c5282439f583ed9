# Reference AR(p) fits for tests/core/test_autoregression.cpp.
# Series: R's built-in dataset LakeHuron (annual level of Lake Huron in feet, 1875-1972, 98 values;
# public domain, shipped with R's datasets package).
# Run: Rscript tests/reference/ar_lakehuron.R > tests/reference/ar_lakehuron.csv
x <- as.numeric(LakeHuron)
n <- length(x)
fmt <- function(v) formatC(v, digits = 15, format = "e")
cat("what,p,index,value\n")
cat(sprintf("r_version,0,0,%s\n", paste(R.version$major, R.version$minor, sep = ".")))
for (p in 1:3) {
  # OLS with intercept over t = p+1..n, two ways: lm on the lagged design and ar.ols.
  X <- embed(x, p + 1)
  m <- lm(X[, 1] ~ X[, -1, drop = FALSE])
  b <- coef(m)
  # ar.ols demeans first (demean = FALSE is numerically singular on a series near 579 ft);
  # demeaning leaves the slopes of a regression with intercept unchanged, and its intercept is
  # b0 - mean (1 - sum phi).
  a <- ar.ols(x, aic = FALSE, order.max = p, demean = TRUE, intercept = TRUE)
  mu <- a$x.mean
  stopifnot(max(abs(as.numeric(a$ar) - b[-1])) < 1e-8,
            abs(mu + a$x.intercept - mu * sum(a$ar) - b[1]) < 1e-8)
  cat(sprintf("intercept,%d,0,%s\n", p, fmt(b[1])))
  for (j in 1:p) cat(sprintf("coef,%d,%d,%s\n", p, j, fmt(b[j + 1])))
  rss <- sum(residuals(m)^2)
  cat(sprintf("sigma2,%d,0,%s\n", p, fmt(rss / nrow(X))))
  # Forecasts h = 1..5 iterating the fitted recursion (predict on the ar.ols object).
  pr <- predict(a, newdata = x, n.ahead = 5)$pred
  for (h in 1:5) cat(sprintf("forecast,%d,%d,%s\n", p, h, fmt(pr[h])))
}
# Order by AIC on common rows t = maxP+1..n: n_eff log(RSS/n_eff) + 2 (p+1), maxP = 6.
maxP <- 6
aics <- sapply(1:maxP, function(p) {
  X <- embed(x, maxP + 1)[, 1:(p + 1)]
  m <- lm(X[, 1] ~ X[, -1, drop = FALSE])
  r <- nrow(X)
  r * log(sum(residuals(m)^2) / r) + 2 * (p + 1)
})
for (p in 1:maxP) cat(sprintf("aic_common,%d,0,%s\n", p, fmt(aics[p])))
cat(sprintf("aic_order,%d,0,%d\n", maxP, which.min(aics)))
