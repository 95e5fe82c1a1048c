/** Every command, one line each; main.ts registers them in this order. */
import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { registerMeasure } from './measureCommand.js';
import { registerInspect } from './inspectCommand.js';
import { registerCheck } from './checkCommand.js';
import { registerSpec } from './specCommand.js';
import { registerUnits } from './unitsCommand.js';
import { registerRecord } from './recordCommand.js';
import { registerCompare } from './compareCommand.js';
import { registerBatch } from './batchCommand.js';
import { registerWatch } from './watchCommand.js';
import { registerCalibrate } from './calibrateCommand.js';
import { registerServe } from './serveCommand.js';
import { registerSync } from './syncCommand.js';
import { registerStore } from './storeCommand.js';

export type RegisterCommand = (program: Command, ctx: CommandContext) => Command;

/** A command's name (the word that starts a command line) and the function that sets it up. */
export interface CommandEntry {
  readonly name: string;
  readonly register: RegisterCommand;
}

export const COMMANDS: readonly CommandEntry[] = [
  { name: 'measure', register: registerMeasure },
  { name: 'inspect', register: registerInspect },
  { name: 'check', register: registerCheck },
  { name: 'spec', register: registerSpec },
  { name: 'units', register: registerUnits },
  { name: 'record', register: registerRecord },
  { name: 'compare', register: registerCompare },
  { name: 'batch', register: registerBatch },
  { name: 'watch', register: registerWatch },
  { name: 'calibrate', register: registerCalibrate },
  { name: 'serve', register: registerServe },
  { name: 'sync', register: registerSync },
  { name: 'store', register: registerStore },
];
