import type { CurveResult } from './analyzeCurve.ts';
import { describeValue } from './validate.ts';

/** The per-curve results that runs can be compared by: field names of CurveResult, unit in the name. */
export type GroupQuantityName = 'apparentBarrierEV' | 'gapToContactNm' | 'phi1EV' | 'phi2EV' | 'asymmetryEV' | 'meanBarrierEV';

/** What a comparable quantity is: its label, unit, the curve kind that carries it, and its error field. */
export interface GroupQuantity {
  readonly name: GroupQuantityName;
  /** Words for headings and axes, e.g. 'apparent barrier height'. */
  readonly label: string;
  /** Short symbol for tables, e.g. 'φ_app'. */
  readonly symbol: string;
  readonly unit: 'eV' | 'nm';
  /** 'iz' for approach-curve results, 'iv' for spectrum results. */
  readonly kind: 'iz' | 'iv';
  /** The CurveResult field holding the value's standard error (same unit). */
  readonly errorField: 'apparentBarrierErrEV' | 'gapToContactErrNm' | 'phi1ErrEV' | 'phi2ErrEV' | 'asymmetryErrEV' | 'meanBarrierErrEV';
}

/**
 * The quantities a comparison can use, by name: apparent barrier (I(z)), gap to contact (I(z)),
 * φ1 tip, φ2 sample, asymmetry φ2 − φ1 and mean barrier (I(V)). Units as in CurveResult.
 * Source: the CurveResult record (analyzeCurve.ts); Burrow's own table.
 * @example GROUP_QUANTITIES.apparentBarrierEV.unit // 'eV'
 */
export const GROUP_QUANTITIES: Readonly<Record<GroupQuantityName, GroupQuantity>> = Object.freeze({
  apparentBarrierEV: { name: 'apparentBarrierEV', label: 'apparent barrier height', symbol: 'φ_app', unit: 'eV', kind: 'iz', errorField: 'apparentBarrierErrEV' },
  gapToContactNm: { name: 'gapToContactNm', label: 'gap to contact', symbol: 's₀', unit: 'nm', kind: 'iz', errorField: 'gapToContactErrNm' },
  phi1EV: { name: 'phi1EV', label: 'tip barrier φ1', symbol: 'φ1', unit: 'eV', kind: 'iv', errorField: 'phi1ErrEV' },
  phi2EV: { name: 'phi2EV', label: 'sample barrier φ2', symbol: 'φ2', unit: 'eV', kind: 'iv', errorField: 'phi2ErrEV' },
  asymmetryEV: { name: 'asymmetryEV', label: 'barrier asymmetry φ2 − φ1', symbol: 'Δφ', unit: 'eV', kind: 'iv', errorField: 'asymmetryErrEV' },
  meanBarrierEV: { name: 'meanBarrierEV', label: 'mean barrier (φ1 + φ2)/2', symbol: 'φ̄', unit: 'eV', kind: 'iv', errorField: 'meanBarrierErrEV' },
} satisfies Record<GroupQuantityName, GroupQuantity>);

/**
 * Names of GROUP_QUANTITIES in the order menus and the CLI list them.
 * @example GROUP_QUANTITY_NAMES[0] // 'apparentBarrierEV'
 */
export const GROUP_QUANTITY_NAMES: readonly GroupQuantityName[] = Object.freeze(Object.keys(GROUP_QUANTITIES) as GroupQuantityName[]);

/**
 * Look up a quantity by name; throws naming the accepted names when it is not one of them.
 * @example groupQuantity('phi2EV').kind // 'iv'
 */
export function groupQuantity(name: string): GroupQuantity {
  if (typeof name !== 'string' || !Object.hasOwn(GROUP_QUANTITIES, name)) {
    throw new RangeError(`groupQuantity: quantity must be one of ${GROUP_QUANTITY_NAMES.join(', ')}, got ${describeValue(name)}`);
  }
  return GROUP_QUANTITIES[name as GroupQuantityName];
}

/**
 * The value and standard error of a quantity on one curve result, in the quantity's unit; null
 * where the curve's kind does not carry it, the fit failed, or the number is missing or not finite.
 * @example quantityOf(result, 'apparentBarrierEV') // { value: 5.64, standardError: 0.012 }
 */
export function quantityOf(result: CurveResult, name: GroupQuantityName): { value: number | null; standardError: number | null } {
  const quantity = groupQuantity(name);
  if (result.kind !== quantity.kind || result.status !== 'ok') return { value: null, standardError: null };
  const value = result[quantity.name];
  const error = result[quantity.errorField];
  return {
    value: typeof value === 'number' && Number.isFinite(value) ? value : null,
    standardError: typeof error === 'number' && Number.isFinite(error) && error > 0 ? error : null,
  };
}
