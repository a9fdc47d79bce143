/**
 * Sessions in IndexedDB. Schema (database 'burrow-sessions', version 1):
 * - 'sessions' (key 'id'): SessionRecord — settings, mapping answers, file list, manual windows,
 *   fitted results and the view;
 * - 'summaries' (key 'id'): SessionSummary — what the session list shows, without reading results;
 * - 'meta' (key 'key'): { key: 'lastSession', value: id }.
 * Raw file text lives in the io layer's RawTextStore (database 'burrow-raw-text'), key
 * `${sessionId}/${fileKey}`, so a session can be re-parsed exactly as it was imported.
 * Works with any IDBFactory (the window's, or fake-indexeddb in tests).
 */
import { RawTextStore, done, promised } from '../io/index.ts';
import { SESSION_SCHEMA_VERSION, type SessionRecord, type SessionSummary } from './types.ts';

const DATABASE_VERSION = 1;

/** The summary of a record. */
export function summarize(record: SessionRecord): SessionSummary {
  return {
    id: record.id,
    name: record.name,
    createdAt: record.createdAt,
    updatedAt: record.updatedAt,
    fileCount: record.files.length,
    curveCount: record.results.length,
  };
}

/**
 * The stored sessions and their raw files.
 * @example const db = await SessionDb.open(indexedDB); await db.put(record); (await db.list())[0].name
 */
export class SessionDb {
  readonly #database: IDBDatabase;
  readonly #raw: RawTextStore;

  private constructor(database: IDBDatabase, raw: RawTextStore) {
    this.#database = database;
    this.#raw = raw;
  }

  /** Open (creating when needed) both databases through `factory`; `prefix` separates test databases. */
  static async open(factory: IDBFactory, prefix = 'burrow'): Promise<SessionDb> {
    if (!factory || typeof factory.open !== 'function') throw new Error('SessionDb.open: factory must be an IDBFactory (e.g. globalThis.indexedDB)');
    const request = factory.open(`${prefix}-sessions`, DATABASE_VERSION);
    request.onupgradeneeded = () => {
      const database = request.result;
      for (const [name, keyPath] of [
        ['sessions', 'id'],
        ['summaries', 'id'],
        ['meta', 'key'],
      ] as const) {
        if (!database.objectStoreNames.contains(name)) database.createObjectStore(name, { keyPath });
      }
    };
    const database = await promised(request);
    const raw = await RawTextStore.open(factory, `${prefix}-raw-text`);
    return new SessionDb(database, raw);
  }

  /** Every session's summary, most recently updated first. */
  async list(): Promise<SessionSummary[]> {
    const transaction = this.#database.transaction('summaries', 'readonly');
    const all = (await promised(transaction.objectStore('summaries').getAll())) as SessionSummary[];
    return all.sort((a, b) => (a.updatedAt < b.updatedAt ? 1 : a.updatedAt > b.updatedAt ? -1 : 0));
  }

  /** One stored session, or undefined (also for a record of an unknown schema version). */
  async get(id: string): Promise<SessionRecord | undefined> {
    const transaction = this.#database.transaction('sessions', 'readonly');
    const record = (await promised(transaction.objectStore('sessions').get(id))) as SessionRecord | undefined;
    return record && record.schema === SESSION_SCHEMA_VERSION ? record : undefined;
  }

  /** Store or replace a session and its summary, and make it the last one opened. */
  async put(record: SessionRecord): Promise<void> {
    if (typeof record.id !== 'string' || record.id === '') throw new Error(`SessionDb.put: id must be a non-empty string, got '${String(record.id)}'`);
    const transaction = this.#database.transaction(['sessions', 'summaries', 'meta'], 'readwrite');
    transaction.objectStore('sessions').put(record);
    transaction.objectStore('summaries').put(summarize(record));
    transaction.objectStore('meta').put({ key: 'lastSession', value: record.id });
    await done(transaction);
  }

  /** Rename a stored session (no error when it is absent). */
  async rename(id: string, name: string, updatedAt: string): Promise<void> {
    const record = await this.get(id);
    if (!record) return;
    await this.put({ ...record, name, updatedAt });
  }

  /** Delete a session, its summary and its raw files; forget it as the last session. */
  async delete(id: string): Promise<void> {
    const record = await this.get(id);
    const last = await this.lastSessionId();
    const transaction = this.#database.transaction(['sessions', 'summaries', 'meta'], 'readwrite');
    transaction.objectStore('sessions').delete(id);
    transaction.objectStore('summaries').delete(id);
    if (last === id) transaction.objectStore('meta').delete('lastSession');
    await done(transaction);
    for (const file of record?.files ?? []) await this.#raw.delete(rawKey(id, file.key));
  }

  /** The id of the session opened last, if it still exists. */
  async lastSessionId(): Promise<string | undefined> {
    const transaction = this.#database.transaction('meta', 'readonly');
    const entry = (await promised(transaction.objectStore('meta').get('lastSession'))) as { value: string } | undefined;
    return entry?.value;
  }

  /** Keep a file's raw text. */
  async putText(sessionId: string, fileKey: string, fileName: string, text: string): Promise<void> {
    await this.#raw.put({ key: rawKey(sessionId, fileKey), fileName, text });
  }

  /** A file's raw text, or undefined. */
  async getText(sessionId: string, fileKey: string): Promise<string | undefined> {
    return (await this.#raw.get(rawKey(sessionId, fileKey)))?.text;
  }

  /** Forget a file's raw text. */
  async deleteText(sessionId: string, fileKey: string): Promise<void> {
    await this.#raw.delete(rawKey(sessionId, fileKey));
  }

  /** Close both connections. */
  close(): void {
    this.#database.close();
    this.#raw.close();
  }
}

/** Key of a file's raw text in the RawTextStore. */
export function rawKey(sessionId: string, fileKey: string): string {
  return `${sessionId}/${fileKey}`;
}
