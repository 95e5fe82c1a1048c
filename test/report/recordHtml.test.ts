import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openStore } from '../../src/records/index.js';
import { renderRecordHtml } from '../../src/report/index.js';
import type { UnitRecord } from '../../src/types/index.js';
import { fillDemoStore } from '../records/helpers/fixtureStore.js';
import { readTags } from '../records/helpers/htmlTags.js';
import type { Tag } from '../records/helpers/htmlTags.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';

let root: string;
let rec: UnitRecord;
let html: string;
let tags: Tag[];

beforeAll(() => {
  root = makeTempDir();
  const store = openStore(fillDemoStore(root), { mode: 'read' });
  rec = store.unitRecord('FK-0104')!;
  store.close();
  html = renderRecordHtml(rec);
  tags = readTags(html);
});
afterAll(() => removeTempDir(root));

const dataValues = (row: Tag): number[] => {
  const start = html.indexOf('>', html.lastIndexOf('<tr', row.end)) + 1;
  const rowHtml = html.slice(start, html.indexOf('</tr>', start));
  return [...rowHtml.matchAll(/data-value="([^"]*)"/g)].map((m) => Number(m[1]));
};

describe('renderRecordHtml', () => {
  it('writes a well-formed page whose elements all close in order', () => {
    expect(tags[0].name).toBe('html');
    expect(tags.filter((t) => t.name === 'h1')).toHaveLength(1);
  });

  it('shows every checked value, its U and margin exactly as the store holds them', () => {
    const latest = rec.runs[rec.runs.length - 1];
    const rows = tags.filter((t) => t.name === 'tr' && t.attrs['data-measurement'] !== undefined);
    const checks = latest.verdict.conditions.flatMap((c) => c.checks);
    expect(rows).toHaveLength(checks.length);
    for (const k of checks) {
      const row = rows.find((r) => r.attrs['data-condition'] === k.condition && r.attrs['data-output'] === k.output && r.attrs['data-measurement'] === k.measurement)!;
      expect(row.attrs['data-run']).toBe(String(latest.id));
      // Exact equality: the page carries the stored double as JavaScript prints it (round-trips).
      expect(dataValues(row)).toEqual([k.value, k.expandedUncertainty, k.margin]);
    }
  });

  it('lists the SHA-256 of every capture of every run', () => {
    const shown = tags.filter((t) => t.attrs['data-sha256']).map((t) => t.attrs['data-sha256']);
    expect(shown.sort()).toEqual(rec.runs.flatMap((r) => r.captures.map((c) => c.sha256)).sort());
  });

  it('draws waveform and spectrum plots per captured channel, and a trend with a limit band per check', () => {
    const svgs = tags.filter((t) => t.name === 'svg');
    const kinds = (cls: string): number => svgs.filter((s) => s.attrs.class === `plot ${cls}`).length;
    expect(kinds('waveform')).toBe(3);
    expect(kinds('spectrum')).toBe(3);
    expect(kinds('trend')).toBe(12);
    expect(svgs.every((s) => s.attrs.role === 'img' && s.attrs['aria-label'])).toBe(true);
    expect(html).toContain('ideal triangle series');
    expect(html).toContain('high state level');
    expect(html).toContain('limit band');
  });

  it('needs nothing from a network: no URL, script, external stylesheet, image or font', () => {
    expect(html).not.toMatch(/(https?:|ftp:|\/\/[\w.-]+\/|url\(|@import|<script|<link|<img|<iframe|xmlns)/i);
    expect(tags.some((t) => 'src' in t.attrs || 'href' in t.attrs)).toBe(false);
  });

  it('carries print rules and states the status as a word', () => {
    expect(html).toMatch(/@media print\s*{[\s\S]*break-inside: avoid/);
    const status = tags.find((t) => t.attrs.class === 'status big')!;
    expect(status.attrs['data-statement']).toBe('pass');
    expect(html.slice(status.end, status.end + 4)).toBe('PASS');
  });

  it('escapes text from the records so it cannot become markup', () => {
    const evil = { ...rec, runs: rec.runs.map((r) => ({ ...r, operator: '<script>x</script> & "co"' })) };
    const page = renderRecordHtml(evil);
    expect(page).not.toContain('<script>');
    expect(page).toContain('&lt;script&gt;x&lt;/script&gt; &amp; &quot;co&quot;');
    expect(() => readTags(page)).not.toThrow();
  });

  it('warns in words when a run no longer matches its stored fingerprint', () => {
    const page = renderRecordHtml({ ...rec, runs: rec.runs.map((r, i) => (i === 0 ? { ...r, intact: false } : r)) });
    expect(page).toMatch(/Run #\d+ no longer matches the fingerprint/);
    expect(page).toContain('<strong>CHANGED</strong>');
  });
});
