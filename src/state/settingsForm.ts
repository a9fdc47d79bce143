/**
 * The settings form: which fields it shows and how, and one edit at a time turned into new settings
 * or an inline message. Every check is the core's validateSettings, so the form, the CLI and a
 * settings file accept exactly the same values. Pure.
 */
import { SETTINGS_SCHEMA, validateSettings, type AnalysisSettings, type RunOverride } from '../fit/index.ts';

/** A settings field the form edits (every field but the run overrides). */
export type SettingsField = keyof RunOverride;

/** How one field is shown. */
export interface FieldSpec {
  field: SettingsField;
  label: string;
  unit: string;
  input: 'number' | 'boolean' | 'choice';
  nullable: boolean;
  /** What an empty session value means, for nullable fields. */
  emptyMeaning?: string;
  choices?: readonly string[];
  help: string;
}

function numberSpec(field: SettingsField, label: string, help: string, emptyMeaning?: string): FieldSpec {
  const rule = SETTINGS_SCHEMA[field];
  if (rule.kind !== 'number') throw new Error(`numberSpec: ${field} is not a number field`);
  return { field, label, unit: rule.unit, input: 'number', nullable: rule.nullable, ...(emptyMeaning ? { emptyMeaning } : {}), help };
}

/** The form, in groups, in the order shown. */
export const SETTINGS_GROUPS: readonly { title: string; fields: readonly FieldSpec[] }[] = [
  {
    title: 'Tip geometry',
    fields: [
      numberSpec('tipRadiusNm', 'Tip radius', 'Paraboloid apex radius; ties the I(V) area to the barrier (A = πR/κ).', 'area fitted'),
      numberSpec('areaNm2', 'Effective area', 'Fixed tunnelling area; wins over the tip radius.', 'not fixed'),
    ],
  },
  {
    title: 'Materials',
    fields: [
      numberSpec('tipWorkFunctionEV', 'Tip work function φ1', 'When set, φ1 is held at this value in I(V) fits.', 'fitted'),
      numberSpec('sampleWorkFunctionEV', 'Sample work function φ2', 'Reference value shown beside the results; never held.', 'none'),
      numberSpec('fermiEnergyEV', 'Fermi energy', 'Above the band bottom, for the supply function.'),
    ],
  },
  {
    title: 'Conditions',
    fields: [
      numberSpec('temperatureK', 'Temperature', 'Fermi smearing of the energy integral.'),
      numberSpec('defaultBiasV', 'Bias of I(z) curves', 'Used when a curve carries no bias of its own.'),
      numberSpec('piezoCalibration', 'Piezo calibration', 'True displacement per reported displacement (enters φ_ap squared).'),
    ],
  },
  {
    title: 'Model',
    fields: [
      { field: 'model', label: 'Model', unit: '', input: 'choice', nullable: false, choices: SETTINGS_SCHEMA.model.kind === 'choice' ? SETTINGS_SCHEMA.model.choices : [], help: 'auto: I(z) line for approach curves, WKB for spectra.' },
      { field: 'imagePotential', label: 'Image potential', unit: '', input: 'boolean', nullable: false, help: 'Image-rounded barrier in the diagram and the exact-current check.' },
    ],
  },
  {
    title: 'Noise',
    fields: [
      numberSpec('noiseRelative', 'Relative noise', 'Known σ of the current as a fraction (0.02 = 2 %).', 'estimated'),
      numberSpec('noiseFloorA', 'Noise floor', 'Known additive current noise σ.', 'estimated'),
      numberSpec('saturationLimitA', 'Preamp limit', '|I| at or above it is clipped.', 'detected'),
    ],
  },
];

/** Every field spec by name. */
export const FIELD_SPECS: ReadonlyMap<SettingsField, FieldSpec> = new Map(SETTINGS_GROUPS.flatMap((g) => g.fields.map((f) => [f.field, f] as const)));

/** Text that sets a run override to null explicitly (instead of inheriting the session value). */
export const NONE_TEXT = 'none';

/**
 * The text an input shows for a field: the session value, or a run's override ('' = inherits).
 * @example fieldText(settings, null, 'tipRadiusNm') // '' (null: area fitted)
 */
export function fieldText(settings: AnalysisSettings, run: string | null, field: SettingsField): string {
  if (run === null) {
    const value = settings[field];
    return value === null ? '' : String(value);
  }
  const override = settings.runOverrides[run];
  if (!override || !(field in override)) return '';
  const value = override[field];
  return value === null ? NONE_TEXT : String(value);
}

/**
 * The path validateSettings uses for a field: 'temperatureK' or 'runOverrides.A-gold.temperatureK'.
 * @example fieldPath('A-gold', 'temperatureK') // 'runOverrides.A-gold.temperatureK'
 */
export function fieldPath(run: string | null, field: SettingsField): string {
  return run === null ? field : `runOverrides.${run}.${field}`;
}

function parseText(spec: FieldSpec, text: string, run: string | null): { inherit: true } | { value: unknown } {
  const trimmed = text.trim();
  if (run !== null && trimmed === '') return { inherit: true };
  if (spec.input === 'boolean') return { value: trimmed === 'true' || trimmed === 'on' ? true : trimmed === 'false' || trimmed === 'off' ? false : trimmed };
  if (spec.input === 'choice') return { value: trimmed };
  if (trimmed === '' || trimmed.toLowerCase() === NONE_TEXT || trimmed.toLowerCase() === 'null') return { value: null };
  const number = Number(trimmed.replace(/\s+/g, '').replace(/^([+-]?\d*),(\d+)$/, '$1.$2'));
  // Not a number: pass the text on so that validateSettings names what it got.
  return { value: Number.isFinite(number) && trimmed !== '' ? number : trimmed };
}

/**
 * Apply one edit: the new settings, or the core's message for that field (the settings unchanged).
 * For a run, empty text removes the override (the run inherits) and 'none' sets it to null.
 * @example editSettings(DEFAULT_SETTINGS, null, 'temperatureK', '-4').problem // 'temperatureK must be a number >= 0 and <= 2000 K, got -4'
 */
export function editSettings(settings: AnalysisSettings, run: string | null, field: SettingsField, text: string): { settings: AnalysisSettings; problem: string | null } {
  const spec = FIELD_SPECS.get(field);
  if (!spec) return { settings, problem: `unknown setting '${field}'` };
  const parsed = parseText(spec, text, run);
  const { runOverrides, ...session } = settings;
  const raw: Record<string, unknown> = { ...session, runOverrides: Object.fromEntries(Object.entries(runOverrides).map(([r, o]) => [r, { ...o }])) };
  if (run === null) {
    if ('inherit' in parsed) return { settings, problem: null };
    raw[field] = parsed.value;
  } else {
    const overrides = raw.runOverrides as Record<string, Record<string, unknown>>;
    const override = overrides[run] ?? {};
    if ('inherit' in parsed) delete override[field];
    else override[field] = parsed.value;
    if (Object.keys(override).length === 0) delete overrides[run];
    else overrides[run] = override;
  }
  const { settings: next, problems } = validateSettings(raw);
  const path = fieldPath(run, field);
  const mine = problems.find((p) => p.field === path);
  if (mine) return { settings, problem: mine.message };
  if (problems.length) return { settings, problem: problems[0].message };
  return { settings: next, problem: null };
}
