/**
 * The editable analysis settings kept with the data: tip–sample geometry, materials, temperature
 * and model choice. Plain JSON; every field is validated with a message that names the field, the
 * accepted range and the value received. Units are in the names.
 */
export interface AnalysisSettings {
  /** Paraboloid tip apex radius, nm; ties the I(V) area to the barrier (A = πR/κ). null: area fitted. */
  tipRadiusNm: number | null;
  /** Fixed effective area, nm² (overrides tipRadiusNm). null: not fixed. */
  areaNm2: number | null;
  /** Tip work function, eV: when set, φ1 is held at it in I(V) fits (the tip material). */
  tipWorkFunctionEV: number | null;
  /** Sample work function, eV: a reference value shown beside the results; never fixed. */
  sampleWorkFunctionEV: number | null;
  /** Temperature of the junction, K (Fermi smearing in the energy integral). */
  temperatureK: number;
  /** Fermi energy above the band bottom, eV. */
  fermiEnergyEV: number;
  /** Multiplies the z axis (true displacement per reported displacement); enters φ_ap squared. */
  piezoCalibration: number;
  /** Image-potential rounding of the barrier in I(V) fits (slower; physics.md §6). */
  imagePotential: boolean;
  /** Which model fits what: auto = I(z) for approach curves and WKB for spectra. */
  model: 'auto' | 'iz' | 'wkb' | 'simmons' | 'bdr';
  /** Known relative noise of the current (0.01 = 1 %); null: estimated per curve. */
  noiseRelative: number | null;
  /** Known additive current noise, A; null: estimated per curve. */
  noiseFloorA: number | null;
  /** Preamplifier limit, A: |I| at or above it is clipped. null: detected from the data. */
  saturationLimitA: number | null;
  /** Bias used for I(z) curves that carry none, V. */
  defaultBiasV: number;
  /** Per-run overrides (e.g. each tip's radius and work function), keyed by run name. */
  runOverrides: Record<string, RunOverride>;
}

/** The settings a run may override: every field but the overrides themselves. */
export type RunOverride = Partial<Omit<AnalysisSettings, 'runOverrides'>>;

export const DEFAULT_SETTINGS: Readonly<AnalysisSettings> = Object.freeze({
  tipRadiusNm: null,
  areaNm2: null,
  tipWorkFunctionEV: null,
  sampleWorkFunctionEV: null,
  temperatureK: 300,
  fermiEnergyEV: 5.5,
  piezoCalibration: 1,
  imagePotential: false,
  model: 'auto',
  noiseRelative: null,
  noiseFloorA: null,
  saturationLimitA: null,
  defaultBiasV: 0.1,
  runOverrides: {},
});

type NumberRule = { kind: 'number'; min: number; max: number; minExclusive?: boolean; nullable: boolean; unit: string };
type Rule = NumberRule | { kind: 'boolean' } | { kind: 'choice'; choices: readonly string[] };

/** Accepted range of each field: the schema the README documents. */
export const SETTINGS_SCHEMA: Readonly<Record<keyof RunOverride, Rule>> = {
  tipRadiusNm: { kind: 'number', min: 0, minExclusive: true, max: 1e5, nullable: true, unit: 'nm' },
  areaNm2: { kind: 'number', min: 0, minExclusive: true, max: 1e8, nullable: true, unit: 'nm²' },
  tipWorkFunctionEV: { kind: 'number', min: 0.05, max: 15, nullable: true, unit: 'eV' },
  sampleWorkFunctionEV: { kind: 'number', min: 0.05, max: 15, nullable: true, unit: 'eV' },
  temperatureK: { kind: 'number', min: 0, max: 2000, nullable: false, unit: 'K' },
  fermiEnergyEV: { kind: 'number', min: 0.1, max: 50, nullable: false, unit: 'eV' },
  piezoCalibration: { kind: 'number', min: 0.01, max: 100, nullable: false, unit: '' },
  imagePotential: { kind: 'boolean' },
  model: { kind: 'choice', choices: ['auto', 'iz', 'wkb', 'simmons', 'bdr'] },
  noiseRelative: { kind: 'number', min: 0, minExclusive: true, max: 10, nullable: true, unit: '' },
  noiseFloorA: { kind: 'number', min: 0, minExclusive: true, max: 1, nullable: true, unit: 'A' },
  saturationLimitA: { kind: 'number', min: 0, minExclusive: true, max: 1, nullable: true, unit: 'A' },
  defaultBiasV: { kind: 'number', min: -20, max: 20, nullable: false, unit: 'V' },
};

export interface SettingsProblem {
  field: string;
  message: string;
}

function describeRule(rule: NumberRule): string {
  const lower = `${rule.minExclusive ? '>' : '>='} ${rule.min}`;
  const unit = rule.unit ? ` ${rule.unit}` : '';
  return `a number ${lower} and <= ${rule.max}${unit}${rule.nullable ? ' or null' : ''}`;
}

/**
 * Validate a settings object (e.g. parsed JSON). Missing fields take the defaults; unknown fields
 * and out-of-range values are problems naming the field, the accepted range and the value received.
 * @example validateSettings({ temperatureK: -4 }).problems[0].message // "temperatureK must be a number >= 0 and <= 2000 K, got -4"
 */
export function validateSettings(raw: unknown): { settings: AnalysisSettings; problems: SettingsProblem[] } {
  const problems: SettingsProblem[] = [];
  const settings: AnalysisSettings = { ...DEFAULT_SETTINGS, runOverrides: {} };
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) {
    return { settings, problems: [{ field: '(root)', message: `settings must be a JSON object, got ${Array.isArray(raw) ? 'an array' : String(raw)}` }] };
  }
  const { runOverrides, ...fields } = raw as Record<string, unknown>;
  validateFields(fields, settings as unknown as Record<string, unknown>, '', problems);
  if (runOverrides !== undefined) {
    if (runOverrides === null || typeof runOverrides !== 'object' || Array.isArray(runOverrides)) {
      problems.push({ field: 'runOverrides', message: `runOverrides must be an object of run name → settings, got ${JSON.stringify(runOverrides)}` });
    } else {
      for (const [run, override] of Object.entries(runOverrides as Record<string, unknown>)) {
        const target: Record<string, unknown> = {};
        if (override === null || typeof override !== 'object' || Array.isArray(override)) {
          problems.push({ field: `runOverrides.${run}`, message: `runOverrides.${run} must be an object of settings, got ${JSON.stringify(override)}` });
          continue;
        }
        validateFields(override as Record<string, unknown>, target, `runOverrides.${run}.`, problems);
        settings.runOverrides[run] = target as RunOverride;
      }
    }
  }
  return { settings, problems };
}

/** The settings in force for one run: the session's, with that run's overrides on top. */
export function settingsForRun(settings: AnalysisSettings, run: string): AnalysisSettings {
  const override = settings.runOverrides[run];
  return override ? { ...settings, ...override } : settings;
}

function validateFields(raw: Record<string, unknown>, settings: Record<string, unknown>, prefix: string, problems: SettingsProblem[]): void {
  for (const [key, value] of Object.entries(raw)) {
    const field = prefix + key;
    const rule = (SETTINGS_SCHEMA as Record<string, Rule>)[key];
    if (!rule) {
      problems.push({ field, message: `unknown setting '${field}'; accepted: ${Object.keys(SETTINGS_SCHEMA).join(', ')}${prefix ? '' : ', runOverrides'}` });
      continue;
    }
    const shown = JSON.stringify(value);
    if (rule.kind === 'boolean') {
      if (typeof value !== 'boolean') problems.push({ field, message: `${field} must be true or false, got ${shown}` });
      else settings[key] = value;
    } else if (rule.kind === 'choice') {
      if (typeof value !== 'string' || !rule.choices.includes(value)) problems.push({ field, message: `${field} must be one of ${rule.choices.join('|')}, got ${shown}` });
      else settings[key] = value;
    } else {
      const ok =
        (value === null && rule.nullable) ||
        (typeof value === 'number' && Number.isFinite(value) && (rule.minExclusive ? value > rule.min : value >= rule.min) && value <= rule.max);
      if (!ok) problems.push({ field, message: `${field} must be ${describeRule(rule)}, got ${shown}` });
      else settings[key] = value;
    }
  }
}
