import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/main.ts';
import type { CommandIO } from '../../src/cli/command.ts';
import type { CurveResult } from '../../src/analysis/index.ts';

const repo = fileURLToPath(new URL('../..', import.meta.url));
const sampleData = join(repo, 'sample-data');

function capture(cwd = repo): CommandIO & { out: string; err: string } {
  const io = { out: '', err: '', stderrIsTTY: false, cwd, stdout: (t: string) => void (io.out += t), stderr: (t: string) => void (io.err += t) };
  return io;
}

interface Truth {
  approach: { file: string; curve: number; segment?: string; apparentBarrierEV: number | null; spoiled: string | null }[];
  spectra: { file: string; curve: number; tipWorkFunctionEV: number; sampleWorkFunctionEV: number; gapNm: number }[];
}
const truth: Truth = JSON.parse(readFileSync(join(sampleData, 'truth.json'), 'utf8'));
const base = (path: string) => path.split(/[\\/]/).pop() as string;

async function fitDemo(extra: string[] = []): Promise<CurveResult[]> {
  const out = join(mkdtempSync(join(tmpdir(), 'burrow-fit-')), 'results.json');
  const io = capture();
  const code = await runCli(['fit', 'sample-data', '--settings', 'sample-data/settings.json', '--out', out, ...extra], io);
  expect(code, io.err).toBe(0);
  return JSON.parse(readFileSync(out, 'utf8')).results;
}

describe('burrow fit on the demo scenario', () => {
  it('fits every curve, flags exactly the spoiled ones with their codes, and recovers the true barriers', async () => {
    const results = await fitDemo();
    expect(results.length).toBe(98);
    expect(results.every((r) => r.status === 'ok')).toBe(true);
    const find = (file: string, index: number, segment = 'single') =>
      results.find((r) => base(r.file) === file && r.index === index && r.segment === segment) as CurveResult;

    // Spoiled curves carry their code; every other curve carries none.
    const spoiled = truth.approach.filter((t) => t.spoiled);
    for (const t of spoiled) {
      const result = find(t.file, t.curve, t.segment ?? 'single');
      expect(result.flags.map((f) => f.code), t.file).toContain(t.spoiled);
    }
    const spoiledKeys = new Set(spoiled.map((t) => `${t.file}#${t.curve}/${t.segment ?? 'single'}`));
    const unexpected = results.filter((r) => r.flags.length && !spoiledKeys.has(`${base(r.file)}#${r.index}/${r.segment}`));
    expect(unexpected.map((r) => `${r.curve}: ${r.flags.map((f) => f.code)}`)).toEqual([]);

    // Clean approach curves: the model's own apparent barrier (slope of the noise-free simulation,
    // physics.md §2) lies inside the fitted 3σ interval.
    for (const t of truth.approach.filter((a) => !a.spoiled)) {
      const result = find(t.file, t.curve);
      expect(Math.abs((result.apparentBarrierEV as number) - (t.apparentBarrierEV as number)), t.file).toBeLessThan(3 * (result.apparentBarrierErrEV as number));
    }
    // Spectra (area tied to each tip's radius in settings.json): φ1, φ2 and the gap inside 3σ.
    for (const t of truth.spectra) {
      const result = find(t.file, t.curve);
      expect(Math.abs((result.phi1EV as number) - t.tipWorkFunctionEV)).toBeLessThan(3 * (result.phi1ErrEV as number));
      expect(Math.abs((result.phi2EV as number) - t.sampleWorkFunctionEV)).toBeLessThan(3 * (result.phi2ErrEV as number));
      expect(Math.abs((result.widthNm as number) - t.gapNm)).toBeLessThan(3 * (result.widthErrNm as number));
    }
  });

  it('without --settings, the settings file kept with the data is used and said so', async () => {
    const out = join(mkdtempSync(join(tmpdir(), 'burrow-fit-')), 'results.json');
    const io = capture();
    expect(await runCli(['fit', 'sample-data', '--out', out], io), io.err).toBe(0);
    expect(io.err).toContain(`burrow fit: settings from ${join('sample-data', 'settings.json')} (kept with the data; --settings FILE chooses another)`);
    const kept = JSON.parse(readFileSync(out, 'utf8'));
    expect(kept.settings.runOverrides['B-gold'].tipRadiusNm).toBe(25);
    expect(kept.results).toEqual(await fitDemo());
  });

  it('fits the approach curve and the spectrum of site S7 jointly, within 3σ of the truth', async () => {
    const results = await fitDemo();
    const spectrum = results.find((r) => base(r.file) === 'site-S7-A-gold-spectrum.csv') as CurveResult;
    const joint = spectrum.joint;
    expect(joint?.pairedBy).toBe('site');
    expect(joint?.status).toBe('ok');
    const site = (truth as unknown as { sites: { tipWorkFunctionEV: number; sampleWorkFunctionEV: number; spectrumGapNm: number }[] }).sites[0];
    expect(Math.abs((joint!.phi1EV as number) - site.tipWorkFunctionEV)).toBeLessThan(3 * (joint!.phi1ErrEV as number));
    expect(Math.abs((joint!.phi2EV as number) - site.sampleWorkFunctionEV)).toBeLessThan(3 * (joint!.phi2ErrEV as number));
    expect(Math.abs((joint!.widthNm as number) - site.spectrumGapNm)).toBeLessThan(3 * (joint!.widthErrNm as number));
  });

  it('gives identical results with 1 and 2 workers', async () => {
    const one = await fitDemo(['--workers', '1']);
    const two = await fitDemo(['--workers', '2']);
    expect(two).toEqual(one);
  });

  it('writes CSV with units in the headers', async () => {
    const out = join(mkdtempSync(join(tmpdir(), 'burrow-fit-')), 'results.csv');
    expect(await runCli(['fit', 'sample-data/approach-A-gold.csv', '--out', out], capture())).toBe(0);
    const lines = readFileSync(out, 'utf8').trim().split(/\r\n/);
    expect(lines[0]).toContain('apparent barrier (eV)');
    expect(lines[0]).toContain('gap to contact (nm)');
    expect(lines).toHaveLength(11);
  });
});

describe('burrow fit with bad input', () => {
  it('a bad settings field gives a located message naming field, range and value, exit 2', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'burrow-settings-'));
    writeFileSync(join(dir, 'settings.json'), '{\n  "temperatureK": 300,\n  "tipRadiusNm": -5\n}\n');
    const io = capture(dir);
    expect(await runCli(['fit', join(sampleData, 'approach-A-gold.csv'), '--settings', 'settings.json'], io)).toBe(2);
    expect(io.err).toContain('settings.json:3:3: tipRadiusNm must be a number > 0 and <= 100000 nm or null, got -5');
  });

  it('settings that are not JSON give the line and column, exit 2', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'burrow-settings-'));
    writeFileSync(join(dir, 'settings.json'), '{\n  "temperatureK": 300,\n  oops\n}\n');
    const io = capture(dir);
    expect(await runCli(['fit', join(sampleData, 'approach-A-gold.csv'), '--settings', 'settings.json'], io)).toBe(2);
    expect(io.err).toMatch(/^settings\.json:3:\d+: settings file is not valid JSON/);
  });

  it('settings files kept with the data: --settings wins; files that disagree or are bad stop with a located message, exit 2', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'burrow-kept-'));
    for (const run of ['tip-A', 'tip-B']) {
      mkdirSync(join(dir, run));
      copyFileSync(join(sampleData, 'approach-A-gold.csv'), join(dir, run, 'approach.csv'));
    }
    writeFileSync(join(dir, 'tip-A', 'settings.json'), '{ "temperatureK": 77 }\n');
    writeFileSync(join(dir, 'tip-B', 'settings.json'), '{ "temperatureK": 4.2 }\n');
    writeFileSync(join(dir, 'chosen.json'), '{ "temperatureK": 300 }\n');

    let io = capture(dir);
    expect(await runCli(['fit', 'tip-A', 'tip-B'], io)).toBe(2);
    expect(io.err).toContain(`the settings files kept with the data disagree (${join('tip-A', 'settings.json')}, ${join('tip-B', 'settings.json')}); choose one with --settings FILE`);

    io = capture(dir);
    expect(await runCli(['fit', 'tip-A', 'tip-B', '--settings', 'chosen.json', '--out', 'r.json'], io), io.err).toBe(0);
    expect(io.err).not.toContain('settings from');
    expect(JSON.parse(readFileSync(join(dir, 'r.json'), 'utf8')).settings.temperatureK).toBe(300);

    io = capture(dir);
    expect(await runCli(['fit', 'tip-A', '--out', 'a.json'], io), io.err).toBe(0);
    expect(JSON.parse(readFileSync(join(dir, 'a.json'), 'utf8')).settings.temperatureK).toBe(77);

    writeFileSync(join(dir, 'tip-B', 'settings.json'), '{\n  "runOverrides": {\n    "A-gold": { "tipRadiusNm": -1 }\n  }\n}\n');
    io = capture(dir);
    expect(await runCli(['fit', 'tip-B'], io)).toBe(2);
    expect(io.err).toContain(`${join('tip-B', 'settings.json')}:3:17: runOverrides.A-gold.tipRadiusNm must be a number > 0`);
  });

  it('one unreadable file in a folder does not stop the others; exit 2 with its location', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'burrow-folder-'));
    copyFileSync(join(sampleData, 'approach-B-gold.csv'), join(dir, 'good.csv'));
    writeFileSync(join(dir, 'broken.csv'), 'z (nm),current (pA)\n0.1,12\n0.2,abc\n0.3,5\n0.4,2\n');
    const io = capture(dir);
    expect(await runCli(['fit', '.'], io)).toBe(2);
    const results: CurveResult[] = JSON.parse(io.out);
    expect(results.filter((r) => r.file.endsWith('good.csv'))).toHaveLength(10);
    expect(io.err).toMatch(/broken\.csv:3:2: error/);
  });
});
