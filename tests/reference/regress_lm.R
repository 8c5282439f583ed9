# Reference values for tests/core/test_combinedmethods.cpp: the regress method's least squares
# against R's lm() (treatment contrasts, Monday = weekday 1 the baseline level).
# Produced with R 4.2.2 (Debian package r-base-core 4.2.2):
#   Rscript tests/reference/regress_lm.R
# Writes regress_data.csv (the small data set, made by integer formulas so no RNG is involved)
# and regress_lm.csv (model, term, coefficient printed with 17 significant digits).
i <- 1:42
weekday <- (i - 1) %% 7 + 1
otb <- (i * 37) %% 53 + 20
stly <- (i * 17) %% 41 + 60
effect <- c(0, 2, -1, 5, 9, 7, -3)[weekday]
final <- round(0.8 * otb + 0.3 * stly + effect + (i * 29) %% 11 - 5)
d <- data.frame(final = final, otb = otb, stly = stly, weekday = weekday)
dir <- if (file.exists("tests/reference")) "tests/reference" else "."
write.csv(d, file.path(dir, "regress_data.csv"), row.names = FALSE, quote = FALSE)

d$weekday <- factor(d$weekday, levels = 1:7)
full <- lm(final ~ otb + stly + weekday, data = d)
short <- lm(final ~ otb + weekday, data = d)
out <- rbind(
  data.frame(model = "with_stly", term = names(coef(full)), coefficient = coef(full)),
  data.frame(model = "without_stly", term = names(coef(short)), coefficient = coef(short)))
out$coefficient <- formatC(out$coefficient, digits = 17, format = "g")
write.csv(out, file.path(dir, "regress_lm.csv"), row.names = FALSE, quote = FALSE)
