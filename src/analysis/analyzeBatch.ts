import type { CurveResult } from './analyzeCurve.ts';
import { compareApproachRetract } from './compareApproachRetract.ts';
import { flagsForFit, type BatchOutlierForCurve } from './flagsForFit.ts';
import { detectBatchOutliers } from './robustZScores.ts';

/**
 * The flags that need more than one curve, added after every curve is fitted:
 * - hysteresis: the approach and retract segments of one curve (same file and index) compared by
 *   their ln I slopes (compareApproachRetract);
 * - batch-outlier: within each run and kind, the apparent barrier (I(z)) or mean barrier (I(V))
 *   by robust modified z-score, with each curve's own error bar (detectBatchOutliers). Grid curves
 *   (those with an x/y position) are left out: across a map, variation is the signal.
 * Returns new records; the input is not changed. Only curves that fitted take part.
 * @example finishBatch(results).filter((r) => r.flags.some((f) => f.code === 'batch-outlier'))
 */
export function finishBatch(results: readonly CurveResult[]): CurveResult[] {
  const extra = results.map(() => [] as CurveResult['flags']);
  // Hysteresis.
  const pairs = new Map<string, { approach?: number; retract?: number }>();
  results.forEach((result, i) => {
    if (result.kind !== 'iz' || result.status !== 'ok' || result.segment === 'single') return;
    const key = `${result.file}#${result.index}`;
    const pair = pairs.get(key) ?? {};
    pair[result.segment] = i;
    pairs.set(key, pair);
  });
  for (const { approach, retract } of pairs.values()) {
    if (approach === undefined || retract === undefined) continue;
    const a = results[approach].line;
    const r = results[retract].line;
    if (!a || !r || !(a.slopeErrPerNm > 0) || !(r.slopeErrPerNm > 0)) continue;
    const hysteresis = compareApproachRetract({
      approach: { slopePerNm: a.slopePerNm, slopeErrorPerNm: a.slopeErrPerNm },
      retract: { slopePerNm: r.slopePerNm, slopeErrorPerNm: r.slopeErrPerNm },
    });
    if (!hysteresis) continue;
    for (const i of [approach, retract]) extra[i].push(...flagsForFit({ kind: 'iz', converged: true, statusMessage: '', hysteresis }));
  }
  // Batch outliers, per run and kind.
  const groups = new Map<string, number[]>();
  results.forEach((result, i) => {
    // Grid curves (with a position) map spatial variation on purpose: they are not compared as repeats.
    if (result.status !== 'ok' || result.position !== null) return;
    const value = result.kind === 'iz' ? result.apparentBarrierEV : result.meanBarrierEV;
    if (value === null) return;
    const key = `${result.run}\u0000${result.kind}`;
    groups.set(key, [...(groups.get(key) ?? []), i]);
  });
  for (const members of groups.values()) {
    if (members.length < 3) continue;
    const kind = results[members[0]].kind;
    const values = members.map((i) => (kind === 'iz' ? results[i].apparentBarrierEV : results[i].meanBarrierEV) as number);
    const errors = members.map((i) => (kind === 'iz' ? results[i].apparentBarrierErrEV : results[i].meanBarrierErrEV) ?? Number.NaN);
    const finding = detectBatchOutliers(values, errors.every(Number.isFinite) ? errors : undefined);
    if (!finding) continue;
    for (const k of finding.outlierIndices) {
      const outlier: BatchOutlierForCurve = {
        quantity: kind === 'iz' ? 'apparent barrier' : 'mean barrier',
        unit: 'eV',
        value: values[k],
        modifiedZScore: finding.scores[k],
        batchMedian: finding.median,
      };
      extra[members[k]].push(...flagsForFit({ kind, converged: true, statusMessage: '', batchOutliers: [outlier] }));
    }
  }
  return results.map((result, i) => (extra[i].length ? { ...result, flags: [...result.flags, ...extra[i]] } : result));
}
