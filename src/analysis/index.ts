/**
 * Public surface of the analysis layer: goodness of fit, quality-flag detectors, the flag table and
 * its composition, and batch statistics. Pure functions: no DOM, no I/O, no Node-only APIs (they run
 * in web workers and the CLI alike).
 */
export * from './flagThresholds.ts';
export * from './qualityMetrics.ts';
export * from './tailProbabilities.ts';
export * from './detectSaturation.ts';
export * from './detectNoiseFloor.ts';
export * from './detectStepChange.ts';
export * from './detectCurvature.ts';
export * from './detectPointContact.ts';
export * from './compareApproachRetract.ts';
export * from './robustZScores.ts';
export * from './checkPlausibility.ts';
export * from './checkDegenerate.ts';
export * from './checkPoorFit.ts';
export * from './flagsForFit.ts';
export * from './analyzeCurve.ts';
export * from './analyzeBatch.ts';
export * from './pairSites.ts';
export * from './analyzeJoint.ts';
export * from './runStatQuantiles.ts';
export * from './groupQuantities.ts';
export * from './groupCurves.ts';
export * from './groupValues.ts';
export * from './runStatistics.ts';
export * from './weightedMean.ts';
export * from './compareMeans.ts';
export * from './compareRanks.ts';
export * from './compareEffectSize.ts';
export * from './compareMultiple.ts';
export * from './compareGroups.ts';
export * from './driftTrend.ts';
export * from './driftAnalysis.ts';
export * from './gridColourScale.ts';
export * from './gridMap.ts';
export * from './compareRuns.ts';
