import { describe, expect, it } from 'vitest';
import { detectLayout, type DetectedLayout } from '../../src/io/detectLayout.ts';

function layoutOf(text: string): DetectedLayout {
  const result = detectLayout(text, true);
  if (result.status !== 'ok') throw new Error(`expected a layout, got ${result.status}`);
  return result.layout;
}

describe('detectLayout', () => {
  it('detectLayout picks the delimiter under which rows split into the same numeric cells', () => {
    expect(layoutOf('a,b\n1.5,2.5\n1.6,2.6\n').delimiter).toBe(',');
    expect(layoutOf('a;b\n1,5;2,5\n1,6;2,6\n')).toMatchObject({ delimiter: ';', decimalMark: ',' });
    expect(layoutOf('a\tb\n1,5\t2,5\n1,6\t2,6\n')).toMatchObject({ delimiter: '\t', decimalMark: ',' });
    expect(layoutOf('a  b\n  1.5   2.5\n 1.6  2.6\n').delimiter).toBe('whitespace');
    expect(layoutOf('a, b\n1.5, 2.5\n1.6, 2.6\n').delimiter).toBe(',');
    expect(layoutOf('a;b;c\n1,5;2,5;3\n1,6;2,6;4\n').columnCount).toBe(3);
  });

  it('detectLayout finds the header under a metadata block, behind a comment marker, or above a units row', () => {
    const below = layoutOf('# note\nbias = 0.1 V\n\nz (nm),I (pA)\n1,2\n3,4\n');
    expect(below).toMatchObject({ headerLine: 4, dataStartLine: 5 });
    expect(below.metadataLines.map((l) => l.line)).toEqual([1, 2]);
    expect(layoutOf('# z (nm)\tI (pA)\n1\t2\n3\t4\n').headerCells).toEqual(['z (nm)', 'I (pA)']);
    expect(layoutOf('gap;current\nnm;pA\n1;2\n3;4\n')).toMatchObject({ headerLine: 1, unitsLine: 2, unitsCells: ['nm', 'pA'] });
    expect(layoutOf('1,2\n3,4\n5,6\n').headerLine).toBeNull();
  });

  it('detectLayout reads whitespace headers whose names contain single spaces', () => {
    expect(layoutOf('tip height (nm)    tunnel current (pA)\n0.5   12\n0.6   8\n').headerCells).toEqual(['tip height (nm)', 'tunnel current (pA)']);
    expect(layoutOf('z (nm) I (pA)\n0.5 12\n0.6 8\n').headerCells).toEqual(['z (nm)', 'I (pA)']);
  });

  it('detectLayout(line endings) reports LF, CRLF, CR and mixed', () => {
    expect(layoutOf('a,b\n1,2\n3,4\n').lineEnding).toBe('lf');
    expect(layoutOf('a,b\r\n1,2\r\n3,4\r\n').lineEnding).toBe('crlf');
    expect(layoutOf('a,b\r1,2\r3,4\r')).toMatchObject({ lineEnding: 'cr', newline: '\r' });
    expect(layoutOf('a,b\r\n1,2\n3,4\n').lineEnding).toBe('mixed');
  });

  it('detectLayout asks for more text until data rows arrive, and says when there are none', () => {
    expect(detectLayout('# only metadata\nkey: value\n', false).status).toBe('needMore');
    expect(detectLayout('# only metadata\nkey: value\n', true)).toMatchObject({ status: 'noData', line: 2 });
  });
});
