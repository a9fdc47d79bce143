import { median, medianAbsoluteDeviation } from 'simple-statistics';
import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { requireFiniteArray, requireSameLength } from './validate.ts';

/** Φ⁻¹(3/4) to four figures, the constant of the modified z-score (Iglewicz & Hoaglin 1993). */
const MODIFIED_Z_CONSTANT = 0.6745;
/** √(π/2): σ / (mean absolute deviation) for normal data, used when the MAD is 0. */
const MEAN_ABSOLUTE_DEVIATION_TO_SIGMA = 1.253314;

/** Modified z-scores with the centre and scale they used, from {@link robustZScoreDetails}. */
export interface RobustZScores {
  /** One score per value, in input order (dimensionless). */
  readonly scores: number[];
  /** Median of the values (unit of the values). */
  readonly median: number;
  /** Median absolute deviation from the median (unit of the values). */
  readonly medianAbsoluteDeviation: number;
  /** 'mad' normally; 'mean-absolute-deviation' when the MAD is 0; 'none' when all values are equal (scores 0). */
  readonly scale: 'mad' | 'mean-absolute-deviation' | 'none';
}

/**
 * Modified z-scores and the centre and scale behind them.
 * M_i = 0.6745 (x_i − median) / MAD, MAD = median |x_i − median| (simple-statistics
 * `medianAbsoluteDeviation`). When MAD = 0 (more than half the values equal), M_i = (x_i − median) /
 * (1.253314 · mean|x_i − median|), the fallback IBM documents for this case [from memory; seen quoted on
 * a public Q&A page]; when that is 0 too, every value is the median and all scores are 0. Any unit in,
 * dimensionless out.
 * Source: B. Iglewicz & D. C. Hoaglin, How to Detect and Handle Outliers (ASQC Quality Press 1993).
 * @example robustZScoreDetails([1, 2, 3, 4, 100]).scores // [-1.349, -0.6745, 0, 0.6745, 65.4265]
 */
export function robustZScoreDetails(values: ArrayLike<number>): RobustZScores {
  const data = requireFiniteArray('robustZScores', 'values', values, 1);
  const centre = median(data);
  const spread = medianAbsoluteDeviation(data);
  if (spread > 0) {
    return {
      scores: data.map((value) => (MODIFIED_Z_CONSTANT * (value - centre)) / spread),
      median: centre,
      medianAbsoluteDeviation: spread,
      scale: 'mad',
    };
  }
  let meanAbsoluteDeviation = 0;
  for (const value of data) meanAbsoluteDeviation += Math.abs(value - centre);
  meanAbsoluteDeviation /= data.length;
  if (meanAbsoluteDeviation > 0) {
    return {
      scores: data.map((value) => (value - centre) / (MEAN_ABSOLUTE_DEVIATION_TO_SIGMA * meanAbsoluteDeviation)),
      median: centre,
      medianAbsoluteDeviation: 0,
      scale: 'mean-absolute-deviation',
    };
  }
  return { scores: data.map(() => 0), median: centre, medianAbsoluteDeviation: 0, scale: 'none' };
}

/**
 * Modified z-score of each value: 0.6745 (x − median)/MAD (see {@link robustZScoreDetails} for the
 * MAD = 0 case). Any unit in, dimensionless out.
 * Source: B. Iglewicz & D. C. Hoaglin, How to Detect and Handle Outliers (ASQC Quality Press 1993).
 * @example robustZScores([1, 2, 3, 4, 100]) // [-1.349, -0.6745, 0, 0.6745, 65.4265]
 */
export function robustZScores(values: ArrayLike<number>): number[] {
  return robustZScoreDetails(values).scores;
}

/** Batch outliers found by {@link detectBatchOutliers}. */
export interface BatchOutlierFinding extends RobustZScores {
  /** Indices (into the batch) of the outliers, ascending. */
  readonly outlierIndices: number[];
}

/**
 * Find the outliers of a batch of per-curve results (barrier heights, gaps, …): |M_i| >
 * FLAG_THRESHOLDS.batchOutlierModifiedZ (3.5). When each value's standard error σ_i is given, a
 * value must also lie more than FLAG_THRESHOLDS.batchOutlierOwnErrorSigmas (3.29) σ_i from the batch
 * median, so a curve that is merely noisier than the rest (its error bar covers the median) is not
 * called an outlier. Needs at least 3 values. Returns null when none stands out. Values and standard
 * errors in the same unit.
 * Source: Iglewicz & Hoaglin (1993), the 3.5 rule; the error-bar condition is Burrow's [cp].
 * @example detectBatchOutliers([4.1, 4.3, 3.9, 4.0, 4.2, 9.5])?.outlierIndices // [5]
 */
export function detectBatchOutliers(values: ArrayLike<number>, standardErrors?: ArrayLike<number>): BatchOutlierFinding | null {
  const name = 'detectBatchOutliers';
  const data = requireFiniteArray(name, 'values', values, 3);
  let errors: number[] | undefined;
  if (standardErrors !== undefined) {
    errors = requireFiniteArray(name, 'standardErrors', standardErrors, 0);
    requireSameLength(name, 'standardErrors', errors.length, data.length);
    for (let i = 0; i < errors.length; i++) {
      if (errors[i] < 0) throw new RangeError(`${name}: standardErrors[${i}] must be ≥ 0, got ${errors[i]}`);
    }
  }
  const details = robustZScoreDetails(data);
  const limit = FLAG_THRESHOLDS.batchOutlierModifiedZ.value;
  const ownErrorLimit = FLAG_THRESHOLDS.batchOutlierOwnErrorSigmas.value;
  const outlierIndices: number[] = [];
  for (let i = 0; i < details.scores.length; i++) {
    if (!(Math.abs(details.scores[i]) > limit)) continue;
    if (errors !== undefined && !(Math.abs(data[i] - details.median) > ownErrorLimit * errors[i])) continue;
    outlierIndices.push(i);
  }
  return outlierIndices.length > 0 ? { ...details, outlierIndices } : null;
}
