/**
 * Public surface of src/fit: the Levenberg–Marquardt solver, its parameter and model layer, robust
 * losses, finite differences, report text and the seeded random generators. Other layers import
 * only from here.
 */
export {
  levenbergMarquardt,
  createSolver,
  SOLVER_STATUS,
  type LeastSquaresProblem,
  type LevenbergMarquardtSolver,
  type SolverOptions,
  type SolverResult,
  type SolverStatus,
  type BoundSide,
} from './solver.ts';
export {
  finiteDifferenceJacobian,
  createFiniteDifferenceWork,
  DEFAULT_RELATIVE_STEP,
  type JacobianMethod,
  type FiniteDifferenceOptions,
  type FiniteDifferenceWork,
  type ResidualFunction,
} from './finiteDifference.ts';
export {
  makeParameter,
  makeParameters,
  withParameter,
  type Parameter,
  type ParameterInput,
  type FittedParameter,
} from './parameters.ts';
export { fitModel, type FitModelInput, type FitModelResult, type FitSolverOptions } from './fitModel.ts';
export {
  robustLevenbergMarquardt,
  robustCost,
  robustWeight,
  medianAbsoluteScale,
  ROBUST_TUNING,
  type RobustLoss,
  type RobustOptions,
  type RobustResult,
} from './robust.ts';
export {
  formatFitReport,
  formatReportNumber,
  type FitReport,
  type FitReportOptions,
  type ReportableFit,
} from './report.ts';
export { mulberry32, gaussian, type UniformRandom } from '../physics/index.ts';
export * from './weightedLine.ts';
export * from './selectMedian.ts';
export * from './polynomialFit.ts';
export * from './approachCurveFit.ts';
export * from './spectrumFit.ts';
export * from './jointFit.ts';
export * from './settings.ts';
