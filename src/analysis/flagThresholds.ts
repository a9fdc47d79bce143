/**
 * Quality flags: the stable flag codes, the shape of a flag, and the ONE table of every threshold the
 * detectors and the flag rules use. The README documents this table; change a number here and only
 * here.
 */
import { FLOOR_SIGNAL_RATIO, SATURATION_RELATIVE_TOLERANCE } from '../fit/approachCurveFit.ts';

/**
 * Every flag code Burrow can raise, in the order flags are listed. The strings are stable: files,
 * the CLI and the dashboard key on them.
 * Source: Burrow's own vocabulary.
 * @example FLAG_CODES.includes('saturation') // true
 */
export const FLAG_CODES = [
  'saturation',
  'noise-floor',
  'tip-change',
  'point-contact',
  'non-exponential',
  'hysteresis',
  'poor-fit',
  'no-convergence',
  'degenerate',
  'implausible',
  'batch-outlier',
] as const;

/**
 * One of {@link FLAG_CODES}.
 * @example const code: FlagCode = 'tip-change';
 */
export type FlagCode = (typeof FLAG_CODES)[number];

/**
 * A quality flag on one curve: a stable code, one sentence with the measured figure, and the indices
 * (into the curve as recorded, 0-based) of the offending points so a plot can highlight them. Point
 * numbers inside a reason are the same 0-based indices.
 * @example
 * const flag: QualityFlag = {
 *   code: 'saturation',
 *   reason: 'Current is clipped at 9.98 nA on the 6 closest points (preamp saturation); they were left out of the fit.',
 *   pointIndices: [0, 1, 2, 3, 4, 5],
 * };
 */
export interface QualityFlag {
  readonly code: FlagCode;
  readonly reason: string;
  readonly pointIndices?: readonly number[];
}

/**
 * One threshold: its value, the unit the value is in, and a one-line rationale.
 * @example const t: FlagThreshold = { value: 3.5, unit: 'modified z-score', rationale: 'Iglewicz & Hoaglin (1993).' };
 */
export interface FlagThreshold {
  readonly value: number;
  readonly unit: string;
  readonly rationale: string;
}

/** The table itself; exported below as FLAG_THRESHOLDS with plain number values. */
const THRESHOLD_TABLE = {
  saturationRelativeTolerance: {
    value: SATURATION_RELATIVE_TOLERANCE,
    unit: 'fraction of |I|',
    rationale:
      'A rail repeats one converter code or toggles between two (one 16-bit step is 3.1e-5 of full scale); unclipped neighbours with 2–5 % noise agree this closely about once in 1000 curves.',
  },
  saturationMinimumRun: {
    value: 2,
    unit: 'points',
    rationale: 'One point at the maximum is just the maximum; two or more equal extremes at the high-current end are a rail.',
  },
  noiseFloorMultiple: {
    value: FLOOR_SIGNAL_RATIO,
    unit: 'times the additive noise σ',
    rationale: 'Below 3σ of the additive noise ln|I| is biased and its scatter is not the multiplicative noise the fit assumes [cp].',
  },
  noiseFloorTailFraction: {
    value: 0.125,
    unit: 'fraction of the points',
    rationale: 'When no floor is given, the additive noise is estimated from the lowest-current eighth of the sweep (at least 8 points).',
  },
  noiseFloorMinimumFraction: {
    value: 0.25,
    unit: 'fraction of the points',
    rationale: 'An I(z) fit always leaves out the few points lost in the floor; the curve is flagged only when a quarter or more of it is (common practice, no source).',
  },
  stepFalseAlarmProbability: {
    value: 1e-3,
    unit: 'probability per series',
    rationale: 'Bonferroni bound over all split positions: at most one false tip change per thousand clean curves.',
  },
  stepMinimumLogCurrent: {
    value: 0.1,
    unit: '|Δ ln I| (I(z) curves)',
    rationale: 'A tip change worth flagging moves the current by 10 % or more; smaller significant steps in long clean curves are noise structure (common practice, no source).',
  },
  stepQuietFloorMultiple: {
    value: 30,
    unit: 'times the additive noise σ',
    rationale: 'The I(z) step test uses the points more than 30 σ_floor above the floor, where the noise of ln I is the even relative noise.',
  },
  stepMinimumSegment: {
    value: 2,
    unit: 'points',
    rationale: 'A single displaced point is a spike, not a step; each side of a step must hold at least two points.',
  },
  curvatureSignificance: {
    value: 1e-3,
    unit: 'two-sided p of the quadratic term',
    rationale: 'Curvature must be real: at most one false non-exponential call per thousand clean curves.',
  },
  curvatureSlopeChangeFraction: {
    value: 0.2,
    unit: 'fraction of the mid-window slope',
    rationale: 'φ_ap ∝ slope², so 20 % in slope is 40 % in φ_ap across the window; planar WKB alone bends ln I by up to ~10 % in slope over 0.3 nm at 0.4–0.8 nm gaps (physics.md §2: φ_ap 4.87 → 4.42 eV from 5 to 10 Å), so only twice that counts.',
  },
  nearContactConductanceG0: {
    value: 0.01,
    unit: 'G0 (2e²/h)',
    rationale: 'Flag G > ~0.01 G0 as near contact (physics.md §3) [cp].',
  },
  contactJumpRobustSigmas: {
    value: 10,
    unit: 'robust σ of neighbour Δln G',
    rationale: 'A jump to contact stands far outside the point-to-point scatter; 10σ keeps clean 2–5 % noise curves of 512 points clear.',
  },
  contactJumpMinimumFactor: {
    value: 2,
    unit: 'conductance ratio between neighbours',
    rationale: 'Jumps to contact change G several-fold between two points; 2–5 % noise never doubles G.',
  },
  contactJumpMinimumLandingG0: {
    value: 0.001,
    unit: 'G0 on the high side of the jump',
    rationale: 'A jump to contact ends within a decade or two of G0 (physics.md §3); a step at 1e-6 G0 is a tip change (common practice, no source).',
  },
  contactQuietFloorMultiple: {
    value: 10,
    unit: 'times the additive noise σ',
    rationale: 'I(z) points whose fitted current is below 10 σ_floor are left out of the jump search: there |I/V| scatters by tens of percent between neighbours.',
  },
  contactTrendWindow: {
    value: 8,
    unit: 'points each side',
    rationale: 'The local trend of Δln G is the median over 8 neighbours each side, so the curvature of I(V) is not taken for a jump.',
  },
  contactMinimumBiasFraction: {
    value: 0.1,
    unit: 'fraction of max |V|',
    rationale: 'Near zero bias I/V is a ratio of two small numbers; such points are skipped in the jump search.',
  },
  hysteresisSigmas: {
    value: 3.29,
    unit: 'combined standard errors',
    rationale: 'Two-sided 0.1 % for normal errors: the same false-alarm budget per curve as the step and curvature tests.',
  },
  poorFitMinimumRSquared: {
    value: 0.95,
    unit: 'R² on the fitted scale (ln I for I(z))',
    rationale: 'A clean curve over one decade at 5 % noise already gives R² ≈ 0.994 on ln I; below 0.95 the model misses the data.',
  },
  poorFitSignificance: {
    value: 1e-3,
    unit: 'one-sided p',
    rationale: 'The χ² and Durbin–Watson tests must reject at 0.1 % before poor-fit is raised.',
  },
  poorFitMaximumReducedChiSquare: {
    value: 1.5,
    unit: 'χ²/ν (noise known)',
    rationale: 'Residuals with 1.5× the stated noise variance matter; smaller excesses on long curves are significant but harmless.',
  },
  poorFitMinimumDurbinWatson: {
    value: 1,
    unit: 'Durbin–Watson d',
    rationale: 'd ≈ 2(1 − r₁): below 1 neighbouring residuals correlate by more than 0.5, a systematic misfit (Durbin & Watson 1950).',
  },
  degenerateCorrelation: {
    value: 0.999,
    unit: '|r| between two parameters',
    rationale: 'Above 0.999 two parameters trade off almost exactly and neither is determined by the data [cp].',
  },
  barrierMinimumEV: {
    value: 0.05,
    unit: 'eV',
    rationale: 'Contaminated tunnel junctions in air reach ≲ 1 eV and alkane films flatten decays 1.5–5× (physics.md §2); below 0.05 eV it is not tunnelling.',
  },
  barrierMaximumEV: {
    value: 10,
    unit: 'eV',
    rationale: 'No elemental work function exceeds ~6 eV (physics.md §12); above 10 eV the slope is miscalibrated or the fit is wrong.',
  },
  widthMinimumNm: {
    value: 0.1,
    unit: 'nm',
    rationale: 'Below 0.1 nm the electrodes are in contact; the tunnel model does not apply.',
  },
  widthMaximumNm: {
    value: 5,
    unit: 'nm',
    rationale: 'Beyond 5 nm the tunnel current is far below any STM preamplifier floor (e^{−2κs} < 1e-40 at 4 eV).',
  },
  batchOutlierModifiedZ: {
    value: 3.5,
    unit: '|modified z-score|',
    rationale: 'Iglewicz & Hoaglin, How to Detect and Handle Outliers (ASQC 1993): |M| > 3.5 marks a potential outlier.',
  },
  batchOutlierOwnErrorSigmas: {
    value: 3.29,
    unit: "the curve's own standard errors",
    rationale: 'A noisy curve whose error bar (3.29σ, two-sided 0.1 %) reaches the batch median is noisy, not an outlier.',
  },
} as const satisfies Record<string, FlagThreshold>;

/**
 * The name of one threshold in {@link FLAG_THRESHOLDS}.
 * @example const name: FlagThresholdName = 'hysteresisSigmas';
 */
export type FlagThresholdName = keyof typeof THRESHOLD_TABLE;

/**
 * Every threshold used to raise a flag, with unit and rationale; keys start with the flag they
 * serve. Tags: "[cp]" common practice, no source; "[mem]" recalled, not checked against a stored copy.
 * @example FLAG_THRESHOLDS.nearContactConductanceG0.value // 0.01
 */
export const FLAG_THRESHOLDS: Readonly<Record<FlagThresholdName, FlagThreshold>> = THRESHOLD_TABLE;
