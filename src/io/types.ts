/**
 * Data model of an imported text file: dialect, metadata, columns, curves and problems.
 * Every length, current and voltage inside a Curve is SI (m, A, V); the original header and unit
 * of each column stay recorded in `columns` so an export can write the file back in its own terms.
 */

/** Cell separator found in a file; 'whitespace' means runs of spaces and tabs. */
export type Delimiter = ',' | ';' | '\t' | 'whitespace';

/** Character between the integer and fractional digits of a number. */
export type DecimalMark = '.' | ',';

/** Line terminator found in a file ('mixed' when both LF and CRLF occur, 'none' for a single line). */
export type LineEnding = 'lf' | 'crlf' | 'cr' | 'mixed' | 'none';

/** How a file is written, as detected (or as defaulted when nothing could be read). */
export interface Dialect {
  delimiter: Delimiter;
  decimalMark: DecimalMark;
  /** 1-based line of the header row, or null when the file has none. */
  headerLine: number | null;
  /** 1-based line of a separate row of units below the header, or null. */
  unitsLine: number | null;
  /** 1-based line of the first data row, or null when no data was found. */
  dataStartLine: number | null;
  hasBOM: boolean;
  lineEnding: LineEnding;
  /** True when double quotes occur in the header or data (RFC 4180 quoting). */
  quoted: boolean;
}

/** What a column holds. 'unknown' only appears before a mapping answer (no header). */
export type ColumnRole =
  | 'distance'
  | 'piezo'
  | 'bias'
  | 'current'
  | 'conductance'
  | 'time'
  | 'segment'
  | 'curveId'
  | 'positionX'
  | 'positionY'
  | 'pointIndex'
  | 'ignore'
  | 'unknown';

/** Every role a mapping answer may assign, in the order a dialog would list them. */
export const COLUMN_ROLES: readonly ColumnRole[] = [
  'distance',
  'piezo',
  'bias',
  'current',
  'conductance',
  'time',
  'segment',
  'curveId',
  'positionX',
  'positionY',
  'pointIndex',
  'ignore',
];

/** One metadata value: the text as written and, for quantities, the value in SI with its SI unit. */
export interface MetadataEntry {
  /** Value text as written in the file (after the key and separator). */
  raw: string;
  /** Numeric value in SI units when the text held a number (with a unit for known quantities). */
  value?: number;
  /** SI unit of `value`: 'A', 'V', 'K', 'm', 'm/V', 's', ... ('' for a plain number). */
  unit?: string;
  /** Key exactly as written in the file ('' for free text). */
  label: string;
  /** 1-based line the entry came from (0 for entries made by the importer). */
  line: number;
}

/** Approach (tip moving in), retract (tip moving out) or a single sweep with no partner. */
export type Segment = 'approach' | 'retract' | 'single';

/** 'iz': current against tip–sample distance; 'iv': current against bias. */
export type CurveKind = 'iz' | 'iv';

/** One column as understood after detection and any mapping answer. */
export interface ImportColumn {
  /** 1-based position in the row, as in problems and mapping answers. */
  index: number;
  /** Header cell as written ('' when the file has no header). */
  header: string;
  /** Header without its unit ('column N' when the file has no header). */
  name: string;
  /** Unit as written in the header or units row ('' when none was given). */
  unit: string;
  /** SI unit the values are converted to ('m', 'A', 'V', 'S', 's', or '' for text and plain numbers). */
  siUnit: string;
  role: ColumnRole;
  /** Factor from file values to SI (a piezo voltage column includes the z calibration in m/V). */
  scaleToSI: number;
  /** True when no unit was written and SI was assumed. */
  unitAssumed: boolean;
  /** 'text' for columns of words (direction, curve labels), else 'number'. */
  valueType: 'number' | 'text';
  /** Segment named in the header itself, e.g. 'I retract (pA)'. */
  segmentHint?: Segment;
}

/** One sweep, ready for fitting: x and current in SI, with where it came from. */
export interface Curve {
  /** Stable id: file name, curve index and segment, e.g. 'run7.csv#0/approach'. */
  id: string;
  fileName: string;
  /** Curve number within the file; an approach and its retract share it. */
  index: number;
  segment: Segment;
  kind: CurveKind;
  /**
   * Sweep axis in SI: metres for 'iz', volts for 'iv'. For a large single curve this may be a view
   * into the column's buffer (shared with `current` of a sibling curve's axis); use slice() for an
   * independent copy before transferring it to a worker.
   */
  x: Float64Array;
  /** What the x column was: a gap/distance, a calibrated piezo position, or the bias. */
  xRole: 'distance' | 'piezo' | 'bias';
  /** Tunnelling current in amperes, one value per x. */
  current: Float64Array;
  /** Bias held during an 'iz' sweep, in volts (constant bias column, else metadata). */
  fixedBiasV?: number;
  /** Distance held during an 'iv' sweep, in metres (constant distance column). */
  fixedGapM?: number;
  /** Lateral tip position of this curve, in metres (grid files or metadata). */
  position?: { xM: number; yM: number };
  /** File metadata plus entries of this curve (curve label, block label, sweep direction). */
  metadata: Record<string, MetadataEntry>;
  /** 1-based indices of the columns the curve was built from (x first, then current). */
  sourceColumns: number[];
  /** 1-based line of the curve's first point in the file. */
  firstLine: number;
}

/** A located message about the input: data, never an exception. */
export interface ImportProblem {
  file: string;
  /** 1-based line (the first one when several lines were merged). */
  line: number;
  /** 1-based cell number in the row; for problems found before cells are split, the character position. */
  column: number;
  message: string;
  severity: 'error' | 'warning';
  /** Stable machine code, e.g. 'ragged', 'nonNumeric', 'needsMapping'. */
  code: string;
  /** How many occurrences were merged into this one problem. */
  count: number;
  /** Lines of the merged occurrences (at most the first 1000). */
  lines: number[];
}

/** A caller's answer to a mapping proposal; columns are 1-based. */
export interface MappingAnswer {
  /** Role of each column the caller decides, e.g. { 1: 'distance', 2: 'current' }. */
  columnRoles?: Record<number, ColumnRole>;
  /** Unit text of each column the caller decides, e.g. { 1: 'nm', 2: 'pA' }. */
  units?: Record<number, string>;
  /** Piezo z calibration in metres per volt, for a piezo column given in volts. */
  piezoCalibrationMPerV?: number;
}

/** One thing the importer could not decide alone, with the choices it sees. */
export interface MappingAmbiguity {
  kind: 'noHeader' | 'role' | 'unit' | 'calibration';
  /** 1-based columns concerned. */
  columns: number[];
  /** Roles or unit texts that would resolve it. */
  candidates: string[];
  message: string;
}

/** Returned instead of curves when the file cannot be read without an answer. */
export interface MappingProposal {
  /** Key under which the answer is remembered (see MappingMemory). */
  headerSignature: string;
  ambiguities: MappingAmbiguity[];
  /** Best guess; a dialog can pre-fill it and the caller may send it back as the answer. */
  suggested: MappingAnswer;
  /** Each column with a few raw sample values, to show in a dialog. */
  columns: { index: number; header: string; samples: string[] }[];
}

/** Everything learnt from one file. A file with errors still carries whatever could be read. */
export interface ImportedFile {
  fileName: string;
  /** Path on disk when the file was read by the Node wrapper (the CLI's way of keeping the raw text). */
  sourcePath?: string;
  /** The text as imported, when kept (see ImportOptions.keepRawText). */
  rawText?: string;
  /** Text encoding used by the Node wrapper ('utf-8', 'utf-16le', 'latin1'), when known. */
  encoding?: string;
  dialect: Dialect;
  metadata: Record<string, MetadataEntry>;
  columns: ImportColumn[];
  curves: Curve[];
  problems: ImportProblem[];
  proposal?: MappingProposal;
  /** Shape of the file (delimiter, column count, header names): the MappingMemory key. */
  headerSignature: string;
  /** Where the column mapping came from. */
  mappingSource: 'detected' | 'answer' | 'memory';
  /** Number of data rows read (rows left out for errors not counted). */
  rowCount: number;
}

/** Anything that can look up a remembered answer by header signature (MappingMemory does). */
export interface MappingLookup {
  get(headerSignature: string): MappingAnswer | undefined;
}

/** Options of importText, importChunks and createImporter. */
export interface ImportOptions {
  /** Explicit answer; wins over memory. */
  mapping?: MappingAnswer;
  /** Remembered answers, looked up by header signature. */
  memory?: MappingLookup;
  /** Keep the text in ImportedFile.rawText (default: true for importText, false when streaming). */
  keepRawText?: boolean;
  /** Path on disk, recorded in ImportedFile.sourcePath. */
  sourcePath?: string;
  /** Expected length of the whole text in characters (a file's size in bytes will do), to size storage once. */
  sizeHintChars?: number;
}
