"""Reference numbers for the run-comparison statistics (scipy 1.17.1, statsmodels 0.15.0, numpy 2.4.6).

Used by test/analysis/runStatQuantiles.test.ts, runStatistics.test.ts, weightedMean.test.ts,
compareMeans.test.ts, compareRanks.test.ts, compareEffectSize.test.ts, compareGroups.test.ts and
driftTrend.test.ts; each check there names the call below that produced its number.
Run: python3 test/analysis/reference/runComparison_reference.py
"""
import numpy as np
import scipy
import statsmodels
import statsmodels.api as sm
from scipy import stats
from statsmodels.stats.meta_analysis import effectsize_smd
from statsmodels.stats.multitest import multipletests

print("scipy", scipy.__version__, "statsmodels", statsmodels.__version__, "numpy", np.__version__)

# --- Student t and normal quantiles -------------------------------------------------------------
for p, df in [(0.975, 1), (0.975, 2), (0.975, 5), (0.975, 10), (0.975, 30), (0.975, 1000), (0.995, 3.5), (1e-6, 4), (0.6, 7)]:
    print("t.ppf(%g, %g) = %.15g" % (p, df, stats.t.ppf(p, df)))
for p in [0.975, 1e-10, 0.3]:
    print("norm.ppf(%g) = %.15g" % (p, stats.norm.ppf(p)))

# --- One sample summary ------------------------------------------------------------------------
x = np.array([4.92, 5.13, 5.05, 4.88, 5.21, 5.02, 4.97, 5.10])
y = np.array([5.31, 5.18, 5.45, 5.60, 5.27, 5.39, 5.52, 5.12, 5.66, 5.34, 5.41, 5.23])
ci = stats.ttest_1samp(x, 0).confidence_interval(0.95)
print("x: mean %.15g sd %.15g median %.15g q1 %.15g q3 %.15g ci95 %.15g %.15g" % (
    x.mean(), x.std(ddof=1), np.median(x), np.percentile(x, 25), np.percentile(x, 75), ci.low, ci.high))
ci90 = stats.ttest_1samp(y, 0).confidence_interval(0.90)
print("y: mean %.15g sd %.15g median %.15g q1 %.15g q3 %.15g ci90 %.15g %.15g" % (
    y.mean(), y.std(ddof=1), np.median(y), np.percentile(y, 25), np.percentile(y, 75), ci90.low, ci90.high))

# --- Welch t-test ------------------------------------------------------------------------------
welch = stats.ttest_ind(x, y, equal_var=False)
wci = welch.confidence_interval(0.95)
print("welch(x, y): t %.15g df %.15g p %.15g ci95 %.15g %.15g" % (welch.statistic, welch.df, welch.pvalue, wci.low, wci.high))
a = np.array([9, 7, 8, 9, 8, 9, 9, 10, 9, 9.0])
b = np.array([9, 6, 7, 8, 7, 9, 8, 8, 8, 7.0])
welch = stats.ttest_ind(a, b, equal_var=False)
wci = welch.confidence_interval(0.99)
print("welch(lakens a, b): t %.15g df %.15g p %.15g ci99 %.15g %.15g" % (welch.statistic, welch.df, welch.pvalue, wci.low, wci.high))

# --- Mann-Whitney U ----------------------------------------------------------------------------
r = stats.mannwhitneyu(x, y, method="exact")
print("mwu exact(x, y): U %.15g p %.15g" % (r.statistic, r.pvalue))
r = stats.mannwhitneyu(x, y, method="asymptotic", use_continuity=True)
print("mwu asymptotic(x, y): U %.15g p %.15g" % (r.statistic, r.pvalue))
rng = np.random.default_rng(20240611)
big1 = np.round(rng.normal(5.0, 0.1, 15), 4)
big2 = np.round(rng.normal(5.07, 0.1, 20), 4)
print("big1 =", ", ".join("%.4f" % v for v in big1))
print("big2 =", ", ".join("%.4f" % v for v in big2))
r = stats.mannwhitneyu(big1, big2, method="exact")
print("mwu exact(big1, big2): U %.15g p %.15g" % (r.statistic, r.pvalue))
r = stats.mannwhitneyu(big1, big2, method="asymptotic")
print("mwu asymptotic(big1, big2): U %.15g p %.15g" % (r.statistic, r.pvalue))
t1 = np.array([1, 2, 2, 3, 4, 4, 4, 5.0])
t2 = np.array([3, 4, 5, 5, 6, 6, 7.0])
r = stats.mannwhitneyu(t1, t2)  # ties: scipy chooses asymptotic with the tie correction
print("mwu ties(t1, t2): U %.15g p %.15g" % (r.statistic, r.pvalue))
r = stats.mannwhitneyu(t1, t2, use_continuity=False)
print("mwu ties no continuity(t1, t2): U %.15g p %.15g" % (r.statistic, r.pvalue))
r = stats.mannwhitneyu([1.0, 2.0, 3.0], [4.0, 5.0, 6.0], method="exact")
print("mwu exact([1,2,3],[4,5,6]): U %.15g p %.15g" % (r.statistic, r.pvalue))

# --- Cohen's d / Hedges' g (statsmodels: g with J = 1 - 3/(4N - 9)) -----------------------------
for name, u, v in [("lakens", a, b), ("x,y", x, y)]:
    g, _ = effectsize_smd(u.mean(), u.std(ddof=1), len(u), v.mean(), v.std(ddof=1), len(v))
    n = len(u) + len(v)
    print("effectsize_smd(%s): g %.15g  d = g/(1-3/(4N-9)) %.15g" % (name, g, g / (1 - 3 / (4 * n - 9))))

# --- Inverse-variance weighted mean (WLS on a constant) ----------------------------------------
values = np.array([5.62, 5.66, 5.59, 5.71, 5.64, 5.60])
errors = np.array([0.02, 0.03, 0.02, 0.04, 0.025, 0.03])
for name, vv in [("scattered", values), ("consistent", np.array([5.630, 5.642, 5.628, 5.655, 5.637, 5.621]))]:
    fit = sm.WLS(vv, np.ones_like(vv), weights=1 / errors**2).fit()
    chi2 = fit.ssr
    sw = np.sum(1 / errors**2)
    print("wls(%s): mean %.15g bse %.15g  1/sqrt(sum w) %.15g  chi2 %.15g  birge = bse*sqrt(sum w) %.15g  chi2.sf %.15g" % (
        name, fit.params[0], fit.bse[0], 1 / np.sqrt(sw), chi2, fit.bse[0] * np.sqrt(sw), stats.chi2.sf(chi2, len(vv) - 1)))

# --- Theil-Sen ---------------------------------------------------------------------------------
ts_y = np.array([5.61, 5.64, 5.60, 5.66, 5.65, 5.70, 5.63, 5.69, 5.72, 5.68, 5.74, 5.71, 5.77, 5.73, 5.76])
ts_x = np.arange(15.0)
r = stats.theilslopes(ts_y, ts_x, 0.95)
print("theilslopes(ts_y, 0..14, 0.95): slope %.15g intercept %.15g low %.15g high %.15g" % r)
tx = np.array([0, 1, 1, 2, 3, 3, 3, 4, 5, 6.0])
ty = np.array([2.0, 2.4, 2.1, 2.9, 3.3, 3.0, 3.5, 3.9, 4.1, 4.6])
r = stats.theilslopes(ty, tx, 0.90)
print("theilslopes(ty, tx, 0.90): slope %.15g intercept %.15g low %.15g high %.15g" % r)

# --- Holm step-down adjustment -------------------------------------------------------------------
p = [0.01, 0.04, 0.03, 0.005, 0.2]
print("multipletests(holm):", ", ".join("%.15g" % v for v in multipletests(p, method="holm")[1]))
