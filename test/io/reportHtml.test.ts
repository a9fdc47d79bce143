import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/main.ts';
import { compareRuns, type CurveResult } from '../../src/analysis/index.ts';
import { decimalsForUncertainty, formatFixed } from '../../src/io/reportFormat.ts';
import { writeReport } from '../../src/io/reportHtml.ts';

const repo = fileURLToPath(new URL('../..', import.meta.url));
let demo: CurveResult[] = [];
let demoHtml = '';
const demoSettings = { temperatureK: 300, fermiEnergyEV: 5.5 };

beforeAll(async () => {
  let out = '';
  const io = { stdout: (t: string) => void (out += t), stderr: () => {}, stderrIsTTY: false, cwd: repo };
  expect(await runCli(['fit', 'sample-data', '--settings', 'sample-data/settings.json', '--workers', '1'], io)).toBe(0);
  demo = JSON.parse(out);
  demoHtml = writeReport({ settings: demoSettings, results: demo, generatedAt: 'test time', source: 'the demo scenario' });
});

/** Results whose every text field carries markup, as a hostile or careless file name would. */
const hostile = '<script>alert("owned")</script>';
function hostileResults(): CurveResult[] {
  const make = (i: number, run: string, value: number, flagged: boolean) =>
    ({
      file: `${hostile}.csv`,
      curve: `${hostile}.csv#${i}/single`,
      index: i,
      segment: 'single',
      kind: 'iz',
      model: 'iz-exponential',
      status: 'ok',
      message: '',
      run,
      apparentBarrierEV: value,
      apparentBarrierErrEV: 0.02,
      flags: flagged ? [{ code: 'poor-fit', reason: `reason with ${hostile}` }] : [],
      position: { xNm: i % 3, yNm: Math.floor(i / 3) },
      quality: { r2: 1, reducedChi2: 1, durbinWatson: 2, rmsResidual: 0, pointsUsed: 10, points: 10 },
    }) as unknown as CurveResult;
  return [
    ...[5.6, 5.62, 5.61, 5.63].map((v, i) => make(i, `<img src=x onerror=alert(1)>`, v, i === 3)),
    ...[5.3, 5.31, 5.29].map((v, i) => make(i + 4, `run "${hostile}"`, v, false)),
  ];
}

function expectSelfContained(html: string): void {
  expect(html).not.toMatch(/<script/i);
  expect(html).not.toMatch(/https?:/i);
  // Attribute values are escaped (no raw quote inside), so blanking them leaves only the markup itself.
  expect(html.replace(/"[^"]*"/g, '""')).not.toMatch(/<[^>]*\ssrc\s*=/i);
  expect(html).not.toMatch(/@import/i);
  expect(html).not.toMatch(/url\((?!#)/);
  for (const href of html.match(/href="[^"]*"/g) ?? []) expect(href.startsWith('href="#')).toBe(true);
}

describe('writeReport on the demo scenario', () => {
  it('writeReport states the A-gold − A-graphite difference with its 95 % CI and both p-values', () => {
    const pair = compareRuns({ results: demo }).pairs.find((p) => p.keyA === 'A-gold' && p.keyB === 'A-graphite')!;
    const ci = pair.welch!.confidenceInterval;
    const decimals = decimalsForUncertainty((ci.high - ci.low) / 2);
    const sentence = `<strong>A-gold − A-graphite</strong> = <strong>${formatFixed(pair.welch!.differenceOfMeans, decimals)} eV</strong> (95 % CI ${formatFixed(ci.low, decimals)} to ${formatFixed(ci.high, decimals)} eV)`;
    expect(demoHtml).toContain(sentence);
    const line = demoHtml.split('<li>').find((item) => item.includes('A-gold − A-graphite'))!;
    expect(line).toMatch(/Welch p = [0-9.e-]+ \(Holm-adjusted [0-9.e-]+\), Mann–Whitney p = [0-9.e-]+ \(exact\)/);
    expect(line).toContain('A-gold is higher.');
  });

  it('writeReport holds the plots and tables: strip-and-box, summaries, pairs, drift, map, flags, settings, method, cautions', () => {
    expect(demoHtml.startsWith('<!doctype html>')).toBe(true);
    expect(demoHtml.match(/<svg class="plot strip-box"/g)).toHaveLength(1);
    for (const table of ['group-summary', 'weighted-summary', 'pairwise', 'flag-counts', 'flagged-curves', 'settings']) expect(demoHtml, table).toContain(`<table class="${table}">`);
    expect(demoHtml.match(/<svg class="plot drift"/g)!.length).toBe(5);
    expect(demoHtml.match(/<svg class="plot grid-map"/g)).toHaveLength(1);
    expect(demoHtml.match(/<rect class="cell/g)).toHaveLength(36);
    expect(demoHtml).toContain('Birge ratio');
    expect(demoHtml).toContain('Biometrika 34, 28–35 (1947)');
    expect(demoHtml).toMatch(/high voltages/);
    expect(demoHtml).toMatch(/ultra-high-vacuum/);
    expect(demoHtml).toMatch(/cryogens/);
    expect(demoHtml).toContain('Burrow only analyses data');
    expect(demoHtml).toContain('@media print');
    expect(demoHtml).toContain(`<meta http-equiv="Content-Security-Policy" content="default-src 'none'`);
    expect(demoHtml).toContain('Made test time · from the demo scenario');
    // 10 groups' pairs in the table: the six runs with values (one has none used) give 5 × 4 / 2 = 10 rows.
    const pairRows = demoHtml.split('<table class="pairwise">')[1].split('</table>')[0].match(/<tr>/g)!.length - 1;
    expect(pairRows).toBe(10);
    expectSelfContained(demoHtml);
  });

  it('writeReport with includeFlagged uses the flagged curves and says so', () => {
    const html = writeReport({ settings: demoSettings, results: demo, includeFlagged: true });
    expect(html).toContain('flagged curves included');
    // A-gold with its flagged curves: 11 clean + 8 flagged
    expect(html).toContain('n = 19');
  });

  it('writeReport by a metadata key labels the groups with its values', () => {
    const metadata = Object.fromEntries(demo.map((r) => [r.curve, { sample: r.run.includes('graphite') ? 'HOPG' : 'Au(111)' }]));
    const html = writeReport({ settings: demoSettings, results: demo, grouping: { by: 'metadata', key: 'sample' }, metadata });
    expect(html).toContain('by metadata entry “sample”');
    expect(html).toContain('<strong>Au(111) − HOPG</strong>');
  });
});

describe('writeReport escaping', () => {
  it('writeReport escapes file names, curve ids, run names, flag reasons and settings, and runs no script', () => {
    const html = writeReport({ settings: { note: hostile, [hostile]: 1 }, results: hostileResults(), title: `Report ${hostile}` });
    expectSelfContained(html);
    expect(html).not.toContain('<img');
    expect(html).toContain('&lt;script&gt;alert(&quot;owned&quot;)&lt;/script&gt;.csv');
    expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;');
    expect(html).toContain('reason with &lt;script&gt;');
    expect(html).toContain('<title>Report &lt;script&gt;');
    expect(html).toContain('data-curve-id="&lt;script&gt;alert(&quot;owned&quot;)&lt;/script&gt;.csv#0/single"');
  });

  it('writeReport rejects input without results', () => {
    expect(() => writeReport({ settings: {} } as never)).toThrow('writeReport: input.results must be an array of curve results, got undefined');
  });
});
