import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CommandIO } from '../../src/cli/command.ts';
import { runCli } from '../../src/cli/main.ts';

const fixtureDir = dirname(fileURLToPath(new URL('../fixtures/import/messy.txt', import.meta.url)));

function capture(): CommandIO & { out: string; err: string } {
  const io = {
    out: '',
    err: '',
    stdout: (t: string) => {
      io.out += t;
    },
    stderr: (t: string) => {
      io.err += t;
    },
    stderrIsTTY: false,
    cwd: fixtureDir,
  };
  return io;
}

let scratch = '';
beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), 'burrow-inspect-'));
});
afterAll(async () => {
  await rm(scratch, { recursive: true, force: true });
});

describe('burrow inspect', () => {
  it("runCli(['inspect', 'messy.txt']) prints dialect, metadata, columns and both curves; exit 0", async () => {
    const io = capture();
    expect(await runCli(['inspect', 'messy.txt'], io)).toBe(0);
    expect(io.err).toBe('');
    expect(io.out).toContain("delimiter semicolon, decimal mark ','");
    expect(io.out).toContain('header line 9, data from line 10');
    expect(io.out).toContain('setpointCurrent');
    expect(io.out).toContain('50 pA');
    expect(io.out).toMatch(/1 {2}gap \(pm\) +distance +pm ×1e-12 → m/);
    expect(io.out).toContain('messy.txt#0/approach  iz  10 points from line 10');
    expect(io.out).toContain('messy.txt#0/retract  iz  9 points from line 20');
    expect(io.out).toContain('problems  none');
  });

  const badCases: [string, string[]][] = [
    ['bad-empty.csv', ['bad-empty.csv:1:1: error: the file is empty']],
    ['bad-binary.bin', ['bad-binary.bin:3:1: error: this looks like a binary file']],
    ['bad-header-only.csv', ['bad-header-only.csv:2:1: error: no rows of numbers found']],
    ['bad-ragged.csv', ['bad-ragged.csv:4:3: error: row has 3 cells', 'bad-ragged.csv:7:2: error: row has 1 cell']],
    ['bad-non-numeric.csv', ["bad-non-numeric.csv:4:2: error: 'n/a'", "bad-non-numeric.csv:6:1: error: '0.7.0'"]],
    ['bad-nan-inf.csv', ["bad-nan-inf.csv:3:2: error: 'NaN' in column 2 'current (pA)' is not a finite number"]],
    ['bad-one-point.csv', ['bad-one-point.csv:2:2: error: curve 0 single']],
    ['bad-zero-current.csv', ['bad-zero-current.csv:2:2: error: curve 0 single']],
    ['bad-non-monotonic.csv', ["bad-non-monotonic.csv:5:1: error: column 1 'gap (nm)' reverses"]],
    ['no-header.dat', ['no-header.dat:1:1: error: needs a mapping answer: no header row']],
    ['two-distance-columns.csv', ['two-distance-columns.csv:1:1: error: needs a mapping answer']],
    ['unknown-unit.csv', ["unknown-unit.csv:1:1: error: needs a mapping answer: column 1 'gap (qu)'"]],
  ];
  for (const [name, messages] of badCases) {
    it(`runCli(['inspect', '${name}']) exits 2 with file:line:column on stderr`, async () => {
      const io = capture();
      expect(await runCli(['inspect', name], io)).toBe(2);
      for (const message of messages) expect(io.err).toContain(message);
    });
  }

  it('runCli(inspect on the whole fixture folder) reports every file and still lists the good ones', async () => {
    const io = capture();
    expect(await runCli(['inspect', '.'], io)).toBe(2);
    expect(io.out).toContain('messy.txt#0/retract');
    expect(io.out).toContain('comma-single.csv#0/single');
    expect(io.err).toContain('bad-ragged.csv:4:3');
  });

  it('runCli(inspect --json) prints machine-readable results', async () => {
    const io = capture();
    expect(await runCli(['inspect', 'wide-pairs.csv', '--json'], io)).toBe(0);
    const parsed = JSON.parse(io.out);
    expect(parsed.files[0].columns.map((c: { role: string }) => c.role)).toEqual(['bias', 'current', 'bias', 'current']);
    expect(parsed.files[0].curves.map((c: { points: number; kind: string }) => [c.kind, c.points])).toEqual([
      ['iv', 9],
      ['iv', 6],
    ]);
  });

  it('runCli(inspect --role --unit --mapping --remember) answers once and the next run imports from memory', async () => {
    const mapping = join(scratch, 'mapping.json');
    const first = capture();
    expect(await runCli(['inspect', 'no-header.dat', '--role', '1=distance,2=current', '--unit', '1=nm,2=pA', '--mapping', mapping, '--remember'], first)).toBe(0);
    expect(first.err).toContain("remembered the mapping for 'whitespace|2|no header'");
    expect(JSON.parse(await readFile(mapping, 'utf8')).answers['whitespace|2|no header'].units).toEqual({ 1: 'nm', 2: 'pA' });
    const second = capture();
    expect(await runCli(['inspect', 'no-header.dat', '--mapping', mapping], second)).toBe(0);
    expect(second.out).toContain('mapping memory');
    expect(second.out).toContain('no-header.dat#0/single  iz  6 points');
  });

  it('runCli(inspect with bad flags) exits 2 with a usage message', async () => {
    const cases: [string[], string][] = [
      [['inspect'], 'burrow inspect: give at least one file or folder'],
      [['inspect', 'messy.txt', '--role', '2=voltage'], "burrow inspect: --role for column 2 must be one of"],
      [['inspect', 'messy.txt', '--role', 'two=current'], "burrow inspect: --role must be N=ROLE[,N=ROLE...] with columns from 1, got 'two=current'"],
      [['inspect', 'messy.txt', '--unit', '1=furlong'], "burrow inspect: --unit for column 1 must be a unit such as nm, Å, pA, mV, got 'furlong'"],
      [['inspect', 'messy.txt', '--remember'], 'burrow inspect: --remember needs --mapping FILE.json'],
      [['inspect', 'messy.txt', '--mapping', 'missing.json'], 'burrow inspect: --mapping file cannot be read'],
      [['inspect', 'messy.txt', '--piezo-nm-per-v', '0'], 'burrow inspect: --piezo-nm-per-v must be a number > 0'],
    ];
    for (const [argv, message] of cases) {
      const io = capture();
      expect(await runCli(argv, io)).toBe(2);
      expect(io.err).toContain(message);
    }
  });
});
