import { readFileSync } from 'node:fs';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { analyzeCurve, finishBatch } from '../../src/analysis/index.ts';
import { importText } from '../../src/io/index.ts';
import { DEMO_FILES, demoSettings } from '../../src/state/demo.ts';
import { Session, uniqueFileKey } from '../../src/state/session.svelte.ts';
import { SessionDb } from '../../src/state/sessionDb.ts';
import { Workspace } from '../../src/state/workspace.svelte.ts';
import type { WorkerPort } from '../../src/workers/pool.ts';
import { inProcessWorker, testEnv } from './helpers.ts';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/import/${name}`, import.meta.url), 'utf8');
const demoSubset = DEMO_FILES.filter((f) => /^approach-A-gold(-clipped)?\.csv$|^spectra-A-gold\.tsv$|^approach-B-gold\.csv$/.test(f.fileName));

/** An environment whose workers count the analysis tasks they are sent. */
function countingEnv(db: SessionDb | null = null) {
  const counter = { analyze: 0 };
  const env = testEnv(db, {
    createWorker: (): WorkerPort => {
      const port = inProcessWorker();
      return {
        ...port,
        postMessage: (message) => {
          if ((message as { task: { type: string } }).task.type === 'analyze') counter.analyze++;
          port.postMessage(message);
        },
      };
    },
  });
  return { env, counter };
}

describe('Session', () => {
  it('Session.addFiles imports in the workers and fits every curve as analyzeCurve and finishBatch do', async () => {
    const session = new Session(testEnv(), { settings: demoSettings() });
    await session.addFiles(demoSubset);
    await session.settled();
    expect(session.curves.length).toBe(24);
    expect(session.staleIds).toEqual([]);
    const expected = finishBatch(demoSubset.flatMap((f) => importText(f.text, f.fileName).curves).map((c) => analyzeCurve(c, demoSettings())));
    expect(session.results).toEqual(expected);
    expect(session.selectedId).toBe(session.curves[0].id);
    expect(session.progress.message).toMatch(/^Fitted 24 curves in /);
    expect(session.rows.filter((r) => r.type === 'run').map((r) => (r.type === 'run' ? r.run : ''))).toEqual(['A-gold', 'B-gold']);
  });

  it('Session.addFiles keeps loaded curves and reports a malformed file with its line and column', async () => {
    const session = new Session(testEnv());
    await session.addFiles([{ fileName: 'comma-single.csv', text: fixture('comma-single.csv') }]);
    await session.addFiles([{ fileName: 'bad-ragged.csv', bytes: new TextEncoder().encode(fixture('bad-ragged.csv')) }]);
    await session.settled();
    expect(session.files.map((f) => f.key)).toEqual(['comma-single.csv', 'bad-ragged.csv']);
    expect(session.curves.map((c) => c.fileName)).toEqual(['comma-single.csv', 'bad-ragged.csv']);
    expect(session.results.length).toBe(2);
    expect(session.notices.at(-1)?.text).toMatch(/^bad-ragged\.csv, line 4, column 3: row has 3 cells but the header and data have 2/);
    expect(session.errorCount).toBe(2);
  });

  it('Session.applySettingsFiles applies a valid settings file kept with the data and refits; a bad or disagreeing one changes nothing', async () => {
    const session = new Session(testEnv());
    const spectra = DEMO_FILES.filter((f) => f.fileName === 'spectra-A-gold.tsv');
    await session.addFiles(spectra);
    await session.settled();
    // Without the tip radius a lone spectrum leaves the area free: barrier, width and area trade off.
    expect(session.results.every((r) => r.flags.some((f) => f.code === 'degenerate'))).toBe(true);

    const kept = readFileSync(new URL('../../sample-data/settings.json', import.meta.url), 'utf8');
    expect(session.applySettingsFiles([{ fileName: 'settings.json', bytes: new TextEncoder().encode(kept) }])).toBe(true);
    await session.settled();
    expect(session.settings).toEqual(demoSettings());
    expect(session.notices.at(-1)?.text).toBe('Settings from settings.json applied.');
    expect(session.results.some((r) => r.flags.some((f) => f.code === 'degenerate'))).toBe(false);

    const bad = '{\n  "temperatureK": -1\n}\n';
    expect(session.applySettingsFiles([{ fileName: 'tip-B-settings.json', text: bad }])).toBe(false);
    expect(session.notices.at(-1)?.text).toMatch(/^Settings not applied: tip-B-settings\.json:2:3: temperatureK must be a number >= 0/);
    expect(session.applySettingsFiles([{ fileName: 'a/settings.json', text: kept }, { fileName: 'b/settings.json', text: '{}' }])).toBe(false);
    expect(session.notices.at(-1)?.text).toMatch(/the settings files a\/settings\.json, b\/settings\.json disagree/);
    expect(session.settings).toEqual(demoSettings());
    expect(session.curves.length).toBe(spectra.flatMap((f) => importText(f.text, f.fileName).curves).length);
  });

  it('Session.addFiles skips an identical file of the same name and renames a different one', async () => {
    const session = new Session(testEnv());
    await session.addFiles([{ fileName: 'a.csv', text: fixture('comma-single.csv') }]);
    await session.addFiles([{ fileName: 'a.csv', text: fixture('comma-single.csv') }]);
    await session.addFiles([{ fileName: 'a.csv', text: fixture('quoted.csv') }]);
    await session.settled();
    expect(session.files.map((f) => f.key)).toEqual(['a.csv', 'a (2).csv']);
    expect(session.notices.some((n) => n.text === 'a.csv is already loaded; skipped.')).toBe(true);
    expect(uniqueFileKey('a.csv', new Set(['a.csv', 'a (2).csv']))).toBe('a (3).csv');
  });

  it('Session.editSetting refits only the curves of the edited run, and rejects a bad value with the core message', async () => {
    const { env, counter } = countingEnv();
    const session = new Session(env, { settings: demoSettings() });
    await session.addFiles(demoSubset);
    await session.settled();
    const before = new Map(session.results.map((r) => [r.curve, r]));
    counter.analyze = 0;
    expect(session.editSetting('A-gold', 'tipWorkFunctionEV', '4.0')).toBeNull();
    const aGold = session.curves.filter((c) => c.metadata.run?.raw === 'A-gold').length;
    expect(session.staleIds.length).toBe(aGold);
    await session.settled();
    expect(counter.analyze).toBe(aGold);
    const spectrum = session.results.find((r) => r.curve === 'spectra-A-gold.tsv#0/single')!;
    expect(spectrum.phi1EV).toBe(4);
    expect(spectrum.phi1EV).not.toBe(before.get(spectrum.curve)!.phi1EV);
    const other = session.results.find((r) => r.run === 'B-gold')!;
    expect(other).toBe(before.get(other.curve));

    expect(session.editSetting(null, 'temperatureK', '-4')).toBe('temperatureK must be a number >= 0 and <= 2000 K, got -4');
    expect(session.settingsProblems.temperatureK).toEqual({ text: '-4', message: 'temperatureK must be a number >= 0 and <= 2000 K, got -4' });
    expect(session.settings.temperatureK).toBe(300);
    expect(session.staleIds).toEqual([]);
  });

  it('Session.setManualWindow refits that one curve and marks it; clearing the window restores the fit', async () => {
    const { env, counter } = countingEnv();
    const session = new Session(env, { settings: demoSettings() });
    await session.addFiles([demoSubset.find((f) => f.fileName === 'approach-A-gold.csv')!]);
    await session.settled();
    const id = session.curves[0].id;
    const original = session.resultById.get(id)!;
    counter.analyze = 0;
    await session.setManualWindow(id, { fromNm: 0.02, toNm: 0.12 });
    await session.settled();
    expect(counter.analyze).toBe(1);
    const windowed = session.resultById.get(id)!;
    expect(windowed.quality.pointsUsed).toBeLessThan(original.quality.pointsUsed);
    expect(session.rows.find((r) => r.type === 'curve' && r.curveId === id)).toMatchObject({ manual: true });
    await session.setManualWindow(id, null);
    await session.settled();
    expect(session.resultById.get(id)).toEqual(original);
  });

  it('Session.cancel stops a fit; the curves stay stale and the next fit finishes them', async () => {
    const session = new Session(testEnv(), { settings: demoSettings() });
    await session.addFiles([demoSubset.find((f) => f.fileName === 'approach-A-gold.csv')!]);
    await session.settled();
    session.editSetting(null, 'temperatureK', '77');
    const running = session.fitStale();
    session.cancel();
    await running;
    expect(session.staleIds.length).toBeGreaterThan(0);
    expect(session.progress.message).toMatch(/^Cancelled after \d+ of 10 curves/);
    await session.fitStale();
    expect(session.staleIds).toEqual([]);
    expect(session.results.every((r) => r.conditions.temperatureK === 77)).toBe(true);
  });

  it('Session.answerMapping reads a file that needed a mapping and remembers the answer', async () => {
    const session = new Session(testEnv());
    await session.addFiles([{ fileName: 'no-header.dat', text: fixture('no-header.dat') }]);
    await session.settled();
    expect(session.pendingMappings.map((f) => f.key)).toEqual(['no-header.dat']);
    expect(session.curves).toEqual([]);
    const signature = session.files[0].proposal!.headerSignature;
    await session.answerMapping('no-header.dat', { columnRoles: { 1: 'distance', 2: 'current' }, units: { 1: 'nm', 2: 'pA' } });
    await session.settled();
    expect(session.pendingMappings).toEqual([]);
    expect(session.curves.length).toBe(1);
    expect(session.results[0].status).toBe('ok');
    expect(session.mappingMemory.answers[signature]).toEqual({ columnRoles: { 1: 'distance', 2: 'current' }, units: { 1: 'nm', 2: 'pA' } });
  });
});

describe('Workspace', () => {
  it('Workspace.start builds the demo session, fitted, when nothing is stored', async () => {
    const db = await SessionDb.open(new IDBFactory(), 'ws1');
    const workspace = new Workspace(testEnv(db));
    await workspace.start();
    const session = workspace.session!;
    await session.settled();
    expect(session.curves.length).toBe(DEMO_FILES.reduce((n, f) => n + importText(f.text, f.fileName).curves.length, 0));
    expect(session.staleIds).toEqual([]);
    expect(session.results.some((r) => r.flags.length > 0)).toBe(true);
    expect(workspace.sessions.map((s) => s.name)).toEqual([session.name]);
    db.close();
  });

  it('Workspace.open restores a saved session exactly, with no refit', async () => {
    const db = await SessionDb.open(new IDBFactory(), 'ws2');
    const { env, counter } = countingEnv(db);
    const workspace = new Workspace(env);
    const session = await workspace.newEmpty();
    await session.addFiles(demoSubset);
    await session.setManualWindow('approach-A-gold.csv#2/single', { fromNm: 0.01, toNm: 0.1 });
    session.editSetting('B-gold', 'tipRadiusNm', '30');
    session.select('spectra-A-gold.tsv#1/single');
    session.setTab('table');
    session.setFilters({ kind: 'iz' });
    await session.settled();
    const results = session.results;
    const other = await workspace.newEmpty();
    expect(workspace.session).toBe(other);
    counter.analyze = 0;
    expect(await workspace.open(session.id)).toBe(true);
    const restored = workspace.session!;
    await restored.settled();
    expect(counter.analyze).toBe(0);
    expect(restored.results).toEqual(results);
    expect(restored.manualWindows).toEqual({ 'approach-A-gold.csv#2/single': { fromNm: 0.01, toNm: 0.1 } });
    expect(restored.settings.runOverrides['B-gold'].tipRadiusNm).toBe(30);
    expect(restored.selectedId).toBe('spectra-A-gold.tsv#1/single');
    expect(restored.tab).toBe('table');
    expect(restored.filters.kind).toBe('iz');
    db.close();
  });

  it('Workspace lists, renames and deletes sessions; a bundle round-trips into a new session', async () => {
    const db = await SessionDb.open(new IDBFactory(), 'ws3');
    const workspace = new Workspace(testEnv(db));
    const first = await workspace.newEmpty();
    await first.addFiles([{ fileName: 'comma-single.csv', text: fixture('comma-single.csv') }]);
    await first.settled();
    await workspace.rename(first.id, 'Gold, day 1');
    expect(workspace.sessions.map((s) => s.name)).toContain('Gold, day 1');
    const bundle = workspace.exportBundle();
    const imported = (await workspace.importBundle(bundle))!;
    await imported.settled();
    expect(imported.id).not.toBe(first.id);
    expect(imported.name).toBe('Gold, day 1');
    expect(imported.results).toEqual(first.results);
    expect(workspace.sessions.length).toBe(2);
    await workspace.remove(imported.id);
    expect(workspace.sessions.map((s) => s.id)).toEqual([first.id]);
    expect(workspace.session?.id).toBe(first.id);
    expect(await workspace.importBundle('{"format":"nope"}')).toBeNull();
    expect(workspace.error).toBe("session bundle: format must be 'burrow-session', got \"nope\"");
    db.close();
  });
});
