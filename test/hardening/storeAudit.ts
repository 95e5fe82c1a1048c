/**
 * An audit of a data folder after processes were killed or starved, read with better-sqlite3
 * directly (not through the store's own code): the database passes `PRAGMA integrity_check` and
 * `PRAGMA foreign_key_check` (sqlite.org/pragma.html), every run is whole (its check, condition,
 * cause and capture rows agree with its stored verdict; no row hangs without its run), and every
 * archived capture still hashes (SHA-256, FIPS 180-4, via node:crypto) to the name it is filed under.
 */
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';

export interface Audit {
  /** Stored runs by id, with their unit. */
  readonly runs: ReadonlyMap<number, string>;
  /** Archived capture files checked against their SHA-256. */
  readonly archived: number;
  /** Files left in the archive's temporary folder. */
  readonly temps: readonly string[];
  readonly problems: readonly string[];
}

interface VerdictShape {
  readonly conditions: readonly { readonly checks: readonly unknown[] }[];
  readonly captures: readonly unknown[];
}

export function auditStore(dataDir: string): Audit {
  const problems: string[] = [];
  const runs = new Map<number, string>();
  const dbFile = join(dataDir, 'records.db');
  if (!existsSync(dbFile)) return { runs, archived: 0, temps: [], problems };
  // Opened for writing so that a WAL left by a killed writer is recovered, as the next benchproof would.
  const db = new Database(dbFile, { timeout: 30_000 });
  try {
    const integrity = db.pragma('integrity_check', { simple: true });
    if (integrity !== 'ok') problems.push(`integrity_check: ${String(integrity)}`);
    const fk = db.pragma('foreign_key_check') as unknown[];
    if (fk.length > 0) problems.push(`foreign_key_check: ${JSON.stringify(fk.slice(0, 3))}`);
    const rows = db.prepare('SELECT id, unit, verdict_json, diagnosis_json FROM runs').all() as { id: number; unit: string; verdict_json: string; diagnosis_json: string }[];
    const count = (table: string, id: number): number => (db.prepare(`SELECT COUNT(*) AS n FROM ${table} WHERE run_id = ?`).get(id) as { n: number }).n;
    for (const r of rows) {
      runs.set(r.id, r.unit);
      const v = JSON.parse(r.verdict_json) as VerdictShape;
      const causes = (JSON.parse(r.diagnosis_json) as { causes: unknown[] }).causes.length;
      const want = { checks: v.conditions.reduce((s, c) => s + c.checks.length, 0), condition_results: v.conditions.length, run_captures: v.captures.length, causes };
      for (const [table, n] of Object.entries(want)) {
        const got = count(table, r.id);
        if (got !== n) problems.push(`run #${r.id}: ${got} row(s) in ${table}, its verdict has ${n}`);
      }
      if (count('measurements', r.id) === 0 && v.captures.length > 0) problems.push(`run #${r.id}: no measurement rows`);
    }
    for (const table of tablesWithRunId(db)) {
      const n = (db.prepare(`SELECT COUNT(*) AS n FROM ${table} WHERE run_id NOT IN (SELECT id FROM runs)`).get() as { n: number }).n;
      if (n > 0) problems.push(`${n} row(s) in ${table} without their run`);
    }
    auditChain(db, problems);
    const blobs = db.prepare('SELECT sha256, file FROM blobs').all() as { sha256: string; file: string }[];
    for (const b of blobs) if (!existsSync(join(dataDir, b.file))) problems.push(`blob ${b.sha256.slice(0, 12)}: ${b.file} is missing`);
  } finally {
    db.close();
  }
  const archived = auditArchive(join(dataDir, 'captures'), problems);
  const tmp = join(dataDir, 'tmp');
  const temps = existsSync(tmp) ? readdirSync(tmp) : [];
  return { runs, archived, temps, problems };
}

/**
 * The hash chain (README "Records"), recomputed here from its definition: link(n) = SHA-256 of
 * "benchproof-chain-1", link(n−1), kind, row number and row fingerprint, one per line, from 64 zeros;
 * every run has exactly one entry carrying its stored fingerprint. A killed writer must leave it whole.
 */
function auditChain(db: Database.Database, problems: string[]): void {
  const has = db.prepare("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'chain'").get();
  if (!has) return;
  const entries = db.prepare('SELECT seq, kind, row_id, row_digest, link FROM chain ORDER BY seq').all() as { seq: number; kind: string; row_id: number; row_digest: string; link: string }[];
  let link = '0'.repeat(64);
  entries.forEach((e, i) => {
    link = createHash('sha256').update(`benchproof-chain-1\n${link}\n${e.kind}\n${e.row_id}\n${e.row_digest}`).digest('hex');
    if (e.seq !== i + 1 || e.link !== link) problems.push(`chain entry ${e.seq} does not follow from the one before`);
  });
  const runs = db.prepare('SELECT id, digest FROM runs').all() as { id: number; digest: string }[];
  const chained = new Map(entries.filter((e) => e.kind === 'run').map((e) => [e.row_id, e.row_digest]));
  for (const r of runs) if (chained.get(r.id) !== r.digest) problems.push(`run #${r.id} has no chain entry with its fingerprint`);
  if (chained.size !== runs.length) problems.push(`${chained.size} run entries in the chain for ${runs.length} runs`);
}

function tablesWithRunId(db: Database.Database): string[] {
  const tables = db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name != 'runs'").all() as { name: string }[];
  return tables
    .map((t) => t.name)
    .filter((name) => (db.pragma(`table_info(${JSON.stringify(name)})`) as { name: string }[]).some((c) => c.name === 'run_id'));
}

/** Every file under captures/<xx>/ hashes to its own name; returns how many were checked. */
function auditArchive(dir: string, problems: string[]): number {
  if (!existsSync(dir)) return 0;
  let n = 0;
  for (const sub of readdirSync(dir)) {
    for (const name of readdirSync(join(dir, sub))) {
      const sha = createHash('sha256').update(readFileSync(join(dir, sub, name))).digest('hex');
      if (!name.startsWith(sha) || !sub.startsWith(sha.slice(0, 2))) problems.push(`archived ${sub}/${name} hashes to ${sha.slice(0, 12)}…`);
      n++;
    }
  }
  return n;
}
