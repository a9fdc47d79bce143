import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { studentTTwoSidedPValue } from './tailProbabilities.ts';
import { describeValue, requireFiniteArray, requireSameLength } from './validate.ts';

/** Result of {@link detectCurvature}: the quadratic fit, its curvature test and the verdict. */
export interface CurvatureResult {
  /** Constant term a of y = a + b x + c x² (unit of y), before any step. */
  readonly intercept: number;
  /** Linear term b (unit of y per unit of x); for I(z), d lnI/dz at x = 0. */
  readonly linear: number;
  /** Quadratic term c (unit of y per unit of x²); for I(z) with z in nm, nm⁻². */
  readonly curvature: number;
  /** Standard error of c, scaled by the reduced χ² of the quadratic fit (same unit as c). */
  readonly curvatureStandardError: number;
  /** t = c / stderr(c). */
  readonly tStatistic: number;
  /** Degrees of freedom n − 3 (n − 4 with a step in the model). */
  readonly degreesOfFreedom: number;
  /** Two-sided Student-t p-value of c = 0. */
  readonly pValue: number;
  /** Slope b + 2c x at the first and last x of the window, and at its middle (unit of y per unit of x). */
  readonly slopeAtMinimumX: number;
  readonly slopeAtMaximumX: number;
  readonly slopeAtMiddle: number;
  /** |slopeAtMaximumX − slopeAtMinimumX| / |slopeAtMiddle| (Infinity when the middle slope is 0). */
  readonly relativeSlopeChange: number;
  /** y minus the fitted model at every point, in input order. */
  readonly residuals: number[];
  /** Points used (weight > 0). */
  readonly pointsUsed: number;
  /** pValue < curvatureSignificance AND relativeSlopeChange > curvatureSlopeChangeFraction. */
  readonly nonExponential: boolean;
}

/** Options of {@link detectCurvature}. */
export interface CurvatureOptions {
  /**
   * Index (into x, y) of the first point after a known step (a tip change from detectStepChange):
   * the model then also fits an offset δ·[i ≥ index], so the step is not taken for curvature.
   */
  readonly stepAtIndex?: number;
}

/**
 * Solve the symmetric positive-definite system M β = r (M row-major, size p) by Gauss–Jordan
 * elimination with partial pivoting; returns β and M⁻¹, or null when M is singular.
 */
function solveNormalEquations(matrix: readonly number[], rhs: readonly number[], size: number): { solution: number[]; inverse: number[] } | null {
  const width = 2 * size;
  const augmented: number[][] = [];
  for (let row = 0; row < size; row++) {
    const line = new Array<number>(width).fill(0);
    for (let column = 0; column < size; column++) line[column] = matrix[row * size + column];
    line[size + row] = 1;
    augmented.push(line);
  }
  const scale = Math.max(...Array.from({ length: size }, (_, i) => Math.abs(matrix[i * size + i])));
  for (let pivot = 0; pivot < size; pivot++) {
    let best = pivot;
    for (let row = pivot + 1; row < size; row++) if (Math.abs(augmented[row][pivot]) > Math.abs(augmented[best][pivot])) best = row;
    if (!(Math.abs(augmented[best][pivot]) > 1e-12 * scale)) return null;
    [augmented[pivot], augmented[best]] = [augmented[best], augmented[pivot]];
    const divisor = augmented[pivot][pivot];
    for (let column = 0; column < width; column++) augmented[pivot][column] /= divisor;
    for (let row = 0; row < size; row++) {
      if (row === pivot) continue;
      const factor = augmented[row][pivot];
      if (factor === 0) continue;
      for (let column = 0; column < width; column++) augmented[row][column] -= factor * augmented[pivot][column];
    }
  }
  const inverse: number[] = [];
  for (let row = 0; row < size; row++) for (let column = 0; column < size; column++) inverse.push(augmented[row][size + column]);
  const solution = new Array<number>(size).fill(0);
  for (let row = 0; row < size; row++) for (let column = 0; column < size; column++) solution[row] += inverse[row * size + column] * rhs[column];
  return { solution, inverse };
}

/**
 * Test a curve for curvature: fit y = a + b x + c x² by weighted least squares and ask whether c is
 * real and whether it matters. For I(z), pass x = z (nm) and y = ln I: a pure exponential is a line.
 * Method: x is mapped to u = (x − x_mid)/h ∈ [−1, 1] (h = half the range) for conditioning; the
 * normal equations Σ w²[1 u u²]ᵀ[1 u u²] β = Σ w² y [1 u u²]ᵀ give β; covariance = (XᵀW²X)⁻¹ × χ²/(n − 3)
 * (as in src/fit); c = β₂/h², stderr(c) = √cov₂₂/h², t = c/stderr, p two-sided Student t, ν = n − 3.
 * The slope b + 2c x changes across the window by 4β₂/h; relative to the mid-window slope β₁/h that is
 * 4|β₂|/|β₁|. nonExponential = p < FLAG_THRESHOLDS.curvatureSignificance (1e-3) and relative change >
 * FLAG_THRESHOLDS.curvatureSlopeChangeFraction (0.2). weights: residual weights 1/σ_i (default 1);
 * points with weight 0 are left out. With options.stepAtIndex (a tip change found by
 * detectStepChange) the model gains an offset δ·[i ≥ stepAtIndex] and ν = n − 4, so that a step is not
 * read as curvature.
 * Source: weighted least squares, e.g. N. R. Draper & H. Smith, Applied Regression Analysis, 3rd ed.
 * (Wiley 1998), ch. 9 [from memory]; t test of a coefficient, ibid.
 * @example detectCurvature([0, 1, 2, 3, 4, 5], [0, -1.1, -1.9, -3.05, -3.95, -5.0]).nonExponential // false
 */
export function detectCurvature(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  weights?: ArrayLike<number>,
  options: CurvatureOptions = {},
): CurvatureResult {
  const name = 'detectCurvature';
  const xs = requireFiniteArray(name, 'x', x, 4);
  const ys = requireFiniteArray(name, 'y', y, 0);
  requireSameLength(name, 'y', ys.length, xs.length);
  const n = xs.length;
  let ws: number[];
  if (weights === undefined) ws = new Array<number>(n).fill(1);
  else {
    ws = requireFiniteArray(name, 'weights', weights, 0);
    requireSameLength(name, 'weights', ws.length, n);
    for (let i = 0; i < n; i++) if (ws[i] < 0) throw new RangeError(`${name}: weights[${i}] must be ≥ 0, got ${ws[i]}`);
  }
  let minimumX = Infinity;
  let maximumX = -Infinity;
  let pointsUsed = 0;
  for (let i = 0; i < n; i++) {
    if (ws[i] === 0) continue;
    pointsUsed++;
    minimumX = Math.min(minimumX, xs[i]);
    maximumX = Math.max(maximumX, xs[i]);
  }
  if (pointsUsed < 4) throw new RangeError(`${name}: weights must leave at least 4 points with weight > 0, got ${pointsUsed}`);
  if (!(maximumX > minimumX)) throw new RangeError(`${name}: x must span a range > 0, got all x = ${minimumX}`);
  if (options === null || typeof options !== 'object') throw new TypeError(`${name}: options must be an object, got ${describeValue(options)}`);
  const { stepAtIndex } = options;
  if (stepAtIndex !== undefined && !(Number.isInteger(stepAtIndex) && stepAtIndex >= 1 && stepAtIndex <= n - 1)) {
    throw new RangeError(`${name}: stepAtIndex must be an integer within [1, ${n - 1}], got ${describeValue(stepAtIndex)}`);
  }
  const size = stepAtIndex === undefined ? 3 : 4;
  if (pointsUsed < size + 1) throw new RangeError(`${name}: weights must leave at least ${size + 1} points with weight > 0, got ${pointsUsed}`);
  const middle = (minimumX + maximumX) / 2;
  const half = (maximumX - minimumX) / 2;
  const basisAt = (i: number): number[] => {
    const u = (xs[i] - middle) / half;
    return stepAtIndex === undefined ? [1, u, u * u] : [1, u, u * u, i >= stepAtIndex ? 1 : 0];
  };

  const matrix = new Array<number>(size * size).fill(0);
  const rhs = new Array<number>(size).fill(0);
  for (let i = 0; i < n; i++) {
    const weightSquared = ws[i] * ws[i];
    if (weightSquared === 0) continue;
    const basis = basisAt(i);
    for (let row = 0; row < size; row++) {
      rhs[row] += weightSquared * basis[row] * ys[i];
      for (let column = 0; column < size; column++) matrix[size * row + column] += weightSquared * basis[row] * basis[column];
    }
  }
  const solved = solveNormalEquations(matrix, rhs, size);
  if (solved === null) {
    throw new RangeError(`${name}: x must hold at least 3 distinct values with weight > 0 (and points on both sides of stepAtIndex), got fewer`);
  }
  const [constantScaled, linearScaled, quadraticScaled] = solved.solution;

  const residuals = new Array<number>(n);
  let chiSquare = 0;
  for (let i = 0; i < n; i++) {
    const basis = basisAt(i);
    let model = 0;
    for (let j = 0; j < size; j++) model += solved.solution[j] * basis[j];
    residuals[i] = ys[i] - model;
    chiSquare += ws[i] * ws[i] * residuals[i] * residuals[i];
  }
  const degreesOfFreedom = pointsUsed - size;
  const reducedChiSquare = chiSquare / degreesOfFreedom;
  const quadraticScaledError = Math.sqrt(solved.inverse[2 * size + 2] * reducedChiSquare);

  const curvature = quadraticScaled / (half * half);
  const linear = linearScaled / half - (2 * quadraticScaled * middle) / (half * half);
  const intercept = constantScaled - (linearScaled * middle) / half + (quadraticScaled * middle * middle) / (half * half);
  const curvatureStandardError = quadraticScaledError / (half * half);
  let tStatistic: number;
  if (quadraticScaledError > 0) tStatistic = quadraticScaled / quadraticScaledError;
  else tStatistic = quadraticScaled === 0 ? 0 : Math.sign(quadraticScaled) * Infinity;
  const pValue = studentTTwoSidedPValue(tStatistic, degreesOfFreedom);
  const slopeAtMiddle = linearScaled / half;
  const slopeAtMinimumX = (linearScaled - 2 * quadraticScaled) / half;
  const slopeAtMaximumX = (linearScaled + 2 * quadraticScaled) / half;
  const slopeDifference = Math.abs(slopeAtMaximumX - slopeAtMinimumX);
  const relativeSlopeChange = slopeAtMiddle !== 0 ? slopeDifference / Math.abs(slopeAtMiddle) : slopeDifference === 0 ? 0 : Infinity;
  const nonExponential =
    pValue < FLAG_THRESHOLDS.curvatureSignificance.value && relativeSlopeChange > FLAG_THRESHOLDS.curvatureSlopeChangeFraction.value;
  return {
    intercept,
    linear,
    curvature,
    curvatureStandardError,
    tStatistic,
    degreesOfFreedom,
    pValue,
    slopeAtMinimumX,
    slopeAtMaximumX,
    slopeAtMiddle,
    relativeSlopeChange,
    residuals,
    pointsUsed,
    nonExponential,
  };
}
