import { cohensD, type EffectSizeResult } from './compareEffectSize.ts';
import { welchTTest, type WelchTTestResult } from './compareMeans.ts';
import { holmAdjust } from './compareMultiple.ts';
import { mannWhitneyU, type MannWhitneyOptions, type MannWhitneyResult } from './compareRanks.ts';
import { groupQuantity, type GroupQuantityName } from './groupQuantities.ts';
import type { GroupValues } from './groupValues.ts';
import { describeValue } from './validate.ts';

/** One row of the pairwise table: group A against group B for one quantity. */
export interface GroupComparison {
  readonly keyA: string;
  readonly labelA: string;
  readonly keyB: string;
  readonly labelB: string;
  readonly quantity: GroupQuantityName;
  readonly unit: string;
  /** Curves used and left out (flagged, no value) in each group. */
  readonly nUsedA: number;
  readonly nExcludedA: number;
  readonly nUsedB: number;
  readonly nExcludedB: number;
  /** Welch's test and the CI of meanA − meanB; null when a group has fewer than 2 values. */
  readonly welch: WelchTTestResult | null;
  /** Mann–Whitney U; null when a group is empty. */
  readonly mannWhitney: MannWhitneyResult | null;
  /** Cohen's d and Hedges' g; null when a group has fewer than 2 values. */
  readonly effectSize: EffectSizeResult | null;
  /** Welch p adjusted by Holm over every row of the table (compareGroupPairs); null otherwise. */
  readonly welchPValueHolm: number | null;
  /** Why a test is missing, or null. */
  readonly note: string | null;
}

/** Options of {@link compareGroups} and {@link compareGroupPairs}. */
export interface CompareGroupsOptions {
  /** Level of the CI of the difference (default 0.95). */
  readonly confidenceLevel?: number;
  /** Passed to mannWhitneyU. */
  readonly mannWhitney?: MannWhitneyOptions;
}

/**
 * Compare two groups' values of one quantity: difference of means with its Welch CI, Welch's
 * t-test, Mann–Whitney U, Cohen's d and Hedges' g, and the curves used and left out. A test that
 * needs more values than a group has is null, with a note. Values in the quantity's unit; the
 * difference is A − B.
 * Source: welchTTest, mannWhitneyU, cohensD (Welch 1947; Mann & Whitney 1947; Cohen 1988; Hedges 1981).
 * @example compareGroups(valuesAGold, valuesAGraphite).welch?.differenceOfMeans // ≈ 0.29 (eV)
 */
export function compareGroups(groupA: GroupValues, groupB: GroupValues, options: CompareGroupsOptions = {}): GroupComparison {
  const name = 'compareGroups';
  for (const [label, group] of [['groupA', groupA], ['groupB', groupB]] as const) {
    if (group === null || typeof group !== 'object' || !Array.isArray(group.values)) {
      throw new TypeError(`${name}: ${label} must be a GroupValues record (from groupValues), got ${describeValue(group)}`);
    }
  }
  if (groupA.quantity !== groupB.quantity) {
    throw new RangeError(`${name}: groupB.quantity must equal groupA.quantity (${groupA.quantity}), got ${describeValue(groupB.quantity)}`);
  }
  const confidenceLevel = options.confidenceLevel ?? 0.95;
  const a = groupA.values;
  const b = groupB.values;
  const notes: string[] = [];
  const bothTwo = a.length >= 2 && b.length >= 2;
  if (!bothTwo) notes.push(`Welch's test and Cohen's d need ≥ 2 curves in each group (have ${a.length} and ${b.length})`);
  const bothOne = a.length >= 1 && b.length >= 1;
  if (!bothOne) notes.push('Mann–Whitney U needs ≥ 1 curve in each group');
  return {
    keyA: groupA.key,
    labelA: groupA.label,
    keyB: groupB.key,
    labelB: groupB.label,
    quantity: groupA.quantity,
    unit: groupQuantity(groupA.quantity).unit,
    nUsedA: groupA.nUsed,
    nExcludedA: groupA.nExcluded,
    nUsedB: groupB.nUsed,
    nExcludedB: groupB.nExcluded,
    welch: bothTwo ? welchTTest(a, b, confidenceLevel) : null,
    mannWhitney: bothOne ? mannWhitneyU(a, b, options.mannWhitney) : null,
    effectSize: bothTwo ? cohensD(a, b) : null,
    welchPValueHolm: null,
    note: notes.length ? notes.join('; ') : null,
  };
}

/**
 * Every pair of groups (i < j, in the given order) compared with compareGroups, with the Welch
 * p-values Holm-adjusted across the table, since many pairs tested at once find chance differences.
 * Source: compareGroups; S. Holm, Scand. J. Stat. 6, 65–70 (1979).
 * @example compareGroupPairs([aGold, aGraphite, bGold]).length // 3
 */
export function compareGroupPairs(groups: readonly GroupValues[], options: CompareGroupsOptions = {}): GroupComparison[] {
  if (!Array.isArray(groups)) throw new TypeError(`compareGroupPairs: groups must be an array of GroupValues, got ${describeValue(groups)}`);
  const rows: GroupComparison[] = [];
  for (let i = 0; i < groups.length; i++) {
    for (let j = i + 1; j < groups.length; j++) rows.push(compareGroups(groups[i], groups[j], options));
  }
  const tested = rows.map((row, index) => ({ index, p: row.welch?.pValue })).filter((entry): entry is { index: number; p: number } => entry.p !== undefined);
  const adjusted = holmAdjust(tested.map((entry) => entry.p));
  const holmByRow = new Map<number, number>();
  tested.forEach((entry, k) => holmByRow.set(entry.index, adjusted[k]));
  return rows.map((row, index) => ({ ...row, welchPValueHolm: holmByRow.get(index) ?? null }));
}
