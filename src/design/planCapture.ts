/**
 * Which unit, condition and outputs a capture file belongs to (from the spec's file-name pattern,
 * overridden by --unit / --condition), and, once measured, which report channel serves each output.
 */
import { BenchError } from '../types/index.js';
import type { Capture, CheckedCapture, MeasureReport } from '../types/index.js';
import { matchCaptureName, patternTokens } from './capturePattern.js';
import { DEFAULT_CONDITION } from './specTypes.js';
import type { Spec } from './specTypes.js';

export interface CapturePlan {
  readonly path: string;
  readonly unit: string;
  readonly condition: string;
  /** Outputs this file supplies, with the channel named in the spec. */
  readonly outputs: readonly { readonly output: string; readonly channel: string | number }[];
  /** True when the file holds a single output (the pattern has {output}). */
  readonly perOutput: boolean;
}

export interface PlanOverrides {
  readonly unit?: string;
  readonly condition?: string;
}

const baseName = (path: string): string => path.split(/[\\/]/).pop() ?? path;

function example(spec: Spec): string {
  return spec.pattern
    .replace('{unit}', 'FK-0101')
    .replace('{condition}', spec.conditions[0]?.name ?? 'mid')
    .replace('{output}', spec.outputs[0]?.fileTag ?? 'out');
}

export function planCapture(spec: Spec, path: string, overrides: PlanOverrides = {}): CapturePlan {
  const names = spec.conditions.map((c) => c.name);
  const tags = spec.outputs.map((o) => o.fileTag);
  const perOutput = patternTokens(spec.pattern).includes('output');
  if (overrides.condition !== undefined && !names.includes(overrides.condition)) {
    throw new BenchError({ code: 'check.unknown-condition', file: '-', problem: `--condition "${overrides.condition}" is not a condition of ${spec.file}`, expected: `one of ${names.join(', ')}`, fix: `write --condition ${names[0]} (or another listed condition)` });
  }
  // A spec without conditions has one implicit condition: any text in the {condition} place is taken.
  const implicit = names.length === 1 && names[0] === DEFAULT_CONDITION;
  const match = matchCaptureName(spec.pattern, baseName(path), implicit ? [] : names, tags);
  const unit = overrides.unit ?? match?.unit;
  const condition = overrides.condition ?? (implicit || names.length === 1 ? names[0] : match?.condition);
  const tag = match?.output;
  if (unit === undefined || condition === undefined || (perOutput && tag === undefined)) {
    throw new BenchError({
      code: 'check.name-unmatched',
      file: path,
      problem: `the file name "${baseName(path)}" does not match the capture pattern "${spec.pattern}" of ${spec.file}`,
      expected: `a name like "${example(spec)}", with a condition among ${names.join(', ')}${perOutput ? ` and an output among ${tags.join(', ')}` : ''}`,
      fix: perOutput ? 'rename the file to fit the pattern' : 'rename the file to fit the pattern, or give --unit and --condition',
    });
  }
  const outputs = spec.outputs.filter((o) => !perOutput || o.fileTag === tag).map((o) => ({ output: o.name, channel: o.channel }));
  return { path, unit, condition, outputs, perOutput };
}

/** The capture as used by a check: each output bound to a measured channel by name or 1-based number. */
export function bindCapture(spec: Spec, plan: CapturePlan, capture: Capture, report: MeasureReport): CheckedCapture {
  const outputs = plan.outputs.map(({ output, channel }) => {
    const found = plan.perOutput && report.channels.length === 1 ? report.channels[0] : findChannel(report, channel);
    if (!found) {
      const names = report.channels.map((c) => c.name);
      throw new BenchError({
        code: 'check.no-channel',
        file: plan.path,
        problem: `no channel ${typeof channel === 'number' ? `number ${channel}` : `"${channel}"`} for output "${output}"`,
        expected: `a channel of this capture: ${names.map((n, i) => `${i + 1} "${n}"`).join(', ')}`,
        fix: `set \`channel:\` of output "${output}" in ${spec.file} to one of them`,
      });
    }
    const shape = spec.outputs.find((o) => o.name === output)?.shape;
    return { output, channel: found.name, ...(shape ? { expectedShape: shape } : {}) };
  });
  return { path: plan.path, sha256: capture.sha256, size: capture.size, layout: describeLayout(capture), unit: plan.unit, condition: plan.condition, outputs, report };
}

function findChannel(report: MeasureReport, channel: string | number): MeasureReport['channels'][number] | undefined {
  if (typeof channel === 'number') return report.channels[channel - 1];
  const want = channel.trim().toLowerCase();
  return report.channels.find((c) => c.name.trim().toLowerCase() === want);
}

const DELIMITER_NAMES: Readonly<Record<string, string>> = { ',': 'comma', ';': 'semicolon', '\t': 'tab', ' ': 'space' };

export function describeLayout(capture: Capture): string {
  const l = capture.layout;
  const header = l.headerLine === null ? 'no header' : `header on line ${l.headerLine}`;
  const time = l.timeColumn !== null ? `time column "${l.columns[l.timeColumn]?.name ?? ''}"` : `timing from ${l.timing}`;
  // The reading profile, when one was used, is part of how the file was read (and of the record).
  const profile = l.reading?.profile ? `, read with profile ${l.reading.profile}` : '';
  return `${DELIMITER_NAMES[l.delimiter] ?? l.delimiter}-separated, ${header}, ${time}, ${capture.length} samples × ${capture.channels.length} channels${profile}`;
}
