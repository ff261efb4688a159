# Reference values that R does not provide, printed with SciPy.
#
#   /usr/bin/python3 statistics.py > statistics-py.out
#
# Run with Debian 12's python3-scipy (and the python3-numpy it depends on); the first lines of the output record the
# versions that printed it. Two blocks:
#
# - SciPy's anderson_ksamp on the Scholz & Stephens (1987) four-laboratory example. ModelWatch's k-sample
#   Anderson-Darling p-value follows SciPy's interpolation in the paper's table, which differs from kSamples'.
# - Durbin-Watson bounds dL and dU: the alpha-quantiles of the two bounding ratios of Durbin & Watson (1950), each a
#   ratio of quadratic forms in N(0, 1) variables, from Imhof's (1961) inversion integral.
#
# Output: one value per line, "block|name|value", numbers with 15 significant digits.
import platform

import numpy as np
import scipy
from scipy import integrate, optimize, stats


def emit(block, name, value):
    text = value if isinstance(value, str) else f"{value:.15g}"
    print(f"{block}|{name}|{text}")


emit("meta", "Python", platform.python_version())
emit("meta", "NumPy", np.__version__)
emit("meta", "SciPy", scipy.__version__)

# ---------------------------------------------------------------------------------------------------------------------
lab_a = [38.7, 41.5, 43.8, 44.5, 45.5, 46.0, 47.7, 58.0]
lab_b = [39.2, 39.3, 39.7, 41.4, 41.8, 42.9, 43.3, 45.8]
lab_c = [34.0, 35.0, 39.0, 40.0, 43.0, 43.0, 44.0, 45.0]
lab_d = [34.0, 34.8, 34.8, 35.4, 37.2, 37.8, 41.2, 42.8]
for midrank, label in [(False, "version1"), (True, "version2_midrank")]:
    result = stats.anderson_ksamp([lab_a, lab_b, lab_c, lab_d], midrank=midrank)
    emit("labs", f"anderson_ksamp_{label}_t", result.statistic)
    emit("labs", f"anderson_ksamp_{label}_p", result.significance_level)


# ---------------------------------------------------------------------------------------------------------------------
def upper_tail_at_zero(weights):
    """P(sum_j w_j z_j^2 > 0) for independent standard normal z_j (Imhof 1961, with x = 0)."""
    w = np.asarray(weights, dtype=float)

    def integrand(u):
        theta = 0.5 * np.sum(np.arctan(w * u))
        rho = np.prod((1.0 + (w * u) ** 2) ** 0.25)
        return np.sin(theta) / (u * rho)

    value, _ = integrate.quad(integrand, 0.0, np.inf, limit=2000)
    return 0.5 + value / np.pi


def durbin_watson_bounds(n, slopes, alpha):
    """dL, dU with P(d_L < dL) = P(d_U < dU) = alpha, for n rows and an intercept plus `slopes` regressors."""
    k = slopes + 1
    # Eigenvalues of the Durbin-Watson difference matrix, ascending; nu_0 = 0 belongs to the constant.
    nu = 2.0 * (1.0 - np.cos(np.pi * np.arange(n) / n))
    lower = nu[1:n - k + 1]
    upper = nu[k:n]

    def quantile(eigenvalues):
        # P(sum nu_j z_j^2 / sum z_j^2 < c) = P(sum (nu_j - c) z_j^2 < 0).
        return optimize.brentq(lambda c: (1.0 - upper_tail_at_zero(eigenvalues - c)) - alpha, 1e-6, 4.0 - 1e-6,
                               xtol=1e-12)

    return quantile(lower), quantile(upper)


for n, slopes, alpha in [(15, 1, 0.05), (20, 1, 0.05), (30, 1, 0.05), (50, 1, 0.05), (100, 1, 0.05), (20, 2, 0.05),
                         (30, 3, 0.05), (50, 5, 0.05), (100, 5, 0.05), (50, 1, 0.01)]:
    dl, du = durbin_watson_bounds(n, slopes, alpha)
    emit("durbin_watson_bounds", f"n{n}_slopes{slopes}_alpha{alpha:g}_dL", dl)
    emit("durbin_watson_bounds", f"n{n}_slopes{slopes}_alpha{alpha:g}_dU", du)
