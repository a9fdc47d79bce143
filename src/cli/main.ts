#!/usr/bin/env node
/**
 * burrow: the headless command line. Same core as the dashboard, no DOM.
 * Usage: npm run -s burrow -- <command> [flags]; `burrow --help` lists the commands.
 */
import { UsageError, formatFlagHelp } from './args.ts';
import type { Command, CommandIO } from './command.ts';
import { commands } from './commands.ts';

export function helpText(): string {
  const width = Math.max(...commands.map((c) => c.name.length)) + 2;
  const list = commands.map((c) => `  ${c.name.padEnd(width)}${c.summary}`).join('\n');
  return [
    'burrow: fit STM approach curves I(z) and spectra I(V) to tunnel-barrier models.',
    '',
    'Usage: burrow <command> [flags]     (burrow <command> --help for its flags)',
    '',
    'Commands:',
    list,
    '',
    'Sign convention: positive bias V is the sample bias; electrons tunnel from the tip into the sample.',
    'Exit codes: 0 done, 1 failed, 2 bad arguments or unreadable input.',
  ].join('\n');
}

export function commandHelp(command: Command): string {
  return `${command.summary}\n\nUsage: ${command.usage}\n\nFlags:\n${formatFlagHelp(command.flags)}`;
}

/** Run one command line in-process; returns the exit code. */
export async function runCli(argv: readonly string[], io: CommandIO): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.stdout(helpText() + '\n');
    return name ? 0 : 2;
  }
  const command = commands.find((c) => c.name === name);
  if (!command) {
    io.stderr(`burrow: unknown command '${name}'; try: ${commands.map((c) => c.name).join(', ')}\n`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.stdout(commandHelp(command) + '\n');
    return 0;
  }
  try {
    return await command.run(rest, io);
  } catch (error) {
    if (error instanceof UsageError) {
      io.stderr(error.message + '\n');
      return error.exitCode;
    }
    io.stderr(`burrow ${name}: ${(error as Error).message}\n`);
    return 1;
  }
}

const isMain = process.argv[1] && import.meta.url.endsWith(process.argv[1].replace(/\\/g, '/').split('/').pop() ?? '');
if (isMain) {
  const io: CommandIO = {
    stdout: (t) => process.stdout.write(t),
    stderr: (t) => process.stderr.write(t),
    stderrIsTTY: Boolean(process.stderr.isTTY),
    cwd: process.cwd(),
  };
  runCli(process.argv.slice(2), io).then((code) => {
    process.exitCode = code;
  });
}
