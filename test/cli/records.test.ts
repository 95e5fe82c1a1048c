import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import type { UnitRecord } from '../../src/types/index.js';
import { fillDemoStore } from '../records/helpers/fixtureStore.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';

let root: string;
beforeAll(() => {
  root = makeTempDir();
  fillDemoStore(root);
});
afterAll(() => removeTempDir(root));

const inRoot = { cwd: '' };
beforeAll(() => {
  inRoot.cwd = root;
});

describe('benchproof units', () => {
  it('lists every unit with the state of its latest attempt and its first pass, from the default data folder', async () => {
    const r = await runCli(['units'], inRoot);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout.split('\n')[0]).toBe('unit     status  waiting for  last tested           runs  attempts  first pass  spec');
    // FK-0104 failed its first complete attempt and passed the second (fixtureStore.ts).
    expect(r.stdout).toContain('FK-0104  PASS    —            2026-03-05 09:00 UTC  2     2         FAIL        FH-210 Kestrel VCO rev. C');
    expect(r.stdout).toContain('FK-0103  FAIL');
  });

  it('reads the data folder from BENCHPROOF_DATA, and --data wins over it', async () => {
    const fromEnv = await runCli(['units', '--json'], { cwd: '/', env: { BENCHPROOF_DATA: join(root, 'benchproof-data') } });
    expect(fromEnv.code).toBe(0);
    expect((JSON.parse(fromEnv.stdout) as { units: unknown[] }).units).toHaveLength(4);
    const flag = await runCli(['units', '--data', join(root, 'benchproof-data')], { cwd: '/', env: { BENCHPROOF_DATA: '/nowhere' } });
    expect(flag.code).toBe(0);
  });

  it('exits 2 with a three-line error when the data folder is missing', async () => {
    const r = await runCli(['units', '--data', 'no-such-folder'], inRoot);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "./no-such-folder: there are no stored records here: the data folder or its records.db does not exist yet
        expected: a data folder that \`benchproof check\` has stored runs in
        fix: run \`benchproof check\` on a unit's captures first, or give another folder with --data DIR or BENCHPROOF_DATA
      "
    `);
  });
});

describe('benchproof record', () => {
  it('prints the Markdown record on stdout by default, nothing on stderr', async () => {
    const r = await runCli(['record', 'FK-0103'], inRoot);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).toMatch(/^# Test record — unit FK-0103\n/);
    expect(r.stdout).toContain('## Current status: **FAIL**');
  });

  it('writes an HTML record to --out and says where in one stderr line with the next command', async () => {
    const r = await runCli(['record', 'FK-0104', '--format', 'html', '--out', 'FK-0104-record.html'], inRoot);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "benchproof: wrote the test record of FK-0104 (PASS, 2 run(s), HTML) to FK-0104-record.html; next: benchproof batch --spec "FH-210 Kestrel VCO" --format html --out batch-report.html
      "
    `);
    const html = readFileSync(join(root, 'FK-0104-record.html'), 'utf8');
    expect(html).toMatch(/^<!DOCTYPE html>/);
    expect(existsSync(join(root, 'FK-0104-record.html.part'))).toBe(false);
  });

  it('prints JSON with a runs array whose captures carry sha256', async () => {
    const r = await runCli(['record', 'FK-0104', '--json'], inRoot);
    const doc = JSON.parse(r.stdout) as UnitRecord;
    expect(doc.runs).toHaveLength(2);
    expect(doc.runs.flatMap((x) => x.captures).every((c) => /^[0-9a-f]{64}$/.test(c.sha256))).toBe(true);
    expect(doc.source?.dataDir).toBe('./benchproof-data');
  });

  it('exits 2 for an unknown serial and suggests the nearest stored one', async () => {
    const r = await runCli(['record', 'FK-0140'], inRoot);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "./benchproof-data: no unit FK-0140 in the records
        expected: one of the 4 stored serials, e.g. FK-0101, FK-0102, FK-0103
        fix: did you mean FK-0101? \`benchproof units\` lists every serial
      "
    `);
  });

  it('prints the error as one JSON object on stderr when JSON was asked for', async () => {
    const r = await runCli(['record', 'FK-9999', '--json'], inRoot);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(JSON.parse(r.stderr)).toMatchObject({ error: { code: 'records.unknown-unit', exitCode: 2 } });
  });

  it('refuses an unknown --format with exit 2', async () => {
    const r = await runCli(['record', 'FK-0104', '--format', 'pdf'], inRoot);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('expected: one of md, html, json');
  });
});

describe('benchproof batch', () => {
  it('prints yields and statistics in Markdown', async () => {
    const r = await runCli(['batch'], inRoot);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('- first-pass yield: 50.0 % (2 of 4 units)');
  });

  it('writes CSV for a spreadsheet and names the unit to look at next', async () => {
    const r = await runCli(['batch', '--spec', 'FH-210 Kestrel VCO', '--format', 'csv', '-o', 'batch.csv'], inRoot);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatchInlineSnapshot(`
      "benchproof: wrote the batch report (1 spec(s), 4 unit(s), CSV) to batch.csv; next: benchproof record FK-0103 --format html --out FK-0103-record.html
      "
    `);
    expect(readFileSync(join(root, 'batch.csv'), 'utf8').split('\r\n')[0]).toMatch(/^spec,condition,output,measurement,unit,count/);
  });

  it('keeps only units first tested since --since', async () => {
    const r = await runCli(['batch', '--since', '2026-03-03', '--json'], inRoot);
    const doc = JSON.parse(r.stdout) as { specs: { units: { unit: string }[] }[] };
    expect(doc.specs[0].units.map((u) => u.unit)).toEqual(['FK-0103', 'FK-0104']);
  });

  it('exits 2 for a date it cannot read and for an unknown spec, suggesting the stored name', async () => {
    const bad = await runCli(['batch', '--since', '03/03/2026'], inRoot);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('--since got "03/03/2026", which is not a date');
    const spec = await runCli(['batch', '--spec', 'FH-210 Kestrl VCO'], inRoot);
    expect(spec.code).toBe(2);
    expect(spec.stderr).toContain('fix: did you mean --spec "FH-210 Kestrel VCO"?');
  });
});
