/**
 * The comparison tab's state for one session: the quantity, the grouping and the include-flagged
 * switch the user chose, the group shown in the drift panel and on the map, and what follows from
 * them through compareRuns (the same numbers the HTML report prints). One per session, kept while
 * the page lives, so leaving the tab (to open a curve) and coming back keeps the choices.
 */
import {
  acquisitionTimes,
  compareRuns,
  GROUP_QUANTITIES,
  metadataKeys,
  metadataTableFromCurves,
  type GroupQuantityName,
  type GroupReport,
  type RunComparison,
} from '../analysis/index.ts';
import { writeReport } from '../io/index.ts';
import { DEFAULT_COMPARE_CHOICES, groupingFor, groupRows, pairRows, type CompareGroupBy } from './compare.ts';
import type { Session } from './session.svelte.ts';

export class CompareView {
  // Set first thing in the constructor; the deriveds below read it only when read themselves.
  readonly #session: Session = null as unknown as Session;
  quantity = $state<GroupQuantityName>(DEFAULT_COMPARE_CHOICES.quantity);
  groupBy = $state.raw<CompareGroupBy>(DEFAULT_COMPARE_CHOICES.groupBy);
  includeFlagged = $state(DEFAULT_COMPARE_CHOICES.includeFlagged);
  /** Key of the group in the drift panel (null: the first group with values). */
  driftKey = $state<string | null>(null);
  /** Key of the group on the map (null: the first group with a map). */
  mapKey = $state<string | null>(null);

  constructor(session: Session) {
    this.#session = session;
  }

  /** Metadata text per curve, from the loaded files' headers. */
  metadata = $derived(metadataTableFromCurves(this.#session.curves));
  /** Metadata keys found in the loaded files, for the "group by" menu. */
  metadataKeys = $derived(metadataKeys(this.metadata));
  /** Acquisition times from the 'date' entries, for the drift plot's time axis. */
  #times = $derived(acquisitionTimes(this.metadata));
  grouping = $derived(groupingFor(this.groupBy, this.#session.tags));

  /** The comparison, or the core's message when it refuses the input. */
  #outcome = $derived.by((): { comparison: RunComparison | null; error: string | null } => {
    try {
      const comparison = compareRuns({
        results: this.#session.results,
        quantity: this.quantity,
        grouping: this.grouping,
        metadata: this.metadata,
        includeFlagged: this.includeFlagged,
        timeSByCurve: this.#times,
      });
      return { comparison, error: null };
    } catch (error) {
      return { comparison: null, error: (error as Error).message };
    }
  });
  get comparison(): RunComparison | null {
    return this.#outcome.comparison;
  }
  get error(): string | null {
    return this.#outcome.error;
  }
  quantityInfo = $derived(GROUP_QUANTITIES[this.quantity]);
  groupRows = $derived(this.comparison ? groupRows(this.comparison) : []);
  pairRows = $derived(this.comparison ? pairRows(this.comparison) : []);
  /** Groups that have at least one used value (the drift menu). */
  driftGroups = $derived((this.comparison?.groups ?? []).filter((g) => g.values.points.length > 0));
  driftGroup = $derived<GroupReport | null>(this.driftGroups.find((g) => g.group.key === this.driftKey) ?? this.driftGroups[0] ?? null);
  /** Groups whose curves carry positions. */
  mapGroups = $derived((this.comparison?.groups ?? []).filter((g) => g.grid !== null && g.grid.cells.length > 0));
  mapGroup = $derived<GroupReport | null>(this.mapGroups.find((g) => g.group.key === this.mapKey) ?? this.mapGroups[0] ?? null);
  /** How many curves carry a tag. */
  taggedCount = $derived(Object.keys(this.#session.tags).length);

  /** The self-contained HTML report of the current comparison (writeReport, no script). */
  reportHtml(generatedAt: string): string {
    return writeReport({
      settings: this.#session.settings,
      results: this.#session.results,
      quantity: this.quantity,
      grouping: this.grouping,
      metadata: this.metadata,
      includeFlagged: this.includeFlagged,
      timeSByCurve: this.#times,
      generatedAt,
      source: `dashboard session “${this.#session.name}”`,
    });
  }
}

const views = new WeakMap<Session, CompareView>();

/**
 * The comparison state of a session (made on first use, then the same object). It is made in its
 * own effect root, so its deriveds outlive the component that first asked for it (the tab is
 * unmounted when the user opens a curve and mounted again on return).
 */
export function compareViewFor(session: Session): CompareView {
  let view = views.get(session);
  if (!view) {
    let made: CompareView | null = null;
    $effect.root(() => {
      made = new CompareView(session);
    });
    // Effects do not run outside a browser (server build in tests): there the view is made plainly.
    view = (made as CompareView | null) ?? new CompareView(session);
    views.set(session, view);
  }
  return view;
}
