/**
 * Records you can trust (issue 22): every command that reads the records verifies the whole store
 * first (fingerprints, hash chain, archived captures) and names the runs that fail, exit 2, instead of
 * showing a changed PASS; damaged rows and reset schema versions are refused with a clear error,
 * never an internal one. The store is changed here the way an attacker or a bad restore would: with
 * better-sqlite3 directly, triggers dropped, or bytes edited in the file.
 * Expected chain links are recomputed in the test from the documented formula with node:crypto
 * (SHA-256, FIPS 180-4); the rest is project rule (no source).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, readFileSync, readdirSync, rmSync, symlinkSync, truncateSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { runCli } from '../helpers/cliHarness.js';
import { fillDemoStore } from '../records/helpers/fixtureStore.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { runDigest } from '../../src/records/index.js';
import type { Diagnosis, UnitVerdict } from '../../src/types/index.js';

let root: string;
let data: string;
beforeEach(() => {
  root = makeTempDir();
  data = fillDemoStore(root);
});
afterEach(() => removeTempDir(root));

const TRIGGERS = ['runs_no_update', 'runs_no_delete', 'chain_no_update', 'chain_no_delete', 'run_captures_no_delete', 'checks_no_delete', 'condition_results_no_delete', 'causes_no_delete', 'measurements_no_delete', 'run_summaries_no_delete', 'run_summary_checks_no_delete'];

function tamper(sql: (db: Database.Database) => void): void {
  const db = new Database(join(data, 'records.db'));
  for (const t of TRIGGERS) db.exec(`DROP TRIGGER IF EXISTS ${t}`);
  sql(db);
  db.close();
}

const cli = (...argv: string[]): ReturnType<typeof runCli> => runCli([...argv, '--data', data], { cwd: root });

/** Every reading command refuses, exit 2, naming the run; none prints PASS for it. */
async function expectRefused(code: string, named: RegExp): Promise<void> {
  for (const argv of [['units'], ['record', 'FK-0103'], ['batch'], ['batch', '--format', 'csv']]) {
    const r = await cli(...argv);
    expect(r.code, argv.join(' ')).toBe(2);
    expect(r.stdout, argv.join(' ')).toBe('');
    expect(r.stderr, argv.join(' ')).toContain(code === 'records.damaged' ? 'verification problem' : 'verification problem');
    expect(r.stderr).toMatch(named);
  }
  const json = await cli('units', '--json');
  expect((JSON.parse(json.stderr) as { error: { code: string } }).error.code).toBe(code);
}

describe('tampering is seen by every command that reads records', () => {
  it('names a FAIL set to PASS through SQL with the triggers dropped', async () => {
    tamper((db) => db.exec("UPDATE runs SET statement = 'pass', verdict_json = replace(verdict_json, '\"statement\":\"fail\"', '\"statement\":\"pass\"') WHERE unit = 'FK-0103'"));
    await expectRefused('records.tampered', /run #3 of FK-0103/);
  });

  it('names every run when each "fail" byte string in the file is replaced by "pass"', async () => {
    const file = join(data, 'records.db');
    const bytes = readFileSync(file);
    writeFileSync(file, Buffer.from(bytes.toString('latin1').replaceAll('"fail"', '"pass"'), 'latin1'));
    await expectRefused('records.tampered', /run #\d+ of FK-010\d/);
  });

  it('sees a deleted failing first run, which would raise the first-pass yield', async () => {
    tamper((db) => {
      for (const t of ['checks', 'condition_results', 'causes', 'run_captures', 'measurements', 'run_summary_checks', 'run_summaries']) db.prepare(`DELETE FROM ${t} WHERE run_id = 4`).run();
      db.prepare('DELETE FROM runs WHERE id = 4').run();
    });
    await expectRefused('records.tampered', /run #4: it is in the hash chain but no longer in the store/);
  });

  it('sees a deleted run together with its chain entry', async () => {
    tamper((db) => {
      for (const t of ['checks', 'condition_results', 'causes', 'run_captures', 'measurements', 'run_summary_checks', 'run_summaries']) db.prepare(`DELETE FROM ${t} WHERE run_id = 4`).run();
      db.prepare('DELETE FROM runs WHERE id = 4').run();
      db.prepare("DELETE FROM chain WHERE kind = 'run' AND row_id = 4").run();
    });
    await expectRefused('records.tampered', /hash chain/);
  });

  it('sees a verdict edited and re-fingerprinted with the tool\'s own digest function', async () => {
    tamper((db) => {
      const row = db.prepare('SELECT * FROM runs WHERE id = 3').get() as Record<string, string>;
      const verdict = JSON.parse(row.verdict_json.replaceAll('"statement":"fail"', '"statement":"pass"')) as UnitVerdict;
      const captures = (db.prepare('SELECT * FROM run_captures WHERE run_id = 3 ORDER BY seq').all() as Record<string, string | number>[]).map((c) => ({
        path: String(c.original_path), sha256: String(c.sha256), size: Number(c.size), layout: String(c.layout), condition: String(c.condition),
      }));
      const fingerprint = (v: UnitVerdict): string => runDigest({
        unit: row.unit, kind: 'check', startedAt: row.started_at, operator: row.operator, station: row.station,
        spec: { name: row.spec_name, revision: row.spec_revision, sha256: row.spec_sha256 }, toolVersion: row.tool_version,
        verdict: v, diagnosis: JSON.parse(row.diagnosis_json) as Diagnosis, captures,
        ...(row.attempt != null ? { attempt: Number(row.attempt) } : {}),
        ...(row.attempt_reason != null ? { attemptReason: row.attempt_reason } : {}),
        ...(row.note != null ? { note: row.note } : {}),
      } as Parameters<typeof runDigest>[0]);
      // The recomputation is the tool's own: it reproduces the stored fingerprint of the untouched row.
      expect(fingerprint(JSON.parse(row.verdict_json) as UnitVerdict)).toBe(row.digest);
      const digest = fingerprint(verdict);
      db.prepare("UPDATE runs SET statement = 'pass', verdict_json = ?, digest = ? WHERE id = 3").run(JSON.stringify(verdict), digest);
    });
    await expectRefused('records.tampered', /run #3 of FK-0103: its fingerprint differs from the one the hash chain holds/);
  });

  it('sees two runs swapped in order (their numbers exchanged)', async () => {
    tamper((db) => {
      db.exec('PRAGMA foreign_keys = OFF');
      db.prepare('UPDATE runs SET id = 100 WHERE id = 4').run();
      db.prepare('UPDATE runs SET id = 4 WHERE id = 5').run();
      db.prepare('UPDATE runs SET id = 5 WHERE id = 100').run();
    });
    await expectRefused('records.tampered', /run #[45]/);
  });

  it('sees an archived capture deleted or edited', async () => {
    const folder = join(data, 'captures');
    const sub = readdirSync(folder)[0];
    const name = readdirSync(join(folder, sub))[0];
    rmSync(join(folder, sub, name), { force: true });
    // `units` and `batch` read no capture and verify the summaries (schema 7); reading a unit verifies its captures.
    const db = new Database(join(data, 'records.db'), { readonly: true });
    const unit = (db.prepare('SELECT r.unit FROM run_captures c JOIN runs r ON r.id = c.run_id WHERE c.sha256 = ? LIMIT 1').get(name.replace(/\.csv$/, '')) as { unit: string }).unit;
    db.close();
    const r = await cli('record', unit);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/archived capture .* is missing/);
  });

  it('reads the other runs with --allow-unverified, marks the changed one and leaves it out of the batch', async () => {
    tamper((db) => db.exec("UPDATE runs SET statement = 'pass', verdict_json = replace(verdict_json, '\"statement\":\"fail\"', '\"statement\":\"pass\"') WHERE unit = 'FK-0103'"));
    const units = await cli('units', '--json', '--allow-unverified');
    expect(units.code).toBe(0);
    const list = (JSON.parse(units.stdout) as { units: { unit: string; unverifiedRuns?: number[] }[] }).units;
    expect(list.find((u) => u.unit === 'FK-0103')?.unverifiedRuns).toEqual([3]);
    expect(units.stderr).toContain('run #3 of FK-0103');
    const text = await cli('units', '--allow-unverified');
    expect(text.stdout).toMatch(/^FK-0103 .*UNVERIFIED: run #3$/m);
    const record = await cli('record', 'FK-0103', '--allow-unverified');
    expect(record.code).toBe(0);
    expect(record.stdout).toContain('**CHANGED**');
    const batch = await cli('batch', '--json', '--allow-unverified');
    const units2 = (JSON.parse(batch.stdout) as { specs: { units: { unit: string }[] }[] }).specs[0].units.map((u) => u.unit);
    expect(units2).not.toContain('FK-0103');
  });

  it('prints the chain head in every report, the one recomputed from the chain entries', async () => {
    const db = new Database(join(data, 'records.db'), { readonly: true });
    const entries = db.prepare('SELECT kind, row_id, row_digest FROM chain ORDER BY seq').all() as { kind: string; row_id: number; row_digest: string }[];
    db.close();
    let link = '0'.repeat(64);
    for (const e of entries) link = createHash('sha256').update(`benchproof-chain-1\n${link}\n${e.kind}\n${e.row_id}\n${e.row_digest}`).digest('hex');
    // Five runs, each with its summary's entry (schema 7).
    expect(entries).toHaveLength(10);
    const md = await cli('record', 'FK-0101');
    expect(md.stdout).toContain(`chain head ${link.slice(0, 16)}`);
    const html = await cli('batch', '--format', 'html');
    expect(html.stdout).toContain(`chain head <code>${link.slice(0, 16)}</code>`);
    const csv = await cli('batch', '--format', 'csv');
    expect(csv.stdout.split('\r\n')[1].endsWith(`,${link}`)).toBe(true);
    const recordCsv = await cli('record', 'FK-0101', '--format', 'csv');
    expect(recordCsv.stdout.split('\r\n')[1].endsWith(`,${link}`)).toBe(true);
    const json = await cli('record', 'FK-0101', '--json');
    expect((JSON.parse(json.stdout) as { source: { chainHead: string } }).source.chainHead).toBe(link);
  });
});

describe('damaged stores and rows are refused, never an internal error', () => {
  it('refuses a 0-byte records.db as damaged instead of starting a new store', async () => {
    truncateSync(join(data, 'records.db'), 0);
    for (const f of ['records.db-wal', 'records.db-shm']) rmSync(join(data, f), { force: true });
    const r = await cli('units');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('records.db is empty (0 bytes)');
    expect(readFileSync(join(data, 'records.db')).length).toBe(0);
  });

  it('names a run whose verdict is not JSON, or whose diagnosis is [], and reads the rest with --allow-unverified', async () => {
    tamper((db) => {
      db.prepare("UPDATE runs SET verdict_json = '{not json' WHERE id = 1").run();
      db.prepare("UPDATE runs SET diagnosis_json = '[]' WHERE id = 2").run();
    });
    // Reading the units in full (not `units`, which reads their summaries) names each damaged row.
    const r = await cli('record', 'FK-0101', '--json');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('records.damaged');
    expect(r.stderr).toContain('run #1 of FK-0101: its verdict is not valid JSON');
    expect((await cli('record', 'FK-0102')).stderr).toContain('run #2 of FK-0102: its diagnosis is not the shape benchproof stores');
    const rest = await cli('batch', '--allow-unverified');
    expect(rest.code).toBe(0);
    expect(rest.stdout).toContain('FK-0104');
    const rec = await cli('record', 'FK-0101', '--allow-unverified');
    expect(rec.code).toBe(2);
    expect(rec.stderr).not.toContain('internal error');
  });

  it('refuses another program\'s SQLite database as records.db, as damaged, and leaves it', async () => {
    const other = join(root, 'other');
    mkdirSync(other);
    const db = new Database(join(other, 'records.db'));
    db.exec('CREATE TABLE invoices (id INTEGER PRIMARY KEY, total REAL)');
    db.close();
    const before = readFileSync(join(other, 'records.db'));
    for (const argv of [['units', '--json', '--data', other], ['check', join(process.cwd(), 'samples/captures/FK-0101_mid.csv'), '--spec', join(process.cwd(), 'samples/fh210-spec.yaml'), '--json', '--data', other]]) {
      const r = await runCli(argv, { cwd: root });
      expect(r.code, argv[0]).toBe(2);
      expect((JSON.parse(r.stderr) as { error: { code: string } }).error.code).toBe('records.damaged');
    }
    expect(readFileSync(join(other, 'records.db')).equals(before)).toBe(true);
  });

  it.each([0, 2, -1])('refuses a store whose schema version was set to %i, with the version found and expected', async (version) => {
    const db = new Database(join(data, 'records.db'));
    db.pragma(`user_version = ${version}`);
    db.close();
    const r = await cli('units');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`says schema version ${version}`);
    expect(r.stderr).not.toContain('internal error');
  });

  it('refuses --data given as a link to a folder that is gone', async () => {
    const link = join(root, 'dangling');
    symlinkSync(join(root, 'gone'), link);
    for (const argv of [['units', '--data', link], ['check', 'samples/captures/FK-0101_mid.csv', '--spec', 'samples/fh210-spec.yaml', '--data', link]]) {
      const r = await runCli(argv.map((a) => (a.startsWith('samples/') ? join(process.cwd(), a) : a)), { cwd: root });
      expect(r.code, argv[0]).toBe(2);
      expect(r.stderr).not.toContain('internal error');
    }
    mkdirSync(join(root, 'unused'));
  });
});
