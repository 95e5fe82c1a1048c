import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openStore } from '../../src/records/index.js';
import { renderRecordJson, renderRecordMarkdown } from '../../src/report/index.js';
import type { UnitRecord } from '../../src/types/index.js';
import { fillDemoStore } from '../records/helpers/fixtureStore.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';

let root: string;
let rec: UnitRecord;
beforeAll(() => {
  root = makeTempDir();
  const store = openStore(fillDemoStore(root), { mode: 'read' });
  rec = store.unitRecord('FK-0104')!;
  store.close();
});
afterAll(() => removeTempDir(root));

describe('renderRecordMarkdown', () => {
  it('gives header, status word, a table per condition, causes, attempts, history and capture hashes in that order', () => {
    const text = renderRecordMarkdown(rec);
    const order = ['# Test record — unit FK-0104', '## Current status: **PASS**', '### Condition low — PASS', '### Condition mid', '### Condition high', '## Likely causes', '## Test attempts', '## History of runs', '## Captures'];
    const at = order.map((h) => text.indexOf(h));
    expect(at.every((i) => i >= 0)).toBe(true);
    expect([...at].sort((a, b) => a - b)).toEqual(at);
    for (const c of rec.runs.flatMap((r) => r.captures)) expect(text).toContain(c.sha256);
    expect(text).toContain('R. Okafor, M. Lindqvist');
    // FK-0104's first run is #4 in the data folder and opened its first attempt (fixtureStore.ts).
    expect(text).toMatch(/\| 1 \(#4\), attempt #1 \| 2026-03-03 11:00 UTC \| R\. Okafor \| bench-2 \| C \| 0\.1\.0 \| FAIL \| matches \|/);
    expect(text).toMatch(/\| #2 \| [^|]+ \| tested again after a complete attempt \| PASS \| 2 \| 0 \|/);
  });

  it('keeps table rows intact when a note contains a pipe or a line break', () => {
    const latest = rec.runs[rec.runs.length - 1];
    const conditions = latest.verdict.conditions.map((c) => ({ ...c, checks: c.checks.map((k) => ({ ...k, note: 'probe | ground\nclip' })) }));
    const text = renderRecordMarkdown({ ...rec, runs: [...rec.runs.slice(0, -1), { ...latest, verdict: { ...latest.verdict, conditions } }] });
    const row = text.split('\n').find((l) => l.startsWith('| triangle out | frequency'))!;
    expect(row).toContain('probe \\| ground clip');
    expect(row.split(/(?<!\\)\|/).length - 2).toBe(7);
  });
});

describe('renderRecordJson', () => {
  it('round-trips the record with a runs array whose captures carry sha256, adding each measurement’s display label', () => {
    const { labels, ...doc } = JSON.parse(renderRecordJson(rec)) as UnitRecord & { labels: Record<string, string> };
    expect(doc).toEqual(rec);
    // One display name per measurement id the record holds, from the label table.
    expect(Object.keys(labels).sort()).toEqual([...new Set(rec.runs.flatMap((r) => r.verdict.conditions.flatMap((c) => c.checks.map((k) => k.measurement))))].sort());
    expect(labels.frequency).toBe('frequency');
    expect(doc.schemaVersion).toBe(1);
    expect(doc.runs.every((r) => r.captures.length === 3 && r.captures.every((c) => /^[0-9a-f]{64}$/.test(c.sha256)))).toBe(true);
  });
});
