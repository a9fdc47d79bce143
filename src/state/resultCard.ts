/**
 * The result card's rows from a CurveResult: each fitted parameter with its error and unit, the
 * correlations between parameters (|r| ≥ 0.1, largest first, as fit/report.ts prints them), and
 * the quality figures. Pure.
 */
import type { CurveResult } from '../analysis/index.ts';
import { formatRelative, formatValue, formatWithError } from './format.ts';

/** One parameter row. */
export interface ParameterRow {
  name: string;
  symbol: string;
  value: string;
  unit: string;
  relative: string;
}

function row(name: string, symbol: string, value: number | null, error: number | null, unit: string): ParameterRow {
  return { name, symbol, value: formatWithError(value, error), unit, relative: formatRelative(value, error) };
}

/**
 * The fitted parameters of a result (those that apply to its kind).
 * @example parameterRows(izResult)[0].name // 'apparent barrier'
 */
export function parameterRows(result: CurveResult): ParameterRow[] {
  if (result.kind === 'iz') {
    return [
      row('apparent barrier', 'φ_ap', result.apparentBarrierEV, result.apparentBarrierErrEV, 'eV'),
      row('prefactor-corrected', 'φ_pc', result.prefactorCorrectedBarrierEV, null, 'eV'),
      row('decay constant', 'κ', result.decayPerNm, result.decayErrPerNm, 'nm⁻¹'),
      row('gap to contact', 'z − z_c', result.gapToContactNm, result.gapToContactErrNm, 'nm'),
      row('slope d ln I/dz', 'b', result.line?.slopePerNm ?? null, result.line?.slopeErrPerNm ?? null, 'nm⁻¹'),
      row('intercept ln I(0)', 'a', result.line?.interceptLn ?? null, result.line?.interceptErrLn ?? null, 'ln A'),
    ];
  }
  return [
    row('tip barrier', 'φ1', result.phi1EV, result.phi1ErrEV, 'eV'),
    row('sample barrier', 'φ2', result.phi2EV, result.phi2ErrEV, 'eV'),
    row('mean barrier', 'φ̄', result.meanBarrierEV, result.meanBarrierErrEV, 'eV'),
    row('asymmetry φ2 − φ1', 'Δφ', result.asymmetryEV, result.asymmetryErrEV, 'eV'),
    row('barrier width', 'd', result.widthNm, result.widthErrNm, 'nm'),
    row('effective area', 'A', result.areaNm2, result.areaErrNm2, 'nm²'),
  ];
}

/** A correlation between two parameters. */
export interface CorrelationPair {
  a: string;
  b: string;
  r: number;
  text: string;
}

/** Short names for the fit's internal parameter names (the fit works on logarithms of most). */
const PARAMETER_SYMBOLS: Readonly<Record<string, string>> = {
  tipWorkFunctionEV: 'φ1',
  sampleWorkFunctionEV: 'φ2',
  meanBarrierEV: 'φ̄',
  asymmetryEV: 'Δφ',
  widthM: 'd',
  widthPerSqrtBarrier: 'd/√φ̄',
  areaM2: 'A',
  zeroBiasConductanceS: 'G(0)',
};

/**
 * A fit parameter name as the card shows it: 'ln widthM' → 'ln d'.
 * @example parameterSymbol('ln tipWorkFunctionEV') // 'ln φ1'
 */
export function parameterSymbol(name: string): string {
  const [head, tail] = name.startsWith('ln ') ? ['ln ', name.slice(3)] : ['', name];
  return head + (PARAMETER_SYMBOLS[tail] ?? tail);
}

/**
 * Correlations with |r| ≥ 0.1, largest first. I(V): the fit's matrix. I(z): intercept and slope,
 * r = cov(a, b)/(σ_a σ_b).
 * @example correlationPairs(izResult)[0].text // 'a–b: −0.87'
 */
export function correlationPairs(result: CurveResult): CorrelationPair[] {
  const pairs: CorrelationPair[] = [];
  if (result.kind === 'iz' && result.line) {
    const { covariancePerNm, interceptErrLn, slopeErrPerNm } = result.line;
    const r = covariancePerNm / (interceptErrLn * slopeErrPerNm);
    if (Number.isFinite(r)) pairs.push({ a: 'a', b: 'b', r, text: '' });
  }
  if (result.kind === 'iv' && result.spectrum) {
    const { correlationNames: names, correlation } = result.spectrum;
    for (let i = 0; i < names.length; i++) {
      for (let j = i + 1; j < names.length; j++) {
        const r = correlation[i * names.length + j];
        if (r !== null && Number.isFinite(r)) pairs.push({ a: parameterSymbol(names[i]), b: parameterSymbol(names[j]), r, text: '' });
      }
    }
  }
  return pairs
    .filter((p) => Math.abs(p.r) >= 0.1)
    .sort((x, y) => Math.abs(y.r) - Math.abs(x.r))
    .map((p) => ({ ...p, text: `${p.a}–${p.b}: ${p.r < 0 ? '−' : ''}${Math.abs(p.r).toFixed(3)}` }));
}

/**
 * Quality figures as label/value pairs; `curvePoints` is the length of the curve itself.
 * @example qualityRows(result, 96).at(-1) // { label: 'points used', value: '64 of 96' }
 */
export function qualityRows(result: CurveResult, curvePoints = result.quality.points): { label: string; value: string }[] {
  const q = result.quality;
  return [
    { label: 'R²', value: formatValue(q.r2, 4) },
    { label: 'reduced χ²', value: formatValue(q.reducedChi2, 3) },
    { label: 'Durbin–Watson', value: formatValue(q.durbinWatson, 3) },
    { label: 'RMS residual', value: formatValue(q.rmsResidual, 3) },
    { label: 'points used', value: `${q.pointsUsed} of ${Math.max(curvePoints, q.points)}` },
  ];
}
