# Reference fit for tests/core/test_unconstrain.cpp: the censored-normal (Tobit) maximum-likelihood
# fit of a small right-censored sample, which is the fixed point of the EM in core/unconstrain.cpp
# (check-values.md §5).
# Produced with R 4.2.2 (Debian r-base-core 4.2.2.20221110-2) and survival 3.5.3 (Debian
# r-cran-survival 3.5-3-1):
#   Rscript tests/reference/unconstrain_survreg.R > tests/reference/unconstrain_survreg.csv
# The sample is made up for this test (no outside data): 40 nights of one weekday at a 120-room
# hotel; 10 of them (25 %) sold out, so their finals (116-120) are right-censored demand.
library(survival)
x <- c(96, 104, 88, 112, 101, 93, 109, 79, 115, 98,
       107, 91, 117, 84, 102, 110, 95, 106, 99, 113,
       87, 103, 100, 111, 92, 108, 97, 105, 114, 90,
       120, 118, 120, 119, 116, 120, 117, 120, 118, 119)
censored <- c(rep(0, 30), rep(1, 10))
stopifnot(length(x) == 40, sum(censored) == 10)
# Surv(time, event): event = 1 observed, 0 right-censored.
fit <- survreg(Surv(x, 1 - censored) ~ 1, dist = "gaussian",
               control = survreg.control(rel.tolerance = 1e-13, iter.max = 200))
mu <- unname(coef(fit)[1])
sigma <- fit$scale # exp(log(scale)): the maximum-likelihood sigma (divisor n when uncensored)
# The same call on the sample with no value censored must give the plain mean and the sd with
# divisor n, which shows that survreg's scale is the divisor-n maximum-likelihood sigma.
plain <- survreg(Surv(x, rep(1, 40)) ~ 1, dist = "gaussian",
                 control = survreg.control(rel.tolerance = 1e-13, iter.max = 200))
stopifnot(abs(coef(plain)[1] - mean(x)) < 1e-8,
          abs(plain$scale - sqrt(mean((x - mean(x))^2))) < 1e-8)
fmt <- function(v) formatC(v, digits = 15, format = "e")
cat("what,value\n")
cat(sprintf("r_version,%s.%s\n", R.version$major, R.version$minor))
cat(sprintf("survival_version,%s\n", as.character(packageVersion("survival"))))
cat(sprintf("n,%d\n", length(x)))
cat(sprintf("censored,%d\n", sum(censored)))
cat(sprintf("mu,%s\n", fmt(mu)))
cat(sprintf("sigma,%s\n", fmt(sigma)))
cat(sprintf("loglik,%s\n", fmt(fit$loglik[2])))
cat(sprintf("iterations,%d\n", fit$iter))
