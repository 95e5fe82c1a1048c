/** Every command, one line each; main.ts registers them in this order. */
import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { registerMeasure } from './measure.js';
import { registerInspect } from './inspect.js';
import { registerCheck } from './check.js';
import { registerSpec } from './spec.js';
import { registerUnits } from './units.js';
import { registerRecord } from './record.js';
import { registerCompare } from './compare.js';
import { registerBatch } from './batch.js';
import { registerWatch } from './watch.js';
import { registerCalibrate } from './calibrate.js';
import { registerServe } from './serve.js';

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
];
