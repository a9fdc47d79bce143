import type { CurveInput } from './analyzeCurve.ts';
import { metadataEntry, runOf } from './analyzeCurve.ts';

/** An approach curve and a spectrum taken at the same site, and how they were matched. */
export interface SitePair {
  approach: number;
  spectrum: number;
  by: 'site' | 'position' | 'file';
}

/** Two curves closer than this laterally count as one site (m). */
const SAME_POSITION_M = 0.5e-9;

/**
 * Pair approach curves with spectra taken at the same site, within one run: by a `site` metadata
 * entry (same text), else by lateral position (within 0.5 nm), else by file (a file holding exactly
 * one curve of each kind). Each curve is used once; the first match in file order wins.
 * @example pairSites(curves) // [{ approach: 3, spectrum: 7, by: 'site' }]
 */
export function pairSites(curves: readonly CurveInput[]): SitePair[] {
  const pairs: SitePair[] = [];
  const used = new Set<number>();
  const site = (c: CurveInput) => metadataEntry(c, 'site')?.raw?.trim() || '';
  const approaches = curves.map((c, i) => i).filter((i) => curves[i].kind === 'iz' && curves[i].segment !== 'retract');
  const spectra = curves.map((c, i) => i).filter((i) => curves[i].kind === 'iv');
  const rules: [SitePair['by'], (a: CurveInput, s: CurveInput) => boolean][] = [
    ['site', (a, s) => site(a) !== '' && site(a) === site(s)],
    ['position', (a, s) => !!a.position && !!s.position && Math.hypot(a.position.xM - s.position.xM, a.position.yM - s.position.yM) <= SAME_POSITION_M],
    [
      'file',
      (a, s) =>
        a.fileName === s.fileName &&
        approaches.filter((i) => curves[i].fileName === a.fileName).length === 1 &&
        spectra.filter((i) => curves[i].fileName === s.fileName).length === 1,
    ],
  ];
  for (const [by, matches] of rules) {
    for (const a of approaches) {
      if (used.has(a)) continue;
      const s = spectra.find((j) => !used.has(j) && runOf(curves[j]) === runOf(curves[a]) && matches(curves[a], curves[j]));
      if (s === undefined) continue;
      used.add(a);
      used.add(s);
      pairs.push({ approach: a, spectrum: s, by });
    }
  }
  return pairs;
}
