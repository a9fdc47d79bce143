import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { DEFAULT_SETTINGS } from '../../src/fit/index.ts';
import { SessionDb } from '../../src/state/sessionDb.ts';
import { DEFAULT_FILTERS, SESSION_SCHEMA_VERSION, type SessionRecord } from '../../src/state/types.ts';

function record(id: string, name: string, updatedAt: string): SessionRecord {
  return {
    schema: SESSION_SCHEMA_VERSION,
    id,
    name,
    createdAt: '2024-05-01T10:00:00.000Z',
    updatedAt,
    settings: { ...DEFAULT_SETTINGS, runOverrides: {} },
    mappings: { version: 1, answers: {} },
    files: [{ key: 'a.csv', fileName: 'a.csv' }],
    manualWindows: {},
    results: [],
    view: { selectedCurveId: null, tab: 'curve', filters: { ...DEFAULT_FILTERS } },
  };
}

describe('SessionDb', () => {
  it('SessionDb stores sessions, lists them newest first and remembers the last one', async () => {
    const db = await SessionDb.open(new IDBFactory(), 'test');
    await db.put(record('s1', 'first', '2024-05-01T10:00:00.000Z'));
    await db.put(record('s2', 'second', '2024-05-01T11:00:00.000Z'));
    expect((await db.list()).map((s) => s.name)).toEqual(['second', 'first']);
    expect((await db.list())[0]).toMatchObject({ id: 's2', fileCount: 1, curveCount: 0 });
    expect(await db.lastSessionId()).toBe('s2');
    expect((await db.get('s1'))?.name).toBe('first');
    expect(await db.get('missing')).toBeUndefined();
    db.close();
  });

  it('SessionDb renames, keeps raw text per session and deletes a session with its text', async () => {
    const db = await SessionDb.open(new IDBFactory(), 'test');
    await db.put(record('s1', 'first', '2024-05-01T10:00:00.000Z'));
    await db.putText('s1', 'a.csv', 'a.csv', 'z,I\n1,2\n');
    await db.putText('s2', 'a.csv', 'a.csv', 'other');
    expect(await db.getText('s1', 'a.csv')).toBe('z,I\n1,2\n');
    await db.rename('s1', 'renamed', '2024-05-01T12:00:00.000Z');
    expect((await db.get('s1'))?.name).toBe('renamed');
    await db.delete('s1');
    expect(await db.get('s1')).toBeUndefined();
    expect(await db.list()).toEqual([]);
    expect(await db.lastSessionId()).toBeUndefined();
    expect(await db.getText('s1', 'a.csv')).toBeUndefined();
    expect(await db.getText('s2', 'a.csv')).toBe('other');
    db.close();
  });

  it('SessionDb.get ignores a record of another schema version; open names a bad factory', async () => {
    const db = await SessionDb.open(new IDBFactory(), 'test');
    await db.put({ ...record('s1', 'old', '2024-05-01T10:00:00.000Z'), schema: 99 as typeof SESSION_SCHEMA_VERSION });
    expect(await db.get('s1')).toBeUndefined();
    db.close();
    await expect(SessionDb.open({} as IDBFactory)).rejects.toThrow('SessionDb.open: factory must be an IDBFactory');
  });
});
