// The `units` listing at the terminal: one aligned line per unit when it fits, and within the width of
// a narrow terminal otherwise (80 columns: the classic terminal width, common practice, no source).
import { describe, expect, it } from 'vitest';
import { createStyle, renderUnitsText } from '../../src/report/index.js';
import type { UnitSummary } from '../../src/types/index.js';

const spec = (name: string) => ({ name, revision: 'C', sha256: 'a'.repeat(64) });
const unit = (serial: string, specName: string, extra: Partial<UnitSummary> = {}): UnitSummary => ({
  unit: serial,
  spec: spec(specName),
  status: 'pass',
  firstStatement: 'pass',
  firstTestedAt: '2026-03-03T10:00:00.000Z',
  lastTestedAt: '2026-03-03T10:20:00.000Z',
  runs: 2,
  attempts: 1,
  firstComplete: 'pass',
  ...extra,
});
// Demo serials and spec names (fictional scenario).
const units = [
  unit('FK-0101', 'FH-210 Kestrel VCO'),
  unit('FK-0102', 'FH-210 Kestrel VCO', { status: 'fail', firstComplete: 'fail', unverifiedRuns: [7] }),
  unit('FL-0001', 'FH-220 Lapwing LFO'),
];
const plain = createStyle(false);
const widest = (text: string) => Math.max(...text.trimEnd().split('\n').map((l) => [...l].length));

describe('the units listing', () => {
  it('keeps one line per unit, the spec on it, when the table fits', () => {
    const text = renderUnitsText(units, plain);
    const lines = text.trimEnd().split('\n');
    expect(lines).toHaveLength(1 + units.length);
    expect(lines[0]).toMatch(/^unit\s+status\s+waiting for\s+last tested\s+runs\s+attempts\s+first pass\s+spec$/);
    expect(lines[2]).toContain('FH-210 Kestrel VCO rev. C  UNVERIFIED: run #7');
    expect(renderUnitsText(units, plain, widest(text))).toBe(text);
  });

  it('fits an 80-column terminal by naming each spec once above its units', () => {
    expect(widest(renderUnitsText(units, plain))).toBeGreaterThan(80);
    const text = renderUnitsText(units, plain, 80);
    expect(widest(text)).toBeLessThanOrEqual(80);
    const lines = text.trimEnd().split('\n');
    expect(lines[0]).not.toContain('spec');
    expect(lines.slice(1).map((l) => l.trim().split(/\s+/)[0])).toEqual(['spec', 'FK-0101', 'FK-0102', 'UNVERIFIED:', 'spec', 'FL-0001']);
    expect(lines[1]).toBe('spec FH-210 Kestrel VCO rev. C');
    expect(lines[5]).toBe('spec FH-220 Lapwing LFO rev. C');
    // What failed verification is named right under the unit's line.
    expect(lines[3]).toMatch(/^FK-0102\s+FAIL\b/);
    expect(lines[4]).toBe('  UNVERIFIED: run #7');
  });
});
