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

export const COMMANDS: readonly RegisterCommand[] = [
  registerMeasure,
  registerInspect,
  registerCheck,
  registerSpec,
  registerUnits,
  registerRecord,
  registerCompare,
  registerBatch,
  registerWatch,
  registerCalibrate,
  registerServe,
  registerSync,
  registerStore,
];
