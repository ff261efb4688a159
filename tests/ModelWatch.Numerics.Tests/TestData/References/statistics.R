# Reference values for ModelWatch's statistics tests, printed by R and its CRAN packages.
#
#   Rscript statistics.R > statistics-r.out
#
# Run with Debian 12's r-base-core (R 4.2.2) and r-cran-lmtest, r-cran-car, r-cran-ksamples, r-cran-spc; the first
# lines of the output record the versions that printed it. The data are restated here exactly as the C# tests hold
# them (tests/ModelWatch.Numerics.Tests/Statistics/ReferenceData.cs, TestData/NistStrd/Longley.csv and
# tests/ModelWatch.Checks.Tests/Evaluation/GujaratiSavingsTests.cs); PROVENANCE.md names their published sources.
#
# Output: one value per line, "block|name|value", numbers with 15 significant digits. The tests keep the values inline;
# this script is how they were obtained and how to check them again.
suppressMessages({
    library(lmtest)
    library(car)
    library(kSamples)
    library(spc)
})

num <- function(x) sprintf("%.15g", x)
emit <- function(block, name, value) cat(sprintf("%s|%s|%s\n", block, name, num(value)))
emit_text <- function(block, name, value) cat(sprintf("%s|%s|%s\n", block, name, value))

emit_text("meta", "R", R.version.string)
for (p in c("lmtest", "car", "kSamples", "spc")) emit_text("meta", p, packageDescription(p)$Version)

# ---------------------------------------------------------------------------------------------------------------------
# Gujarati savings on disposable income, US 1970-1995: the reference model is fitted on 1970-81 (n = 12, p = 2) and
# scored on 1982-95 (m = 14).
savings <- c(61, 68.6, 63.6, 89.6, 97.6, 104.4, 96.4, 92.5, 112.6, 130.1, 161.8, 199.1, 205.5, 167, 235.7, 206.2,
             196.5, 168.4, 189.1, 187.8, 208.7, 246.4, 272.6, 214.4, 189.4, 249.3)
income <- c(727.1, 790.2, 855.3, 965, 1054.2, 1159.2, 1273, 1401.4, 1580.1, 1769.5, 1973.3, 2200.2, 2347.3, 2522.4,
            2810, 3002, 3187.6, 3363.1, 3640.8, 3894.5, 4166.8, 4343.7, 4613.7, 4790.2, 5021.7, 5320.8)
ref <- 1:12
new <- 13:26
n <- length(ref); m <- length(new); p <- 2

fit_ref <- lm(savings[ref] ~ income[ref])
fit_new <- lm(savings[new] ~ income[new])
fit_pooled <- lm(savings ~ income)
rss_ref <- deviance(fit_ref); rss_new <- deviance(fit_new); rss_pooled <- deviance(fit_pooled)
emit("savings", "rss_1970_81", rss_ref)
emit("savings", "rss_1982_95", rss_new)
emit("savings", "rss_pooled", rss_pooled)
emit("savings", "intercept_1970_81", coef(fit_ref)[1])
emit("savings", "slope_1970_81", coef(fit_ref)[2])
emit("savings", "intercept_1982_95", coef(fit_new)[1])
emit("savings", "slope_1982_95", coef(fit_new)[2])

# Chow (1960): equal coefficients in the two periods, F(p, n + m - 2p).
chow <- ((rss_pooled - rss_ref - rss_new) / p) / ((rss_ref + rss_new) / (n + m - 2 * p))
emit("savings", "chow_f", chow)
emit("savings", "chow_p", pf(chow, p, n + m - 2 * p, lower.tail = FALSE))

# Wald test of the same hypothesis with each period's own covariance matrix, chi-square on p df.
delta <- coef(fit_new) - coef(fit_ref)
wald <- drop(t(delta) %*% solve(vcov(fit_ref) + vcov(fit_new)) %*% delta)
emit("savings", "wald", wald)
emit("savings", "wald_chi2_p", pchisq(wald, p, lower.tail = FALSE))

# Chow's predictive test: do the 1982-95 rows fit the 1970-81 model? F(m, n - p).
predictive <- ((rss_pooled - rss_ref) / m) / (rss_ref / (n - p))
emit("savings", "chow_predictive_f", predictive)
emit("savings", "chow_predictive_p", pf(predictive, m, n - p, lower.tail = FALSE))

# The deployed 1970-81 model's errors on 1982-95 and its mean-error t, whose variance includes the reference fit's.
X_ref <- cbind(1, income[ref]); X_new <- cbind(1, income[new]); y_new <- savings[new]
e0 <- drop(y_new - X_new %*% coef(fit_ref))
s_ref <- summary(fit_ref)$sigma
x_bar <- colMeans(X_new)
bias <- mean(e0)
bias_t <- bias / (s_ref * sqrt(1 / m + drop(t(x_bar) %*% solve(crossprod(X_ref)) %*% x_bar)))
emit("savings", "bias", bias)
emit("savings", "bias_t", bias_t)
emit("savings", "bias_t_p", 2 * pt(-abs(bias_t), n - p))

# MSE of the deployed model = MSE of the window's own refit + bias^2 + slope-drift term (the cross terms vanish).
mse_deployed <- mean(e0^2)
mse_noise <- rss_new / m
mse_level <- drop(x_bar %*% delta)^2
mse_slope <- delta[2]^2 * mean((income[new] - mean(income[new]))^2)
emit("savings", "mse_deployed", mse_deployed)
emit("savings", "mse_noise", mse_noise)
emit("savings", "mse_level_drift", mse_level)
emit("savings", "mse_slope_drift", mse_slope)
emit("savings", "mse_components_sum", mse_noise + mse_level + mse_slope)
emit("savings", "rmse", sqrt(mse_deployed))
emit("savings", "mae", mean(abs(e0)))
emit("savings", "r2_out_of_sample", 1 - sum(e0^2) / sum((y_new - mean(savings[ref]))^2))

# Leverage of each new row against the reference design, x'(X_ref'X_ref)^-1 x, and the largest leave-one-out leverage
# h/(1 - h) among the reference rows: a reference row's leverage against the other rows, comparable with a new row's.
h_new <- rowSums((X_new %*% solve(crossprod(X_ref))) * X_new)
h_ref <- hatvalues(fit_ref)
emit("savings", "leverage_new_min", min(h_new))
emit("savings", "leverage_new_max", max(h_new))
emit("savings", "leverage_reference_loo_max", max(h_ref / (1 - h_ref)))
emit("savings", "leverage_new_above_reference_loo_max", sum(h_new > max(h_ref / (1 - h_ref))))

# Serial correlation of the pooled 1970-95 regression's residuals.
dw <- dwtest(fit_pooled)
emit("savings", "durbin_watson", dw$statistic)
emit("savings", "durbin_watson_p_positive", dw$p.value)
lb5 <- Box.test(resid(fit_pooled), lag = 5, type = "Ljung-Box")
emit("savings", "ljung_box_5", lb5$statistic)
emit("savings", "ljung_box_5_p", lb5$p.value)

# ---------------------------------------------------------------------------------------------------------------------
# Gujarati Table 11.3, consumption Y on income X (n = 30): Breusch-Pagan (original, BP = ESS/2) and Koenker's
# studentized n R^2.
cons_y <- c(55, 65, 70, 80, 79, 84, 98, 95, 90, 75, 74, 110, 113, 125, 108, 115, 140, 120, 145, 130, 152, 144, 175,
            180, 135, 140, 178, 191, 137, 189)
cons_x <- c(80, 100, 85, 110, 120, 115, 130, 140, 125, 90, 105, 160, 150, 165, 145, 180, 225, 200, 240, 185, 220, 210,
            245, 260, 190, 205, 265, 270, 230, 250)
fit_cons <- lm(cons_y ~ cons_x)
bp <- bptest(fit_cons, studentize = FALSE)
koenker <- bptest(fit_cons)
emit("consumption", "rss", deviance(fit_cons))
emit("consumption", "breusch_pagan", bp$statistic)
emit("consumption", "breusch_pagan_p", bp$p.value)
emit("consumption", "koenker", koenker$statistic)
emit("consumption", "koenker_p", koenker$p.value)

# ---------------------------------------------------------------------------------------------------------------------
# Longley (1967), in NIST StRD units: Employed on all six predictors. VIFs from car::vif; Belsley-Kuh-Welsch condition
# indices and variance-decomposition proportions from the SVD of X with the intercept, columns scaled to unit length,
# not centred.
longley_nist <- matrix(c(
    60323, 83.0, 234289, 2356, 1590, 107608, 1947,
    61122, 88.5, 259426, 2325, 1456, 108632, 1948,
    60171, 88.2, 258054, 3682, 1616, 109773, 1949,
    61187, 89.5, 284599, 3351, 1650, 110929, 1950,
    63221, 96.2, 328975, 2099, 3099, 112075, 1951,
    63639, 98.1, 346999, 1932, 3594, 113270, 1952,
    64989, 99.0, 365385, 1870, 3547, 115094, 1953,
    63761, 100.0, 363112, 3578, 3350, 116219, 1954,
    66019, 101.2, 397469, 2904, 3048, 117388, 1955,
    67857, 104.6, 419180, 2822, 2857, 118734, 1956,
    68169, 108.4, 442769, 2936, 2798, 120445, 1957,
    66513, 110.8, 444546, 4681, 2637, 121950, 1958,
    68655, 112.6, 482704, 3813, 2552, 123366, 1959,
    69564, 114.2, 502601, 3931, 2514, 125368, 1960,
    69331, 115.7, 518173, 4806, 2572, 127852, 1961,
    70551, 116.9, 554894, 4007, 2827, 130081, 1962), ncol = 7, byrow = TRUE,
    dimnames = list(NULL, c("TOTEMP", "GNPDEFL", "GNP", "UNEMP", "ARMED", "POP", "YEAR")))
longley_df <- as.data.frame(longley_nist)
fit_longley <- lm(TOTEMP ~ ., data = longley_df)
vifs <- vif(fit_longley)
for (j in names(vifs)) emit("longley", paste0("vif_", j), vifs[[j]])

X <- model.matrix(fit_longley)
X_scaled <- sweep(X, 2, sqrt(colSums(X^2)), "/")
s <- svd(X_scaled)
indices <- s$d[1] / s$d
for (k in seq_along(indices)) emit("longley", sprintf("condition_index_%d", k), indices[k])
phi <- sweep(s$v^2, 2, s$d^2, "/")          # phi[j, k] = v_jk^2 / mu_k^2
proportions <- phi / rowSums(phi)           # share of Var(b_j) carried by component k
colnames(X)[1] <- "INTERCEPT"
for (k in seq_along(indices)) {
    for (j in seq_len(ncol(X))) {
        emit("longley", sprintf("proportion_%d_%s", k, colnames(X)[j]), proportions[j, k])
    }
}

# ---------------------------------------------------------------------------------------------------------------------
# Scholz & Stephens (1987), paper smoothness from four laboratories (8 each).
lab_a <- c(38.7, 41.5, 43.8, 44.5, 45.5, 46.0, 47.7, 58.0)
lab_b <- c(39.2, 39.3, 39.7, 41.4, 41.8, 42.9, 43.3, 45.8)
lab_c <- c(34.0, 35.0, 39.0, 40.0, 43.0, 43.0, 44.0, 45.0)
lab_d <- c(34.0, 34.8, 34.8, 35.4, 37.2, 37.8, 41.2, 42.8)
labs <- list(lab_a, lab_b, lab_c, lab_d)
# ad.test rounds what it returns to 3-5 significant digits, so the two statistics are taken from the compiled routine it
# calls (version 1, A2_kN, and the midrank version 2, A2_akN) and standardized with the paper's closed-form variance.
pooled <- unlist(labs)
stat <- .C("adkTestStat0", ans = double(2), k = length(labs), x = as.double(pooled), ns = as.integer(lengths(labs)),
           Z.star = as.double(sort(unique(pooled))), L = length(unique(pooled)), PACKAGE = "kSamples")$ans
# Scholz & Stephens (1987) give the null variance in closed form:
# Var(A2_kN) = (a N^3 + b N^2 + c N + d) / ((N - 1)(N - 2)(N - 3)).
n_labs <- length(labs); N <- length(pooled)
H <- sum(1 / lengths(labs)); h_sum <- sum(1 / (1:(N - 1)))
g <- sum(sapply(1:(N - 2), function(i) sum(1 / ((N - i) * ((i + 1):(N - 1))))))
coef_a <- (4 * g - 6) * (n_labs - 1) + (10 - 6 * g) * H
coef_b <- (2 * g - 4) * n_labs^2 + 8 * h_sum * n_labs + (2 * g - 14 * h_sum - 4) * H - 8 * h_sum + 4 * g - 6
coef_c <- (6 * h_sum + 2 * g - 2) * n_labs^2 + (4 * h_sum - 4 * g + 6) * n_labs + (2 * h_sum - 6) * H + 4 * h_sum
coef_d <- (2 * h_sum + 6) * n_labs^2 - 4 * h_sum * n_labs
sigma <- sqrt((coef_a * N^3 + coef_b * N^2 + coef_c * N + coef_d) / ((N - 1) * (N - 2) * (N - 3)))
emit("labs", "ad_sigma", sigma)
for (v in 1:2) {
    label <- c("ad_version1", "ad_version2_midrank")[v]
    t_v <- (stat[v] - (n_labs - 1)) / sigma
    emit("labs", paste0(label, "_a2"), stat[v])
    emit("labs", paste0(label, "_t"), t_v)
    emit("labs", paste0(label, "_p_kSamples"), ad.pval(t_v, n_labs - 1, v))
}
printed <- ad.test(lab_a, lab_b, lab_c, lab_d, method = "asymptotic")
emit("labs", "ad_test_printed_version1_a2", printed$ad[1, 1])
emit("labs", "ad_test_printed_version2_midrank_a2", printed$ad[2, 1])
emit("labs", "ad_test_printed_sigma", printed$sig)

# Labs A and D: Brown-Forsythe (Levene on absolute deviations from the group median) and the two-sample KS test.
bf <- leveneTest(c(lab_a, lab_d), factor(rep(c("A", "D"), each = 8)), center = median)
emit("labs", "brown_forsythe_a_d_f", bf[["F value"]][1])
emit("labs", "brown_forsythe_a_d_df2", bf[["Df"]][2])
emit("labs", "brown_forsythe_a_d_p", bf[["Pr(>F)"]][1])
ks_ad <- ks.test(lab_a, lab_d, exact = TRUE)
emit("labs", "ks_a_d_statistic", ks_ad$statistic)
emit("labs", "ks_a_d_p_exact", ks_ad$p.value)

# ---------------------------------------------------------------------------------------------------------------------
# Two-sample KS on the small invented example (n = 25, m = 20): the exact p-value and the plain Kolmogorov limit.
ks_x <- c(0.61, 0.29, 0.06, 0.59, -1.73, -0.74, 0.51, -0.56, 0.39, 1.64, 0.05, -0.06, 0.64, -0.82, 0.37, 1.77, 1.09,
          -1.28, 2.36, 1.31, 1.05, -0.32, -0.4, 1.06, -2.47)
ks_y <- c(2.2, 1.66, 1.38, 0.2, 0.36, 0, 0.96, 1.56, 0.44, 1.5, -0.3, 0.66, 2.31, 3.29, -0.27, -0.37, 0.38, 0.7, 0.52,
          -0.71)
ks_exact <- ks.test(ks_x, ks_y, exact = TRUE)
ks_limit <- ks.test(ks_x, ks_y, exact = FALSE)
emit("ks", "statistic", ks_exact$statistic)
emit("ks", "p_exact", ks_exact$p.value)
emit("ks", "p_asymptotic", ks_limit$p.value)

# Kolmogorov limit Q(lambda) = 2 sum_{j>=1} (-1)^(j-1) exp(-2 j^2 lambda^2), and the critical constants
# c(alpha) = sqrt(-ln(alpha/2)/2) that keep its first term, with Q at each constant.
kolmogorov_upper <- function(lambda) { j <- 1:100; 2 * sum((-1)^(j - 1) * exp(-2 * j^2 * lambda^2)) }
emit("ks", "kolmogorov_limit_at_sqrt_ne_d", kolmogorov_upper(sqrt(25 * 20 / 45) * ks_exact$statistic))
for (alpha in c(0.10, 0.05, 0.01, 0.001)) {
    c_alpha <- sqrt(-log(alpha / 2) / 2)
    emit("ks", sprintf("c_alpha_%s", format(alpha)), c_alpha)
    emit("ks", sprintf("kolmogorov_limit_at_c_alpha_%s", format(alpha)), kolmogorov_upper(c_alpha))
}

# ---------------------------------------------------------------------------------------------------------------------
# Ljung-Box and Box-Pierce on R's lh series (48 observations); the inline copy must equal datasets::lh.
lh_inline <- c(2.4, 2.4, 2.4, 2.2, 2.1, 1.5, 2.3, 2.3, 2.5, 2.0, 1.9, 1.7, 2.2, 1.8, 3.2, 3.2, 2.7, 2.2, 2.2, 1.9, 1.9,
               1.8, 2.7, 3.0, 2.3, 2.0, 2.0, 2.9, 2.9, 2.7, 2.7, 2.3, 2.6, 2.4, 1.8, 1.7, 1.5, 1.4, 2.1, 3.3, 3.5, 3.5,
               3.1, 2.6, 2.1, 3.4, 3.0, 2.9)
emit_text("lh", "inline_equals_datasets_lh", identical(lh_inline, as.numeric(datasets::lh)))
lb1 <- Box.test(lh_inline, lag = 1, type = "Ljung-Box")
lb10 <- Box.test(lh_inline, lag = 10, type = "Ljung-Box")
bp10 <- Box.test(lh_inline, lag = 10, type = "Box-Pierce")
emit("lh", "ljung_box_1", lb1$statistic)
emit("lh", "ljung_box_1_p", lb1$p.value)
emit("lh", "ljung_box_10", lb10$statistic)
emit("lh", "ljung_box_10_p", lb10$p.value)
emit("lh", "box_pierce_10", bp10$statistic)
emit("lh", "box_pierce_10_p", bp10$p.value)

# ---------------------------------------------------------------------------------------------------------------------
# Page's CUSUM of N(mu, 1) observations, reference value k = 0.5, zero start: average run lengths (spc's integral
# equation solver) and the thresholds h that give a target in-control ARL.
for (h in c(4, 5)) {
    for (mu in c(0, 0.5, 1, 2)) {
        emit("cusum", sprintf("one_sided_arl_h%s_mu%s", format(h), format(mu)),
             xcusum.arl(k = 0.5, h = h, mu = mu, hs = 0, sided = "one"))
    }
    emit("cusum", sprintf("two_sided_arl_h%s_mu0", format(h)),
         xcusum.arl(k = 0.5, h = h, mu = 0, hs = 0, sided = "two"))
}
for (target in c(370, 1000, 8760, 43800)) {
    emit("cusum", sprintf("two_sided_h_for_arl0_%d", target), xcusum.crit(k = 0.5, L0 = target, hs = 0, sided = "two"))
}
# The tests quote h to 3-4 digits; these are the ARLs at the quoted h.
for (h in c(4.774, 5.757, 7.921, 9.529)) {
    for (mu in c(0, 0.5, 1, 2)) {
        emit("cusum", sprintf("two_sided_arl_h%s_mu%s", format(h), format(mu)),
             xcusum.arl(k = 0.5, h = h, mu = mu, hs = 0, sided = "two"))
    }
}
# Siegmund's (1985) approximation, one-sided: ARL = (exp(-2 D b) + 2 D b - 1) / (2 D^2), D = mu - k, b = h + 1.166.
siegmund <- function(h, k, mu) { D <- mu - k; b <- h + 1.166; (exp(-2 * D * b) + 2 * D * b - 1) / (2 * D^2) }
for (h in c(4, 5)) emit("cusum", sprintf("siegmund_one_sided_arl_h%s_mu0", format(h)), siegmund(h, 0.5, 0))

# ---------------------------------------------------------------------------------------------------------------------
# Distribution quantiles, and the null 99 % point of the population stability index with 10 bins,
# (1/N + 1/M) chi-square(9), for N = 10,000 reference and M = 500 new rows.
emit("quantiles", "normal_0.975", qnorm(0.975))
emit("quantiles", "chisq9_0.99", qchisq(0.99, 9))
emit("quantiles", "psi_null_0.99_n10000_m500", (1 / 10000 + 1 / 500) * qchisq(0.99, 9))
