"""Reference numbers for test/analysis/detectStepChange.test.ts (statsmodels 0.15.0, numpy 2.4.6).

For every split k (both sides >= 2 points) fit y ~ 1 + x (+ x^2) + H_k, H_k = [i >= k], by OLS and
keep the split with the largest |t| of the H_k coefficient: the likelihood-ratio change point with a
polynomial trend. Run: python3 this_file.py
"""
import numpy as np
import statsmodels.api as sm

x = np.arange(20.0)
wiggle = np.array([0.12, -0.31, 0.05, 0.22, -0.18, 0.09, -0.04, 0.27, -0.22, 0.15,
                   -0.08, 0.19, -0.26, 0.03, 0.11, -0.14, 0.24, -0.06, 0.01, -0.17])
y = 0.3 * x + np.where(x >= 12, 2.0, 0.0) + wiggle

for degree in (1, 2):
    best = None
    for k in range(2, 19):
        columns = [np.ones_like(x)] + [x ** p for p in range(1, degree + 1)] + [(x >= k).astype(float)]
        fit = sm.OLS(y, np.column_stack(columns)).fit()
        t = fit.tvalues[-1]
        if best is None or abs(t) > abs(best[1]):
            best = (k, t, fit.params[-1], fit.pvalues[-1], np.sqrt(fit.scale))
    print("degree %d: k %d t %.15g step %.15g p %.15g sigma %.15g" % ((degree,) + best))
