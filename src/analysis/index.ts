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
