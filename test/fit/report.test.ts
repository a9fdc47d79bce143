import { describe, expect, it } from 'vitest';
import { fitModel, formatFitReport, formatReportNumber, gaussian, makeParameters, mulberry32 } from '../../src/fit/index.ts';

function exampleFit(extra: { maxDecay?: number } = {}) {
  const rng = mulberry32(3);
  const n = 40;
  const x = Float64Array.from({ length: n }, (_, i) => i / 8);
  const measured = Float64Array.from(x, (xi) => 4 * Math.exp(-1.5 * xi) + 0.2 + 0.01 * gaussian(rng));
  return fitModel({
    parameters: makeParameters([
      { name: 'amplitude', value: 2, min: 0 },
      { name: 'decayPerNm', value: 1, min: 0, max: extra.maxDecay ?? Infinity },
      { name: 'offset', value: 0.1 },
      { name: 'tilt', value: 0, vary: false },
    ]),
    nPoints: n,
    measured,
    evaluate(p, out) {
      for (let i = 0; i < n; i++) out[i] = p[0] * Math.exp(-p[1] * x[i]) + p[2] + p[3] * x[i];
    },
  });
}

describe('formatFitReport', () => {
  it('formatFitReport prints statistics, parameters and correlations blocks', () => {
    const fit = exampleFit();
    const report = formatFitReport(fit);
    expect(report.text).toBe([report.statistics, report.parameters, report.correlations].join('\n\n'));

    expect(report.statistics.split('\n')[0]).toBe('[[Fit statistics]]');
    expect(report.statistics).toMatch(/status\s+converged-/);
    expect(report.statistics).toMatch(/data points\s+40\n/);
    expect(report.statistics).toMatch(/varying parameters\s+3\n/);
    expect(report.statistics).toMatch(/degrees of freedom\s+37\n/);
    expect(report.statistics).toContain(`chi-square            ${formatReportNumber(fit.chiSquare)}`);
    expect(report.statistics).toMatch(/uncertainties\s+ok$/);

    const lines = report.parameters.split('\n');
    expect(lines[0]).toBe('[[Parameters]]');
    const amplitude = fit.parameters[0];
    const relative = formatReportNumber((100 * amplitude.stderr) / amplitude.value, 3);
    expect(lines[1]).toBe(
      `    amplitude  = ${formatReportNumber(amplitude.value)} ± ${formatReportNumber(amplitude.stderr)} (${relative} %)  start 2`,
    );
    expect(lines[4]).toBe('    tilt       = 0 (fixed)');

    const correlationLines = report.correlations.split('\n');
    expect(correlationLines[0]).toBe('[[Correlations]] (|r| ≥ 0.1, largest first)');
    const values = correlationLines.slice(1).map((line) => Number(line.split('=')[1]));
    expect(values.length).toBeGreaterThan(0);
    for (let k = 1; k < values.length; k++) expect(Math.abs(values[k])).toBeLessThanOrEqual(Math.abs(values[k - 1]));
    for (const value of values) expect(Math.abs(value)).toBeGreaterThanOrEqual(0.1);
    const r = fit.parameters[1].correlations.offset;
    expect(report.correlations).toContain(`C(decayPerNm, offset)    = ${r >= 0 ? '+' : ''}${r.toFixed(4)}`);
  });

  it('formatFitReport marks a parameter on its bound and explains missing uncertainties', () => {
    const report = formatFitReport(exampleFit({ maxDecay: 1.2 }));
    expect(report.parameters).toMatch(/decayPerNm = 1\.2 ± n\/a {2}at upper bound {2}start 1/);
    expect(report.statistics).toContain('uncertainties         not reliable: decayPerNm at its upper bound 1.2');
    expect(report.statistics).toMatch(/status\s+stuck-at-bound/);
  });

  it('formatFitReport lists no correlations below the threshold', () => {
    const report = formatFitReport(exampleFit(), { minCorrelation: 0.99 });
    expect(report.correlations).toBe('[[Correlations]] (|r| ≥ 0.99, largest first)\n    none');
    expect(() => formatFitReport(exampleFit(), { digits: 0 })).toThrow('formatFitReport: digits must be an integer in [1, 17], got 0');
  });

  it('formatReportNumber rounds to significant digits and switches to exponents', () => {
    expect(formatReportNumber(0.000123456, 3)).toBe('1.23e-4');
    expect(formatReportNumber(1234567, 3)).toBe('1.23e6');
    expect(formatReportNumber(2.5)).toBe('2.5');
    expect(formatReportNumber(-0.125, 2)).toBe('-0.13');
    expect(formatReportNumber(NaN)).toBe('n/a');
    expect(formatReportNumber(-Infinity)).toBe('-inf');
  });
});
