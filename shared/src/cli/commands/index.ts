/**
 * Every command of the CLI, in the order the overview lists them. One line per command:
 * either a lazy import `() => import('./name')` of a module exporting `command`, or a
 * `CliCommand` object.
 */
import type { CliCommand } from '../cli-command';

export type CommandEntry = CliCommand | (() => Promise<{ command: CliCommand }>);

export const COMMANDS: CommandEntry[] = [
  () => import('./period'),
  () => import('./age'),
  () => import('./plan'),
  () => import('./periodogram'),
  () => import('./windows'),
  () => import('./measure'),
];
