/**
 * Two attempts of a unit compared: a unit built with its timing capacitor 6 % high (the fixture
 * synthesises every frequency at 0.94 × design) fails, is repaired with a note, and passes. Expected
 * changes come from the fixture's closed form (Δf = f_design × (1 − 0.94)); significance is the
 * normalized-error test |Δ| > √(U₁² + U₂²) of ISO 13528:2022 §9.7, computed here by hand.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compareAttempts, openStore } from '../../src/records/index.js';
import { renderComparisonHtml, renderComparisonJson, renderComparisonMarkdown, renderComparisonText } from '../../src/report/index.js';
import type { AttemptComparison, UnitRecord } from '../../src/types/index.js';
import { KESTREL_CONDITIONS, kestrelRun } from '../records/fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { expectWithin } from '../helpers/expectWithin.js';

let root: string;
let rec: UnitRecord;
let cmp: AttemptComparison;
beforeAll(() => {
  root = makeTempDir();
  const store = openStore(root);
  try {
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-03T11:00:00.000Z', frequencyScale: 0.94 }));
    store.saveRun({ ...kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-04T09:00:00.000Z' }), note: 'C1 replaced with a 4.7 nF C0G part' });
    rec = store.unitRecord('FK-0104')!;
  } finally {
    store.close();
  }
  cmp = compareAttempts(rec, 1, 2);
});
afterAll(() => removeTempDir(root));

describe('compareAttempts', () => {
  it('gives each check before and after, and the frequency change the repair made at every condition', () => {
    expect([cmp.before.number, cmp.before.statement, cmp.after.number, cmp.after.statement]).toEqual([1, 'fail', 2, 'pass']);
    expect(cmp.after.notes).toEqual(['C1 replaced with a 4.7 nF C0G part']);
    for (const { condition, frequency } of KESTREL_CONDITIONS) {
      const k = cmp.checks.find((x) => x.condition === condition && x.output === 'triangle out' && x.measurement === 'frequency')!;
      expect([k.before?.statement, k.after?.statement, k.statementChanged, k.significant]).toEqual(['fail', 'pass', true, true]);
      // Closed form of the fixture's synthesis: design × (1 − 0.94); the measurement adds far less than 0.1 %.
      expectWithin(k.change, frequency * 0.06, { rel: 1e-3 }, 'fixture closed form f_design × (1 − 0.94)');
    }
  });

  it('calls a change significant only when it exceeds the root-sum-square of both expanded uncertainties', () => {
    for (const k of cmp.checks) {
      if (k.change === null || !k.before || !k.after) continue;
      const rss = Math.sqrt((k.before.expandedUncertainty ?? 0) ** 2 + (k.after.expandedUncertainty ?? 0) ** 2);
      expect(k.significant, `${k.condition} ${k.measurement}`).toBe(Math.abs(k.change) > rss);
    }
    // Same amplitude in both syntheses: peak-to-peak does not move beyond its uncertainty.
    expect(cmp.checks.filter((k) => k.measurement === 'peakToPeak').every((k) => !k.significant && !k.statementChanged)).toBe(true);
  });

  it('names the causes that are gone after the repair and none that are new', () => {
    expect(cmp.causesGone.map((c) => c.id)).toContain('timing-capacitor-high');
    expect(cmp.causesNew).toEqual([]);
  });

  it('refuses an attempt number the record does not have, as a caller bug', () => {
    expect(() => compareAttempts(rec, 1, 3)).toThrow(RangeError);
  });
});

describe('comparison reports', () => {
  it('say what changed in text, Markdown and HTML from the same facts', () => {
    const text = renderComparisonText(cmp);
    expect(text).toContain('What changed\n  unit: FAIL → PASS\n');
    expect(text).toMatch(/ {2}low · triangle out · frequency: FAIL → PASS \(/);
    expect(text).toContain('no longer named: timing capacitor above its value');
    expect(text).toContain('note: C1 replaced with a 4.7 nF C0G part');
    const markdown = renderComparisonMarkdown(cmp);
    const rows = markdown.split('\n').filter((l) => l.startsWith('| ') && !l.startsWith('| check') && !l.startsWith('| ---'));
    expect(rows).toHaveLength(cmp.checks.length);
    const html = renderComparisonHtml(cmp);
    expect(html).toContain('<h2>What changed</h2>');
    expect((html.match(/data-changed="true"/g) ?? []).length).toBe(cmp.checks.filter((k) => k.statementChanged || k.significant).length);
  });

  it('prints the facts and the change lines as one JSON document that survives a round trip', () => {
    const doc = JSON.parse(renderComparisonJson(cmp)) as AttemptComparison & { changes: string[] };
    expect(doc.schemaVersion).toBe(1);
    expect(doc.checks).toEqual(cmp.checks);
    expect(doc.changes[0]).toBe('unit: FAIL → PASS');
  });
});
