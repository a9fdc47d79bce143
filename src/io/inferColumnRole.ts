import type { ColumnRole, Segment } from './types.ts';
import type { ParsedUnit, UnitDimension } from './parseUnit.ts';

/** Role and unit reading chosen for one column from its header name and unit. */
export interface RoleGuess {
  role: ColumnRole;
  /** The unit reading that fits the role (undefined when no unit was written or none fits). */
  unit?: ParsedUnit;
  /** Segment named in the header, e.g. 'retract' for 'I_ret'. */
  segmentHint?: Segment;
  /** Set when the name and the unit disagree, e.g. 'current' in nm. */
  conflict?: string;
}

/** Dimension each numeric role expects; undefined for roles without a physical unit. */
export const DIMENSION_OF_ROLE: Readonly<Partial<Record<ColumnRole, UnitDimension>>> = {
  distance: 'length',
  bias: 'voltage',
  current: 'current',
  conductance: 'conductance',
  time: 'time',
  positionX: 'length',
  positionY: 'length',
};

// Header vocabularies. These are words of the trade (common practice, no source), matched on
// lower-case tokens with trailing digits removed, so 'I2', 'z_1' and 'Current 3' all match.
const SEGMENT_NAMES = new Set(['direction', 'dir', 'segment', 'seg', 'branch', 'leg', 'approachretract', 'sweepdirection', 'movement']);
const CURVE_NAMES = new Set(['curve', 'curveid', 'curveno', 'curvenr', 'curvenumber', 'curveindex', 'id', 'sweep', 'sweepid', 'sweepno', 'sweepnumber', 'sweepindex', 'trace', 'traceid', 'spectrum', 'spectrumid', 'spectrumno', 'run', 'series', 'cycle', 'repeat', 'repetition', 'block', 'set']);
const POINT_NAMES = new Set(['index', 'idx', 'point', 'pointno', 'pointnr', 'pointindex', 'pt', 'n', 'no', 'nr', 'row', '#', 'step', 'sampleno']);
const X_NAMES = new Set(['x', 'xpos', 'xposition', 'positionx', 'posx', 'xoffset', 'xcoord', 'xcoordinate', 'xtip', 'tipx']);
const Y_NAMES = new Set(['y', 'ypos', 'yposition', 'positiony', 'posy', 'yoffset', 'ycoord', 'ycoordinate', 'ytip', 'tipy']);
const PIEZO_WORDS = new Set(['piezo', 'zpiezo', 'piezoz', 'zp', 'extension', 'zextension', 'zdrive', 'scanner', 'zscanner']);
const DISTANCE_WORDS = new Set(['z', 'gap', 'distance', 'height', 'separation', 'displacement', 'dz', 'deltaz', 'zrel', 'zpos', 'zposition', 'tipheight', 'tipz', 's']);
const CONDUCTANCE_WORDS = new Set(['g', 'conductance', 'didv', 'lockin', 'lia', 'dydx', 'differentialconductance']);
const BIAS_WORDS = new Set(['bias', 'voltage', 'v', 'u', 'vbias', 'ubias', 'vb', 'vs', 'vsample', 'samplevoltage', 'biasvoltage', 'vgap', 'vt', 'ub']);
const CURRENT_WORDS = new Set(['i', 'current', 'it', 'itunnel', 'itip', 'isample', 'tunnelcurrent', 'tunnelingcurrent', 'tunnellingcurrent', 'signal']);
const TIME_WORDS = new Set(['t', 'time', 'elapsed', 'timestamp', 'ts', 'clock']);
const APPROACH_WORDS = new Set(['approach', 'app', 'appr', 'fwd', 'forward', 'in', 'toward', 'towards', 'extend', 'advance']);
const RETRACT_WORDS = new Set(['retract', 'ret', 'retr', 'bwd', 'backward', 'back', 'out', 'withdraw', 'withdrawal', 'reverse', 'rev']);

/** Lower-case tokens of a header name, split at anything that is not a letter, digit, # or /. */
function tokensOf(name: string): string[] {
  return name
    .toLowerCase()
    .normalize('NFC')
    .split(/[^\p{L}\p{N}#/]+/u)
    .filter((t) => t !== '')
    .map((t) => (/^\p{L}+\d+$/u.test(t) ? t.replace(/\d+$/, '') : t));
}

/** Segment word alone, e.g. 'approach' or 'ret'; undefined for anything else. */
export function segmentFromWord(word: string): Segment | undefined {
  const w = word.trim().toLowerCase();
  if (APPROACH_WORDS.has(w)) return 'approach';
  if (RETRACT_WORDS.has(w)) return 'retract';
  return undefined;
}

function roleFromName(name: string): ColumnRole {
  const tokens = tokensOf(name);
  if (tokens.length === 0) return 'unknown';
  const compact = tokens.join('').replace(/\//g, '');
  const compactNoMarks = compact.replace(/#/g, '') || '#';
  const has = (set: Set<string>) => set.has(compact) || tokens.some((t) => set.has(t.replace(/\//g, '')));
  // Order matters: 'piezo voltage' is a piezo column, 'dI/dV' a conductance, 'sweep direction' a segment.
  if (SEGMENT_NAMES.has(compact) || tokens.includes('direction')) return 'segment';
  if (CURVE_NAMES.has(compactNoMarks)) return 'curveId';
  if (POINT_NAMES.has(compactNoMarks)) return 'pointIndex';
  if (X_NAMES.has(compact)) return 'positionX';
  if (Y_NAMES.has(compact)) return 'positionY';
  if (has(PIEZO_WORDS)) return 'piezo';
  if (has(CONDUCTANCE_WORDS) || compact === 'di/dv' || compact.startsWith('didv')) return 'conductance';
  if (has(DISTANCE_WORDS) && !tokens.includes('current')) return 'distance';
  if (has(BIAS_WORDS)) return 'bias';
  if (has(CURRENT_WORDS)) return 'current';
  if (has(TIME_WORDS)) return 'time';
  return 'unknown';
}

function roleFromDimension(dimension: UnitDimension): ColumnRole {
  switch (dimension) {
    case 'length':
      return 'distance';
    case 'voltage':
      return 'bias';
    case 'current':
      return 'current';
    case 'conductance':
      return 'conductance';
    case 'time':
      return 'time';
    default:
      return 'unknown';
  }
}

/**
 * Guess a column's role from its header name and the readings of its unit.
 * The name decides when the unit agrees (or is absent); a length-like name in volts is a piezo
 * voltage; when name and unit disagree, the unit wins and `conflict` says so.
 * @example inferColumnRole('Current', parseUnit('pA')).role // 'current'
 */
export function inferColumnRole(name: string, units: readonly ParsedUnit[]): RoleGuess {
  const byName = roleFromName(name);
  const tokens = tokensOf(name);
  let segmentHint: Segment | undefined;
  for (const t of tokens.slice(1)) segmentHint ??= segmentFromWord(t);

  if (byName === 'piezo') {
    const unit = units.find((u) => u.dimension === 'length' || u.dimension === 'voltage');
    return { role: 'piezo', unit, segmentHint };
  }
  const expected = DIMENSION_OF_ROLE[byName];
  if (byName !== 'unknown' && (units.length === 0 || expected === undefined)) {
    return { role: byName, segmentHint };
  }
  if (expected) {
    const fitting = units.find((u) => u.dimension === expected);
    if (fitting) return { role: byName, unit: fitting, segmentHint };
    const voltage = units.find((u) => u.dimension === 'voltage');
    if (byName === 'distance' && voltage) return { role: 'piezo', unit: voltage, segmentHint };
  }
  // No usable name: let the unit speak. A bare 'A' means ampere unless the name said length.
  const first = units[0];
  if (!first) return { role: byName, segmentHint };
  const byUnit = roleFromDimension(first.dimension);
  if (byName === 'unknown') return { role: byUnit, unit: first, segmentHint };
  return {
    role: byUnit,
    unit: first,
    segmentHint,
    conflict: `the name reads as ${byName} but the unit '${first.text}' is a ${first.dimension}`,
  };
}
