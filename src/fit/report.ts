/**
 * Plain-text fit report in three blocks, shared by the CLI and the dashboard:
 * statistics; parameters (value ± stderr, relative %, start value, or "fixed"); correlations with
 * |r| ≥ 0.1, largest first. Layout after lmfit's fit_report (M. Newville et al.; from memory).
 */
import type { FitModelResult } from './fitModel.ts';

/** The fields of a fit result that the report reads (a FitModelResult has them all). */
export type ReportableFit = Pick<
  FitModelResult,
  | 'parameters'
  | 'freeNames'
  | 'status'
  | 'message'
  | 'converged'
  | 'nPoints'
  | 'nFree'
  | 'nEvaluations'
  | 'nJacobianEvaluations'
  | 'iterations'
  | 'chiSquare'
  | 'reducedChiSquare'
  | 'aic'
  | 'bic'
  | 'uncertaintiesOk'
  | 'uncertaintyNote'
  | 'loss'
  | 'lossScale'
>;

/** The three report blocks, and all three joined by blank lines in `text`. */
export interface FitReport {
  statistics: string;
  parameters: string;
  correlations: string;
  text: string;
}

/** Options of {@link formatFitReport}. */
export interface FitReportOptions {
  /** Significant digits for values; default 6. */
  digits?: number;
  /** Smallest |r| listed among the correlations; default 0.1. */
  minCorrelation?: number;
}

const INDENT = '    ';

/**
 * A number for a report: `digits` significant digits, exponent form for |x| < 1e-3 or ≥ 1e6,
 * "n/a" for NaN, "inf"/"-inf" for infinities.
 * Source: none needed (formatting).
 * @example formatReportNumber(0.000123456, 3) // "1.23e-4"
 */
export function formatReportNumber(value: number, digits = 6): string {
  if (Number.isNaN(value)) return 'n/a';
  if (value === Infinity) return 'inf';
  if (value === -Infinity) return '-inf';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude < 1e-3 || magnitude >= 1e6) {
    return value.toExponential(Math.max(0, digits - 1)).replace(/\.?0+e/, 'e').replace('e+', 'e');
  }
  const text = value.toPrecision(digits);
  return text.includes('.') ? text.replace(/\.?0+$/, '') : text;
}

/**
 * Format a fit as three text blocks.
 *   statistics:   status, message, points, varying parameters, degrees of freedom, evaluations,
 *                 χ², reduced χ², AIC, BIC, and whether uncertainties are available (with the reason)
 *   parameters:   name = value ± stderr (stderr/|value| in %), start value; "fixed" for held ones;
 *                 "at lower/upper bound" when a fit ended on its box
 *   correlations: C(a, b) = r for |r| ≥ minCorrelation, largest |r| first
 * Source: layout after lmfit's fit_report (from memory).
 * @example formatFitReport(fitModel({ ... })).parameters
 * // "[[Parameters]]\n    amplitude  = 2.00012 ± 0.00123 (0.06 %)  start 2.1\n ..."
 */
export function formatFitReport(fit: ReportableFit, options: FitReportOptions = {}): FitReport {
  const digits = options.digits ?? 6;
  const minCorrelation = options.minCorrelation ?? 0.1;
  if (!Number.isInteger(digits) || digits < 1 || digits > 17) {
    throw new RangeError(`formatFitReport: digits must be an integer in [1, 17], got ${digits}`);
  }
  if (!(minCorrelation >= 0 && minCorrelation <= 1)) {
    throw new RangeError(`formatFitReport: minCorrelation must be in [0, 1], got ${minCorrelation}`);
  }
  const number = (value: number): string => formatReportNumber(value, digits);

  const rows: Array<[string, string]> = [
    ['status', fit.status],
    ['message', fit.message],
    ['data points', String(fit.nPoints)],
    ['varying parameters', String(fit.nFree)],
    ['degrees of freedom', String(fit.nPoints - fit.nFree)],
    ['function evaluations', String(fit.nEvaluations)],
    ['Jacobian evaluations', String(fit.nJacobianEvaluations)],
    ['iterations', String(fit.iterations)],
    ['chi-square', number(fit.chiSquare)],
    ['reduced chi-square', number(fit.reducedChiSquare)],
    ['Akaike info crit', number(fit.aic)],
    ['Bayesian info crit', number(fit.bic)],
  ];
  if (fit.loss !== 'linear') rows.push(['loss', `${fit.loss}, scale ${number(fit.lossScale)}`]);
  rows.push(['uncertainties', fit.uncertaintiesOk ? 'ok' : `not reliable: ${fit.uncertaintyNote}`]);
  const labelWidth = Math.max(...rows.map(([label]) => label.length));
  const statistics = ['[[Fit statistics]]', ...rows.map(([label, value]) => `${INDENT}${label.padEnd(labelWidth)}  ${value}`)].join('\n');

  const nameWidth = Math.max(...fit.parameters.map((parameter) => parameter.name.length));
  const parameterLines = ['[[Parameters]]'];
  for (const parameter of fit.parameters) {
    const head = `${INDENT}${parameter.name.padEnd(nameWidth)} = ${number(parameter.value)}`;
    if (!parameter.vary) {
      parameterLines.push(`${head} (fixed)`);
      continue;
    }
    let line = `${head} ± ${number(parameter.stderr)}`;
    if (Number.isFinite(parameter.stderr) && parameter.value !== 0) {
      line += ` (${formatReportNumber((100 * parameter.stderr) / Math.abs(parameter.value), 3)} %)`;
    }
    if (parameter.atBound) line += `  at ${parameter.atBound} bound`;
    line += `  start ${number(parameter.initValue)}`;
    parameterLines.push(line);
  }
  const parameters = parameterLines.join('\n');

  const pairs: Array<{ first: string; second: string; r: number }> = [];
  const names = fit.freeNames;
  for (let a = 0; a < names.length; a++) {
    const parameter = fit.parameters.find((candidate) => candidate.name === names[a]);
    if (!parameter) continue;
    for (let b = a + 1; b < names.length; b++) {
      const r = parameter.correlations[names[b]];
      if (Number.isFinite(r) && Math.abs(r) >= minCorrelation) pairs.push({ first: names[a], second: names[b], r });
    }
  }
  pairs.sort((x, y) => Math.abs(y.r) - Math.abs(x.r));
  const correlationLines = [`[[Correlations]] (|r| ≥ ${minCorrelation}, largest first)`];
  if (pairs.length === 0) correlationLines.push(`${INDENT}none`);
  const pairWidth = Math.max(0, ...pairs.map(({ first, second }) => first.length + second.length + 5));
  for (const { first, second, r } of pairs) {
    const label = `C(${first}, ${second})`.padEnd(pairWidth);
    correlationLines.push(`${INDENT}${label} = ${r >= 0 ? '+' : ''}${r.toFixed(4)}`);
  }
  const correlations = correlationLines.join('\n');

  return { statistics, parameters, correlations, text: [statistics, parameters, correlations].join('\n\n') };
}
