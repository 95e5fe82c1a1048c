/**
 * The text of a starter spec (YAML with comments), from the drafted outputs. Writing is the command
 * line's job; this only builds the text, which parseSpec reads back to the same limits.
 */
import { Document, isMap } from 'yaml';
import { draftOutputs, written } from './draftSpec.js';
import type { DraftCheck, DraftOptions, GoldenCapture } from './draftSpec.js';
import { DEFAULT_CONDITION } from './specTypes.js';

export function writeDraftSpec(golden: readonly GoldenCapture[], options: DraftOptions): string {
  const outputs = draftOutputs(golden, options.tolerance);
  const conditions = [...new Set(golden.map((g) => g.condition))];
  const pct = `${Number((options.tolerance * 100).toPrecision(4))} %`;
  const perCondition: Record<string, Record<string, Record<string, { nominal: string | number }>>> = {};
  for (const c of conditions) perCondition[c] = {};
  const body = {
    format: 1,
    name: options.name ?? 'my module',
    revision: 'A',
    description: `Starter spec drafted from ${golden.map((g) => g.path).join(', ')}. Edit names, limits and hints.`,
    captures: { pattern: options.pattern },
    decision: 'guarded',
    outputs: Object.fromEntries(
      outputs.map((o) => [
        o.name,
        {
          channel: o.channel,
          shape: o.shape,
          description: `channel "${o.channelName}" of the golden captures`,
          checks: o.checks.map((c) => checkEntry(c, o.name, perCondition)),
        },
      ]),
    ),
    // A single unnamed condition (a pattern without {condition}) needs no conditions section.
    ...(conditions.length === 1 && conditions[0] === DEFAULT_CONDITION
      ? {}
      : { conditions: Object.fromEntries(conditions.map((c) => [c, Object.keys(perCondition[c]).length ? { expect: perCondition[c] } : { setting: c }])) }),
  };
  const doc = new Document(body);
  doc.commentBefore = [
    ` Starter spec from a known-good unit (benchproof spec init): one reading per quantity of each output.`,
    ` Nominals are the golden unit's readings (4 significant digits). Each limit is nominal ± the larger of`,
    ` ${pct} (--tolerance) and 3U, U being the golden reading's expanded uncertainty (k = 2): room for its`,
    ' own U, the next good unit\'s U and the guard band, so a good unit passes outright. Tighten with care.',
    ' Not written (no nominal to copy): overshoot, jitter, THD, hum. Add max limits from your design.',
    ...outputs.flatMap((o) => o.skipped.map((s) => ` ${o.name}: ${s}`)),
  ].join('\n');
  outputs.forEach((o) =>
    o.checks.forEach((c, i) => {
      if (!c.widened) return;
      const node = doc.getIn(['outputs', o.name, 'checks', i], true);
      if (isMap(node)) node.comment = ` widened from ${pct} to 3U of the golden reading`;
    }),
  );
  for (const c of conditions) {
    const expect = doc.getIn(['conditions', c, 'expect'], true);
    if (isMap(expect)) for (const item of expect.items) if (isMap(item.value)) item.value.flow = true;
  }
  return doc.toString({ lineWidth: 0 });
}

function checkEntry(c: DraftCheck, output: string, perCondition: Record<string, Record<string, Record<string, { nominal: string | number }>>>): Record<string, string | number> {
  const tolerance = c.relative ? `${Number((c.tolerance * 100).toPrecision(3))} %` : written(c.tolerance, c.unit);
  if (typeof c.nominal === 'number') return { measure: c.measure, nominal: written(c.nominal, c.unit), tolerance };
  for (const [cond, v] of Object.entries(c.nominal)) {
    perCondition[cond][output] ??= {};
    perCondition[cond][output][c.measure] = { nominal: written(v, c.unit) };
  }
  return { measure: c.measure, tolerance };
}
