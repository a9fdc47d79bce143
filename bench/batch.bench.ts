/**
 * A 128 × 128 grid of WKB-trapezoid I(V) spectra (16,384 curves, 512 points, ±1 V, 300 K, 1 % +
 * 2 pA noise, made with a 10 nm tip) fitted through the worker pool on every core, as `burrow fit`
 * does, twice: with the area tied to the tip radius (settings tipRadiusNm; φ1, φ2, d fitted) and
 * with the area free (no geometry; φ1, φ2, d and the area fitted, 4 parameters). Prints wall time
 * (target ≤ 90 s on both cores), curves per second, the per-curve median from a single-thread
 * sample, peak memory of the process (threads included; target ≤ 1 GB) and the recovery error
 * against the simulated truth (meaningful with the area tied; a lone free-area spectrum does not
 * fix φ̄). `BURROW_BENCH_GRID=32` runs a 32 × 32 grid instead (quick look).
 */
import { performance } from 'node:perf_hooks';
import { analyzeCurve, type CurveInput } from '../src/analysis/index.ts';
import { DEFAULT_SETTINGS, type AnalysisSettings } from '../src/fit/index.ts';
import { TrapezoidSpectrum, gaussian, mulberry32, paraboloidTipAreaM2 } from '../src/physics/index.ts';
import { defaultPoolSize, runAnalysisPool } from '../src/workers/nodePool.ts';
import { median } from './timing.ts';

const SIDE = Number(process.env.BURROW_BENCH_GRID ?? 128);
const POINTS = 512;
const TIP_RADIUS_M = 1e-8;

function gridCurves(): { curves: CurveInput[]; truth: { meanBarrierEV: number; widthNm: number }[] } {
  const biasV = Float64Array.from({ length: POINTS }, (_, i) => -1 + (2 * i) / (POINTS - 1));
  const spectrum = new TrapezoidSpectrum(biasV, 300);
  const density = new Float64Array(POINTS);
  const curves: CurveInput[] = [];
  const truth: { meanBarrierEV: number; widthNm: number }[] = [];
  const random = mulberry32(2026);
  for (let ix = 0; ix < SIDE; ix++) {
    for (let iy = 0; iy < SIDE; iy++) {
      // A smooth work-function landscape and a gap that follows the feedback (±0.02 nm).
      const tip = 4.5;
      const sample = 4.8 + 0.3 * Math.sin((2 * Math.PI * ix) / SIDE) * Math.cos((2 * Math.PI * iy) / SIDE);
      const gapM = 6e-10 + 2e-11 * gaussian(random);
      spectrum.evaluate({ tipWorkFunctionEV: tip, sampleWorkFunctionEV: sample, gapM, fermiEnergyEV: 5.5 }, density, null);
      const area = paraboloidTipAreaM2(TIP_RADIUS_M, (tip + sample) / 2);
      const current = new Float64Array(POINTS);
      for (let i = 0; i < POINTS; i++) current[i] = area * density[i] * (1 + 0.01 * gaussian(random)) + 2e-12 * gaussian(random);
      curves.push({ id: `grid#${ix}-${iy}`, fileName: 'grid', index: ix * SIDE + iy, segment: 'single', kind: 'iv', x: biasV, current, position: { xM: ix * 1e-9, yM: iy * 1e-9 } });
      truth.push({ meanBarrierEV: (tip + sample) / 2, widthNm: gapM * 1e9 });
    }
  }
  return { curves, truth };
}

export default async function batchBench(): Promise<void> {
  const t0 = performance.now();
  const { curves, truth } = gridCurves();
  console.log(`simulated ${curves.length} spectra in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  await fitGrid('area tied to the 10 nm tip radius (3 parameters)', { ...DEFAULT_SETTINGS, tipRadiusNm: TIP_RADIUS_M * 1e9 }, curves, truth);
  await fitGrid('area free (4 parameters)', { ...DEFAULT_SETTINGS, tipRadiusNm: null, areaNm2: null }, curves, truth);
}

async function fitGrid(label: string, settings: AnalysisSettings, curves: CurveInput[], truth: { meanBarrierEV: number; widthNm: number }[]): Promise<void> {
  console.log(`-- ${label}`);
  // Single-thread sample for the per-curve median, after 24 curves of warm-up.
  for (let k = 0; k < 24; k++) analyzeCurve(curves[(k * 53) % curves.length], settings);
  const sample: number[] = [];
  for (let k = 0; k < 24; k++) {
    const s = performance.now();
    analyzeCurve(curves[(k * 37) % curves.length], settings);
    sample.push(performance.now() - s);
  }
  console.log(`one thread: median ${median(sample).toFixed(1)} ms per curve (analyzeCurve: BDR → Simmons → WKB + flags)`);
  const size = defaultPoolSize();
  let lastProgress = 0;
  let progressCalls = 0;
  const start = performance.now();
  const results = await runAnalysisPool(
    curves.map((curve) => ({ curve, settings })),
    size,
    {
      onProgress: (done) => {
        progressCalls++;
        lastProgress = done;
      },
    },
  );
  const seconds = (performance.now() - start) / 1000;
  const peakMB = process.resourceUsage().maxRSS / 1024;
  let converged = 0;
  const barrierErrors: number[] = [];
  const widthErrors: number[] = [];
  const pulls: number[] = [];
  results.forEach((result, i) => {
    if (result instanceof Error || result.status !== 'ok' || result.meanBarrierEV === null || result.widthNm === null) return;
    converged++;
    barrierErrors.push(Math.abs(result.meanBarrierEV - truth[i].meanBarrierEV) / truth[i].meanBarrierEV);
    widthErrors.push(Math.abs(result.widthNm - truth[i].widthNm) / truth[i].widthNm);
    if (result.meanBarrierErrEV) pulls.push(Math.abs(result.meanBarrierEV - truth[i].meanBarrierEV) / result.meanBarrierErrEV);
  });
  console.log(`pool of ${size} workers: ${curves.length} curves in ${seconds.toFixed(1)} s (${(curves.length / seconds).toFixed(0)} curves/s; target ≤ 90 s for 16,384), ${progressCalls} progress reports, last ${lastProgress}`);
  console.log(`converged ${((100 * converged) / curves.length).toFixed(1)} %; median |Δφ̄|/φ̄ ${median(barrierErrors).toExponential(2)}, |Δd|/d ${median(widthErrors).toExponential(2)}; ${((100 * pulls.filter((p) => p <= 3).length) / pulls.length).toFixed(1)} % within 3σ`);
  console.log(`peak memory so far (process with worker threads): ${peakMB.toFixed(0)} MB (target ≤ 1024 MB)`);
}
