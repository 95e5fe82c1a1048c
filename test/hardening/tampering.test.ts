/**
 * Tampering, seeded: a store of demo runs is copied, changed
 * the way someone with the database file could (triggers dropped, rows edited, deleted, inserted or
 * reordered, chain entries removed or reordered, fingerprints recomputed with benchproof's own
 * digest function, archived captures deleted or edited, bytes edited in the file), and the store's
 * verification must name a problem every time. A change it misses is counted as a "tampering missed".
 * Each change is checked to have happened (the database differs), so a no-op cannot pass as caught.
 * What the design does not claim to catch (rewriting the whole chain after the change, or removing
 * the newest rows with their entries) is not generated here; the README says what catches those.
 * Project rule (no source); SHA-256 via node:crypto (FIPS 180-4).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import fc from 'fast-check';
import { openStore, runDigest } from '../../src/records/index.js';
import { fillDemoStore } from '../records/helpers/fixtureStore.js';
import { newTally, saveTally, scaled, seedFor } from './budget.js';

const tally = newTally();
let template: string;
let work: string;

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'benchproof-tamper-'));
  template = fillDemoStore(work);
});
afterAll(() => {
  saveTally('tampering', tally);
  rmSync(work, { recursive: true, force: true });
});

type Db = Database.Database;
const KINDS = ['edit-column', 'edit-verdict', 'edit-bytes', 'delete-run', 'delete-run-and-entry', 'swap-ids', 'refingerprint', 'insert-copy', 'swap-entries', 'archive-delete', 'archive-edit'] as const;
type Kind = (typeof KINDS)[number];

function dropTriggers(db: Db): void {
  const names = db.prepare("SELECT name FROM sqlite_master WHERE type = 'trigger'").all() as { name: string }[];
  for (const { name } of names) db.exec(`DROP TRIGGER "${name}"`);
}

const runIds = (db: Db): number[] => (db.prepare('SELECT id FROM runs ORDER BY id').all() as { id: number }[]).map((r) => r.id);

/** Apply one change; returns a description, or null when the store had nothing to change that way. */
function tamper(dir: string, kind: Kind, pick: number): string | null {
  const file = join(dir, 'records.db');
  if (kind === 'edit-bytes') {
    const bytes = readFileSync(file);
    const text = bytes.toString('latin1');
    const words = [['"fail"', '"pass"'], ['"FK-0103"', '"FK-0130"'], ['R. Okafor', 'R. Okafar']].filter(([a]) => text.includes(a));
    if (!words.length) return null;
    const [a, b] = words[pick % words.length];
    writeFileSync(file, Buffer.from(text.replaceAll(a, b), 'latin1'));
    return `bytes ${a} → ${b}`;
  }
  if (kind === 'archive-delete' || kind === 'archive-edit') {
    const files = readdirSync(join(dir, 'captures'), { recursive: true, withFileTypes: true }).filter((e) => e.isFile()).map((e) => join(e.parentPath, e.name));
    const target = files[pick % files.length];
    if (kind === 'archive-delete') rmSync(target);
    else {
      const b = readFileSync(target);
      b[b.length >> 1] ^= 0x01;
      rmSync(target);
      writeFileSync(target, b);
    }
    return `${kind} ${target.slice(dir.length)}`;
  }
  const db = new Database(file);
  try {
    dropTriggers(db);
    db.exec('PRAGMA foreign_keys = OFF');
    const ids = runIds(db);
    const id = ids[pick % ids.length];
    switch (kind) {
      case 'edit-column': {
        const col = ['operator', 'station', 'started_at', 'statement', 'spec_revision', 'unit'][pick % 6];
        const value = col === 'statement' ? 'pass' : col === 'started_at' ? '2020-01-01T00:00:00.000Z' : `x${pick}`;
        const before = db.prepare(`SELECT ${col} AS v FROM runs WHERE id = ?`).get(id) as { v: string };
        if (before.v === value) return null;
        db.prepare(`UPDATE runs SET ${col} = ? WHERE id = ?`).run(value, id);
        return `run #${id} ${col} = ${value}`;
      }
      case 'edit-verdict': {
        const row = db.prepare('SELECT verdict_json AS v FROM runs WHERE id = ?').get(id) as { v: string };
        const edited = row.v.replace(/"value":(-?[0-9.e+-]+)/, (_m, n: string) => `"value":${Number(n) * 1.001 + 1e-9}`);
        if (edited === row.v) return null;
        db.prepare('UPDATE runs SET verdict_json = ? WHERE id = ?').run(edited, id);
        return `run #${id} a measured value nudged`;
      }
      case 'delete-run':
      case 'delete-run-and-entry': {
        // Not the newest row: removing the newest with its entry is the documented blind spot.
        const older = ids.filter((x) => x !== Math.max(...ids));
        const victim = older[pick % older.length];
        for (const t of ['checks', 'condition_results', 'causes', 'run_captures', 'measurements']) db.prepare(`DELETE FROM ${t} WHERE run_id = ?`).run(victim);
        db.prepare('DELETE FROM runs WHERE id = ?').run(victim);
        if (kind === 'delete-run-and-entry') db.prepare("DELETE FROM chain WHERE kind = 'run' AND row_id = ?").run(victim);
        return `${kind} #${victim}`;
      }
      case 'swap-ids': {
        const other = ids[(pick + 1) % ids.length];
        if (other === id) return null;
        db.prepare('UPDATE runs SET id = -1 WHERE id = ?').run(id);
        db.prepare('UPDATE runs SET id = ? WHERE id = ?').run(id, other);
        db.prepare('UPDATE runs SET id = ? WHERE id = -1').run(other);
        return `swap runs #${id} and #${other}`;
      }
      case 'insert-copy': {
        const cols = (db.prepare('PRAGMA table_info(runs)').all() as { name: string }[]).map((c) => c.name).filter((c) => c !== 'id');
        db.prepare(`INSERT INTO runs (${cols.join(', ')}) SELECT ${cols.join(', ')} FROM runs WHERE id = ?`).run(id);
        return `copy of run #${id} inserted`;
      }
      case 'swap-entries': {
        const seqs = (db.prepare('SELECT seq FROM chain ORDER BY seq').all() as { seq: number }[]).map((r) => r.seq);
        const a = seqs[pick % (seqs.length - 1)];
        const b = a + 1;
        db.prepare('UPDATE chain SET seq = -1 WHERE seq = ?').run(a);
        db.prepare('UPDATE chain SET seq = ? WHERE seq = ?').run(a, b);
        db.prepare('UPDATE chain SET seq = ? WHERE seq = -1').run(b);
        return `chain entries ${a} and ${b} swapped`;
      }
      case 'refingerprint': {
        db.close();
        const store = openStore(dir, { mode: 'read', unverified: 'mark' });
        const run = store.runs().find((r) => r.id === id)!;
        store.close();
        const verdict = { ...run.verdict, statement: run.verdict.statement === 'pass' ? 'fail' : 'pass' } as typeof run.verdict;
        const digest = runDigest({ ...run, verdict });
        const again = new Database(file);
        again.prepare('UPDATE runs SET statement = ?, verdict_json = ?, digest = ? WHERE id = ?').run(verdict.statement, JSON.stringify(verdict), digest, id);
        again.close();
        return `run #${id} statement flipped and re-fingerprinted`;
      }
    }
  } finally {
    if (db.open) db.close();
  }
  return null;
}

const digestOfFolder = (dir: string): string => {
  const h = createHash('sha256');
  for (const e of readdirSync(dir, { recursive: true, withFileTypes: true }).filter((x) => x.isFile() && !x.name.endsWith('-shm')).sort((a, b) => join(a.parentPath, a.name).localeCompare(join(b.parentPath, b.name)))) {
    h.update(join(e.parentPath, e.name).slice(dir.length));
    h.update(readFileSync(join(e.parentPath, e.name)));
  }
  return h.digest('hex');
};

describe('tampering with a store', () => {
  it('is detected for every kind of change, seeded', { timeout: scaled(120_000, 60 * 60_000) }, () => {
    let i = 0;
    fc.assert(
      fc.property(fc.constantFrom(...KINDS), fc.nat(1000), (kind, pick) => {
        const dir = join(work, `t${i++}`);
        cpSync(template, dir, { recursive: true });
        const before = digestOfFolder(dir);
        const what = tamper(dir, kind, pick);
        if (what === null || digestOfFolder(dir) === before) {
          rmSync(dir, { recursive: true, force: true });
          return;
        }
        tally.inputs++;
        let problems = 0;
        try {
          const store = openStore(dir, { mode: 'read', unverified: 'mark' });
          try {
            problems = store.audit().problems.length;
          } finally {
            store.close();
          }
        } catch (err) {
          // A refusal on opening (a damaged file) is a detection too; anything else is a crash.
          if ((err as { code?: string }).code?.startsWith('records.')) problems = 1;
          else {
            tally.crashes++;
            tally.notes.push(`${what}: ${(err as Error).message.split('\n')[0]}`);
          }
        }
        if (problems === 0) {
          tally.missed = (tally.missed ?? 0) + 1;
          tally.notes.push(`tampering missed: ${what}`);
        }
        rmSync(dir, { recursive: true, force: true });
        expect(problems, what).toBeGreaterThan(0);
      }),
      { seed: seedFor(40), numRuns: scaled(22, 600) },
    );
  });

  it('finds nothing wrong in the untouched store (no false alarm)', () => {
    const store = openStore(template, { mode: 'read' });
    expect(store.audit().problems).toEqual([]);
    store.close();
  });
});
