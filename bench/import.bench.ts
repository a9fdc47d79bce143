/**
 * Import benchmark: MB/s and peak memory for a 100 MB three-column text file, streamed from disk
 * through readTextChunks → createImporter (papaparse in fast mode, 64 KB pieces).
 * Targets (from the import issue): ≥ 40 MB/s in Node, peak memory ≤ 2.5 × the file size.
 *
 * Each measurement runs in a fresh child process so that its peak RSS (process.resourceUsage().maxRSS)
 * belongs to that run alone. Printed per layout:
 *   - import MB/s (median of 3 children) and papaparse alone (same pieces, rows discarded), by wall
 *     time and per CPU-second (user + system, which includes the parallel garbage collector);
 *   - peak RSS above the child's baseline / file size, and peak RSS / file size;
 *   - sampled peak of heap + array buffers above baseline / file size.
 * The files are generated in os.tmpdir() and deleted afterwards.
 */
import { spawnSync } from 'node:child_process';
import { createWriteStream } from 'node:fs';
import { rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { median } from './timing.ts';

const TARGET_BYTES = 100 * 1000 * 1000;
const CHILD_FLAG = 'BURROW_IMPORT_BENCH_CHILD';

interface ChildReport {
  seconds: number;
  /** User + system CPU time of the run: less sensitive than wall time to other load on the machine. */
  cpuSeconds: number;
  bytes: number;
  rows: number;
  curves: number;
  points: number;
  problems: number;
  baselineRssBytes: number;
  maxRssBytes: number;
  peakHeapBytes: number;
  baselineHeapBytes: number;
}

type Layout = 'gap, current, fixed bias' | 'gap, two currents';

async function writeFile(path: string, layout: Layout): Promise<number> {
  const out = createWriteStream(path);
  const header = layout === 'gap, two currents' ? 'gap (nm),I first (pA),I second (pA)\n' : 'gap (nm),current (pA),bias (V)\n';
  out.write(header);
  let written = header.length;
  let row = 0;
  while (written < TARGET_BYTES) {
    let batch = '';
    for (let k = 0; k < 20000 && written + batch.length < TARGET_BYTES; k++, row++) {
      const gapNm = 1.2 - row * 2e-7;
      const currentPA = 1000 * Math.exp(-20 * (gapNm - 0.2));
      const third = layout === 'gap, two currents' ? (currentPA * 0.93).toPrecision(7) : '0.1';
      batch += `${gapNm.toFixed(7)},${currentPA.toPrecision(7)},${third}\n`;
    }
    written += batch.length;
    if (!out.write(batch)) await new Promise<void>((resolve) => out.once('drain', () => resolve()));
  }
  await new Promise<void>((resolve, reject) => out.end((error?: Error | null) => (error ? reject(error) : resolve())));
  return (await stat(path)).size;
}

/** Runs in the child: one import (or papaparse alone) of the file, then prints a JSON report. */
async function child(): Promise<void> {
  const path = process.env.BURROW_IMPORT_BENCH_FILE!;
  const mode = process.env.BURROW_IMPORT_BENCH_MODE!;
  const { importPaths, readTextChunks } = await import('../src/io/readFileNode.ts');
  const Papa = (await import('papaparse')).default;
  const collect = (globalThis as { gc?: () => void }).gc;
  collect?.();
  const baselineRssBytes = process.memoryUsage().rss;
  const heapNow = () => {
    const m = process.memoryUsage();
    return m.heapUsed + m.arrayBuffers;
  };
  const baselineHeapBytes = heapNow();
  let peakHeapBytes = baselineHeapBytes;
  const sampler = setInterval(() => (peakHeapBytes = Math.max(peakHeapBytes, heapNow())), 2);
  const t0 = performance.now();
  const cpu0 = process.cpuUsage();
  let rows = 0;
  let curves = 0;
  let points = 0;
  let problems = 0;
  if (mode === 'papaparse') {
    // Papa Parse alone: the same 64 KB pieces cut at newlines, fast mode, rows counted and dropped.
    let pending = '';
    for await (const chunk of readTextChunks(path)) {
      pending += chunk;
      while (pending.length > 65536) {
        const cut = pending.indexOf('\n', 65536);
        if (cut < 0) break;
        rows += Papa.parse<string[]>(pending.slice(0, cut), { delimiter: ',', newline: '\n', fastMode: true }).data.length;
        pending = pending.slice(cut + 1);
      }
    }
    rows += Papa.parse<string[]>(pending, { delimiter: ',', newline: '\n', fastMode: true }).data.length;
  } else {
    const [file] = await importPaths([path], { cwd: '/' });
    peakHeapBytes = Math.max(peakHeapBytes, heapNow());
    rows = file.rowCount;
    curves = file.curves.length;
    points = file.curves.reduce((n, c) => n + c.x.length, 0);
    problems = file.problems.length;
  }
  const seconds = (performance.now() - t0) / 1000;
  const cpu = process.cpuUsage(cpu0);
  clearInterval(sampler);
  const report: ChildReport = {
    seconds,
    cpuSeconds: (cpu.user + cpu.system) / 1e6,
    bytes: (await stat(path)).size,
    rows,
    curves,
    points,
    problems,
    baselineRssBytes,
    // resourceUsage().maxRSS is in kilobytes (Node.js docs, process.resourceUsage).
    maxRssBytes: process.resourceUsage().maxRSS * 1024,
    peakHeapBytes,
    baselineHeapBytes,
  };
  process.stdout.write(JSON.stringify(report));
}

function runChild(path: string, mode: 'import' | 'papaparse'): ChildReport {
  const self = fileURLToPath(import.meta.url);
  const result = spawnSync(process.execPath, [...process.execArgv, '--expose-gc', self], {
    env: { ...process.env, [CHILD_FLAG]: '1', BURROW_IMPORT_BENCH_FILE: path, BURROW_IMPORT_BENCH_MODE: mode },
    encoding: 'utf8',
    maxBuffer: 1 << 20,
  });
  if (result.status !== 0) throw new Error(`import bench child failed (${result.status}): ${result.stderr}`);
  return JSON.parse(result.stdout) as ChildReport;
}

const mb = (bytes: number) => bytes / 1e6;

/** Generate each 100 MB layout in os.tmpdir(), measure it in child processes, print the figures, delete the file. */
export default async function (): Promise<void> {
  for (const layout of ['gap, current, fixed bias', 'gap, two currents'] as Layout[]) {
    const path = join(tmpdir(), `burrow-import-bench-${process.pid}.csv`);
    try {
      const size = await writeFile(path, layout);
      const imports = [runChild(path, 'import'), runChild(path, 'import'), runChild(path, 'import')];
      const papa = [runChild(path, 'papaparse'), runChild(path, 'papaparse')];
      const first = imports[0];
      const importRate = median(imports.map((r) => mb(r.bytes) / r.seconds));
      const importCpuRate = median(imports.map((r) => mb(r.bytes) / r.cpuSeconds));
      const papaCpuRate = median(papa.map((r) => mb(r.bytes) / r.cpuSeconds));
      const papaRate = median(papa.map((r) => mb(r.bytes) / r.seconds));
      const rssAbove = Math.max(...imports.map((r) => r.maxRssBytes - r.baselineRssBytes));
      const rssTotal = Math.max(...imports.map((r) => r.maxRssBytes));
      const heapAbove = Math.max(...imports.map((r) => r.peakHeapBytes - r.baselineHeapBytes));
      console.log(`${layout}: ${mb(size).toFixed(1)} MB, ${first.rows} rows → ${first.curves} curve(s), ${first.points} points, ${first.problems} problems`);
      console.log(`  import (stream from disk)   ${importRate.toFixed(1)} MB/s wall, ${importCpuRate.toFixed(1)} MB per CPU-second  (wall runs: ${imports.map((r) => (mb(r.bytes) / r.seconds).toFixed(1)).join(', ')}; target ≥ 40)`);
      console.log(`  papaparse alone (fast mode) ${papaRate.toFixed(1)} MB/s wall, ${papaCpuRate.toFixed(1)} MB per CPU-second  (wall runs: ${papa.map((r) => (mb(r.bytes) / r.seconds).toFixed(1)).join(', ')})`);
      console.log(`  peak RSS above baseline     ${(rssAbove / size).toFixed(2)} × file size  (${mb(rssAbove).toFixed(0)} MB; target ≤ 2.5)`);
      console.log(`  peak RSS of the process     ${(rssTotal / size).toFixed(2)} × file size  (${mb(rssTotal).toFixed(0)} MB, baseline ${mb(first.baselineRssBytes).toFixed(0)} MB)`);
      console.log(`  peak heap + buffers (sampled, above baseline) ${(heapAbove / size).toFixed(2)} × file size`);
    } finally {
      await rm(path, { force: true });
    }
  }
}

if (process.env[CHILD_FLAG] === '1') {
  child().catch((error) => {
    process.stderr.write(String((error as Error).stack ?? error));
    process.exitCode = 1;
  });
}
