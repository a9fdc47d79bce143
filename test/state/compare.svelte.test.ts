import { IDBFactory } from 'fake-indexeddb';
import { flushSync } from 'svelte';
import { describe, expect, it } from 'vitest';
import { compareRuns, groupCurves } from '../../src/analysis/index.ts';
import { driftSummary, fixed, formatP, groupByValue, groupingFor, groupRows, pairRows, pairSentence, parseGroupBy } from '../../src/state/compare.ts';
import { compareViewFor } from '../../src/state/compareView.svelte.ts';
import { DEMO_FILES, demoSettings } from '../../src/state/demo.ts';
import { Session } from '../../src/state/session.svelte.ts';
import { readBundle, writeBundle } from '../../src/state/sessionBundle.ts';
import { SessionDb } from '../../src/state/sessionDb.ts';
import { cleanTags, type SessionRecord } from '../../src/state/types.ts';
import { Workspace } from '../../src/state/workspace.svelte.ts';
import { testEnv } from './helpers.ts';

const subset = DEMO_FILES.filter((f) => /^approach-A-(gold|graphite)\.csv$/.test(f.fileName));

async function fittedSession(): Promise<Session> {
  const session = new Session(testEnv(), { settings: demoSettings() });
  await session.addFiles(subset);
  await session.settled();
  return session;
}

describe('state/compare', () => {
  it('groupByValue and parseGroupBy round-trip every menu choice; unknown text groups by run', () => {
    for (const choice of [{ by: 'run' }, { by: 'file' }, { by: 'tag' }, { by: 'metadata', key: 'tip' }] as const) {
      expect(parseGroupBy(groupByValue(choice))).toEqual(choice);
    }
    expect(parseGroupBy('metadata:')).toEqual({ by: 'run' });
    expect(groupingFor({ by: 'tag' }, { a: 'x' })).toEqual({ by: 'tag', tags: { a: 'x' } });
  });

  it('fixed and formatP write a true minus sign and two significant figures of p', () => {
    // By hand: −0.29114 to 3 decimals
    expect(fixed(-0.29114, 3)).toBe('\u22120.291');
    expect(fixed(-0.0001, 2)).toBe('0.00');
    expect(formatP(2.776e-14)).toBe('2.8e-14');
    expect(formatP(1e-320)).toBe('< 1e-300');
    expect(formatP(null)).toBe('—');
  });

  it('pairRows and the sentence give the difference of compareRuns with its CI and Welch p', async () => {
    const session = await fittedSession();
    const comparison = compareRuns({ results: session.results, quantity: 'apparentBarrierEV' });
    const pair = comparison.pairs[0];
    const [row] = pairRows(comparison);
    expect([row.labelA, row.labelB]).toEqual(['A-gold', 'A-graphite']);
    expect(row.welchPValue).toBe(pair.welch!.pValue);
    expect(pair.welch!.pValue).toBeLessThan(0.01);
    expect(row.sentence).toMatch(/^A-gold is higher than A-graphite by 0\.\d+ eV \(95 % CI 0\.\d+–0\.\d+\), Welch p = \d(\.\d)?e-\d+$/);
    expect(pairSentence(pair, 95)).toBe(row.sentence);
    const groups = groupRows(comparison);
    expect(groups.map((g) => g.label)).toEqual(['A-gold', 'A-graphite']);
    expect(groups[0].nUsed).toBe(comparison.groups[0].values.nUsed);
    expect(groups[0].meanCI).toMatch(/^5\.\d+ ± 0\.\d+ eV \(5\.\d+–5\.\d+\)$/);
    expect(driftSummary(comparison.groups[0], 95, 'eV')).toMatch(/^Theil–Sen slope/);
  });

  it('pairSentence says "lower" for a negative difference and "no clear difference" when the CI holds 0', async () => {
    const session = await fittedSession();
    const comparison = compareRuns({ results: session.results, groups: [...groupCurves(session.results)].reverse() });
    expect(pairRows(comparison)[0].sentence).toMatch(/^A-graphite is lower than A-gold by 0\.\d+ eV/);
    const pair = comparison.pairs[0];
    const straddling = { ...pair, welch: { ...pair.welch!, differenceOfMeans: 0.004, confidenceInterval: { low: -0.011, high: 0.019 } } };
    expect(pairSentence(straddling, 95)).toMatch(/^A-graphite and A-gold show no clear difference: 0\.004 eV \(95 % CI −0\.011 to 0\.019 includes 0\)/);
    expect(pairSentence({ ...pair, welch: null, note: 'A-graphite has fewer than 2 values' }, 95)).toBe('A-graphite and A-gold: A-graphite has fewer than 2 values.');
  });

  it('CompareView follows the session: grouping by tag uses the tags set on the session', async () => {
    const session = await fittedSession();
    const cleanup = $effect.root(() => {});
    const view = compareViewFor(session);
    expect(compareViewFor(session)).toBe(view);
    expect(view.comparison?.groups.map((g) => g.group.label)).toEqual(['A-gold', 'A-graphite']);
    const ids = session.curves.filter((c) => c.fileName === 'approach-A-gold.csv').slice(0, 4).map((c) => c.id);
    session.setTag(ids, ' terrace ');
    session.setTag(['no-such-curve'], 'x');
    expect(session.tags).toEqual(Object.fromEntries(ids.map((id) => [id, 'terrace'])));
    view.groupBy = { by: 'tag' };
    flushSync();
    expect(view.comparison?.groups.map((g) => [g.group.label, g.group.curveIds.length])).toEqual([
      ['terrace', 4],
      ['(untagged)', session.curves.length - 4],
    ]);
    session.setTag(ids.slice(0, 1), '');
    expect(view.comparison?.groups.find((g) => g.group.label === 'terrace')?.group.curveIds.length).toBe(3);
    const html = view.reportHtml('2024-05-01T12:00:00Z');
    expect(html).toContain('<table class="pairwise"');
    expect(html).not.toMatch(/<script/i);
    cleanup();
  });

  it('tags are saved with the session and restored; records and bundles without tags still load', async () => {
    const db = await SessionDb.open(new IDBFactory(), 'compare-tags');
    const workspace = new Workspace(testEnv(db));
    const session = await workspace.newEmpty();
    await session.addFiles(subset);
    await session.settled();
    const id = session.curves[0].id;
    session.setTag([id], 'tip 1');
    await session.settled();
    expect(session.toRecord().tags).toEqual({ [id]: 'tip 1' });
    await workspace.newEmpty();
    expect(await workspace.open(session.id)).toBe(true);
    expect(workspace.session!.tags).toEqual({ [id]: 'tip 1' });
    // A bundle carries the tags across.
    const bundle = workspace.exportBundle();
    expect(readBundle(bundle).tags).toEqual({ [id]: 'tip 1' });
    // A record saved before tags existed (no field) opens with none.
    const record = { ...workspace.session!.toRecord() } as Partial<SessionRecord>;
    delete record.tags;
    await db.put(record as SessionRecord);
    expect(await workspace.open(record.id!)).toBe(true);
    expect(workspace.session!.tags).toEqual({});
    const old = JSON.parse(bundle) as Record<string, unknown>;
    delete old.tags;
    expect(readBundle(writeBundle(old as never)).tags).toBeUndefined();
    expect(cleanTags({ a: ' x ', b: 3, c: '' })).toEqual({ a: 'x' });
    db.close();
  });
});
