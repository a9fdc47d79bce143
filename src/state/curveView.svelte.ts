/**
 * What the curve view shows for the selected curve: the per-point detail and the WKB-versus-exact
 * check (both computed in a long-lived worker, stale replies dropped), the barrier diagram at the
 * chosen bias, the flag whose points are highlighted, and the I(V) display toggles.
 */
import type { Curve } from '../io/index.ts';
import type { AnalysisSettings } from '../fit/index.ts';
import type { Junction } from '../physics/index.ts';
import type { BrowserTask, BrowserTaskResult } from '../workers/browserTasks.ts';
import { barrierDiagram, diagramJunction, type WkbDeviation } from './barrierDiagram.ts';
import { exclusionRegions, type CurveDetail } from './curveDetail.ts';
import { curveInput, fitKey } from './fitKey.ts';
import type { TaskClient } from './taskClient.ts';
import type { Workspace } from './workspace.svelte.ts';

/** Points of one flag to ring on the plots. */
export interface Highlight {
  curveId: string;
  code: string;
  pointIndices: readonly number[];
}

export class CurveView {
  readonly #workspace: Workspace;
  readonly #client: TaskClient<BrowserTask, BrowserTaskResult>;
  detail = $state.raw<CurveDetail | null>(null);
  detailError = $state<string | null>(null);
  detailLoading = $state(false);
  deviation = $state.raw<WkbDeviation | null>(null);
  deviationLoading = $state(false);
  highlight = $state.raw<Highlight | null>(null);
  /** I(V): show the Fowler–Nordheim plot instead of the normalised conductance. */
  fowlerNordheim = $state(false);
  #bias = $state.raw<{ curveId: string; biasV: number } | null>(null);
  #detailKey = '';
  #detailRequest = 0;
  #deviationKey = '';
  #deviationRequest = 0;
  #deviationTimer: ReturnType<typeof setTimeout> | null = null;
  /** Quiet time before a WKB check is requested, ms. */
  deviationDelayMs = 150;

  constructor(workspace: Workspace, client: TaskClient<BrowserTask, BrowserTaskResult>) {
    this.#workspace = workspace;
    this.#client = client;
  }

  get #session() {
    return this.#workspace.session;
  }
  /** The detail, only when it belongs to the selected curve. */
  current = $derived(this.detail && this.detail.curveId === this.#session?.selectedId ? this.detail : null);
  regions = $derived(this.current?.kind === 'iz' ? exclusionRegions(this.current.zNm, this.current.exclusion) : []);
  highlighted = $derived(this.highlight && this.highlight.curveId === this.#session?.selectedId ? this.highlight : null);

  /** Bias range of the selected spectrum, V (for the diagram's bias control). */
  #biasRange = $derived.by((): [number, number] | undefined => {
    const curve = this.#session?.selectedCurve;
    if (!curve || curve.kind !== 'iv' || curve.x.length === 0) return undefined;
    let lo = Infinity;
    let hi = -Infinity;
    for (const v of curve.x) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    return [lo, hi];
  });
  junction = $derived.by(() => {
    const session = this.#session;
    const result = session?.selectedResult;
    if (!session || !result) return null;
    return diagramJunction(result, session.selectedSettings, this.#biasRange);
  });
  diagramBiasV = $derived(this.#bias && this.#bias.curveId === this.#session?.selectedId ? this.#bias.biasV : (this.junction?.biasV ?? 0));
  diagram = $derived.by(() => {
    const junction = this.junction;
    const session = this.#session;
    if (!junction || !session) return null;
    return barrierDiagram(junction.junction, this.diagramBiasV, session.selectedSettings.temperatureK, session.selectedSettings.imagePotential);
  });

  /** Move the diagram's bias (V) for the selected curve. */
  setDiagramBias(biasV: number): void {
    const id = this.#session?.selectedId;
    if (id && Number.isFinite(biasV)) this.#bias = { curveId: id, biasV };
  }

  /** Ring a flag's points on the plots (again: clear). */
  toggleHighlight(code: string, pointIndices: readonly number[] | undefined): void {
    const id = this.#session?.selectedId;
    if (!id) return;
    if (this.highlight && this.highlight.curveId === id && this.highlight.code === code) this.highlight = null;
    else this.highlight = { curveId: id, code, pointIndices: pointIndices ?? [] };
  }

  /** Ask the worker for the detail of a curve (no request when the same one is loaded or loading). */
  requestDetail(curve: Curve | null, settings: AnalysisSettings, window: { fromNm: number; toNm: number } | null): void {
    if (!curve) {
      this.#detailKey = '';
      return;
    }
    const key = `${curve.id}\u0000${fitKey(curve, settings, window)}`;
    if (key === this.#detailKey) return;
    this.#detailKey = key;
    const request = ++this.#detailRequest;
    this.detailLoading = true;
    this.#client.run({ type: 'detail', curve: curveInput(curve, window), settings }).then(
      (reply) => {
        if (request !== this.#detailRequest || reply.type !== 'detail') return;
        this.detail = reply.detail;
        this.detailError = null;
        this.detailLoading = false;
      },
      (error: Error) => {
        if (request !== this.#detailRequest) return;
        this.detailError = error.message;
        this.detailLoading = false;
        this.#detailKey = '';
      },
    );
  }

  /** Ask the worker for the WKB-versus-exact check of the diagram's junction at its bias. */
  requestDeviation(junction: Junction | null, biasV: number, temperatureK: number, imagePotential: boolean): void {
    if (!junction || biasV === 0) {
      this.#deviationKey = '';
      this.deviation = null;
      return;
    }
    const key = JSON.stringify([junction, biasV, temperatureK, imagePotential]);
    if (key === this.#deviationKey) return;
    this.#deviationKey = key;
    const request = ++this.#deviationRequest;
    this.deviationLoading = true;
    // The exact current takes tens of ms: wait until the bias control rests before asking.
    if (this.#deviationTimer !== null) clearTimeout(this.#deviationTimer);
    this.#deviationTimer = setTimeout(() => {
      this.#deviationTimer = null;
      if (request === this.#deviationRequest) this.#runDeviation(request, junction, biasV, temperatureK, imagePotential);
    }, this.deviationDelayMs);
  }

  #runDeviation(request: number, junction: Junction, biasV: number, temperatureK: number, imagePotential: boolean): void {
    this.#client.run({ type: 'deviation', junction, biasV, temperatureK, imagePotential }).then(
      (reply) => {
        if (request !== this.#deviationRequest || reply.type !== 'deviation') return;
        this.deviation = reply.deviation;
        this.deviationLoading = false;
      },
      () => {
        if (request !== this.#deviationRequest) return;
        this.deviationLoading = false;
        this.#deviationKey = '';
      },
    );
  }
}
