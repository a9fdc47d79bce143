import type { Command } from './command.ts';
import { simulateCommand } from './simulate.ts';

/** Every burrow command, in the order `burrow --help` lists them. Add new commands here. */
export const commands: Command[] = [simulateCommand];
