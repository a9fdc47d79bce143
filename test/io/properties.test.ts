import { readFileSync, readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { importChunks, importText, type ImportedFile } from '../../src/io/index.ts';

const fixtureDir = new URL('../fixtures/import/', import.meta.url);
const goodFixtures = readdirSync(fileURLToPath(fixtureDir))
  .filter((name) => !name.startsWith('bad-'))
  .sort()
  .map((name) => ({ name, text: readFileSync(fileURLToPath(new URL(name, fixtureDir)), 'utf8') }));

/** The contract: never throw; always curves or located problems; curves hold finite SI values. */
function expectWellFormed(file: ImportedFile, fileName: string): void {
  expect(file.curves.length > 0 || file.problems.length > 0).toBe(true);
  for (const problem of file.problems) {
    expect(problem.file).toBe(fileName);
    expect(Number.isInteger(problem.line) && problem.line >= 1).toBe(true);
    expect(Number.isInteger(problem.column) && problem.column >= 1).toBe(true);
    expect(problem.message.length).toBeGreaterThan(0);
    expect(['error', 'warning']).toContain(problem.severity);
  }
  if (file.proposal) expect(file.problems.some((p) => p.code === 'needsMapping')).toBe(true);
  for (const curve of file.curves) {
    expect(curve.x.length).toBe(curve.current.length);
    expect(curve.x.length).toBeGreaterThanOrEqual(2);
    for (let i = 0; i < curve.x.length; i++) {
      expect(Number.isFinite(curve.x[i]) && Number.isFinite(curve.current[i])).toBe(true);
    }
  }
}

// Characters that matter to the importer: delimiters, decimal marks, quotes, comment markers,
// line ends, digits, exponent and sign, NUL, BOM, micro sign and a few letters.
const interesting = fc.constantFrom(',', ';', '\t', ' ', '\n', '\r', '"', '#', '%', '/', '0', '1', '5', '9', '.', 'e', '-', '+', 'a', 'NaN', 'Inf', '\u0000', '\ufeff', 'µ', 'Å', '(', ')', '[', ']', '=', ':');
const snippet = fc.array(interesting, { maxLength: 12 }).map((parts) => parts.join(''));

type Mutation =
  | { kind: 'insert'; at: number; text: string }
  | { kind: 'delete'; at: number; length: number }
  | { kind: 'replace'; at: number; length: number; text: string }
  | { kind: 'duplicateLine'; at: number }
  | { kind: 'dropLine'; at: number };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: snippet }),
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 40 }) }),
  fc.record({ kind: fc.constant('replace' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 8 }), text: snippet }),
  fc.record({ kind: fc.constant('duplicateLine' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('dropLine' as const), at: fc.nat() }),
);

function mutate(text: string, mutations: readonly Mutation[]): string {
  let out = text;
  for (const m of mutations) {
    const at = out.length === 0 ? 0 : m.at % (out.length + 1);
    if (m.kind === 'insert') out = out.slice(0, at) + m.text + out.slice(at);
    else if (m.kind === 'delete') out = out.slice(0, at) + out.slice(at + m.length);
    else if (m.kind === 'replace') out = out.slice(0, at) + m.text + out.slice(at + m.length);
    else {
      const lines = out.split('\n');
      const line = m.at % lines.length;
      if (m.kind === 'duplicateLine') lines.splice(line, 0, lines[line]);
      else lines.splice(line, 1);
      out = lines.join('\n');
    }
  }
  return out;
}

describe('fast-check properties of importText', () => {
  it('importText(random bytes read as Latin-1 or UTF-8) never throws and always gives curves or located problems', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 3000 }), fc.boolean(), (bytes, asUtf8) => {
        const text = asUtf8 ? new TextDecoder('utf-8').decode(bytes) : new TextDecoder('latin1').decode(bytes);
        expectWellFormed(importText(text, 'random.bin'), 'random.bin');
      }),
      { seed: 4217, numRuns: 300 },
    );
  });

  it('importText(random text from import-relevant characters) never throws', () => {
    fc.assert(
      fc.property(fc.array(snippet, { maxLength: 60 }), (parts) => {
        expectWellFormed(importText(parts.join(''), 'random.txt'), 'random.txt');
      }),
      { seed: 99, numRuns: 300 },
    );
  });

  it('importText(random mutations of each valid fixture) never throws and keeps the contract', () => {
    fc.assert(
      fc.property(fc.constantFrom(...goodFixtures), fc.array(mutation, { minLength: 1, maxLength: 6 }), (fixture, mutations) => {
        expectWellFormed(importText(mutate(fixture.text, mutations), fixture.name), fixture.name);
      }),
      { seed: 20240305, numRuns: 600 },
    );
  });

  it('importChunks(a valid fixture split at random places) equals importText of the whole', async () => {
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...goodFixtures), fc.array(fc.nat(), { maxLength: 20 }), async (fixture, cuts) => {
        const text = fixture.text;
        const points = [...new Set(cuts.map((c) => c % (text.length + 1)))].sort((a, b) => a - b);
        const pieces: string[] = [];
        let from = 0;
        for (const p of points) {
          pieces.push(text.slice(from, p));
          from = p;
        }
        pieces.push(text.slice(from));
        const streamed = await importChunks(pieces, fixture.name);
        const whole = importText(text, fixture.name, { keepRawText: false });
        expect(streamed.problems).toEqual(whole.problems);
        expect(streamed.dialect).toEqual(whole.dialect);
        expect(streamed.columns).toEqual(whole.columns);
        expect(streamed.curves.map((c) => [c.id, Array.from(c.x), Array.from(c.current)])).toEqual(
          whole.curves.map((c) => [c.id, Array.from(c.x), Array.from(c.current)]),
        );
      }),
      { seed: 7, numRuns: 200 },
    );
  });
});
