import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { openStore, summarizeBatch } from '../../src/records/index.js';
import { BATCH_CSV_COLUMNS, renderBatchCsv, renderBatchHtml, renderBatchMarkdown } from '../../src/report/index.js';
import type { BatchReport } from '../../src/types/index.js';
import { fillDemoStore } from '../records/helpers/fixtureStore.js';
import { readTags } from '../records/helpers/htmlTags.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';

let root: string;
let batch: BatchReport;
beforeAll(() => {
  root = makeTempDir();
  const store = openStore(fillDemoStore(root), { mode: 'read' });
  batch = summarizeBatch(store.runs());
  store.close();
});
afterAll(() => removeTempDir(root));

describe('batch reports', () => {
  it('exports CSV that a general CSV parser (papaparse) reads back to the same numbers', () => {
    const csv = renderBatchCsv(batch);
    expect(csv.endsWith('\r\n')).toBe(true);
    const parsed = Papa.parse<Record<string, string>>(csv.trim(), { header: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual([...BATCH_CSV_COLUMNS]);
    const stats = batch.specs[0].measurements;
    expect(parsed.data).toHaveLength(stats.length);
    parsed.data.forEach((row, i) => {
      const m = stats[i];
      expect([row.condition, row.output, row.measurement]).toEqual([m.condition, m.output, m.measurement]);
      expect(row.mean === '' ? null : Number(row.mean)).toBe(m.mean);
      expect(row.sd === '' ? null : Number(row.sd)).toBe(m.sd);
      expect(row.cpk === '' ? null : Number(row.cpk)).toBe(m.cpk);
      expect(Number(row.final_yield)).toBe(0.75);
    });
  });

  it('quotes CSV text with commas and quotes, and defuses cells a spreadsheet would run as formulas', () => {
    const m = batch.specs[0].measurements[0];
    const evil: BatchReport = { ...batch, specs: [{ ...batch.specs[0], spec: '=HYPERLINK("x")', measurements: [{ ...m, output: 'tri, "A"' }] }] };
    const row = Papa.parse<string[]>(renderBatchCsv(evil).trim()).data[1];
    expect(row[0]).toBe('\'=HYPERLINK("x")');
    expect(row[2]).toBe('tri, "A"');
  });

  it('draws one histogram per checked quantity in HTML, with numbers equal to the statistics', () => {
    const html = renderBatchHtml(batch);
    const tags = readTags(html);
    const stats = batch.specs[0].measurements;
    expect(tags.filter((t) => t.name === 'svg' && t.attrs.class === 'plot histogram')).toHaveLength(stats.length);
    expect(html).not.toMatch(/(https?:|url\(|<script|<link|xmlns)/i);
    const rows = tags.filter((t) => t.name === 'tr' && t.attrs['data-measurement']);
    rows.forEach((row, i) => {
      const cells = html.slice(row.end, html.indexOf('</tr>', row.end));
      const values = [...cells.matchAll(/data-value="([^"]*)"/g)].map((x) => Number(x[1]));
      const m = stats[i];
      expect(values).toEqual([m.count, m.mean, m.sd, m.min, m.max, m.lower, m.upper, m.cp, m.cpk].filter((v) => v !== null));
    });
  });

  it('states first-pass and final yield in Markdown', () => {
    const text = renderBatchMarkdown(batch);
    expect(text).toContain('- first-pass yield: 50.0 % (2 of 4 units)');
    expect(text).toContain('- final yield: 75.0 % (3 of 4 units)');
    expect(text).toContain('NIST/SEMATECH e-Handbook §6.1.6');
  });
});
