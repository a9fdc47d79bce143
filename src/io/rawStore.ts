/**
 * Keeps the raw text of imported files in the browser's IndexedDB, so a file can be re-mapped
 * later without the original at hand. The command line keeps files by path instead
 * (ImportedFile.sourcePath). Works with any IDBFactory (window.indexedDB, a worker's, or
 * fake-indexeddb in tests).
 */

/** One stored file. */
export interface RawTextRecord {
  /** Caller's key, unique per file (e.g. the file name, or name plus size and date). */
  key: string;
  fileName: string;
  text: string;
}

import { done, promised } from './indexedDbPromises.ts';

const STORE_NAME = 'rawText';
const DATABASE_VERSION = 1;

/**
 * Raw text of imported files in one IndexedDB object store, keyed by RawTextRecord.key.
 * @example const store = await RawTextStore.open(indexedDB); await store.put({ key: 'a.csv', fileName: 'a.csv', text: 'z,I' });
 */
export class RawTextStore {
  readonly #database: IDBDatabase;

  private constructor(database: IDBDatabase) {
    this.#database = database;
  }

  /** Open (creating when needed) the database `databaseName` through `factory`. */
  static async open(factory: IDBFactory, databaseName = 'burrow-raw-text'): Promise<RawTextStore> {
    if (!factory || typeof factory.open !== 'function') throw new Error('RawTextStore.open: factory must be an IDBFactory (e.g. globalThis.indexedDB)');
    const request = factory.open(databaseName, DATABASE_VERSION);
    request.onupgradeneeded = () => {
      const database = request.result;
      if (!database.objectStoreNames.contains(STORE_NAME)) database.createObjectStore(STORE_NAME, { keyPath: 'key' });
    };
    return new RawTextStore(await promised(request));
  }

  /** Store or replace one file's text. */
  async put(record: RawTextRecord): Promise<void> {
    if (typeof record.key !== 'string' || record.key === '') throw new Error(`RawTextStore.put: key must be a non-empty string, got '${String(record.key)}'`);
    if (typeof record.text !== 'string') throw new Error(`RawTextStore.put: text must be a string, got ${typeof record.text}`);
    const transaction = this.#database.transaction(STORE_NAME, 'readwrite');
    transaction.objectStore(STORE_NAME).put({ key: record.key, fileName: record.fileName, text: record.text });
    await done(transaction);
  }

  /** The stored record for a key, or undefined. */
  async get(key: string): Promise<RawTextRecord | undefined> {
    const transaction = this.#database.transaction(STORE_NAME, 'readonly');
    const value = (await promised(transaction.objectStore(STORE_NAME).get(key))) as RawTextRecord | undefined;
    return value ?? undefined;
  }

  /** Every stored key, in IndexedDB key order. */
  async keys(): Promise<string[]> {
    const transaction = this.#database.transaction(STORE_NAME, 'readonly');
    const keys = await promised(transaction.objectStore(STORE_NAME).getAllKeys());
    return keys.map((k) => String(k));
  }

  /** Remove one record (no error when absent). */
  async delete(key: string): Promise<void> {
    const transaction = this.#database.transaction(STORE_NAME, 'readwrite');
    transaction.objectStore(STORE_NAME).delete(key);
    await done(transaction);
  }

  /** Close the database connection. */
  close(): void {
    this.#database.close();
  }
}
