import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import type { CurveResult } from '../../src/analysis/index.ts';
import type { CommandIO } from '../../src/cli/command.ts';
import { runCli } from '../../src/cli/main.ts';

const repo = fileURLToPath(new URL('../..', import.meta.url));

function capture(cwd = repo): CommandIO & { out: string; err: string } {
  const io = { out: '', err: '', stderrIsTTY: false, cwd, stdout: (t: string) => void (io.out += t), stderr: (t: string) => void (io.err += t) };
  return io;
}

const scratch = mkdtempSync(join(tmpdir(), 'burrow-report-'));
const resultsPath = join(scratch, 'results.json');

beforeAll(async () => {
  const io = capture();
  const code = await runCli(['fit', 'sample-data', '--settings', 'sample-data/settings.json', '--workers', '1', '--out', resultsPath], io);
  expect(code, io.err).toBe(0);
});

describe('burrow report', () => {
  it('burrow report fits data folders itself and writes the HTML report with plots, tables and the answer', async () => {
    const out = join(scratch, 'from-data.html');
    const io = capture();
    const code = await runCli(['report', 'sample-data', '--settings', 'sample-data/settings.json', '--workers', '1', '--out', out], io);
    expect(code, io.err).toBe(0);
    expect(io.err).toContain(`burrow report: wrote ${out}`);
    const html = readFileSync(out, 'utf8');
    expect(html.startsWith('<!doctype html>')).toBe(true);
    expect(html).toContain('<svg class="plot strip-box"');
    expect(html).toContain('<table class="pairwise">');
    expect(html).toContain('<svg class="plot grid-map"');
    expect(html).toMatch(/<strong>A-gold − A-graphite<\/strong> = <strong>0\.\d+ eV<\/strong> \(95 % CI 0\.\d+ to 0\.\d+ eV\)/);
    expect(html).toContain('sample-data (fitted for this report)');
  });

  it('burrow report reads a results JSON and groups by a metadata key read from the files it names', async () => {
    const io = capture();
    const code = await runCli(['report', resultsPath, '--group-by', 'metadata:tip'], io);
    expect(code, io.err).toBe(0);
    expect(io.out).toContain('by metadata entry “tip”');
    expect(io.out).toContain('<strong>A (etched W wire) − B (cut Pt-Ir wire)</strong>');
  });

  it('burrow report reads a dashboard session file: stored results, batch flags added, metadata from the kept text', async () => {
    const results: CurveResult[] = JSON.parse(readFileSync(resultsPath, 'utf8')).results;
    const names = ['sample-data/approach-A-gold.csv', 'sample-data/approach-A-gold-odd-site.csv', 'sample-data/approach-B-graphite.csv'];
    const kept = results.filter((r) => names.includes(r.file)).map((r) => ({ ...r, flags: [] }));
    const session = {
      format: 'burrow-session',
      version: 1,
      name: 'demo',
      settings: { temperatureK: 300 },
      files: names.map((name) => ({ key: name, fileName: name, text: readFileSync(join(repo, name), 'utf8') })),
      results: kept.map((result) => ({ curveId: result.curve, fitKey: 'k', result })),
    };
    const path = join(scratch, 'session.json');
    writeFileSync(path, JSON.stringify(session));
    const out = join(scratch, 'session.html');
    const io = capture(scratch);
    const code = await runCli(['report', 'session.json', '--group-by', 'metadata:sample', '--out', 'session.html'], io);
    expect(code, io.err).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(html).toContain('<strong>gold (Au(111) film on mica) − graphite (cleaved HOPG)</strong>');
    // finishBatch re-flags the odd site (stored results lack batch flags)
    expect(html).toMatch(/<strong>batch-outlier<\/strong>: Apparent barrier/);
  });

  it('burrow report escapes a results fixture whose file names carry a <script> tag', async () => {
    const hostile = '<script>alert(1)</script>';
    const base = JSON.parse(readFileSync(resultsPath, 'utf8')) as { settings: unknown; results: CurveResult[] };
    const results = base.results
      .filter((r) => r.run === 'A-graphite' || r.run === 'B-gold')
      .map((r) => ({ ...r, file: `${hostile}${r.file}`, curve: `${hostile}${r.curve}`, run: `${r.run} ${hostile}` }));
    writeFileSync(join(scratch, 'hostile.json'), JSON.stringify({ settings: base.settings, results }));
    const io = capture(scratch);
    const code = await runCli(['report', 'hostile.json', '--out', 'hostile.html'], io);
    expect(code, io.err).toBe(0);
    const html = readFileSync(join(scratch, 'hostile.html'), 'utf8');
    expect(html).not.toMatch(/<script/i);
    expect(html).toContain('A-graphite &lt;script&gt;alert(1)&lt;/script&gt;');
  });

  it('burrow report prints the report on stdout without --out', async () => {
    const io = capture();
    expect(await runCli(['report', resultsPath, '--quantity', 'phi2EV'], io)).toBe(0);
    expect(io.out).toContain('<title>Burrow report: sample barrier φ2 by run</title>');
  });

  it.each([
    [['report'], 'burrow report: give a results or session .json, or data files and folders'],
    [['report', 'RESULTS', '--out', 'report.pdf'], "burrow report: --out must end in .html or .htm, got 'report.pdf'"],
    [['report', 'RESULTS', '--group-by', 'colour'], "burrow report: --group-by must be run, file or metadata:KEY, got 'colour'"],
    [['report', 'RESULTS', '--quantity', 'workFunction'], "burrow report: --quantity must be one of apparentBarrierEV|gapToContactNm|phi1EV|phi2EV|asymmetryEV|meanBarrierEV, got 'workFunction'"],
    [['report', 'RESULTS', '--settings', 'sample-data/settings.json'], 'burrow report: --settings applies to data files; RESULTS carries its own settings, got --settings sample-data/settings.json'],
    [['report', 'RESULTS', 'sample-data'], 'burrow report: give one results or session .json, or data files and folders, not both; got 2 paths'],
    [['report', 'RESULTS', '--group-by', 'metadata:lens'], /^burrow report: --group-by metadata:lens: no curve has a 'lens' entry; keys found: [^\n]*\brun\b[^\n]*\bsample\b[^\n]*\btip\n$/],
    [['report', 'missing.json'], 'burrow report: cannot read missing.json (ENOENT)'],
    [['report', 'sample-data/settings.json'], 'burrow report: sample-data/settings.json is neither a results file ({ settings, results } from burrow fit --out) nor a burrow session'],
    [['report', 'RESULTS', '--bogus'], 'burrow report: unknown flag --bogus; accepted: --settings, --group-by, --tags, --quantity, --include-flagged, --colour-map, --title, --out, --workers'],
  ] as [string[], string | RegExp][])('burrow report %j exits 2 with one line', async (argv, message) => {
    const io = capture();
    const args = argv.map((a) => (a === 'RESULTS' ? resultsPath : a));
    expect(await runCli(args, io)).toBe(2);
    if (typeof message === 'string') expect(io.err).toBe(`${message.replace('RESULTS', resultsPath)}\n`);
    else expect(io.err).toMatch(message);
    expect(io.out).toBe('');
  });

  it('burrow report groups by user tags from a file', async () => {
    const results: CurveResult[] = JSON.parse(readFileSync(resultsPath, 'utf8')).results;
    const tags = { terrace: results.filter((r) => r.run === 'B-gold').map((r) => r.curve), 'step edge': results.filter((r) => r.run === 'B-graphite').map((r) => r.curve) };
    writeFileSync(join(scratch, 'tags.json'), JSON.stringify(tags));
    const io = capture(scratch);
    expect(await runCli(['report', resultsPath, '--tags', 'tags.json'], io)).toBe(0);
    expect(io.out).toContain('<strong>terrace − step edge</strong>');
    expect(io.out).toContain('(untagged)');
  });

  it('burrow --help lists report', async () => {
    const io = capture();
    await runCli(['--help'], io);
    expect(io.out).toMatch(/\n {2}report +Compare runs/);
  });
});
