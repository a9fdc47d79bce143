import { MAD_TO_SIGMA } from '../fit/index.ts';
import { median, medianAbsoluteDeviation } from 'simple-statistics';
import { CONDUCTANCE_QUANTUM_S } from '../physics/index.ts';
import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { requireFiniteArray, requireSameLength, describeValue } from './validate.ts';

/** Input of {@link detectPointContact}. */
export interface PointContactInput {
  /** Current at each point, A, in sweep order. */
  readonly currentA: ArrayLike<number>;
  /** The bias in V: one number for an I(z) sweep, or one value per point for I(V). */
  readonly biasV: number | ArrayLike<number>;
}

/** Near-contact evidence found by {@link detectPointContact}. */
export interface PointContactFinding {
  /** Largest conductance |I/V| of the sweep, in units of G0 = 2e²/h. */
  readonly maximumConductanceG0: number;
  /** Index of that point. */
  readonly maximumIndex: number;
  /** True when maximumConductanceG0 ≥ FLAG_THRESHOLDS.nearContactConductanceG0. */
  readonly nearContact: boolean;
  /** The jump to contact, if one was found: G changes by `factor` between `fromIndex` and `toIndex` (neighbours). */
  readonly jump: {
    readonly fromIndex: number;
    readonly toIndex: number;
    /** G(toIndex)/G(fromIndex), or its inverse, whichever is > 1. */
    readonly factor: number;
    /** |Δln G − local trend| in robust σ of the neighbour differences. */
    readonly robustSigmas: number;
    readonly fromConductanceG0: number;
    readonly toConductanceG0: number;
  } | null;
  /** Points at or above the near-contact conductance, plus the higher-conductance side of a jump. */
  readonly pointIndices: number[];
}


/**
 * Find point contact or a jump to contact in a sweep.
 * Conductance G_i = |I_i/V_i| / G0 (G0 = 2e²/h = 7.748091729864e-5 S). Near contact when
 * max G ≥ FLAG_THRESHOLDS.nearContactConductanceG0 (0.01 G0). Jump: with d_i = ln G_{i+1} − ln G_i
 * over the usable points (I ≠ 0, |V| ≥ contactMinimumBiasFraction·max|V|), the local trend is the
 * median of d over contactTrendWindow (8) neighbours each side and σ_robust = 1.4826·MAD(d − trend);
 * a jump is |d_i − trend_i| > contactJumpRobustSigmas (10) σ_robust AND > ln contactJumpMinimumFactor
 * (ln 2). The largest such jump is reported. Currents in A, bias in V.
 * Source: physics.md §3 (near-contact at ~0.01 G0 [cp]; abrupt jump to contact, Limot et al.,
 * Phys. Rev. Lett. 94, 126102 (2005)); G0 from src/physics.
 * @example detectPointContact({ currentA: [1e-9, 1e-8, 1e-7], biasV: 0.01 })?.maximumConductanceG0 // ≈ 0.129
 */
export function detectPointContact(input: PointContactInput): PointContactFinding | null {
  const name = 'detectPointContact';
  if (input === null || typeof input !== 'object') throw new TypeError(`${name}: input must be an object, got ${describeValue(input)}`);
  const current = requireFiniteArray(name, 'currentA', input.currentA, 1);
  const n = current.length;
  let bias: number[];
  if (typeof input.biasV === 'number') {
    if (!Number.isFinite(input.biasV) || input.biasV === 0) throw new RangeError(`${name}: biasV must be a finite non-zero number, got ${input.biasV}`);
    bias = new Array<number>(n).fill(input.biasV);
  } else {
    bias = requireFiniteArray(name, 'biasV', input.biasV, 0);
    requireSameLength(name, 'biasV', bias.length, n);
  }
  let maximumBias = 0;
  for (const value of bias) maximumBias = Math.max(maximumBias, Math.abs(value));
  if (!(maximumBias > 0)) throw new RangeError(`${name}: biasV must not be 0 everywhere, got max |V| = 0`);

  const conductanceG0 = new Array<number>(n).fill(NaN);
  let maximumConductanceG0 = 0;
  let maximumIndex = -1;
  for (let i = 0; i < n; i++) {
    if (bias[i] === 0) continue;
    conductanceG0[i] = Math.abs(current[i] / bias[i]) / CONDUCTANCE_QUANTUM_S;
    if (conductanceG0[i] > maximumConductanceG0) {
      maximumConductanceG0 = conductanceG0[i];
      maximumIndex = i;
    }
  }
  const nearContactLimit = FLAG_THRESHOLDS.nearContactConductanceG0.value;
  const nearContact = maximumConductanceG0 >= nearContactLimit;
  const jump = findJump(conductanceG0, bias, maximumBias);

  if (!nearContact && jump === null) return null;
  const flagged = new Set<number>();
  for (let i = 0; i < n; i++) if (conductanceG0[i] >= nearContactLimit) flagged.add(i);
  if (jump !== null) flagged.add(jump.toConductanceG0 >= jump.fromConductanceG0 ? jump.toIndex : jump.fromIndex);
  return {
    maximumConductanceG0,
    maximumIndex,
    nearContact,
    jump,
    pointIndices: [...flagged].sort((a, b) => a - b),
  };
}

function findJump(conductanceG0: readonly number[], bias: readonly number[], maximumBias: number): PointContactFinding['jump'] {
  const minimumBias = FLAG_THRESHOLDS.contactMinimumBiasFraction.value * maximumBias;
  const usable: number[] = [];
  for (let i = 0; i < conductanceG0.length; i++) {
    if (conductanceG0[i] > 0 && Math.abs(bias[i]) >= minimumBias) usable.push(i);
  }
  const window = FLAG_THRESHOLDS.contactTrendWindow.value;
  if (usable.length < 2 * window + 2) return null;
  const differences: number[] = [];
  for (let k = 1; k < usable.length; k++) {
    differences.push(Math.log(conductanceG0[usable[k]]) - Math.log(conductanceG0[usable[k - 1]]));
  }
  const departures: number[] = [];
  for (let k = 0; k < differences.length; k++) {
    const neighbours: number[] = [];
    for (let j = Math.max(0, k - window); j <= Math.min(differences.length - 1, k + window); j++) {
      if (j !== k) neighbours.push(differences[j]);
    }
    departures.push(differences[k] - median(neighbours));
  }
  const robustSigma = MAD_TO_SIGMA * medianAbsoluteDeviation(departures);
  const minimumLogJump = Math.log(FLAG_THRESHOLDS.contactJumpMinimumFactor.value);
  const sigmas = FLAG_THRESHOLDS.contactJumpRobustSigmas.value;
  let best: PointContactFinding['jump'] = null;
  let bestDeparture = 0;
  for (let k = 0; k < departures.length; k++) {
    const size = Math.abs(departures[k]);
    const inSigmas = robustSigma > 0 ? size / robustSigma : size > 0 ? Infinity : 0;
    const fromIndex = usable[k];
    const toIndex = usable[k + 1];
    // A jump to contact lands near contact: its high side reaches contactJumpMinimumLandingG0. A
    // sudden step far from contact (at 1e-6 G0, say) is a tip change, not a contact.
    const landing = Math.max(conductanceG0[fromIndex], conductanceG0[toIndex]);
    if (size > minimumLogJump && inSigmas > sigmas && landing >= FLAG_THRESHOLDS.contactJumpMinimumLandingG0.value && size > bestDeparture) {
      bestDeparture = size;
      best = {
        fromIndex,
        toIndex,
        factor: Math.exp(Math.abs(differences[k])),
        robustSigmas: inSigmas,
        fromConductanceG0: conductanceG0[fromIndex],
        toConductanceG0: conductanceG0[toIndex],
      };
    }
  }
  return best;
}
