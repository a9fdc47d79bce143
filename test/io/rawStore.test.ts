import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { importText, RawTextStore } from '../../src/io/index.ts';

describe('RawTextStore', () => {
  it('RawTextStore keeps raw text by key so a file can be re-imported later', async () => {
    const store = await RawTextStore.open(new IDBFactory(), 'test-raw');
    const text = 'gap (nm),I (pA)\n0.5,100\n0.6,30\n0.7,9\n';
    const first = importText(text, 'a.csv');
    await store.put({ key: 'a.csv', fileName: first.fileName, text: first.rawText! });
    await store.put({ key: 'b.csv', fileName: 'b.csv', text: 'x' });
    expect(await store.keys()).toEqual(['a.csv', 'b.csv']);
    const record = await store.get('a.csv');
    expect(record).toEqual({ key: 'a.csv', fileName: 'a.csv', text });
    const again = importText(record!.text, record!.fileName);
    expect(Array.from(again.curves[0].x)).toEqual(Array.from(first.curves[0].x));
    await store.delete('b.csv');
    expect(await store.keys()).toEqual(['a.csv']);
    expect(await store.get('missing')).toBeUndefined();
    store.close();
  });

  it('RawTextStore rejects caller mistakes at once', async () => {
    await expect(RawTextStore.open(undefined as unknown as IDBFactory)).rejects.toThrow('RawTextStore.open: factory must be an IDBFactory');
    const store = await RawTextStore.open(new IDBFactory());
    await expect(store.put({ key: '', fileName: 'a', text: '' })).rejects.toThrow("RawTextStore.put: key must be a non-empty string, got ''");
    store.close();
  });
});
