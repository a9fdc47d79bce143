import { describe, expect, it } from 'vitest';
import { groupCurves, metadataKeys, metadataTableFromCurves, metadataText, type CurveResult } from '../../src/analysis/index.ts';

/** A fitted I(z) result with only the fields a grouping reads set (the rest null). */
function result(curve: string, run: string, file = 'f.csv'): CurveResult {
  return { curve, run, file, kind: 'iz', status: 'ok', flags: [], position: null } as unknown as CurveResult;
}

const results = [result('a#0', 'A-gold', 'a.csv'), result('b#0', 'B-gold', 'b.csv'), result('a#1', 'A-gold', 'a.csv'), result('c#0', 'A-graphite', 'c.csv')];

describe('groupCurves', () => {
  it('groupCurves(run) keeps the order of first appearance and every curve once', () => {
    const groups = groupCurves(results);
    expect(groups.map((g) => g.key)).toEqual(['A-gold', 'B-gold', 'A-graphite']);
    expect(groups[0]).toEqual({ key: 'A-gold', label: 'A-gold', curveIds: ['a#0', 'a#1'] });
    expect(groups.flatMap((g) => g.curveIds).sort()).toEqual(['a#0', 'a#1', 'b#0', 'c#0']);
  });

  it('groupCurves(file) groups by the file', () => {
    expect(groupCurves(results, { by: 'file' }).map((g) => g.curveIds.length)).toEqual([2, 1, 1]);
  });

  it('groupCurves(metadata) matches keys loosely and puts curves without the entry in "(no KEY)"', () => {
    const table = metadataTableFromCurves([
      { id: 'a#0', metadata: { tip: { raw: 'A (W)', label: 'Tip' } } },
      { id: 'a#1', metadata: { tip: { raw: ' A (W) ', label: 'Tip' } } },
      { id: 'b#0', metadata: { tip: { raw: 'B (PtIr)', label: 'tip' } } },
      { id: 'c#0', metadata: {} },
    ]);
    const groups = groupCurves(results, { by: 'metadata', key: 'TIP' }, table);
    expect(groups.map((g) => [g.key, g.label, g.curveIds.length])).toEqual([
      ['A (W)', 'A (W)', 2],
      ['B (PtIr)', 'B (PtIr)', 1],
      ['', '(no TIP)', 1],
    ]);
    expect(metadataText(table['a#0'], 'Tip')).toBe('A (W)');
    expect(metadataKeys(table)).toEqual(['tip']);
  });

  it('groupCurves(tag) uses the user tags and leaves the rest "(untagged)"', () => {
    const groups = groupCurves(results, { by: 'tag', tags: { 'a#0': 'terrace', 'c#0': 'terrace', 'b#0': 'step edge' } });
    expect(groups.map((g) => [g.label, g.curveIds])).toEqual([
      ['terrace', ['a#0', 'c#0']],
      ['step edge', ['b#0']],
      ['(untagged)', ['a#1']],
    ]);
  });

  it('groupCurves rejects an unknown grouping and an empty metadata key', () => {
    expect(() => groupCurves(results, { by: 'colour' } as never)).toThrow('groupCurves: grouping.by must be run, file, metadata or tag, got "colour"');
    expect(() => groupCurves(results, { by: 'metadata', key: ' ' })).toThrow('groupCurves: grouping.key must be a non-empty metadata key, got " "');
  });
});
