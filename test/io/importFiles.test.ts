import { describe, expect, it } from 'vitest';
import { importFiles } from '../../src/io/index.ts';

describe('importFiles', () => {
  it('importFiles returns one result per input; a failing file never removes the others', async () => {
    async function* broken(): AsyncGenerator<string> {
      yield 'z (nm),I (pA)\n0.5,10\n';
      throw new Error('disk went away');
    }
    const files = await importFiles([
      { fileName: 'good.csv', text: 'z (nm),I (pA)\n0.5,10\n0.6,4\n' },
      { fileName: 'empty.csv', text: '' },
      { fileName: 'broken.csv', chunks: broken() },
      { fileName: 'wrong-answer.dat', text: '1 2\n3 4\n5 6\n', mapping: { columnRoles: { 7: 'current' } } },
      { fileName: 'nothing.csv' },
      { fileName: 'later.csv', chunks: ['bias (V),I (nA)\n-1,-2\n', '0,0\n1,2\n'] },
    ]);
    expect(files.map((f) => [f.fileName, f.curves.length, f.problems.map((p) => `${p.code} ${p.line}:${p.column}`)])).toEqual([
      ['good.csv', 1, []],
      ['empty.csv', 0, ['empty 1:1']],
      ['broken.csv', 0, ['readFailed 1:1']],
      ['wrong-answer.dat', 0, ['mappingRejected 1:1']],
      ['nothing.csv', 0, ['noInput 1:1']],
      ['later.csv', 1, []],
    ]);
    expect(files[2].problems[0].message).toBe('disk went away');
  });
});
