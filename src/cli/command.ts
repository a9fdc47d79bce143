import type { FlagSpecs } from './args.ts';

/** Where a command writes; injected so tests can run commands in-process. */
export interface CommandIO {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
  /** True when stderr is a terminal (progress bars only then). */
  stderrIsTTY: boolean;
  cwd: string;
}

/** One burrow sub-command. `run` returns the process exit code. */
export interface Command {
  name: string;
  summary: string;
  usage: string;
  flags: FlagSpecs;
  run(argv: readonly string[], io: CommandIO): Promise<number>;
}
