/** Every command, one line each; main.ts registers them in this order. */
import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { registerMeasure } from './measure.js';

export type RegisterCommand = (program: Command, ctx: CommandContext) => Command;

export const COMMANDS: readonly RegisterCommand[] = [
  registerMeasure,
];
