/**
 * Every session the user has: the one open, the list of stored ones, and the actions on them
 * (new, demo, open, rename, delete, export to and import from a bundle). On start it reopens the
 * last session, or builds the demo session when there is none.
 */
import { DEMO_FILES, DEMO_SESSION_NAME, demoSettings } from './demo.ts';
import { Session, type SessionEnv } from './session.svelte.ts';
import { readBundle, writeBundle, type SessionBundle } from './sessionBundle.ts';
import { DEFAULT_FILTERS, type SessionSummary } from './types.ts';

export class Workspace {
  readonly #env: SessionEnv;
  session = $state.raw<Session | null>(null);
  sessions = $state.raw<SessionSummary[]>([]);
  /** 'starting' until the first session is open. */
  status = $state<'starting' | 'ready'>('starting');
  /** A problem that concerns the workspace as a whole (a bundle that could not be read). */
  error = $state<string | null>(null);

  constructor(env: SessionEnv) {
    this.#env = env;
  }

  get env(): SessionEnv {
    return this.#env;
  }

  /** Reopen the last session, else the most recent one, else build the demo session. */
  async start(): Promise<void> {
    const db = this.#env.db;
    if (db) {
      await this.refreshList();
      const last = (await db.lastSessionId()) ?? this.sessions[0]?.id;
      if (last && (await this.open(last))) {
        this.status = 'ready';
        return;
      }
    }
    this.status = 'ready';
    await this.loadDemo();
  }

  /** Reload the list of stored sessions. */
  async refreshList(): Promise<void> {
    if (this.#env.db) this.sessions = await this.#env.db.list();
  }

  async #leave(): Promise<void> {
    const current = this.session;
    if (!current) return;
    current.cancel();
    await current.save();
    current.dispose();
  }

  /** Open a stored session; false when it is not there. */
  async open(id: string): Promise<boolean> {
    const db = this.#env.db;
    if (!db) return false;
    const record = await db.get(id);
    if (!record) return false;
    await this.#leave();
    const files = [];
    for (const file of record.files) files.push({ key: file.key, text: await db.getText(record.id, file.key), ...(file.mapping ? { mapping: file.mapping } : {}) });
    const session = await Session.restore(
      this.#env,
      { id: record.id, name: record.name, createdAt: record.createdAt, settings: record.settings, mappings: record.mappings, manualWindows: record.manualWindows, view: record.view, tags: record.tags ?? {} },
      files,
      record.results,
    );
    this.session = session;
    await session.save();
    await this.refreshList();
    return true;
  }

  /** Start an empty session (default settings) and open it. */
  async newEmpty(): Promise<Session> {
    await this.#leave();
    const count = this.sessions.length + 1;
    const session = new Session(this.#env, { name: `Session ${count}` });
    this.session = session;
    await session.save();
    await this.refreshList();
    return session;
  }

  /** Build a new demo session from the bundled sample data and fit it. */
  async loadDemo(): Promise<Session> {
    await this.#leave();
    const session = new Session(this.#env, { name: DEMO_SESSION_NAME, settings: demoSettings() });
    this.session = session;
    await session.save();
    await this.refreshList();
    await session.addFiles(DEMO_FILES);
    await session.save();
    await this.refreshList();
    return session;
  }

  /** Rename a session (the open one or a stored one). */
  async rename(id: string, name: string): Promise<void> {
    const trimmed = name.trim();
    if (!trimmed) return;
    if (this.session?.id === id) {
      this.session.name = trimmed;
      await this.session.save();
    } else await this.#env.db?.rename(id, trimmed, this.#env.now().toISOString());
    await this.refreshList();
  }

  /** Delete a session; deleting the open one opens the next stored one, or an empty session. */
  async remove(id: string): Promise<void> {
    const db = this.#env.db;
    const wasOpen = this.session?.id === id;
    if (wasOpen && this.session) {
      this.session.cancel();
      this.session.dispose();
      this.session = null;
    }
    await db?.delete(id);
    await this.refreshList();
    if (wasOpen) {
      const next = this.sessions[0];
      if (!(next && (await this.open(next.id)))) await this.newEmpty();
    }
  }

  /** The open session as a bundle (JSON text), with every file's text. */
  exportBundle(): string {
    const session = this.session;
    if (!session) throw new Error('Workspace.exportBundle: no session is open');
    const record = session.toRecord();
    const bundle: SessionBundle = {
      format: 'burrow-session',
      version: 1,
      name: record.name,
      createdAt: record.createdAt,
      exportedAt: this.#env.now().toISOString(),
      settings: record.settings,
      mappings: record.mappings,
      manualWindows: record.manualWindows,
      files: record.files.map((f) => ({ ...f, text: session.textOf(f.key) ?? '' })),
      results: record.results,
      view: record.view,
      tags: record.tags ?? {},
    };
    return writeBundle(bundle);
  }

  /** Read a bundle into a new session (a new id, so it never overwrites one) and open it. */
  async importBundle(text: string): Promise<Session | null> {
    let bundle: SessionBundle;
    try {
      bundle = readBundle(text);
    } catch (error) {
      this.error = (error as Error).message;
      return null;
    }
    this.error = null;
    await this.#leave();
    const session = await Session.restore(
      this.#env,
      {
        name: bundle.name,
        settings: bundle.settings,
        mappings: bundle.mappings,
        manualWindows: bundle.manualWindows,
        view: { ...bundle.view, filters: { ...DEFAULT_FILTERS, ...bundle.view.filters } },
        tags: bundle.tags ?? {},
      },
      bundle.files.map((f) => ({ key: f.key, text: f.text, ...(f.mapping ? { mapping: f.mapping } : {}) })),
      bundle.results,
    );
    this.session = session;
    if (this.#env.db) for (const file of bundle.files) await this.#env.db.putText(session.id, file.key, file.fileName, file.text);
    await session.save();
    await this.refreshList();
    return session;
  }
}
