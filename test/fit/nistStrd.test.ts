/**
 * The solver against the NIST StRD nonlinear regression problems (22 data sets in
 * shared/reference-data/nist-strd/, beside the repository). Each model is built from models.json's
 * `formula` by a small parser below, which also differentiates it exactly (forward-mode dual
 * numbers), so the "exact" runs use an analytic Jacobian; the "central" runs use the solver's own
 * central differences. Scores are log relative errors (LRE, digits) against the certified values
 * in each .dat header. A digit table for every set is printed at the end.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { levenbergMarquardt, type JacobianMethod, type LeastSquaresProblem, type SolverResult } from '../../src/fit/index.ts';
import { logRelativeError } from '../helpers.ts';

// shared/ sits beside the repository root: <repo>/../shared/reference-data/nist-strd/
const NIST_FOLDER = new URL('../../../shared/reference-data/nist-strd/', import.meta.url);

// ---------------------------------------------------------------------------------------------
// A parser for models.json formulas: numbers, names, + − * / **, unary minus, parentheses and the
// one-argument functions exp, log, sqrt, sin, cos, atan; `pi` is π. Precedence as in Python:
// ** binds tighter than unary minus, which binds tighter than * and /.

type FormulaNode =
  | { kind: 'number'; value: number }
  | { kind: 'name'; name: string }
  | { kind: 'negate'; argument: FormulaNode }
  | { kind: 'binary'; operator: '+' | '-' | '*' | '/' | '**'; left: FormulaNode; right: FormulaNode }
  | { kind: 'call'; callee: string; argument: FormulaNode };

function parseFormula(text: string): FormulaNode {
  const tokens = text.match(/\*\*|\d*\.?\d+(?:[eE][+-]?\d+)?|[A-Za-z_]\w*|[-+*/()]/g) ?? [];
  if (tokens.join('') !== text.replace(/\s+/g, '')) throw new Error(`parseFormula: unexpected character in ${text}`);
  let position = 0;
  const peek = (): string | undefined => tokens[position];
  const take = (expected?: string): string => {
    const token = tokens[position++];
    if (token === undefined || (expected !== undefined && token !== expected)) {
      throw new Error(`parseFormula: expected ${expected ?? 'a token'}, got ${token} in ${text}`);
    }
    return token;
  };
  const sum = (): FormulaNode => {
    let left = product();
    while (peek() === '+' || peek() === '-') {
      const operator = take() as '+' | '-';
      left = { kind: 'binary', operator, left, right: product() };
    }
    return left;
  };
  const product = (): FormulaNode => {
    let left = unary();
    while (peek() === '*' || peek() === '/') {
      const operator = take() as '*' | '/';
      left = { kind: 'binary', operator, left, right: unary() };
    }
    return left;
  };
  const unary = (): FormulaNode => {
    if (peek() === '-') {
      take();
      return { kind: 'negate', argument: unary() };
    }
    if (peek() === '+') {
      take();
      return unary();
    }
    return power();
  };
  const power = (): FormulaNode => {
    const base = primary();
    if (peek() === '**') {
      take();
      return { kind: 'binary', operator: '**', left: base, right: unary() };
    }
    return base;
  };
  const primary = (): FormulaNode => {
    const token = take();
    if (token === '(') {
      const inner = sum();
      take(')');
      return inner;
    }
    if (/^[\d.]/.test(token)) return { kind: 'number', value: Number(token) };
    if (/^[A-Za-z_]/.test(token)) {
      if (peek() === '(') {
        take('(');
        const argument = sum();
        take(')');
        return { kind: 'call', callee: token, argument };
      }
      return { kind: 'name', name: token };
    }
    throw new Error(`parseFormula: unexpected ${token} in ${text}`);
  };
  const tree = sum();
  if (position !== tokens.length) throw new Error(`parseFormula: unexpected ${tokens[position]} in ${text}`);
  return tree;
}

/** A value with its gradient with respect to the parameters (null: does not depend on them). */
interface Dual {
  value: number;
  gradient: Float64Array | null;
}

interface Scope {
  /** Parameter values by index. */
  params: ArrayLike<number>;
  /** Parameter name → index. */
  paramIndex: ReadonlyMap<string, number>;
  /** Data values by column name. */
  data: ReadonlyMap<string, number>;
}

/** into += factor · gradient (allocating into when absent). */
function addScaled(into: Float64Array | null, gradient: Float64Array | null, factor: number, size: number): Float64Array | null {
  if (!gradient) return into;
  const out = into ?? new Float64Array(size);
  for (let j = 0; j < size; j++) out[j] += factor * gradient[j];
  return out;
}

/** Evaluate a formula and its exact gradient (forward-mode automatic differentiation). */
function evaluateDual(node: FormulaNode, scope: Scope): Dual {
  const size = scope.paramIndex.size;
  switch (node.kind) {
    case 'number':
      return { value: node.value, gradient: null };
    case 'name': {
      const index = scope.paramIndex.get(node.name);
      if (index !== undefined) {
        const gradient = new Float64Array(size);
        gradient[index] = 1;
        return { value: scope.params[index], gradient };
      }
      if (node.name === 'pi') return { value: Math.PI, gradient: null };
      const value = scope.data.get(node.name);
      if (value === undefined) throw new Error(`evaluateDual: unknown name ${node.name}`);
      return { value, gradient: null };
    }
    case 'negate': {
      const inner = evaluateDual(node.argument, scope);
      return { value: -inner.value, gradient: addScaled(null, inner.gradient, -1, size) };
    }
    case 'call': {
      const inner = evaluateDual(node.argument, scope);
      const u = inner.value;
      const [value, slope] =
        node.callee === 'exp' ? [Math.exp(u), Math.exp(u)]
        : node.callee === 'log' ? [Math.log(u), 1 / u]
        : node.callee === 'sqrt' ? [Math.sqrt(u), 0.5 / Math.sqrt(u)]
        : node.callee === 'sin' ? [Math.sin(u), Math.cos(u)]
        : node.callee === 'cos' ? [Math.cos(u), -Math.sin(u)]
        : node.callee === 'atan' ? [Math.atan(u), 1 / (1 + u * u)]
        : [NaN, NaN];
      if (Number.isNaN(slope) && !['exp', 'log', 'sqrt', 'sin', 'cos', 'atan'].includes(node.callee)) {
        throw new Error(`evaluateDual: unknown function ${node.callee}`);
      }
      return { value, gradient: addScaled(null, inner.gradient, slope, size) };
    }
    case 'binary': {
      const a = evaluateDual(node.left, scope);
      const b = evaluateDual(node.right, scope);
      switch (node.operator) {
        case '+':
          return { value: a.value + b.value, gradient: addScaled(addScaled(null, a.gradient, 1, size), b.gradient, 1, size) };
        case '-':
          return { value: a.value - b.value, gradient: addScaled(addScaled(null, a.gradient, 1, size), b.gradient, -1, size) };
        case '*':
          return {
            value: a.value * b.value,
            gradient: addScaled(addScaled(null, a.gradient, b.value, size), b.gradient, a.value, size),
          };
        case '/': {
          const value = a.value / b.value;
          return { value, gradient: addScaled(addScaled(null, a.gradient, 1 / b.value, size), b.gradient, -value / b.value, size) };
        }
        case '**': {
          const value = a.value ** b.value;
          // d(a^b) = b a^(b−1) da + a^b ln(a) db; the second term only when b depends on the parameters
          const viaBase = addScaled(null, a.gradient, b.value * a.value ** (b.value - 1), size);
          return { value, gradient: b.gradient ? addScaled(viaBase, b.gradient, value * Math.log(a.value), size) : viaBase };
        }
      }
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Loading the data sets.

interface ModelsEntry {
  name: string;
  file: string;
  sha256: string;
  difficulty: 'lower' | 'average' | 'higher';
  formula: string;
  response: string;
  parameters: string[];
  data_columns: string[];
  data_lines: [number, number];
}

interface NistDataset {
  name: string;
  difficulty: 'lower' | 'average' | 'higher';
  url: string;
  formula: string;
  response: string;
  parameterNames: string[];
  columns: string[];
  rows: number[][];
  starts: [number[], number[]];
  certifiedValues: number[];
  certifiedStdDev: number[];
  certifiedRss: number;
  recordedSha256: string;
  fileSha256: string;
}

function loadDatasets(): NistDataset[] {
  const models = JSON.parse(readFileSync(new URL('models.json', NIST_FOLDER), 'utf8')) as { datasets: ModelsEntry[] };
  return models.datasets.map((entry) => {
    const bytes = readFileSync(new URL(entry.file, NIST_FOLDER));
    const lines = bytes.toString('utf8').split(/\r?\n/);
    const rows: number[][] = [];
    for (let line = entry.data_lines[0]; line <= entry.data_lines[1]; line++) {
      rows.push(lines[line - 1].trim().split(/\s+/).map(Number));
    }
    // Header lines 41 … 40+p: "bK = start1 start2 certified_value certified_sd"
    const start1: number[] = [];
    const start2: number[] = [];
    const certifiedValues: number[] = [];
    const certifiedStdDev: number[] = [];
    for (let k = 0; k < entry.parameters.length; k++) {
      const match = lines[40 + k].match(/^\s*b\d+\s*=\s*(\S+)\s+(\S+)\s+(\S+)\s+(\S+)/);
      if (!match) throw new Error(`${entry.file}: cannot read parameter line ${41 + k}`);
      start1.push(Number(match[1]));
      start2.push(Number(match[2]));
      certifiedValues.push(Number(match[3]));
      certifiedStdDev.push(Number(match[4]));
    }
    const rssLine = lines.find((line) => line.startsWith('Residual Sum of Squares:'));
    if (!rssLine) throw new Error(`${entry.file}: no residual sum of squares line`);
    return {
      name: entry.name,
      difficulty: entry.difficulty,
      url: `https://www.itl.nist.gov/div898/strd/nls/data/${entry.name.toLowerCase()}.shtml`,
      formula: entry.formula,
      response: entry.response,
      parameterNames: entry.parameters,
      columns: entry.data_columns,
      rows,
      starts: [start1, start2],
      certifiedValues,
      certifiedStdDev,
      certifiedRss: Number(rssLine.split(':')[1]),
      recordedSha256: entry.sha256,
      fileSha256: createHash('sha256').update(bytes).digest('hex'),
    };
  });
}

/** Residuals response(data) − formula(data; b) and, if asked, their exact Jacobian. */
function nistProblem(set: NistDataset, analyticJacobian: boolean): LeastSquaresProblem {
  const model = parseFormula(set.formula);
  const response = parseFormula(set.response);
  const paramIndex = new Map(set.parameterNames.map((name, j) => [name, j] as const));
  const data = set.rows.map((row) => new Map(set.columns.map((column, k) => [column, row[k]] as const)));
  const noParams = new Map<string, number>();
  const observed = data.map((values) => evaluateDual(response, { params: [], paramIndex: noParams, data: values }).value);
  const p = set.parameterNames.length;
  return {
    nParams: p,
    nResiduals: set.rows.length,
    residuals(params, out) {
      for (let i = 0; i < data.length; i++) {
        out[i] = observed[i] - evaluateDual(model, { params, paramIndex, data: data[i] }).value;
      }
    },
    jacobian: analyticJacobian
      ? (params, out) => {
          for (let i = 0; i < data.length; i++) {
            const gradient = evaluateDual(model, { params, paramIndex, data: data[i] }).gradient;
            for (let j = 0; j < p; j++) out[i * p + j] = gradient ? -gradient[j] : 0;
          }
        }
      : undefined,
  };
}

interface Score {
  params: number;
  deviations: number;
  rss: number;
}

function score(set: NistDataset, result: SolverResult): Score {
  let params = 11;
  let deviations = 11;
  for (let j = 0; j < set.certifiedValues.length; j++) {
    params = Math.min(params, logRelativeError(result.params[j], set.certifiedValues[j]));
    deviations = Math.min(deviations, logRelativeError(result.stderr[j], set.certifiedStdDev[j]));
  }
  return { params, deviations, rss: logRelativeError(result.chiSquare, set.certifiedRss) };
}

// ---------------------------------------------------------------------------------------------

const datasets = loadDatasets();

type JacobianChoice = 'exact' | 'central';

/**
 * Digits required. "exact" is this project's target: ≥ 6 digits of parameters and standard
 * deviations from both starts on lower and average sets. "central" uses the suggested thresholds
 * of the reference-data README (its table "Suggested thresholds").
 */
const REQUIRED: Record<JacobianChoice, Record<NistDataset['difficulty'], Score>> = {
  exact: {
    lower: { params: 6, deviations: 6, rss: 6 },
    average: { params: 6, deviations: 6, rss: 6 },
    higher: { params: 4, deviations: 3, rss: 4 },
  },
  central: {
    lower: { params: 6, deviations: 4, rss: 6 },
    average: { params: 6, deviations: 4, rss: 6 },
    higher: { params: 4, deviations: 3, rss: 4 },
  },
};

/** Where a start may end in a reported failure instead of the certified values. */
function mayReportFailure(choice: JacobianChoice, difficulty: NistDataset['difficulty'], start: 1 | 2): boolean {
  if (start === 2) return false;
  return difficulty === 'higher' || (choice === 'central' && difficulty === 'average');
}

const FAILURE_STATUSES = ['singular', 'max-iterations', 'max-evaluations', 'non-finite'];

interface TableRow extends Score {
  name: string;
  difficulty: string;
  choice: JacobianChoice;
  start: 1 | 2;
  status: string;
}
const table: TableRow[] = [];

function fitNist(set: NistDataset, choice: JacobianChoice, start: 1 | 2): SolverResult {
  const method: JacobianMethod = 'central';
  return levenbergMarquardt(nistProblem(set, choice === 'exact'), set.starts[start - 1], {
    parameterNames: set.parameterNames,
    jacobianMethod: method,
  });
}

describe('NIST StRD reference files', () => {
  it('every data file matches the SHA-256 recorded in models.json', () => {
    expect(datasets).toHaveLength(22);
    for (const set of datasets) {
      // shared/reference-data/nist-strd/models.json, sha256 recorded when the files were copied
      expect(set.fileSha256, set.name).toBe(set.recordedSha256);
    }
  });

  it('the parsed formulas reproduce the certified RSS at the certified values', () => {
    for (const set of datasets) {
      if (set.name === 'Lanczos1') continue; // README: its rounded certified values give RSS 4e-21, not 1.4e-25
      const problem = nistProblem(set, false);
      const residuals = new Float64Array(problem.nResiduals);
      problem.residuals(Float64Array.from(set.certifiedValues), residuals);
      let rss = 0;
      for (const value of residuals) rss += value * value;
      // NIST StRD certified RSS, file header (README "JavaScript check": ≥ 10.4 digits for all but Lanczos1)
      expect(logRelativeError(rss, set.certifiedRss), `${set.name} ${set.url}`).toBeGreaterThanOrEqual(9);
    }
  });

  it('the exact Jacobian agrees with central differences at Start 2', () => {
    for (const set of datasets) {
      const exact = nistProblem(set, true);
      const p = Float64Array.from(set.starts[1]);
      const m = exact.nResiduals;
      const n = exact.nParams;
      const analytic = new Float64Array(m * n);
      exact.jacobian!(p, analytic);
      const base = new Float64Array(m);
      const plus = new Float64Array(m);
      const minus = new Float64Array(m);
      exact.residuals(p, base);
      for (let j = 0; j < n; j++) {
        const h = 1e-6 * Math.abs(p[j]);
        const shifted = Float64Array.from(p);
        shifted[j] = p[j] + h;
        exact.residuals(shifted, plus);
        shifted[j] = p[j] - h;
        exact.residuals(shifted, minus);
        let scale = 0;
        let worst = 0;
        for (let i = 0; i < m; i++) {
          const numeric = (plus[i] - minus[i]) / (2 * h);
          scale = Math.max(scale, Math.abs(numeric));
          worst = Math.max(worst, Math.abs(numeric - analytic[i * n + j]));
        }
        // central differences are good to ~1e-8 relative to the column's size (common practice, no source)
        expect(worst, `${set.name} column ${set.parameterNames[j]}`).toBeLessThanOrEqual(1e-6 * scale);
      }
    }
  });
});

for (const choice of ['exact', 'central'] as const) {
  describe(`levenbergMarquardt with ${choice === 'exact' ? 'an exact' : 'a central-difference'} Jacobian on NIST StRD`, () => {
    for (const set of datasets) {
      for (const start of [1, 2] as const) {
        it(`${set.name} (${set.difficulty}) from Start ${start} reaches the certified values or reports failure`, () => {
          const result = fitNist(set, choice, start);
          const digits = score(set, result);
          table.push({ name: set.name, difficulty: set.difficulty, choice, start, status: result.status, ...digits });
          const required = REQUIRED[choice][set.difficulty];
          const context = `${set.name} Start ${start}: ${result.status} ${result.message} (${set.url})`;

          if (!result.converged) {
            // A failure must be allowed here and must say so; silent convergence elsewhere is checked below.
            expect(mayReportFailure(choice, set.difficulty, start), context).toBe(true);
            expect(FAILURE_STATUSES, context).toContain(result.status);
            expect(result.message, context).toMatch(/^(failed|not converged)/);
            return;
          }
          // NIST StRD certified parameter values of this data set (file header; page in `context`)
          expect(digits.params, context).toBeGreaterThanOrEqual(required.params);
          if (set.name === 'Lanczos1') return; // README: RSS and SD at rounding level in binary64, not scored
          // NIST StRD certified residual sum of squares (file header; page in `context`)
          expect(digits.rss, context).toBeGreaterThanOrEqual(required.rss);
          // NIST StRD certified standard deviations, √diag(s²(JᵀJ)⁻¹) (file header; page in `context`)
          expect(digits.deviations, context).toBeGreaterThanOrEqual(required.deviations);
          expect(result.uncertaintiesOk, context).toBe(true);
        });
      }
    }
  });
}

describe('levenbergMarquardt on the BoxBOD Start 1 trap', () => {
  const boxbod = datasets.find((set) => set.name === 'BoxBOD')!;
  const certified = boxbod.certifiedValues;

  for (const method of ['exact', 'forward', 'central', 'richardson'] as const) {
    it(`never calls a wrong point converged (${method} Jacobian)`, () => {
      const result = levenbergMarquardt(nistProblem(boxbod, method === 'exact'), boxbod.starts[0], {
        parameterNames: boxbod.parameterNames,
        jacobianMethod: method === 'exact' ? undefined : method,
      });
      const digits = Math.min(logRelativeError(result.params[0], certified[0]), logRelativeError(result.params[1], certified[1]));
      if (result.converged) {
        // NIST StRD BoxBOD, certified values (https://www.itl.nist.gov/div898/strd/nls/data/boxbod.shtml)
        expect(digits, result.message).toBeGreaterThanOrEqual(4);
      } else {
        expect(result.status).toBe('singular');
        expect(result.message).toContain('b2');
      }
    });
  }

  it('reports the MINPACK stall point (b1 = 172.5, b2 = 88) as singular, naming b2', () => {
    // reference-data README: scipy's MINPACK LM stops at b1 = 172.5, b2 ≈ 88, RSS 9771.5 and reports success
    const result = levenbergMarquardt(nistProblem(boxbod, true), [172.5, 88], { parameterNames: boxbod.parameterNames });
    expect(result.converged).toBe(false);
    expect(result.status).toBe('singular');
    expect(result.message).toMatch(/^failed: Jacobian is singular.*b2 has no measurable effect/);
    expect(result.uncertaintiesOk).toBe(false);
    expect(result.uncertaintyNote).toContain('b2');
  });
});

afterAll(() => {
  if (table.length === 0) return;
  const cell = (row: TableRow | undefined): string =>
    row ? `${row.params.toFixed(1).padStart(4)} ${row.deviations.toFixed(1).padStart(4)} ${row.rss.toFixed(1).padStart(4)} ${row.status.padEnd(15)}` : ''.padEnd(31);
  const lines = [
    'NIST StRD digits (LRE: worst parameter, worst standard deviation, RSS; then status)',
    `${''.padEnd(18)}${'exact Jacobian'.padEnd(66)}central differences`,
    `${'data set'.padEnd(9)}${'level'.padEnd(9)}${'Start 1'.padEnd(33)}${'Start 2'.padEnd(33)}${'Start 1'.padEnd(33)}Start 2`,
  ];
  for (const set of datasets) {
    const find = (choice: JacobianChoice, start: 1 | 2) => table.find((row) => row.name === set.name && row.choice === choice && row.start === start);
    lines.push(
      `${set.name.padEnd(9)}${set.difficulty.padEnd(9)}${cell(find('exact', 1))}  ${cell(find('exact', 2))}  ${cell(find('central', 1))}  ${cell(find('central', 2))}`,
    );
  }
  console.log(lines.join('\n'));
});
