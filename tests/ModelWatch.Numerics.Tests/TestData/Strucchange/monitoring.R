# Reference values for ModelWatch's structural-change monitors, printed by R's strucchange.
#
#   Rscript monitoring.R > monitoring.out
#
# Run with Debian 12's r-base-core (R 4.2.2) and r-cran-strucchange (1.5-3); the header of monitoring.out records
# the versions that printed it. It writes the two invented data sets (slope-change.csv, level-shift.csv) it
# monitors, and the two that ship with R (nile.csv, seatbelt.csv), so the C# tests read exactly the rows R read. Every number is printed with 17 significant digits.
#
# Output: one line per value, "case|field|index|value". For each case: its settings, strucchange's critical value,
# the first crossing (NA when none), and for every monitored observation k = n+1..N the process value(s) and the
# boundary. For the moving-estimates (ME) cases it also prints, per coefficient, the coefficient-standardized
# component that ModelWatch alarms on: K/(sigma*sqrt(n)) * (b_window_j - b_history_j) / sqrt(((X_w'X_w)/K)^-1_jj),
# computed here by hand from lm.fit, so that both forms are checked.
suppressMessages(library(strucchange))

cat(sprintf("meta|R|0|%s\n", R.version.string))
cat(sprintf("meta|strucchange|0|%s\n", as.character(packageVersion("strucchange"))))

num <- function(x) sprintf("%.17g", x)
emit <- function(case, field, index, value) cat(sprintf("%s|%s|%d|%s\n", case, field, index, value))

# Invented data set 1: a delivery-time style regression whose slope on x1 changes at observation 241.
set.seed(20261202)
N1 <- 320
x1 <- round(rnorm(N1, 10, 3), 3)
x2 <- round(runif(N1, 0, 5), 3)
beta1 <- ifelse(seq_len(N1) <= 240, 2.0, 2.8)
y <- round(4 + beta1 * x1 - 1.5 * x2 + rnorm(N1, 0, 2), 4)
slope <- data.frame(y = y, x1 = x1, x2 = x2)
write.csv(slope, "slope-change.csv", row.names = FALSE)

# Invented data set 2: no intercept, correlated features with non-zero means, a level shift from observation 151.
set.seed(7031)
N2 <- 220
z1 <- round(rnorm(N2, 5, 1), 3)
z2 <- round(0.6 * z1 + rnorm(N2, 2, 0.8), 3)
shift <- ifelse(seq_len(N2) <= 150, 0, 1.2)
v <- round(0.8 * z1 + 1.1 * z2 + shift + rnorm(N2, 0, 1), 4)
level <- data.frame(v = v, z1 = z1, z2 = z2)
write.csv(level, "level-shift.csv", row.names = FALSE)

# Published data sets that ship with R: the Nile's annual flow (Cobb 1978; Balke 1993), and the UK driver deaths
# seatbelt regression of strucchange's own examples (Harvey & Durbin 1986).
nile <- data.frame(y = as.numeric(Nile))
write.csv(nile, "nile.csv", row.names = FALSE)
seat <- log10(UKDriverDeaths)
seat <- cbind(seat, stats::lag(seat, k = -1), stats::lag(seat, k = -12))
colnames(seat) <- c("y", "ylag1", "ylag12")
seat <- window(seat, start = c(1970, 1), end = c(1984, 12))
seat <- as.data.frame(seat)
write.csv(seat, "seatbelt.csv", row.names = FALSE)

run <- function(case, formula, data, histsize, type, h = 1, alpha = 0.05, period = 10) {
  hist <- data[seq_len(histsize), , drop = FALSE]
  m0 <- mefp(formula, data = hist, type = type, h = h, alpha = alpha, period = period)
  m1 <- monitor(m0, data = data, verbose = FALSE)
  N <- nrow(data)
  ks <- (histsize + 1):N
  emit(case, "type", 0, type)
  emit(case, "h", 0, num(h))
  emit(case, "alpha", 0, num(alpha))
  emit(case, "period", 0, num(period))
  emit(case, "history", 0, histsize)
  emit(case, "rows", 0, N)
  emit(case, "critval", 0, num(m1$critval))
  emit(case, "breakpoint", 0, ifelse(is.na(m1$breakpoint), "NA", as.character(m1$breakpoint)))
  Xh0 <- model.matrix(formula, data = hist)
  fh0 <- lm.fit(Xh0, model.response(model.frame(formula, data = hist)))
  emit(case, "sigma", 0, num(sqrt(sum(fh0$residuals^2) / fh0$df.residual)))
  bound <- m1$border(ks)
  proc <- as.matrix(m1$process)
  for (i in seq_along(ks)) {
    emit(case, "boundary", ks[i], num(bound[i]))
    emit(case, "process", ks[i], paste(num(proc[i, ]), collapse = ","))
  }
  if (type == "ME") {
    X <- model.matrix(formula, data = data)
    Y <- model.response(model.frame(formula, data = data))
    Xh <- X[seq_len(histsize), , drop = FALSE]
    fh <- lm.fit(Xh, Y[seq_len(histsize)])
    sigma <- sqrt(sum(fh$residuals^2) / fh$df.residual)
    K <- floor(h * histsize)
    emit(case, "window", 0, K)
    for (k in ks) {
      ok <- (k - K + 1):k
      fw <- lm.fit(X[ok, , drop = FALSE], Y[ok])
      qinv <- solve(crossprod(X[ok, , drop = FALSE]) / K)
      z <- K / (sigma * sqrt(histsize)) * (fw$coefficients - fh$coefficients) / sqrt(diag(qinv))
      emit(case, "coefficient_process", k, paste(num(z), collapse = ","))
    }
  }
}

run("nile-cusum", y ~ 1, nile, 20, "OLS-CUSUM")
run("nile-mosum", y ~ 1, nile, 20, "OLS-MOSUM", h = 0.5)
run("nile-me", y ~ 1, nile, 20, "ME", h = 0.5)
run("seatbelt-me", y ~ ylag1 + ylag12, seat, 72, "ME", h = 0.25, period = 4)
run("seatbelt-mosum", y ~ ylag1 + ylag12, seat, 72, "OLS-MOSUM", h = 0.25, period = 4)
run("seatbelt-cusum", y ~ ylag1 + ylag12, seat, 72, "OLS-CUSUM")
run("slope-me", y ~ x1 + x2, slope, 100, "ME", h = 0.25, period = 4)
run("slope-me-h1", y ~ x1 + x2, slope, 100, "ME", h = 1, alpha = 0.1, period = 4)
run("slope-mosum", y ~ x1 + x2, slope, 100, "OLS-MOSUM", h = 0.25, period = 4)
run("slope-cusum", y ~ x1 + x2, slope, 100, "OLS-CUSUM", alpha = 0.01)
run("level-me", v ~ z1 + z2 - 1, level, 60, "ME", h = 0.5, period = 4)
run("level-mosum", v ~ z1 + z2 - 1, level, 60, "OLS-MOSUM", h = 1, period = 4)
run("level-cusum", v ~ z1 + z2 - 1, level, 60, "OLS-CUSUM")

# strucchange's tabulated ME/MOSUM critical values (Leisch, Hornik & Kuan 2000; max functional), for the
# simulated critical values to be compared with: "table|max|h,period,level|critval".
tab <- strucchange:::monitorMECritvalTable
for (h in dimnames(tab)[[1]]) for (p in dimnames(tab)[[2]]) for (lv in c("0.95", "0.99", "0.999")) {
  cat(sprintf("table|max|%s,%s,%s|%s\n", h, p, lv, num(tab[h, p, lv, "max"])))
}

# The OLS-CUSUM critical value solves 2*(pnorm(c) - c*dnorm(c)) + alpha - 2 = 0 (Chu, Stinchcombe & White 1996).
for (a in c(0.1, 0.05, 0.01, 0.001)) {
  f <- function(c) abs(2 * (pnorm(c) - c * dnorm(c)) + a - 2)
  cat(sprintf("cusumcrit|%s|0|%s\n", num(a), num(optimize(f, c(0, 10), tol = .Machine$double.eps^0.5)$minimum)))
}
