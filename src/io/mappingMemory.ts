import { COLUMN_ROLES, type ColumnRole, type MappingAnswer, type MappingLookup } from './types.ts';

/** Plain-JSON form of a MappingMemory (what IndexedDB or a JSON file stores). */
export interface MappingMemoryJSON {
  version: 1;
  answers: Record<string, MappingAnswer>;
}

function copyAnswer(answer: MappingAnswer): MappingAnswer {
  const copy: MappingAnswer = {};
  if (answer.columnRoles) copy.columnRoles = { ...answer.columnRoles };
  if (answer.units) copy.units = { ...answer.units };
  if (answer.piezoCalibrationMPerV !== undefined) copy.piezoCalibrationMPerV = answer.piezoCalibrationMPerV;
  return copy;
}

function readAnswer(signature: string, value: unknown): MappingAnswer {
  if (typeof value !== 'object' || value === null) throw new Error(`MappingMemory.fromJSON: answer for '${signature}' must be an object, got ${typeof value}`);
  const source = value as Record<string, unknown>;
  const answer: MappingAnswer = {};
  if (source.columnRoles !== undefined) {
    const roles: Record<number, ColumnRole> = {};
    for (const [key, role] of Object.entries(source.columnRoles as Record<string, unknown>)) {
      if (!COLUMN_ROLES.includes(role as ColumnRole)) throw new Error(`MappingMemory.fromJSON: role of column ${key} for '${signature}' must be one of ${COLUMN_ROLES.join('|')}, got '${String(role)}'`);
      roles[Number(key)] = role as ColumnRole;
    }
    answer.columnRoles = roles;
  }
  if (source.units !== undefined) {
    const units: Record<number, string> = {};
    for (const [key, unit] of Object.entries(source.units as Record<string, unknown>)) {
      if (typeof unit !== 'string') throw new Error(`MappingMemory.fromJSON: unit of column ${key} for '${signature}' must be a string, got ${typeof unit}`);
      units[Number(key)] = unit;
    }
    answer.units = units;
  }
  if (source.piezoCalibrationMPerV !== undefined) {
    const c = source.piezoCalibrationMPerV;
    if (typeof c !== 'number' || !(c > 0)) throw new Error(`MappingMemory.fromJSON: piezoCalibrationMPerV for '${signature}' must be > 0, got ${String(c)}`);
    answer.piezoCalibrationMPerV = c;
  }
  return answer;
}

/**
 * Mapping answers remembered per header signature, so the next file of the same shape imports
 * without asking. Pure: the dashboard stores toJSON() in IndexedDB, the CLI in a JSON file.
 * @example const m = new MappingMemory(); m.remember('comma|2|no header', { columnRoles: { 1: 'distance', 2: 'current' } }); m.get('comma|2|no header')?.columnRoles?.[2] // 'current'
 */
export class MappingMemory implements MappingLookup {
  #answers = new Map<string, MappingAnswer>();

  /** The answer remembered for a header signature (a copy), or undefined. */
  get(headerSignature: string): MappingAnswer | undefined {
    const answer = this.#answers.get(headerSignature);
    return answer ? copyAnswer(answer) : undefined;
  }

  /** Remember (or replace) the answer for a header signature; the answer is copied. */
  remember(headerSignature: string, answer: MappingAnswer): void {
    this.#answers.set(headerSignature, copyAnswer(answer));
  }

  /** Forget one signature; true when something was forgotten. */
  forget(headerSignature: string): boolean {
    return this.#answers.delete(headerSignature);
  }

  /** Number of remembered signatures. */
  get size(): number {
    return this.#answers.size;
  }

  /** Remembered signatures, sorted. */
  signatures(): string[] {
    return [...this.#answers.keys()].sort();
  }

  /** Plain JSON (sorted by signature), for IndexedDB or a file. */
  toJSON(): MappingMemoryJSON {
    const answers: Record<string, MappingAnswer> = {};
    for (const signature of this.signatures()) answers[signature] = copyAnswer(this.#answers.get(signature)!);
    return { version: 1, answers };
  }

  /** Rebuild from toJSON() output (or the parsed text of a JSON file); throws on a malformed value. */
  static fromJSON(json: unknown): MappingMemory {
    if (typeof json !== 'object' || json === null) throw new Error(`MappingMemory.fromJSON: expected an object, got ${json === null ? 'null' : typeof json}`);
    const source = json as Record<string, unknown>;
    if (source.version !== 1) throw new Error(`MappingMemory.fromJSON: version must be 1, got ${String(source.version)}`);
    if (typeof source.answers !== 'object' || source.answers === null) throw new Error('MappingMemory.fromJSON: answers must be an object');
    const memory = new MappingMemory();
    for (const [signature, answer] of Object.entries(source.answers as Record<string, unknown>)) memory.remember(signature, readAnswer(signature, answer));
    return memory;
  }
}
