/**
 * One open session: its files, curves, settings, manual windows, mapping answers and fitted
 * results, plus what the user is looking at. Parsing and fitting run in the worker pool (the
 * environment provides the workers); this class keeps the results, knows which are stale (their
 * fit key differs from the current one), shows progress, cancels, and saves itself to IndexedDB.
 */
import { finishBatch, runOf, type CurveResult } from '../analysis/index.ts';
import { DEFAULT_SETTINGS, settingsForRun, type AnalysisSettings } from '../fit/index.ts';
import { failedImport, MappingMemory, readSettingsText, settingsAgree, type Curve, type ImportedFile, type MappingAnswer, type MappingMemoryJSON } from '../io/index.ts';
import { CancelledError, runPool, type ReplyMessage, type WorkerPort } from '../workers/pool.ts';
import type { BrowserTask, BrowserTaskResult } from '../workers/browserTasks.ts';
import { browserRows, curveLabel, neighbourCurve, runsOf, type FileColumns } from './curveBrowser.ts';
import { curveInput, fitKeys } from './fitKey.ts';
import { formatValue, plural } from './format.ts';
import type { SessionDb } from './sessionDb.ts';
import { editSettings, fieldPath, type SettingsField } from './settingsForm.ts';
import {
  cleanTags,
  DEFAULT_FILTERS,
  SESSION_SCHEMA_VERSION,
  type CurveFilters,
  type DashboardTab,
  type ManualWindow,
  type SessionFile,
  type SessionRecord,
  type StoredResult,
  type ViewState,
} from './types.ts';

/** What a session needs from the outside world (injected, so tests run it in Node). */
export interface SessionEnv {
  /** A worker speaking the browser task protocol (a web worker in the app, in-process in tests). */
  createWorker: () => WorkerPort;
  poolSize: number;
  /** Where sessions are saved; null keeps them in memory only. */
  db: SessionDb | null;
  now: () => Date;
  newId: () => string;
  /** Wait after the last change before saving, ms. */
  saveDelayMs: number;
  /** Wait after the last settings edit before refitting, ms (edits in a row refit once). */
  refitDelayMs: number;
  /** How often results arriving from the workers are merged into the tables while fitting, ms. */
  flushIntervalMs: number;
}

/** The current long-running job, for the progress bar. */
export interface Progress {
  phase: 'idle' | 'importing' | 'fitting';
  done: number;
  total: number;
  /** What is happening, or what happened last ('Fitted 96 curves in 2.1 s'). */
  message: string;
}

/** A message for the user (an import error, a cancelled fit, a failed save). */
export interface Notice {
  id: number;
  level: 'error' | 'warning' | 'info';
  text: string;
}

/** One file handed to the session: its name and either its bytes or its text. */
export interface FileInput {
  fileName: string;
  bytes?: Uint8Array;
  text?: string;
}

/** How a session starts. */
export interface SessionInit {
  id?: string;
  name?: string;
  createdAt?: string;
  settings?: AnalysisSettings;
  mappings?: MappingMemoryJSON;
  manualWindows?: Record<string, ManualWindow>;
  view?: ViewState;
  /** User tags by curve id. */
  tags?: Record<string, string>;
}

/** A file to import with the key it will have. */
interface PlannedFile {
  key: string;
  bytes?: Uint8Array;
  text?: string;
  mapping?: MappingAnswer;
}

/**
 * A file key not yet taken: the name itself, else 'name (2).csv', 'name (3).csv', …
 * @example uniqueFileKey('a.csv', new Set(['a.csv'])) // 'a (2).csv'
 */
export function uniqueFileKey(fileName: string, taken: ReadonlySet<string>): string {
  if (!taken.has(fileName)) return fileName;
  const dot = fileName.lastIndexOf('.');
  const stem = dot > 0 ? fileName.slice(0, dot) : fileName;
  const extension = dot > 0 ? fileName.slice(dot) : '';
  for (let n = 2; ; n++) {
    const candidate = `${stem} (${n})${extension}`;
    if (!taken.has(candidate)) return candidate;
  }
}

function sessionFileOf(key: string, file: ImportedFile, mapping: MappingAnswer | undefined): SessionFile {
  return {
    key,
    fileName: key,
    sizeChars: file.rawText?.length ?? 0,
    ...(mapping ? { mapping } : {}),
    problems: file.problems,
    ...(file.proposal ? { proposal: file.proposal } : {}),
    metadata: file.metadata,
    dialect: file.dialect,
    curveIds: file.curves.map((c) => c.id),
    rowCount: file.rowCount,
    mappingSource: file.mappingSource,
  };
}

/** A one-line description of a file's first error, with its location. */
export function describeFileErrors(file: SessionFile): string | null {
  const errors = file.problems.filter((p) => p.severity === 'error');
  if (errors.length === 0) return null;
  const first = errors[0];
  const more = errors.length > 1 ? ` (and ${plural(errors.length - 1, 'more error')})` : '';
  return `${file.fileName}, line ${first.line}, column ${first.column}: ${first.message}${more}`;
}

export class Session {
  readonly id: string;
  readonly createdAt: string;
  readonly #env: SessionEnv;
  name = $state('');

  #files = $state.raw<SessionFile[]>([]);
  #curves = $state.raw<Curve[]>([]);
  #stored = $state.raw<ReadonlyMap<string, StoredResult>>(new Map());
  #settings = $state.raw<AnalysisSettings>({ ...DEFAULT_SETTINGS, runOverrides: {} });
  #windows = $state.raw<Record<string, ManualWindow>>({});
  #tags = $state.raw<Record<string, string>>({});
  #mappings: MappingMemory;
  #texts = new Map<string, string>();

  selectedId = $state<string | null>(null);
  filters = $state<CurveFilters>({ ...DEFAULT_FILTERS });
  tab = $state<DashboardTab>('curve');
  progress = $state.raw<Progress>({ phase: 'idle', done: 0, total: 0, message: '' });
  notices = $state.raw<Notice[]>([]);
  saveStatus = $state<'saved' | 'pending' | 'saving' | 'failed' | 'memory'>('saved');
  /** Inline messages of rejected settings edits, by field path, with the text that was rejected. */
  settingsProblems = $state.raw<Record<string, { text: string; message: string }>>({});
  /** Files whose mapping question the user put off for now. */
  mappingDeferred = $state.raw<ReadonlySet<string>>(new Set());

  #controller: AbortController | null = null;
  #cancelRequested = false;
  #refitTimer: ReturnType<typeof setTimeout> | null = null;
  #saveTimer: ReturnType<typeof setTimeout> | null = null;
  #saving: Promise<void> = Promise.resolve();
  #busy = new Set<Promise<unknown>>();
  #noticeId = 0;
  #disposed = false;

  constructor(env: SessionEnv, init: SessionInit = {}) {
    this.#env = env;
    this.id = init.id ?? env.newId();
    this.createdAt = init.createdAt ?? env.now().toISOString();
    this.name = init.name ?? 'Untitled session';
    if (init.settings) this.#settings = init.settings;
    this.#mappings = init.mappings ? MappingMemory.fromJSON(init.mappings) : new MappingMemory();
    if (init.manualWindows) this.#windows = init.manualWindows;
    if (init.tags) this.#tags = cleanTags(init.tags);
    if (init.view) {
      this.selectedId = init.view.selectedCurveId;
      this.tab = init.view.tab;
      this.filters = { ...DEFAULT_FILTERS, ...init.view.filters };
    }
    this.saveStatus = env.db ? 'saved' : 'memory';
  }

  // ---- read side -------------------------------------------------------------------------

  get files(): readonly SessionFile[] {
    return this.#files;
  }
  get curves(): readonly Curve[] {
    return this.#curves;
  }
  get settings(): AnalysisSettings {
    return this.#settings;
  }
  get manualWindows(): Readonly<Record<string, ManualWindow>> {
    return this.#windows;
  }
  /** User tags by curve id (grouping by tag); curves without a tag are absent. */
  get tags(): Readonly<Record<string, string>> {
    return this.#tags;
  }
  get mappingMemory(): MappingMemoryJSON {
    return this.#mappings.toJSON();
  }
  /** The raw text of a file, as imported. */
  textOf(fileKey: string): string | undefined {
    return this.#texts.get(fileKey);
  }

  curveById = $derived(new Map(this.#curves.map((c) => [c.id, c])));
  fileByKey = $derived(new Map(this.#files.map((f) => [f.key, f])));
  /** Per-curve results as fitted, in curve order (before batch flags). */
  baseResults = $derived(this.#curves.map((c) => this.#stored.get(c.id)?.result).filter((r): r is CurveResult => r !== undefined));
  /** Results with the batch flags (hysteresis, batch outliers): what every view and export shows. */
  results = $derived(finishBatch(this.baseResults));
  resultById = $derived(new Map(this.results.map((r) => [r.curve, r])));
  runs = $derived(runsOf(this.#curves));
  /** Curves whose stored result is missing or was fitted with other settings or another window. */
  staleIds = $derived.by(() => {
    const keyOf = fitKeys(this.#settings);
    return this.#curves.filter((c) => this.#stored.get(c.id)?.fitKey !== keyOf(c, this.#windows[c.id])).map((c) => c.id);
  });
  problemCount = $derived(this.#files.reduce((n, f) => n + f.problems.length, 0));
  errorCount = $derived(this.#files.reduce((n, f) => n + f.problems.filter((p) => p.severity === 'error').length, 0));
  flaggedCount = $derived(this.results.filter((r) => r.flags.length > 0).length);
  pendingMappings = $derived(this.#files.filter((f) => f.proposal && !this.mappingDeferred.has(f.key)));
  #fileColumns = $derived.by(() => {
    const map = new Map<string, FileColumns>();
    const currentColumns = new Map<string, Set<number>>();
    for (const curve of this.#curves) {
      const set = currentColumns.get(curve.fileName) ?? new Set<number>();
      set.add(curve.sourceColumns[1]);
      currentColumns.set(curve.fileName, set);
    }
    for (const file of this.#files) {
      map.set(file.fileName, { columns: this.#columns.get(file.key) ?? [], curveCount: file.curveIds.length, currentColumns: currentColumns.get(file.key)?.size ?? 0 });
    }
    return map;
  });
  #columns = new Map<string, ImportedFile['columns']>();
  rows = $derived(
    browserRows({
      curves: this.#curves,
      results: this.resultById,
      files: this.#fileColumns,
      manualIds: new Set(Object.keys(this.#windows)),
      filters: this.filters,
    }),
  );
  selectedCurve = $derived(this.selectedId === null ? null : (this.curveById.get(this.selectedId) ?? null));
  selectedResult = $derived(this.selectedId === null ? null : (this.resultById.get(this.selectedId) ?? null));
  selectedFile = $derived(this.selectedCurve ? (this.fileByKey.get(this.selectedCurve.fileName) ?? null) : null);
  /** The settings in force for the selected curve's run. */
  selectedSettings = $derived(this.selectedCurve ? settingsForRun(this.#settings, runOf(this.selectedCurve)) : this.#settings);
  selectedWindow = $derived(this.selectedId === null ? null : (this.#windows[this.selectedId] ?? null));
  busy = $derived(this.progress.phase !== 'idle');

  /** The browser label of a curve ('curve 3', 'I site 2 · approach', …). */
  labelOf(curve: Curve): string {
    return curveLabel(curve, this.#fileColumns.get(curve.fileName));
  }

  // ---- selection and view ----------------------------------------------------------------

  /** Open a curve in the curve view. */
  select(curveId: string | null): void {
    if (curveId !== null && !this.curveById.has(curveId)) return;
    this.selectedId = curveId;
    this.scheduleSave();
  }

  /** The curve `step` rows away in the browser's current order (↑/↓). */
  neighbour(fromId: string | null, step: number): string | null {
    return neighbourCurve(this.rows, fromId, step);
  }

  setTab(tab: DashboardTab): void {
    this.tab = tab;
    this.scheduleSave();
  }

  setFilters(filters: Partial<CurveFilters>): void {
    this.filters = { ...this.filters, ...filters };
    this.scheduleSave();
  }

  notify(level: Notice['level'], text: string): void {
    this.notices = [...this.notices.slice(-5), { id: ++this.#noticeId, level, text }];
  }

  dismissNotice(id: number): void {
    this.notices = this.notices.filter((n) => n.id !== id);
  }

  // ---- files -----------------------------------------------------------------------------

  /**
   * Import files in the workers, add their curves, keep their text, then fit what is new. A file
   * with errors still adds whatever it could read; a file identical to one already loaded under
   * the same name is skipped.
   */
  addFiles(inputs: readonly FileInput[]): Promise<void> {
    return this.#track(this.#addFiles(inputs));
  }

  async #addFiles(inputs: readonly FileInput[]): Promise<void> {
    if (inputs.length === 0) return;
    const taken = new Set(this.#files.map((f) => f.key));
    const planned: (PlannedFile & { originalName: string })[] = inputs.map((input) => {
      const key = uniqueFileKey(input.fileName, taken);
      taken.add(key);
      return { key, originalName: input.fileName, ...(input.bytes ? { bytes: input.bytes } : {}), ...(input.text !== undefined ? { text: input.text } : {}) };
    });
    const imported = await this.#importPlanned(planned, `Reading ${plural(planned.length, 'file')}`);
    const kept: { key: string; file: ImportedFile }[] = [];
    imported.forEach((file, i) => {
      const plan = planned[i];
      if (plan.key !== plan.originalName && this.#texts.get(plan.originalName) === file.rawText) {
        this.notify('info', `${plan.originalName} is already loaded; skipped.`);
        return;
      }
      kept.push({ key: plan.key, file });
    });
    this.#addImported(kept);
    for (const { key } of kept) {
      const file = this.fileByKey.get(key);
      const errors = file ? describeFileErrors(file) : null;
      if (errors && !file?.proposal) this.notify('error', errors);
    }
    const firstNew = kept.flatMap((k) => k.file.curves)[0];
    if (firstNew && (this.selectedId === null || !this.curveById.has(this.selectedId))) this.selectedId = firstNew.id;
    const curves = kept.reduce((n, k) => n + k.file.curves.length, 0);
    this.progress = { phase: 'idle', done: 0, total: 0, message: `Read ${plural(kept.length, 'file')}, ${plural(curves, 'curve')}` };
    if (this.#env.db) for (const { key, file } of kept) await this.#env.db.putText(this.id, key, key, file.rawText ?? '');
    this.scheduleSave();
    await this.#fitStale();
  }

  async #importPlanned(planned: readonly PlannedFile[], message: string): Promise<ImportedFile[]> {
    if (planned.length === 0) return [];
    const memory = this.#mappings.toJSON();
    const tasks: BrowserTask[] = planned.map((p) => ({
      type: 'import',
      fileName: p.key,
      memory,
      ...(p.bytes ? { bytes: p.bytes } : {}),
      ...(p.text !== undefined ? { text: p.text } : {}),
      ...(p.mapping ? { mapping: p.mapping } : {}),
    }));
    if (this.progress.phase !== 'fitting') this.progress = { phase: 'importing', done: 0, total: tasks.length, message };
    const replies = await runPool<BrowserTask, BrowserTaskResult>(tasks, Math.min(this.#env.poolSize, tasks.length), this.#env.createWorker, {
      onProgress: (done, total) => {
        if (this.progress.phase === 'importing') this.progress = { phase: 'importing', done, total, message };
      },
    });
    if (this.progress.phase === 'importing') this.progress = { phase: 'idle', done: 0, total: 0, message: '' };
    return replies.map((reply, i) => {
      if (reply instanceof Error || reply.type !== 'import') {
        const text = planned[i].text;
        return { ...failedImport(planned[i].key, 'readFailed', reply instanceof Error ? reply.message : 'unexpected reply'), ...(text !== undefined ? { rawText: text } : {}) };
      }
      return reply.file;
    });
  }

  #addImported(entries: readonly { key: string; file: ImportedFile; mapping?: MappingAnswer }[]): void {
    if (entries.length === 0) return;
    const replaced = new Set(entries.map((e) => e.key));
    const files = this.#files.filter((f) => !replaced.has(f.key));
    const curves = this.#curves.filter((c) => !replaced.has(c.fileName));
    for (const { key, file, mapping } of entries) {
      files.push(sessionFileOf(key, file, mapping));
      curves.push(...file.curves);
      this.#texts.set(key, file.rawText ?? '');
      this.#columns.set(key, file.columns);
    }
    // Keep the order files were added in, with a re-imported file in its old place.
    const order = new Map(this.#files.map((f, i) => [f.key, i]));
    files.sort((a, b) => (order.get(a.key) ?? Infinity) - (order.get(b.key) ?? Infinity));
    const fileOrder = new Map(files.map((f, i) => [f.key, i]));
    const curveOrder = new Map(curves.map((c, i) => [c.id, i]));
    curves.sort((a, b) => (fileOrder.get(a.fileName)! - fileOrder.get(b.fileName)!) || curveOrder.get(a.id)! - curveOrder.get(b.id)!);
    this.#files = files;
    this.#curves = curves;
  }

  /**
   * Answer a file's mapping question: remember the answer for its header signature, re-import it
   * and every other waiting file of the same shape, and fit their curves.
   */
  answerMapping(fileKey: string, answer: MappingAnswer): Promise<void> {
    return this.#track(this.#answerMapping(fileKey, answer));
  }

  async #answerMapping(fileKey: string, answer: MappingAnswer): Promise<void> {
    const file = this.fileByKey.get(fileKey);
    if (!file) return;
    const signature = file.proposal?.headerSignature;
    if (signature) this.#mappings.remember(signature, answer);
    const others = signature ? this.#files.filter((f) => f.key !== fileKey && f.proposal?.headerSignature === signature) : [];
    const planned: PlannedFile[] = [
      { key: fileKey, text: this.#texts.get(fileKey) ?? '', mapping: answer },
      ...others.map((f) => ({ key: f.key, text: this.#texts.get(f.key) ?? '' })),
    ];
    const imported = await this.#importPlanned(planned, `Reading ${plural(planned.length, 'file')} with the new mapping`);
    this.#addImported(imported.map((f, i) => ({ key: planned[i].key, file: f, ...(i === 0 ? { mapping: answer } : {}) })));
    const updated = this.fileByKey.get(fileKey);
    const errors = updated ? describeFileErrors(updated) : null;
    if (errors && !updated?.proposal) this.notify('error', errors);
    if (updated && updated.curveIds.length) this.selectedId = updated.curveIds[0];
    this.scheduleSave();
    await this.#fitStale();
  }

  /** Put a mapping question off (the file stays, without curves, listed under Files). */
  deferMapping(fileKey: string): void {
    this.mappingDeferred = new Set([...this.mappingDeferred, fileKey]);
  }

  /** Ask a deferred mapping question again. */
  reopenMapping(fileKey: string): void {
    const next = new Set(this.mappingDeferred);
    next.delete(fileKey);
    this.mappingDeferred = next;
  }

  /** Remove a file with its curves, results, manual windows and stored text. */
  async removeFile(fileKey: string): Promise<void> {
    const file = this.fileByKey.get(fileKey);
    if (!file) return;
    const ids = new Set(file.curveIds);
    this.#files = this.#files.filter((f) => f.key !== fileKey);
    this.#curves = this.#curves.filter((c) => c.fileName !== fileKey);
    const stored = new Map(this.#stored);
    for (const id of ids) stored.delete(id);
    this.#stored = stored;
    this.#windows = Object.fromEntries(Object.entries(this.#windows).filter(([id]) => !ids.has(id)));
    this.#tags = Object.fromEntries(Object.entries(this.#tags).filter(([id]) => !ids.has(id)));
    this.#texts.delete(fileKey);
    this.#columns.delete(fileKey);
    if (this.selectedId !== null && ids.has(this.selectedId)) this.selectedId = this.#curves[0]?.id ?? null;
    await this.#env.db?.deleteText(this.id, fileKey);
    this.scheduleSave();
  }

  // ---- settings and manual windows --------------------------------------------------------

  /**
   * Edit one setting for the session (run = null) or for one run. A rejected value leaves the
   * settings as they are and records the core's message for that field; an accepted one schedules
   * a refit of the curves it affects.
   */
  editSetting(run: string | null, field: SettingsField, text: string): string | null {
    const { settings, problem } = editSettings(this.#settings, run, field, text);
    const path = fieldPath(run, field);
    const problems = { ...this.settingsProblems };
    if (problem) {
      problems[path] = { text, message: problem };
      this.settingsProblems = problems;
      return problem;
    }
    delete problems[path];
    this.settingsProblems = problems;
    if (settings !== this.#settings) {
      this.#settings = settings;
      this.scheduleSave();
      this.scheduleRefit();
    }
    return null;
  }

  /**
   * Settings files that came with the data (a dropped folder's settings.json): read and checked;
   * when they are valid and agree they replace the session's settings, else nothing changes and
   * the notice names the file, line and column. Returns whether the settings were applied.
   */
  applySettingsFiles(inputs: readonly FileInput[]): boolean {
    if (inputs.length === 0) return false;
    const settings: AnalysisSettings[] = [];
    for (const input of inputs) {
      const read = readSettingsText(input.text ?? new TextDecoder().decode(input.bytes ?? new Uint8Array(0)), input.fileName);
      if (!read.ok) {
        this.notify('error', `Settings not applied: ${read.message}`);
        return false;
      }
      settings.push(read.settings);
    }
    const names = inputs.map((input) => input.fileName).join(', ');
    if (!settingsAgree(settings)) {
      this.notify('error', `Settings not applied: the settings files ${names} disagree; load the one to use from Geometry & settings.`);
      return false;
    }
    this.replaceSettings(settings[0]);
    this.notify('info', `Settings from ${names} applied.`);
    return true;
  }

  /** Replace all settings at once (already validated), and refit what changed. */
  replaceSettings(settings: AnalysisSettings): void {
    this.#settings = settings;
    this.settingsProblems = {};
    this.scheduleSave();
    this.scheduleRefit();
  }

  /** Set (or clear, with null) the manual fit window of an I(z) curve, and refit it at once. */
  setManualWindow(curveId: string, window: ManualWindow | null): Promise<void> {
    const curve = this.curveById.get(curveId);
    if (!curve || curve.kind !== 'iz') return Promise.resolve();
    const next = { ...this.#windows };
    if (window && window.toNm > window.fromNm) next[curveId] = { fromNm: window.fromNm, toNm: window.toNm };
    else delete next[curveId];
    this.#windows = next;
    this.scheduleSave();
    return this.fitStale();
  }

  /** Tag curves (trimmed text; an empty tag removes theirs). Unknown curve ids are ignored. */
  setTag(curveIds: readonly string[], tag: string): void {
    const text = tag.trim();
    const next = { ...this.#tags };
    for (const id of curveIds) {
      if (!this.curveById.has(id)) continue;
      if (text) next[id] = text;
      else delete next[id];
    }
    this.#tags = next;
    this.scheduleSave();
  }

  // ---- fitting ---------------------------------------------------------------------------

  /** Refit after the refit delay (several edits in a row refit once). */
  scheduleRefit(): void {
    if (this.#refitTimer !== null) clearTimeout(this.#refitTimer);
    this.#refitTimer = setTimeout(() => {
      this.#refitTimer = null;
      void this.fitStale();
    }, this.#env.refitDelayMs);
  }

  /** Fit every stale curve now (a fit already running is replaced by this one). */
  fitStale(): Promise<void> {
    return this.#track(this.#fitStale());
  }

  /** Stop the running fit; results that arrived are kept, the rest stay stale. */
  cancel(): void {
    if (!this.#controller) return;
    this.#cancelRequested = true;
    this.#controller.abort();
  }

  async #fitStale(): Promise<void> {
    if (this.#refitTimer !== null) {
      clearTimeout(this.#refitTimer);
      this.#refitTimer = null;
    }
    if (this.#disposed) return;
    const ids = this.staleIds;
    if (ids.length === 0) return;
    this.#controller?.abort();
    const controller = new AbortController();
    this.#controller = controller;
    this.#cancelRequested = false;
    const settings = this.#settings;
    const windows = this.#windows;
    const keyOf = fitKeys(settings);
    const entries = ids.map((id) => {
      const curve = this.curveById.get(id)!;
      return { id, key: keyOf(curve, windows[id]), task: { type: 'analyze', curve: curveInput(curve, windows[id]), settings } as BrowserTask };
    });
    const total = entries.length;
    const started = performance.now();
    const message = `Fitting ${plural(total, 'curve')}`;
    this.progress = { phase: 'fitting', done: 0, total, message };
    const buffer: StoredResult[] = [];
    const flush = () => {
      if (buffer.length === 0) return;
      const next = new Map(this.#stored);
      for (const entry of buffer) next.set(entry.curveId, entry);
      buffer.length = 0;
      this.#stored = next;
    };
    const timer = setInterval(flush, this.#env.flushIntervalMs);
    // Each reply is caught on its way to the pool, so results arrive while the batch runs and
    // those that arrived before a cancel are kept.
    const createWorker = (): WorkerPort => {
      const port = this.#env.createWorker();
      return {
        postMessage: (m) => port.postMessage(m),
        onError: (listener) => port.onError(listener),
        terminate: () => port.terminate(),
        onMessage: (listener) =>
          port.onMessage((message) => {
            const reply = message as ReplyMessage<BrowserTaskResult>;
            if (!controller.signal.aborted && 'result' in reply && reply.result.type === 'analyze') {
              const entry = entries[reply.id];
              if (entry) buffer.push({ curveId: entry.id, fitKey: entry.key, result: reply.result.result });
            }
            listener(message);
          }),
      };
    };
    let done = 0;
    try {
      await runPool<BrowserTask, BrowserTaskResult>(
        entries.map((e) => e.task),
        Math.min(this.#env.poolSize, total),
        createWorker,
        {
          signal: controller.signal,
          onProgress: (count) => {
            done = count;
            if (this.#controller === controller) this.progress = { phase: 'fitting', done: count, total, message };
          },
        },
      );
      flush();
      if (this.#controller === controller) {
        const seconds = (performance.now() - started) / 1000;
        this.progress = { phase: 'idle', done: total, total, message: `Fitted ${plural(total, 'curve')} in ${formatValue(seconds, 2)} s` };
      }
    } catch (error) {
      flush();
      if (error instanceof CancelledError) {
        if (this.#controller === controller && this.#cancelRequested) {
          const text = `Cancelled after ${done} of ${plural(total, 'curve')}; the other ${total - done} keep their previous fit or stay unfitted (Fit to resume).`;
          this.progress = { phase: 'idle', done, total, message: text };
          this.notify('warning', text);
        }
      } else if (this.#controller === controller) {
        this.progress = { phase: 'idle', done, total, message: `Fitting stopped: ${(error as Error).message}` };
        this.notify('error', `Fitting stopped: ${(error as Error).message}`);
      }
    } finally {
      clearInterval(timer);
      if (this.#controller === controller) {
        this.#controller = null;
        this.#cancelRequested = false;
      }
      this.scheduleSave();
    }
  }

  // ---- persistence -----------------------------------------------------------------------

  /** The stored form of the session (see SessionRecord). */
  toRecord(): SessionRecord {
    return {
      schema: SESSION_SCHEMA_VERSION,
      id: this.id,
      name: this.name,
      createdAt: this.createdAt,
      updatedAt: this.#env.now().toISOString(),
      settings: this.#settings,
      mappings: this.#mappings.toJSON(),
      files: this.#files.map((f) => ({ key: f.key, fileName: f.fileName, ...(f.mapping ? { mapping: f.mapping } : {}) })),
      manualWindows: { ...this.#windows },
      results: this.#curves.map((c) => this.#stored.get(c.id)).filter((s): s is StoredResult => s !== undefined),
      view: { selectedCurveId: this.selectedId, tab: this.tab, filters: $state.snapshot(this.filters) },
      tags: { ...this.#tags },
    };
  }

  /** Save after the save delay (changes in a row save once). */
  scheduleSave(): void {
    if (!this.#env.db || this.#disposed) return;
    this.saveStatus = 'pending';
    if (this.#saveTimer !== null) clearTimeout(this.#saveTimer);
    this.#saveTimer = setTimeout(() => {
      this.#saveTimer = null;
      void this.save();
    }, this.#env.saveDelayMs);
  }

  /** Save now (waits for a save already under way). */
  save(): Promise<void> {
    const db = this.#env.db;
    if (!db) return Promise.resolve();
    if (this.#saveTimer !== null) {
      clearTimeout(this.#saveTimer);
      this.#saveTimer = null;
    }
    this.#saving = this.#saving.then(async () => {
      this.saveStatus = 'saving';
      try {
        await db.put(this.toRecord());
        if (this.#saveTimer === null) this.saveStatus = 'saved';
      } catch (error) {
        this.saveStatus = 'failed';
        this.notify('error', `Could not save the session: ${(error as Error).message}`);
      }
    });
    return this.#saving;
  }

  /** Resolves once no import, fit or save is running or scheduled (for tests and shutdown). */
  async settled(): Promise<void> {
    for (;;) {
      if (this.#refitTimer !== null) await this.fitStale();
      const running = [...this.#busy];
      if (running.length === 0 && this.#refitTimer === null) break;
      await Promise.allSettled(running);
    }
    if (this.#saveTimer !== null) await this.save();
    await this.#saving;
  }

  /** Stop timers and the running fit (the session object is no longer shown). */
  dispose(): void {
    this.#disposed = true;
    this.#controller?.abort();
    if (this.#refitTimer !== null) clearTimeout(this.#refitTimer);
    if (this.#saveTimer !== null) clearTimeout(this.#saveTimer);
    this.#refitTimer = null;
    this.#saveTimer = null;
  }

  /**
   * Rebuild a session from stored parts: re-import each file's text with its mapping (in the
   * workers), take the stored results whose curves still exist, and fit only what is stale.
   */
  static async restore(
    env: SessionEnv,
    init: SessionInit,
    files: readonly { key: string; text: string | undefined; mapping?: MappingAnswer }[],
    results: readonly StoredResult[],
  ): Promise<Session> {
    const session = new Session(env, init);
    await session.#track(session.#restore(files, results));
    return session;
  }

  async #restore(files: readonly { key: string; text: string | undefined; mapping?: MappingAnswer }[], results: readonly StoredResult[]): Promise<void> {
    const readable = files.filter((f) => f.text !== undefined);
    const imported = await this.#importPlanned(
      readable.map((f) => ({ key: f.key, text: f.text!, ...(f.mapping ? { mapping: f.mapping } : {}) })),
      `Restoring ${plural(readable.length, 'file')}`,
    );
    const entries: { key: string; file: ImportedFile; mapping?: MappingAnswer }[] = imported.map((file, i) => ({
      key: readable[i].key,
      file,
      ...(readable[i].mapping ? { mapping: readable[i].mapping } : {}),
    }));
    for (const missing of files.filter((f) => f.text === undefined)) {
      entries.push({ key: missing.key, file: failedImport(missing.key, 'textMissing', 'the stored text of this file is missing; add the file again') });
    }
    this.#addImported(entries);
    const known = this.curveById;
    this.#stored = new Map(results.filter((r) => known.has(r.curveId)).map((r) => [r.curveId, r]));
    if (this.selectedId !== null && !known.has(this.selectedId)) this.selectedId = this.#curves[0]?.id ?? null;
    await this.#fitStale();
  }

  #track<T>(promise: Promise<T>): Promise<T> {
    this.#busy.add(promise);
    const forget = () => this.#busy.delete(promise);
    promise.then(forget, forget);
    return promise;
  }
}
