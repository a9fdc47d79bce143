import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { FLAG_CODES, FLAG_THRESHOLDS } from '../../src/analysis/index.ts';
import { SETTINGS_SCHEMA } from '../../src/fit/index.ts';
import { commands } from '../../src/cli/commands.ts';

const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');

describe('README', () => {
  it('documents every flag threshold with its current value', () => {
    for (const [name, threshold] of Object.entries(FLAG_THRESHOLDS)) {
      expect(readme, name).toContain(`| \`${name}\` | ${threshold.value} |`);
    }
  });

  it('documents every flag code and every settings field', () => {
    for (const code of FLAG_CODES) expect(readme, code).toContain(`| \`${code}\` |`);
    for (const field of Object.keys(SETTINGS_SCHEMA)) expect(readme, field).toContain(`| \`${field}\` |`);
  });

  it('describes every command', () => {
    for (const command of commands) expect(readme, command.name).toContain(`### \`burrow ${command.name}\``);
  });

  it('gives exactly two quick-start commands, the second the one .ci/run executes', () => {
    const quickStart = readme.split('## Quick start')[1].split('\n## ')[0];
    const block = /```sh\n([\s\S]*?)```/.exec(quickStart)?.[1] ?? '';
    const lines = block.trim().split('\n');
    expect(lines).toHaveLength(2);
    const testCommand = lines[1].split('#')[0].trim();
    const ci = readFileSync(new URL('../../.ci/run', import.meta.url), 'utf8');
    expect(ci).toContain(`\n${testCommand}\n`);
  });
});
