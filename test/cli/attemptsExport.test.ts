/**
 * The per-unit spreadsheet export: one row per attempt × condition × measurement, CSV with a header
 * (RFC 4180 §2 quoting, CRLF; read back from the --out file), and a comma decimal mark with
 * semicolon separators on request. The values are compared with the stored record itself (the
 * export must not change a digit).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { openStore } from '../../src/records/index.js';
import { RECORD_CSV_COLUMNS } from '../../src/report/index.js';
import type { UnitRecord } from '../../src/types/index.js';
import { kestrelRun } from '../records/fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { runCli } from '../helpers/cliHarness.js';

let root: string;
let data: string;
let rec: UnitRecord;
beforeAll(() => {
  root = makeTempDir();
  data = join(root, 'data');
  const store = openStore(data);
  try {
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-03T11:00:00.000Z', frequencyScale: 0.94 }));
    store.saveRun({ ...kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-04T09:00:00.000Z' }), note: 'C1 replaced; "C0G", 4.7 nF' });
    rec = store.unitRecord('FK-0104')!;
  } finally {
    store.close();
  }
});
afterAll(() => removeTempDir(root));

/** RFC 4180 fields of one line: quoted fields may hold the separator and doubled quotes. */
function fields(line: string, sep: string): string[] {
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quoted && ch === '"' && line[i + 1] === '"') {
      cur += '"';
      i++;
    } else if (ch === '"') {
      quoted = !quoted;
    } else if (ch === sep && !quoted) {
      out.push(cur);
      cur = '';
    } else {
      cur += ch;
    }
  }
  return [...out, cur];
}

describe('record --format csv', () => {
  it('gives a header and one row per attempt, condition and checked measurement, with the stored values unchanged', async () => {
    const r = await runCli(['record', 'FK-0104', '--format', 'csv', '--data', data, '--out', join(root, 'a.csv')], { cwd: root });
    expect(r.code).toBe(0);
    const lines = readFileSync(join(root, 'a.csv'), 'utf8').split('\r\n').filter(Boolean);
    expect(lines[0]).toBe(RECORD_CSV_COLUMNS.join(','));
    const checks = rec.runs[0].verdict.conditions.flatMap((c) => c.checks);
    expect(lines).toHaveLength(1 + 2 * checks.length);
    const col = (name: (typeof RECORD_CSV_COLUMNS)[number]): number => RECORD_CSV_COLUMNS.indexOf(name);
    const rows = lines.slice(1).map((l) => fields(l, ','));
    expect(rows.every((f) => f.length === RECORD_CSV_COLUMNS.length)).toBe(true);
    const first = rows.find((f) => f[col('attempt')] === '1' && f[col('condition')] === 'mid' && f[col('measurement')] === 'frequency')!;
    const stored = checks.find((k) => k.condition === 'mid' && k.measurement === 'frequency')!;
    // Shortest round-trip text of a double (ECMA-262 Number::toString): parsing gives the same value.
    expect(Number(first[col('value')])).toBe(stored.value);
    expect(first[col('statement')]).toBe('fail');
    const second = rows.find((f) => f[col('attempt')] === '2')!;
    expect(second[col('attempt_notes')]).toBe('C1 replaced; "C0G", 4.7 nF');
  });

  it('writes a comma decimal mark with semicolon separators when asked, quoting a note that holds a semicolon', async () => {
    const r = await runCli(['record', 'FK-0104', '--format', 'csv', '--decimal-mark', 'comma', '--data', data, '--out', join(root, 'b.csv')], { cwd: root });
    expect(r.code).toBe(0);
    const lines = readFileSync(join(root, 'b.csv'), 'utf8').split('\r\n').filter(Boolean);
    expect(lines[0]).toBe(RECORD_CSV_COLUMNS.join(';'));
    const row = fields(lines.find((l) => l.startsWith('FK-0104;2;'))!, ';');
    expect(row).toHaveLength(RECORD_CSV_COLUMNS.length);
    const value = row[RECORD_CSV_COLUMNS.indexOf('value')];
    expect(value).toMatch(/^\d+,\d+$/);
    expect(row[RECORD_CSV_COLUMNS.indexOf('attempt_notes')]).toBe('C1 replaced; "C0G", 4.7 nF');
  });
});
