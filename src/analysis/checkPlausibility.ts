import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { describeValue } from './validate.ts';

/** Input of {@link checkPlausibility}: any of the fitted physical quantities. */
export interface PlausibilityInput {
  /** Barrier height(s), eV: the apparent barrier of an I(z) fit, or φ1 and φ2 of an I(V) fit. */
  readonly barrierEV?: number | ArrayLike<number>;
  /** Barrier (gap) width, nm. */
  readonly widthNm?: number;
}

/** One quantity outside its plausible range. */
export interface ImplausibleValue {
  readonly quantity: 'barrier' | 'width';
  /** The value, in eV (barrier) or nm (width). */
  readonly value: number;
  /** Index in barrierEV when an array was given (0 otherwise). */
  readonly index: number;
  readonly minimum: number;
  readonly maximum: number;
  readonly unit: 'eV' | 'nm';
}

/** What {@link checkPlausibility} found outside the plausible ranges. */
export interface PlausibilityFinding {
  readonly implausible: ImplausibleValue[];
}

/**
 * Check fitted physical values against the plausible ranges of a tunnel junction: barrier
 * FLAG_THRESHOLDS.barrierMinimumEV–barrierMaximumEV (0.05–10 eV), width widthMinimumNm–widthMaximumNm
 * (0.1–5 nm), inclusive. A non-finite value is implausible too. Returns null when all are plausible
 * (or none was given).
 * Source: ranges from physics.md §2 and §12 (typical barriers 0.1–5 eV, work functions ≤ 6 eV) [cp].
 * @example checkPlausibility({ barrierEV: 12.3 })?.implausible[0].value // 12.3
 */
export function checkPlausibility(input: PlausibilityInput): PlausibilityFinding | null {
  const name = 'checkPlausibility';
  if (input === null || typeof input !== 'object') throw new TypeError(`${name}: input must be an object, got ${describeValue(input)}`);
  const implausible: ImplausibleValue[] = [];
  const barrierMinimum = FLAG_THRESHOLDS.barrierMinimumEV.value;
  const barrierMaximum = FLAG_THRESHOLDS.barrierMaximumEV.value;
  const barriers: ArrayLike<number> | undefined = typeof input.barrierEV === 'number' ? [input.barrierEV] : input.barrierEV;
  if (barriers !== undefined) {
    if (barriers === null || typeof barriers !== 'object' || typeof barriers.length !== 'number') {
      throw new TypeError(`${name}: barrierEV must be a number or an array of numbers, got ${describeValue(barriers)}`);
    }
    for (let i = 0; i < barriers.length; i++) {
      const value = barriers[i];
      if (typeof value !== 'number') throw new TypeError(`${name}: barrierEV[${i}] must be a number, got ${describeValue(value)}`);
      if (!(value >= barrierMinimum && value <= barrierMaximum)) {
        implausible.push({ quantity: 'barrier', value, index: i, minimum: barrierMinimum, maximum: barrierMaximum, unit: 'eV' });
      }
    }
  }
  if (input.widthNm !== undefined) {
    const value = input.widthNm;
    if (typeof value !== 'number') throw new TypeError(`${name}: widthNm must be a number, got ${describeValue(value)}`);
    const minimum = FLAG_THRESHOLDS.widthMinimumNm.value;
    const maximum = FLAG_THRESHOLDS.widthMaximumNm.value;
    if (!(value >= minimum && value <= maximum)) implausible.push({ quantity: 'width', value, index: 0, minimum, maximum, unit: 'nm' });
  }
  return implausible.length > 0 ? { implausible } : null;
}
