/**
 * npm run demo-data: writes the demo scenario into sample-data/ through `burrow simulate`.
 * An invented laboratory compares two tips on two samples at room temperature: approach curves
 * I(z) and spectra I(V) at many sites, a small grid over a patchy region, and a handful of curves
 * spoiled the ways the quality flags describe. The true parameters of every curve go to
 * sample-data/truth.json so tests can check what the fits recover. Deterministic (fixed seeds).
 */
import { mkdirSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runCli } from '../src/cli/main.ts';
import { CONDUCTANCE_QUANTUM_S, apparentBarrierFromSlopeEV, mulberry32, gaussian } from '../src/physics/index.ts';

const out = join(dirname(fileURLToPath(import.meta.url)), '..', 'sample-data');

interface Tip { label: string; description: string; workFunctionEV: number; radiusNm: number }
interface Sample { label: string; description: string; workFunctionEV: number }
const tips: Tip[] = [
  { label: 'A', description: 'etched W wire', workFunctionEV: 4.55, radiusNm: 12 },
  { label: 'B', description: 'cut Pt-Ir wire', workFunctionEV: 5.25, radiusNm: 25 },
];
const samples: Sample[] = [
  { label: 'gold', description: 'Au(111) film on mica', workFunctionEV: 5.1 },
  { label: 'graphite', description: 'cleaved HOPG', workFunctionEV: 4.6 },
];
const TEMPERATURE_K = 300;
const APPROACH_BIAS_V = 0.1;
const SETPOINT_A = 1e-9;
const SPECTRUM_SETPOINT_A = 1e-9; // at the largest bias, +1 V
const FLOOR_A = 0.5e-12;

/** One in-process `burrow simulate --json` call. */
async function simulate(flags: Record<string, string | number>): Promise<{ biasV: number; gapNm: number; currentA: number }[]> {
  let text = '';
  const argv = ['simulate', '--json', ...Object.entries(flags).flatMap(([k, v]) => [`--${k}`, String(v)])];
  const code = await runCli(argv, { stdout: (t) => (text += t), stderr: (t) => process.stderr.write(t), stderrIsTTY: false, cwd: process.cwd() });
  if (code !== 0) throw new Error(`makeDemoData: burrow ${argv.join(' ')} exited ${code}`);
  return JSON.parse(text).points;
}

function junctionFlags(tip: Tip, sample: Sample) {
  return {
    'tip-work-function-ev': tip.workFunctionEV,
    'sample-work-function-ev': sample.workFunctionEV,
    'tip-radius-nm': tip.radiusNm,
    'temperature-k': TEMPERATURE_K,
  };
}

/** The gap (nm) at which the junction passes `targetA` at `biasV` (what the feedback loop does), by bisection. */
async function setpointGapNm(tip: Tip, sample: Sample, biasV: number, targetA: number): Promise<number> {
  let low = 0.2;
  let high = 2.0;
  for (let k = 0; k < 40; k++) {
    const middle = 0.5 * (low + high);
    const [point] = await simulate({ ...junctionFlags(tip, sample), kind: 'iz', 'bias-v': biasV, from: middle, to: middle, points: 1 });
    if (Math.abs(point.currentA) > targetA) low = middle;
    else high = middle;
  }
  return 0.5 * (low + high);
}

interface ApproachTruth {
  file: string;
  curve: number;
  segment?: 'approach' | 'retract';
  run: string;
  tipWorkFunctionEV: number;
  sampleWorkFunctionEV: number;
  /** φ_ap of the noise-free model over the points above the floor: what an I(z) fit should find. */
  apparentBarrierEV: number;
  spoiled: string | null;
}
interface SpectrumTruth {
  file: string;
  curve: number;
  run: string;
  tipWorkFunctionEV: number;
  sampleWorkFunctionEV: number;
  gapNm: number;
  spoiled: string | null;
}
const truth: { approach: ApproachTruth[]; spectra: SpectrumTruth[]; grid: unknown[]; sites: unknown[] } = { approach: [], spectra: [], grid: [], sites: [] };

/** Least-squares slope of ln I over points above 20× the floor, as φ_ap. */
function modelApparentBarrier(points: { gapNm: number; currentA: number }[]): number {
  const kept = points.filter((p) => p.currentA > 20 * FLOOR_A);
  const n = kept.length;
  const mx = kept.reduce((s, p) => s + p.gapNm, 0) / n;
  const my = kept.reduce((s, p) => s + Math.log(p.currentA), 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (const p of kept) {
    sxx += (p.gapNm - mx) ** 2;
    sxy += (p.gapNm - mx) * (Math.log(p.currentA) - my);
  }
  return apparentBarrierFromSlopeEV((sxy / sxx) * 1e9);
}

const metadataLines = (entries: [string, string][], comment = '#') => entries.map(([k, v]) => `${comment} ${k}: ${v}`);

/** Approach curves of one run: z = retract distance from the setpoint position (nm), current in pA. */
async function approachRun(tip: Tip, sample: Sample, count: number, seedBase: number): Promise<void> {
  const run = `${tip.label}-${sample.label}`;
  const file = `approach-${run}.csv`;
  const gap0 = await setpointGapNm(tip, sample, APPROACH_BIAS_V, SETPOINT_A);
  const rows: string[] = [];
  for (let c = 0; c < count; c++) {
    // Site-to-site variation of the local work function: ±0.03 eV.
    const rng = mulberry32(seedBase + c);
    const local = { ...tip };
    const localSample = { ...sample, workFunctionEV: sample.workFunctionEV + 0.03 * gaussian(rng) };
    const flags = { ...junctionFlags(local, localSample), kind: 'iz', 'bias-v': APPROACH_BIAS_V, from: gap0, to: gap0 + 0.25, points: 96 };
    const clean = await simulate(flags);
    const noisy = await simulate({ ...flags, 'noise-relative': 0.02, 'noise-floor-a': FLOOR_A, seed: seedBase + c });
    for (let i = 0; i < noisy.length; i++) rows.push(`${c + 1},${(noisy[i].gapNm - gap0).toFixed(5)},${(noisy[i].currentA * 1e12).toPrecision(6)}`);
    truth.approach.push({ file, curve: c, run, tipWorkFunctionEV: tip.workFunctionEV, sampleWorkFunctionEV: localSample.workFunctionEV, apparentBarrierEV: modelApparentBarrier(clean), spoiled: null });
  }
  const header = metadataLines([
    ['run', run],
    ['tip', `${tip.label} (${tip.description})`],
    ['sample', `${sample.label} (${sample.description})`],
    ['bias', `${APPROACH_BIAS_V} V`],
    ['setpoint current', `${SETPOINT_A * 1e9} nA`],
    ['temperature', `${TEMPERATURE_K} K`],
    ['note', 'z is the retract distance from the setpoint position'],
  ]);
  writeFileSync(join(out, file), [...header, 'curve,z (nm),current (pA)', ...rows].join('\n') + '\n');
}

/** Spectra of one run, wide layout: one bias column, one current column per site (tab separated, nA). */
async function spectrumRun(tip: Tip, sample: Sample, count: number, seedBase: number): Promise<void> {
  const run = `${tip.label}-${sample.label}`;
  const file = `spectra-${run}.tsv`;
  const gap = await setpointGapNm(tip, sample, 1, SPECTRUM_SETPOINT_A);
  const columns: { biasV: number; currentA: number }[][] = [];
  for (let c = 0; c < count; c++) {
    const points = await simulate({
      ...junctionFlags(tip, sample),
      kind: 'iv',
      'gap-nm': gap,
      from: -1,
      to: 1,
      points: 201,
      'noise-relative': 0.01,
      'noise-floor-a': 2e-12,
      seed: seedBase + c,
    });
    columns.push(points);
    truth.spectra.push({ file, curve: c, run, tipWorkFunctionEV: tip.workFunctionEV, sampleWorkFunctionEV: sample.workFunctionEV, gapNm: gap, spoiled: null });
  }
  const header = metadataLines([
    ['run', run],
    ['tip', `${tip.label} (${tip.description})`],
    ['sample', `${sample.label} (${sample.description})`],
    ['setpoint current', `${SPECTRUM_SETPOINT_A * 1e9} nA`],
    ['temperature', `${TEMPERATURE_K} K`],
  ]);
  const lines = [...header, ['bias (V)', ...columns.map((_, c) => `I site ${c + 1} (nA)`)].join('\t')];
  for (let i = 0; i < columns[0].length; i++) lines.push([columns[0][i].biasV.toFixed(4), ...columns.map((col) => (col[i].currentA * 1e9).toPrecision(6))].join('\t'));
  writeFileSync(join(out, file), lines.join('\n') + '\n');
}

/** A 6 × 6 grid of approach curves on tip B over gold with a lower-work-function patch in one corner. */
async function gridRun(): Promise<void> {
  const tip = tips[1];
  const sample = samples[0];
  const gap0 = await setpointGapNm(tip, sample, APPROACH_BIAS_V, SETPOINT_A);
  const rows: string[] = [];
  for (let ix = 0; ix < 6; ix++) {
    for (let iy = 0; iy < 6; iy++) {
      const patch = ix >= 3 && iy >= 3;
      const local = { ...sample, workFunctionEV: patch ? 4.6 : sample.workFunctionEV };
      const flags = { ...junctionFlags(tip, local), kind: 'iz', 'bias-v': APPROACH_BIAS_V, from: gap0, to: gap0 + 0.25, points: 48 };
      const clean = await simulate(flags);
      const noisy = await simulate({ ...flags, 'noise-relative': 0.02, 'noise-floor-a': FLOOR_A, seed: 500 + ix * 6 + iy });
      for (const p of noisy) rows.push(`${ix * 2},${iy * 2},${(p.gapNm - gap0).toFixed(5)},${(p.currentA * 1e12).toPrecision(6)}`);
      truth.grid.push({ xNm: ix * 2, yNm: iy * 2, sampleWorkFunctionEV: local.workFunctionEV, apparentBarrierEV: modelApparentBarrier(clean) });
    }
  }
  const header = metadataLines([
    ['run', 'B-gold-grid'],
    ['tip', `${tip.label} (${tip.description})`],
    ['sample', `${sample.label} (${sample.description}), patch of lower work function at x, y >= 6 nm`],
    ['bias', `${APPROACH_BIAS_V} V`],
    ['setpoint current', `${SETPOINT_A * 1e9} nA`],
  ]);
  writeFileSync(join(out, 'grid-B-gold.csv'), [...header, 'x (nm),y (nm),z (nm),current (pA)', ...rows].join('\n') + '\n');
}

type SimulatedPoint = { biasV: number; gapNm: number; currentA: number };
type Spoiler = (points: SimulatedPoint[], gap0: number) => SimulatedPoint[];

/** Spoiled approach curves, one file each, tip A over gold; the README lists what each should raise. */
async function spoiledCurves(): Promise<void> {
  const tip = tips[0];
  const sample = samples[0];
  const gap0 = await setpointGapNm(tip, sample, APPROACH_BIAS_V, SETPOINT_A);
  const base = { ...junctionFlags(tip, sample), kind: 'iz', 'bias-v': APPROACH_BIAS_V, 'noise-relative': 0.02, 'noise-floor-a': FLOOR_A };
  const cases: { name: string; code: string; from: number; to: number; seed: number; spoil?: Spoiler; second?: Record<string, number>; local?: Record<string, number> }[] = [
    // Preamp clipped at 0.5 nA: the closest points sit flat at the limit.
    { name: 'clipped', code: 'saturation', from: gap0 - 0.08, to: gap0 + 0.25, seed: 901, spoil: (p) => p.map((q) => ({ ...q, currentA: Math.min(q.currentA, 5e-10) })) },
    // Started far out: most of the sweep is in the 0.5 pA floor.
    { name: 'far-out', code: 'noise-floor', from: gap0 + 0.25, to: gap0 + 0.6, seed: 902 },
    // The tip changed half way: the current drops by ×3 from one point to the next.
    { name: 'tip-jump', code: 'tip-change', from: gap0, to: gap0 + 0.3, seed: 903, spoil: (p) => p.map((q, i) => ({ ...q, currentA: i >= 40 ? q.currentA / 3 : q.currentA })) },
    // Driven into contact: the closest points jump to about one conductance quantum.
    {
      name: 'contact',
      code: 'point-contact',
      from: gap0 - 0.3,
      to: gap0 + 0.05,
      seed: 904,
      spoil: (p) => p.map((q, i) => ({ ...q, currentA: i < 6 ? 0.9 * CONDUCTANCE_QUANTUM_S * APPROACH_BIAS_V * (1 + 0.01 * i) : q.currentA })),
    },
    // An odd site: an adsorbate lowers the local work function to 4.2 eV; the curve itself is clean.
    { name: 'odd-site', code: 'batch-outlier', from: gap0, to: gap0 + 0.25, seed: 908, local: { 'sample-work-function-ev': 4.2 } },
    // A contaminated junction: a slow second channel (φ ≈ 0.6 eV) adds to the tunnel current, so ln I bends.
    { name: 'bent', code: 'non-exponential', from: gap0, to: gap0 + 0.35, seed: 905, second: { 'tip-work-function-ev': 0.6, 'sample-work-function-ev': 0.6, 'area-nm2': 0.003 } },
  ];
  for (const spoiled of cases) {
    const flags = { ...base, ...spoiled.local, from: spoiled.from, to: spoiled.to, points: 96, seed: spoiled.seed };
    let points = await simulate(flags);
    if (spoiled.second) {
      const { 'tip-radius-nm': _radius, ...withoutRadius } = flags;
      const extra = await simulate({ ...withoutRadius, ...spoiled.second, 'noise-relative': 0, 'noise-floor-a': 0 });
      points = points.map((p, i) => ({ ...p, currentA: p.currentA + extra[i].currentA }));
    }
    if (spoiled.spoil) points = spoiled.spoil(points, gap0);
    const file = `approach-A-gold-${spoiled.name}.csv`;
    const header = metadataLines([
      ['run', 'A-gold'],
      ['tip', `${tip.label} (${tip.description})`],
      ['sample', `${sample.label} (${sample.description})`],
      ['bias', `${APPROACH_BIAS_V} V`],
    ]);
    writeFileSync(join(out, file), [...header, 'z (nm),current (pA)', ...points.map((p) => `${(p.gapNm - gap0).toFixed(5)},${(p.currentA * 1e12).toPrecision(6)}`)].join('\n') + '\n');
    truth.approach.push({ file, curve: 0, run: 'A-gold', tipWorkFunctionEV: tip.workFunctionEV, sampleWorkFunctionEV: sample.workFunctionEV, apparentBarrierEV: Number.NaN, spoiled: spoiled.code });
  }
  // Approach and retract that disagree: the tip blunted between them (retract barrier 15 % lower),
  // written the European way: semicolon, decimal comma, pm and pA.
  const approach = await simulate({ ...base, from: gap0, to: gap0 + 0.3, points: 64, seed: 906 });
  const retract = await simulate({ ...base, 'sample-work-function-ev': 3.9, 'tip-work-function-ev': 3.9, from: gap0 + 0.3, to: gap0, points: 64, seed: 907 });
  const european = (value: number, digits: number) => value.toFixed(digits).replace('.', ',');
  const lines = [
    'Tip: A (etched W wire)',
    'Sample: gold (Au(111) film on mica)',
    'Run: A-gold',
    'Bias voltage = 0,1 V',
    '',
    'direction;z (pm);I (pA)',
    ...approach.map((p) => `approach;${european((p.gapNm - gap0) * 1000, 2)};${european(p.currentA * 1e12, 5)}`),
    ...retract.map((p) => `retract;${european((p.gapNm - gap0) * 1000, 2)};${european(p.currentA * 1e12, 5)}`),
  ];
  writeFileSync(join(out, 'approach-A-gold-blunted.txt'), lines.join('\n') + '\n');
  for (const segment of ['approach', 'retract'] as const) {
    truth.approach.push({ file: 'approach-A-gold-blunted.txt', curve: 0, segment, run: 'A-gold', tipWorkFunctionEV: tip.workFunctionEV, sampleWorkFunctionEV: sample.workFunctionEV, apparentBarrierEV: Number.NaN, spoiled: 'hysteresis' });
  }
}

/** One site where tip A over gold took both an approach curve and a spectrum (paired by `site`). */
async function sitePair(): Promise<void> {
  const tip = tips[0];
  const sample = samples[0];
  const spectrumGap = await setpointGapNm(tip, sample, 1, SPECTRUM_SETPOINT_A);
  const approachGap = await setpointGapNm(tip, sample, APPROACH_BIAS_V, SETPOINT_A);
  const header = (kind: string) =>
    metadataLines([
      ['run', 'A-gold'],
      ['site', 'S7'],
      ['tip', `${tip.label} (${tip.description})`],
      ['sample', `${sample.label} (${sample.description})`],
      ['note', `${kind} at site S7; the other curve of this site is in the companion file`],
    ]);
  const approach = await simulate({ ...junctionFlags(tip, sample), kind: 'iz', 'bias-v': APPROACH_BIAS_V, from: approachGap, to: approachGap + 0.25, points: 96, 'noise-relative': 0.02, 'noise-floor-a': FLOOR_A, seed: 950 });
  writeFileSync(
    join(out, 'site-S7-A-gold-approach.csv'),
    [...header('approach curve'), '# bias: 0.1 V', 'z (nm),current (pA)', ...approach.map((p) => `${(p.gapNm - approachGap).toFixed(5)},${(p.currentA * 1e12).toPrecision(6)}`)].join('\n') + '\n',
  );
  const spectrum = await simulate({ ...junctionFlags(tip, sample), kind: 'iv', 'gap-nm': spectrumGap, from: -1, to: 1, points: 201, 'noise-relative': 0.01, 'noise-floor-a': 2e-12, seed: 951 });
  writeFileSync(
    join(out, 'site-S7-A-gold-spectrum.csv'),
    [...header('spectrum'), 'bias (V),current (nA)', ...spectrum.map((p) => `${p.biasV.toFixed(4)},${(p.currentA * 1e9).toPrecision(6)}`)].join('\n') + '\n',
  );
  truth.sites.push({ site: 'S7', run: 'A-gold', tipWorkFunctionEV: tip.workFunctionEV, sampleWorkFunctionEV: sample.workFunctionEV, spectrumGapNm: spectrumGap });
}

async function main(): Promise<void> {
  mkdirSync(out, { recursive: true });
  for (const name of readdirSync(out)) if (/\.(csv|tsv|txt|json)$/.test(name) && name !== 'settings.json') rmSync(join(out, name));
  let seed = 100;
  for (const tip of tips) {
    for (const sample of samples) {
      await approachRun(tip, sample, 10, (seed += 20));
      await spectrumRun(tip, sample, 3, (seed += 20));
    }
  }
  await gridRun();
  await spoiledCurves();
  await sitePair();
  writeFileSync(join(out, 'truth.json'), JSON.stringify({ note: 'true parameters of the simulated demo curves (invented scenario)', ...truth }, null, 1) + '\n');
  console.log(`wrote demo data to ${out}`);
}

await main();
