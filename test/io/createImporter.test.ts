import { describe, expect, it } from 'vitest';
import { createImporter, importChunks, importText } from '../../src/io/index.ts';

function bigFile(rows: number): string {
  const lines = ['# generated in the test', 'bias = 0,2 V', '"gap (nm)";"I (pA)"'];
  for (let i = 0; i < rows; i++) lines.push(`${(0.9 - i * 1e-5).toFixed(5).replace('.', ',')};${(50 * Math.exp(i / 5000)).toFixed(4).replace('.', ',')}`);
  return lines.join('\r\n') + '\r\n';
}

describe('createImporter', () => {
  it('createImporter(push in pieces) gives the same curve as one string, across the detection and parse boundaries', async () => {
    const text = bigFile(40_000);
    const whole = importText(text, 'big.csv');
    expect(whole.problems).toEqual([]);
    expect(whole.curves[0].x.length).toBe(40_000);
    for (const size of [1, 997, 65_536, 300_001]) {
      const pieces: string[] = [];
      for (let i = 0; i < Math.min(text.length, size * 3000); i += size) pieces.push(text.slice(i, i + size));
      if (size * 3000 < text.length) pieces.push(text.slice(size * 3000));
      const streamed = await importChunks(pieces, 'big.csv');
      expect(streamed.problems).toEqual([]);
      expect(streamed.dialect).toEqual(whole.dialect);
      expect(streamed.curves[0].x).toEqual(whole.curves[0].x);
      expect(streamed.curves[0].current).toEqual(whole.curves[0].current);
      expect(streamed.rawText).toBeUndefined();
    }
  });

  it('createImporter keeps the raw text only when asked and reports lines after the parse boundary exactly', () => {
    const text = bigFile(30_000).replace('\r\n0,70000;', '\r\n0,70000;oops\r\n0,7;');
    const importer = createImporter('x.csv', { keepRawText: true });
    importer.push(text);
    const file = importer.finish();
    expect(file.rawText).toBe(text);
    const line = text.split('\r\n').findIndex((l) => l === '0,70000;oops') + 1;
    expect(file.problems.map((p) => `${p.code} ${p.line}:${p.column}`)).toEqual([`nonNumeric ${line}:2`]);
  });

  it('createImporter rejects push after finish and a second finish', () => {
    const importer = createImporter('a.csv');
    importer.push('z (nm),I (pA)\n1,2\n2,1\n');
    importer.finish();
    expect(() => importer.push('x')).toThrow('createImporter(a.csv): push after finish');
    expect(() => importer.finish()).toThrow('createImporter(a.csv): finish called twice');
  });

  it('createImporter stops reading a binary stream early and says where it noticed', () => {
    const importer = createImporter('b.bin');
    importer.push('PK\u0003\u0004\u0000' + 'x'.repeat(9000));
    importer.push('more bytes that are never kept');
    const file = importer.finish();
    expect(file.problems.map((p) => `${p.code} ${p.line}:${p.column}`)).toEqual(['binary 1:5']);
  });

  it('importText(blank and comment lines inside data) separates blocks; a "# retract" label is kept', () => {
    const file = importText('z (nm),I (pA)\n0.5,10\n0.6,5\n\n# retract\n0.5,9\n0.6,4\n\n', 'blocks.csv');
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => [c.index, c.x.length, c.metadata.blockLabel?.raw])).toEqual([
      [0, 2, undefined],
      [1, 2, 'retract'],
    ]);
  });

  it('importText(direction codes that are not words) reads the first as approach and warns once', () => {
    const file = importText('dir,z (nm),I (pA)\n0,0.7,1\n0,0.6,3\n0,0.5,9\n1,0.5,8\n1,0.6,2.9\n1,0.7,1.1\n', 'codes.csv');
    expect(file.curves.map((c) => c.segment)).toEqual(['approach', 'retract']);
    expect(file.problems.map((p) => `${p.severity} ${p.code} ${p.line}:${p.column}`)).toEqual(['warning directionCode 2:1']);
  });

  it('importText(bias and distance both present) picks the swept one and keeps the other as fixed', () => {
    const iz = importText('z (nm),V (V),I (pA)\n0.5,0.1,10\n0.6,0.1,4\n0.7,0.1,1\n', 'iz.csv');
    expect(iz.curves[0]).toMatchObject({ kind: 'iz', fixedBiasV: 0.1, sourceColumns: [1, 3, 2] });
    const iv = importText('z (nm),V (V),I (pA)\n0.5,-0.1,-10\n0.5,0,0\n0.5,0.1,10\n', 'iv.csv');
    expect(iv.curves[0]).toMatchObject({ kind: 'iv' });
    expect(iv.curves[0].fixedGapM).toBeCloseTo(5e-10, 20);
  });

  it('importText(I(V) up and down) makes one curve per sweep with its direction', () => {
    const file = importText('bias (V),I (nA)\n-1,-2\n0,0\n1,2\n0,0.1\n-1,-1.9\n', 'updown.csv');
    expect(file.curves.map((c) => [c.index, c.x.length, c.metadata.sweepDirection.raw])).toEqual([
      [0, 3, 'increasing'],
      [1, 2, 'decreasing'],
    ]);
  });

  it('importText(a bare column with implausible SI values) asks for the unit', () => {
    const file = importText('gap,current\n0.5,120\n0.6,44\n0.7,16\n', 'bare.csv');
    expect(file.proposal?.ambiguities.map((a) => [a.kind, a.columns])).toEqual([
      ['unit', [1]],
      ['unit', [2]],
    ]);
    expect(file.curves).toEqual([]);
  });

  it('importText(an empty cell inside the data) warns and leaves that point out', () => {
    const file = importText('z (nm),I (pA)\n0.5,10\n0.6,\n0.7,2\n0.8,1\n', 'gap.csv');
    expect(file.problems.map((p) => `${p.severity} ${p.code} ${p.line}:${p.column}`)).toEqual(['warning emptyCell 3:2']);
    expect(file.curves[0].x.length).toBe(3);
  });
});
