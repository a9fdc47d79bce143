import type { Command } from './command.ts';
import { simulateCommand } from './simulate.ts';
import { inspectCommand } from './inspect.ts';
import { fitCommand } from './fit.ts';
import { reportCommand } from './report.ts';

/** Every burrow command, in the order `burrow --help` lists them. Add new commands here. */
export const commands: Command[] = [simulateCommand, inspectCommand, fitCommand, reportCommand];

