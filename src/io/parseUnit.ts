/**
 * Unit texts as they appear in instrument exports, read into a dimension and a factor to SI.
 * Prefixes: f p n µ (also μ and u) m k. Lengths also in ångström (Å, A, angstrom).
 * A bare 'A' is either an ampere or an ångström; parseUnit returns both readings and the column
 * role (current or distance) decides.
 */

/** Physical dimension of a unit, as far as import needs to tell them apart. */
export type UnitDimension =
  | 'length'
  | 'current'
  | 'voltage'
  | 'conductance'
  | 'time'
  | 'temperature'
  | 'lengthPerVoltage'
  | 'frequency';

/** One reading of a unit text. SI value = file value × scaleToSI + offsetToSI. */
export interface ParsedUnit {
  /** The unit text as given (trimmed). */
  text: string;
  dimension: UnitDimension;
  scaleToSI: number;
  /** Non-zero only for degrees Celsius (273.15 K). */
  offsetToSI: number;
  /** SI unit symbol of the dimension: m, A, V, S, s, K, m/V, Hz. */
  siUnit: string;
}

/** SI unit symbol for each dimension. */
export const SI_UNIT_OF: Readonly<Record<UnitDimension, string>> = {
  length: 'm',
  current: 'A',
  voltage: 'V',
  conductance: 'S',
  time: 's',
  temperature: 'K',
  lengthPerVoltage: 'm/V',
  frequency: 'Hz',
};

// BIPM, The International System of Units (SI Brochure, 9th edition 2019), Table 7: SI prefixes.
// Only the prefixes met in STM exports are accepted; 'u' is the common ASCII stand-in for µ.
const PREFIXES: Readonly<Record<string, number>> = {
  '': 1,
  f: 1e-15,
  p: 1e-12,
  n: 1e-9,
  '\u00b5': 1e-6,
  '\u03bc': 1e-6,
  u: 1e-6,
  m: 1e-3,
  k: 1e3,
};

interface BaseUnit {
  dimension: UnitDimension;
  scale: number;
  offset: number;
  /** Whether SI prefixes may precede it. */
  prefixable: boolean;
}

// BIPM SI Brochure, 8th edition (2006), Table 8: 1 Å = 0.1 nm = 1e-10 m.
const ANGSTROM_M = 1e-10;
// BIPM SI Brochure, 9th edition (2019), section 2.3.1: t/°C = T/K − 273.15.
const CELSIUS_OFFSET_K = 273.15;

const BASE_UNITS: Readonly<Record<string, BaseUnit[]>> = {
  m: [{ dimension: 'length', scale: 1, offset: 0, prefixable: true }],
  A: [
    { dimension: 'current', scale: 1, offset: 0, prefixable: true },
    { dimension: 'length', scale: ANGSTROM_M, offset: 0, prefixable: false },
  ],
  '\u00c5': [{ dimension: 'length', scale: ANGSTROM_M, offset: 0, prefixable: false }],
  V: [{ dimension: 'voltage', scale: 1, offset: 0, prefixable: true }],
  S: [{ dimension: 'conductance', scale: 1, offset: 0, prefixable: true }],
  s: [{ dimension: 'time', scale: 1, offset: 0, prefixable: true }],
  K: [{ dimension: 'temperature', scale: 1, offset: 0, prefixable: true }],
  '\u00b0C': [{ dimension: 'temperature', scale: 1, offset: CELSIUS_OFFSET_K, prefixable: false }],
  Hz: [{ dimension: 'frequency', scale: 1, offset: 0, prefixable: true }],
};

// Spelled-out forms, compared in lower case. Not prefixable.
const WORD_UNITS: Readonly<Record<string, BaseUnit>> = {
  angstrom: { dimension: 'length', scale: ANGSTROM_M, offset: 0, prefixable: false },
  angstroms: { dimension: 'length', scale: ANGSTROM_M, offset: 0, prefixable: false },
  ang: { dimension: 'length', scale: ANGSTROM_M, offset: 0, prefixable: false },
  degc: { dimension: 'temperature', scale: 1, offset: CELSIUS_OFFSET_K, prefixable: false },
  sec: { dimension: 'time', scale: 1, offset: 0, prefixable: false },
  volt: { dimension: 'voltage', scale: 1, offset: 0, prefixable: false },
  volts: { dimension: 'voltage', scale: 1, offset: 0, prefixable: false },
};

function readSimpleUnit(text: string): BaseUnit[] {
  const word = WORD_UNITS[text.toLowerCase()];
  if (word) return [word];
  const readings: BaseUnit[] = [];
  const whole = BASE_UNITS[text];
  if (whole) readings.push(...whole);
  // A prefix is one character; µ and μ are single UTF-16 code units.
  if (text.length >= 2) {
    const prefix = PREFIXES[text[0]];
    const rest = BASE_UNITS[text.slice(1)];
    if (prefix !== undefined && rest) {
      for (const base of rest) {
        if (base.prefixable) readings.push({ ...base, scale: prefix * base.scale });
      }
    }
  }
  return readings;
}

/** Normalise the spellings of Å, µ and ° that look alike but differ in code points. */
function normaliseUnitText(text: string): string {
  // Unicode NFC maps U+212B ANGSTROM SIGN (and A + combining ring) to U+00C5.
  return text.normalize('NFC').replace(/\u00ba/g, '\u00b0').replace(/^deg\s*C$/i, 'degC');
}

/**
 * Every reading of a unit text, most likely first; empty when the text is not a unit.
 * Accepts simple units with an optional prefix (nm, pA, mV, µs, Å) and the two quotients that
 * occur in exports: length per voltage (piezo calibration, nm/V) and current per voltage (nA/V).
 * SI value = value × scaleToSI + offsetToSI.
 * Source: BIPM SI Brochure 9th ed. (2019), Table 7 (prefixes); 8th ed. (2006), Table 8 (ångström).
 * @example parseUnit('pA')[0].scaleToSI // 1e-12
 */
export function parseUnit(text: string): ParsedUnit[] {
  const trimmed = normaliseUnitText(text.trim());
  if (trimmed === '' || trimmed.length > 16) return [];
  const slash = trimmed.indexOf('/');
  if (slash > 0) {
    const top = readSimpleUnit(trimmed.slice(0, slash).trim());
    const bottom = readSimpleUnit(trimmed.slice(slash + 1).trim());
    const readings: ParsedUnit[] = [];
    for (const t of top) {
      for (const b of bottom) {
        if (b.dimension !== 'voltage') continue;
        const scale = t.scale / b.scale;
        if (t.dimension === 'length') readings.push({ text: trimmed, dimension: 'lengthPerVoltage', scaleToSI: scale, offsetToSI: 0, siUnit: 'm/V' });
        if (t.dimension === 'current') readings.push({ text: trimmed, dimension: 'conductance', scaleToSI: scale, offsetToSI: 0, siUnit: 'S' });
      }
    }
    return readings;
  }
  return readSimpleUnit(trimmed).map((base) => ({
    text: trimmed,
    dimension: base.dimension,
    scaleToSI: base.scale,
    offsetToSI: base.offset,
    siUnit: SI_UNIT_OF[base.dimension],
  }));
}

/**
 * The reading of a unit text in one dimension, or undefined when the text is not such a unit.
 * @example parseUnitAs('A', 'length')?.scaleToSI // 1e-10 (ångström)
 */
export function parseUnitAs(text: string, dimension: UnitDimension): ParsedUnit | undefined {
  return parseUnit(text).find((u) => u.dimension === dimension);
}
