import type { ResultColumn } from './exportResults.ts';
import type { CurveResult } from '../analysis/analyzeCurve.ts';

/**
 * The columns of the per-curve result table, shared by the CSV export, the CLI and the dashboard's
 * batch table: identifiers, then the fitted values each followed by its error, units in the header.
 */
export const RESULT_COLUMNS: readonly ResultColumn<CurveResult>[] = [
  { header: 'file', value: (r) => r.file },
  { header: 'curve', value: (r) => r.curve },
  { header: 'run', value: (r) => r.run },
  { header: 'kind', value: (r) => r.kind },
  { header: 'segment', value: (r) => r.segment },
  { header: 'model', value: (r) => r.model },
  { header: 'status', value: (r) => r.status },
  { header: 'apparent barrier (eV)', value: (r) => r.apparentBarrierEV },
  { header: 'apparent barrier err (eV)', value: (r) => r.apparentBarrierErrEV },
  { header: 'prefactor-corrected barrier (eV)', value: (r) => r.prefactorCorrectedBarrierEV },
  { header: 'decay constant (1/nm)', value: (r) => r.decayPerNm },
  { header: 'decay constant err (1/nm)', value: (r) => r.decayErrPerNm },
  { header: 'gap to contact (nm)', value: (r) => r.gapToContactNm },
  { header: 'gap to contact err (nm)', value: (r) => r.gapToContactErrNm },
  { header: 'phi1 tip (eV)', value: (r) => r.phi1EV },
  { header: 'phi1 err (eV)', value: (r) => r.phi1ErrEV },
  { header: 'phi2 sample (eV)', value: (r) => r.phi2EV },
  { header: 'phi2 err (eV)', value: (r) => r.phi2ErrEV },
  { header: 'mean barrier (eV)', value: (r) => r.meanBarrierEV },
  { header: 'mean barrier err (eV)', value: (r) => r.meanBarrierErrEV },
  { header: 'asymmetry phi2-phi1 (eV)', value: (r) => r.asymmetryEV },
  { header: 'asymmetry err (eV)', value: (r) => r.asymmetryErrEV },
  { header: 'width (nm)', value: (r) => r.widthNm },
  { header: 'width err (nm)', value: (r) => r.widthErrNm },
  { header: 'area (nm2)', value: (r) => r.areaNm2 },
  { header: 'area err (nm2)', value: (r) => r.areaErrNm2 },
  { header: 'R2', value: (r) => r.quality.r2 },
  { header: 'reduced chi2', value: (r) => r.quality.reducedChi2 },
  { header: 'Durbin-Watson', value: (r) => r.quality.durbinWatson },
  { header: 'points used', value: (r) => r.quality.pointsUsed },
  { header: 'points', value: (r) => r.quality.points },
  { header: 'x (nm)', value: (r) => r.position?.xNm ?? null },
  { header: 'y (nm)', value: (r) => r.position?.yNm ?? null },
  { header: 'joint mean barrier (eV)', value: (r) => r.joint?.meanBarrierEV ?? null },
  { header: 'joint mean barrier err (eV)', value: (r) => r.joint?.meanBarrierErrEV ?? null },
  { header: 'joint phi1 (eV)', value: (r) => r.joint?.phi1EV ?? null },
  { header: 'joint phi2 (eV)', value: (r) => r.joint?.phi2EV ?? null },
  { header: 'joint width (nm)', value: (r) => r.joint?.widthNm ?? null },
  { header: 'flags', value: (r) => r.flags.map((f) => f.code).join(' ') },
  { header: 'flag reasons', value: (r) => r.flags.map((f) => `${f.code}: ${f.reason}`).join(' | ') },
];
