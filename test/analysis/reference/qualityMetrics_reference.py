"""Reference numbers for test/analysis/qualityMetrics.test.ts and detectCurvature.test.ts.

Recomputed with statsmodels 0.15.0 / numpy 2.4.6 / scipy 1.17.1 (run: python3 this_file.py).
The values printed here are copied into the tests; the TypeScript code never sees this script.
"""
import numpy as np
import statsmodels.api as sm
from statsmodels.stats.stattools import durbin_watson

# Twelve points of ln I against z (nm): a line with hand-typed wiggles.
z = np.array([0.40, 0.42, 0.44, 0.46, 0.48, 0.50, 0.52, 0.54, 0.56, 0.58, 0.60, 0.62])
ln_i = np.array([-20.70, -21.13, -21.49, -21.95, -22.31, -22.72, -23.18, -23.52, -23.97, -24.40, -24.77, -25.23])
sigma = np.array([0.02, 0.02, 0.03, 0.03, 0.04, 0.04, 0.05, 0.05, 0.06, 0.06, 0.07, 0.07])
w = 1 / sigma

X = sm.add_constant(z)
ols = sm.OLS(ln_i, X).fit()
print("OLS fitted", repr(ols.fittedvalues.tolist()))
print("OLS rsquared %.15g" % ols.rsquared)
print("OLS durbin_watson %.15g" % durbin_watson(ols.resid))
print("OLS ssr/df %.15g" % (ols.ssr / ols.df_resid))
print("OLS rms %.15g" % np.sqrt(np.mean(ols.resid ** 2)))

wls = sm.WLS(ln_i, X, weights=w ** 2).fit()
print("WLS fitted", repr(wls.fittedvalues.tolist()))
print("WLS rsquared %.15g" % wls.rsquared)
print("WLS durbin_watson(wresid) %.15g" % durbin_watson(wls.wresid))
print("WLS ssr/df %.15g" % (wls.ssr / wls.df_resid))
print("WLS rms(unweighted resid) %.15g" % np.sqrt(np.mean(wls.resid ** 2)))

# Quadratic WLS for detectCurvature: y = a + b z + c z^2 with weights 1/sigma^2.
Xq = np.column_stack([np.ones_like(z), z, z ** 2])
quad = sm.WLS(ln_i, Xq, weights=w ** 2).fit()
print("quad params", repr(quad.params.tolist()))
print("quad bse", repr(quad.bse.tolist()))
print("quad t %.15g p %.15g" % (quad.tvalues[2], quad.pvalues[2]))
quad_unweighted = sm.OLS(ln_i, Xq).fit()
print("quad OLS params", repr(quad_unweighted.params.tolist()))
print("quad OLS bse", repr(quad_unweighted.bse.tolist()))
print("quad OLS t %.15g p %.15g" % (quad_unweighted.tvalues[2], quad_unweighted.pvalues[2]))

# A clearly curved set for detectCurvature: y = 1 + 2x + 0.5x^2 plus hand-typed wiggles, x = 0..9.
x2 = np.arange(10.0)
y2 = 1 + 2 * x2 + 0.5 * x2 ** 2 + np.array([0.3, -0.2, 0.1, -0.4, 0.2, 0.0, -0.1, 0.3, -0.3, 0.1])
curved = sm.OLS(y2, np.column_stack([np.ones_like(x2), x2, x2 ** 2])).fit()
print("curved params", repr(curved.params.tolist()))
print("curved bse", repr(curved.bse.tolist()))
print("curved t %.15g p %.15g" % (curved.tvalues[2], curved.pvalues[2]))
