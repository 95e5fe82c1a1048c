/**
 * A unit's open test attempt in a new check: the captures the attempt already holds for what the new
 * files do not cover are checked again with them (read from the archive, recorded under their own
 * file names), so the run holds the whole attempt so far and the unit completes once the last
 * condition lands. Used by `check` and `watch`; `--new-attempt` or `--note` start afresh instead.
 */
import { basename, join } from 'node:path';
import type { CapturePlan, Spec } from '../design/index.js';
import type { RecordStore } from '../records/index.js';
import { BenchError } from '../types/index.js';
import type { CommandContext } from './context.js';
import { hasRecords, openDataStore, resolveDataDir } from './store.js';
import type { StoreFlags } from './store.js';
import { planCapture } from './checkRun.js';
import type { SourcedPlan } from './checkRun.js';

/** What a plan covers: its condition and outputs; one capture per key goes into a run. */
export const coverKey = (p: Pick<CapturePlan, 'condition' | 'outputs'>): string => `${p.condition}|${p.outputs.map((o) => o.output).sort().join(',')}`;

export interface Companions {
  readonly plans: readonly SourcedPlan[];
  /** Archive path (absolute) by SHA-256, for storing the run again from the archived bytes. */
  readonly sources: ReadonlyMap<string, string>;
  /** Per unit: the open attempt's number and the files taken from it. */
  readonly taken: ReadonlyMap<string, { readonly attempt: number; readonly files: readonly string[] }>;
}

export function attemptCompanions(store: RecordStore, dataDir: string, spec: Spec, plans: readonly CapturePlan[]): Companions {
  const out: SourcedPlan[] = [];
  const sources = new Map<string, string>();
  const taken = new Map<string, { attempt: number; files: string[] }>();
  for (const unit of new Set(plans.map((p) => p.unit))) {
    const open = store.openAttempt(unit, spec.name);
    if (!open) continue;
    const covered = new Set(plans.filter((p) => p.unit === unit).map(coverKey));
    for (const c of open.captures) {
      let plan: CapturePlan;
      try {
        plan = planCapture(spec, c.path, { unit, condition: c.condition });
      } catch {
        continue; // the spec no longer names this capture's output: it is not part of this check
      }
      if (covered.has(coverKey(plan))) continue; // the new file replaces it: a re-capture
      covered.add(coverKey(plan));
      const readFrom = join(dataDir, ...c.archivePath.split('/'));
      out.push({ ...plan, readFrom });
      sources.set(c.sha256, readFrom);
      const entry = taken.get(unit) ?? { attempt: open.number, files: [] };
      entry.files.push(c.path);
      taken.set(unit, entry);
    }
  }
  return { plans: out, sources, taken };
}

/** The open attempts' captures from the data folder, when it holds records; undefined otherwise. */
export function companionsFromStore(ctx: CommandContext, flags: StoreFlags, spec: Spec, plans: readonly CapturePlan[]): Companions | undefined {
  const location = resolveDataDir(ctx, flags);
  if (!hasRecords(ctx, flags)) return undefined;
  // 'write': on a shared store out of reach, the bench's own outbox answers (store.ts).
  const { store } = openDataStore(ctx, flags, 'write');
  try {
    return attemptCompanions(store, location.dir, spec, plans);
  } finally {
    store.close();
  }
}

/** One stderr line per unit whose open attempt supplied captures. */
export function describeCompanions(companions: Companions | undefined): string {
  if (!companions) return '';
  return [...companions.taken.entries()]
    .map(([unit, t]) => `benchproof: ${unit}: checked together with ${t.files.map((f) => basename(f)).join(', ')} from its open attempt #${t.attempt} (--new-attempt starts a new one)\n`)
    .join('');
}

const NOTE_MAX = 500;

/** A --note must say something, on one line, in a length a record can show. */
export function checkNote(note: string | undefined): string | undefined {
  if (note === undefined) return undefined;
  const text = note.trim();
  // Control characters (line breaks, escapes) would break the record's one-line cells and the terminal.
  const control = [...text].some((ch) => ch.charCodeAt(0) < 0x20 || ch.charCodeAt(0) === 0x7f);
  if (text === '' || text.length > NOTE_MAX || control) {
    throw new BenchError({
      code: 'usage.bad-note',
      file: '--note',
      problem: text === '' ? 'the note is empty' : text.length > NOTE_MAX ? `the note is ${text.length} characters long` : 'the note holds a line break or another control character',
      expected: `one line of at most ${NOTE_MAX} characters saying what was done to the unit`,
      fix: 'write e.g. --note "C3 replaced with a 4.7 nF C0G part"',
    });
  }
  return text;
}
