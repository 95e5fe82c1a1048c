/**
 * Spec fuzzing: the demo spec mutated field by field (values swapped for others of any type, keys
 * dropped, misspelt or added), written as YAML or JSON, then cut or sprinkled with stray bytes; and
 * free-form YAML. Every text must give a Spec or one `spec.*` BenchError whose issues each name the
 * dotted path (or the line, for syntax) — STYLE.md §14 — never another exception.
 */
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parse, stringify } from 'yaml';
import { parseSpec } from '../../src/design/index.js';
import { isBenchError } from '../../src/types/index.js';
import type { BenchErrorFields } from '../../src/types/index.js';
import { runCli } from '../helpers/cliHarness.js';
import { newTally, saveTally, scaled, seedFor, timeBudget } from './budget.js';

const SAMPLE_TEXT = readFileSync('samples/fh210-spec.yaml', 'utf8');
const SAMPLE = parse(SAMPLE_TEXT) as unknown;
const tally = newTally();
afterAll(() => saveTally('spec', tally));

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** Every path to a value in the tree, so a mutation can land anywhere. */
function paths(x: unknown, at: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(at);
  if (Array.isArray(x)) x.forEach((v, i) => paths(v, [...at, i], out));
  else if (x !== null && typeof x === 'object') for (const [k, v] of Object.entries(x)) paths(v, [...at, k], out);
  return out;
}
const ALL_PATHS = paths(SAMPLE);

const oddValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom('6.0 kVpp', '-5 %', '1e400 Hz', 'abc Hz', '', '0', 'NaN V', '∞', '12 µA', '4.7 nF ± 5 %', '50 % ', '{unit}_{unit}.csv', '{condition}', '*.csv', '../x.csv'),
  fc.constantFrom(0, -1, 1e308, -1e-320, Number.MAX_SAFE_INTEGER, 0.5, 3),
  fc.constantFrom(null, true, false, [], {}),
  fc.jsonValue({ maxDepth: 2 }),
  fc.string({ maxLength: 12 }),
);

type Mutation =
  | { readonly op: 'set'; readonly path: number; readonly value: unknown }
  | { readonly op: 'delete'; readonly path: number }
  | { readonly op: 'rename'; readonly path: number; readonly name: string };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ op: fc.constant('set' as const), path: fc.nat(ALL_PATHS.length - 1), value: oddValue }),
  fc.record({ op: fc.constant('delete' as const), path: fc.nat(ALL_PATHS.length - 1) }),
  fc.record({ op: fc.constant('rename' as const), path: fc.nat(ALL_PATHS.length - 1), name: fc.constantFrom('chanel', 'tolerence', 'measure ', 'Frequency', '__proto__', 'constructor', '', '0', 'x.y') }),
);

function mutate(tree: unknown, m: Mutation): unknown {
  const root = structuredClone(tree) as Json;
  const path = ALL_PATHS[m.path];
  if (path.length === 0) return m.op === 'set' ? m.value : root;
  let parent: Json = root;
  for (const k of path.slice(0, -1)) {
    if (parent === null || typeof parent !== 'object') return root;
    parent = (parent as Record<string, Json>)[k as string];
  }
  if (parent === null || typeof parent !== 'object') return root;
  const obj = parent as Record<string | number, Json>;
  const key = path[path.length - 1];
  if (!(key in obj)) return root;
  if (m.op === 'set') obj[key] = m.value as Json;
  else if (m.op === 'delete' && Array.isArray(obj)) obj.splice(key as number, 1);
  else if (m.op === 'delete') delete obj[key];
  else if (!Array.isArray(obj)) {
    Object.defineProperty(obj, m.name, { value: obj[key], enumerable: true, configurable: true, writable: true });
    delete obj[key];
  }
  return root;
}

const specText: fc.Arbitrary<string> = fc.oneof(
  { weight: 6, arbitrary: fc.tuple(fc.array(mutation, { minLength: 1, maxLength: 4 }), fc.boolean()).map(([ms, json]) => {
    const tree = ms.reduce<unknown>(mutate, SAMPLE);
    return json ? JSON.stringify(tree, null, 1) : stringify(tree);
  }) },
  { weight: 2, arbitrary: fc.tuple(fc.double({ min: 0, max: 1, noNaN: true }), fc.string({ maxLength: 6 })).map(([at, junk]) => {
    const p = Math.floor(at * SAMPLE_TEXT.length);
    return SAMPLE_TEXT.slice(0, p) + junk + SAMPLE_TEXT.slice(p + junk.length);
  }) },
  { weight: 1, arbitrary: fc.double({ min: 0, max: 1, noNaN: true }).map((at) => SAMPLE_TEXT.slice(0, Math.floor(at * SAMPLE_TEXT.length))) },
  { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 4 }).map((v) => stringify(v)) },
  { weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 200 }) },
);

const SYNTAX_CODES = new Set(['spec.syntax', 'spec.not-a-map']);
const PATH_FIRST = /^(\(top level\)|[A-Za-z_[][^:]*):/;

/** A problem for the tally, or null when the text gave a Spec or a well-formed spec error. */
function judge(text: string): string | null {
  try {
    parseSpec(text, 'fuzzed-spec.yaml');
    return null;
  } catch (err) {
    if (!isBenchError(err)) return `parseSpec threw ${String((err as Error)?.stack ?? err).split('\n').slice(0, 3).join(' | ')}`;
    const issues: readonly BenchErrorFields[] = err.issues ?? [err];
    if (!err.code.startsWith('spec.') || issues.length === 0) return `unexpected error ${err.code} with ${issues.length} issue(s)`;
    for (const i of issues) {
      if (!i.code.startsWith('spec.') || !i.problem || !i.expected || !i.fix) return `issue without its fields: ${JSON.stringify(i)}`;
      if (!SYNTAX_CODES.has(i.code) && !PATH_FIRST.test(i.problem)) return `issue without a dotted path: ${i.code} "${i.problem}"`;
    }
    return null;
  }
}

describe('spec parser under mutated and random specs', () => {
  it('gives a Spec or one spec error listing each problem with its path, never a crash', { timeout: scaled(60_000, 30 * 60_000) }, async () => {
    const details = await fc.check(
      fc.property(specText, (text) => {
        tally.inputs++;
        const problem = judge(text);
        if (problem === null) return true;
        tally.crashes++;
        tally.notes.push(`spec: ${problem.slice(0, 300)}`);
        throw new Error(problem);
      }),
      { seed: seedFor(3), numRuns: scaled(400, 20_000), ...timeBudget(10 * 60_000) },
    );
    expect(details.failed, fc.defaultReportMessage(details) ?? '').toBe(false);
  });

  it('rejects a YAML alias bomb and an alias without its anchor as spec errors (exit 2), not internal errors', async () => {
    const bomb = ['a: &a [x, x, x, x, x, x, x, x, x]', ...'bcdefg'.split('').map((k, i) => `${k}: &${k} [${Array(9).fill(`*${'abcdefg'[i]}`).join(', ')}]`)].join('\n');
    for (const text of [bomb, 'name: &n x\nrevision: *n\nformat: *nowhere\n']) {
      tally.inputs++;
      expect(judge(text)).toBeNull();
      expect(() => parseSpec(text, 'bomb.yaml')).toThrow(/aliases|alias/i);
    }
  });

  it('ends `spec validate` with exit 0 or 2 on mutated specs, printing nothing to stdout on error', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'benchproof-specfuzz-'));
    for (const [n, text] of fc.sample(specText, { seed: seedFor(4), numRuns: scaled(10, 300) }).entries()) {
      const file = join(dir, `spec-${n}.yaml`);
      writeFileSync(file, text);
      tally.inputs++;
      const r = await runCli(['spec', 'validate', file], { cwd: dir, env: { BENCHPROOF_DATA: join(dir, 'data') } });
      if (r.code !== 0 && r.code !== 2) {
        tally.crashes++;
        tally.notes.push(`spec validate exit ${r.code}: ${r.stderr.split('\n')[0]}`);
      }
      expect([0, 2], r.stderr).toContain(r.code);
      if (r.code === 2) expect(r.stdout).toBe('');
    }
    rmSync(dir, { recursive: true, force: true });
  });

  it('ends `check` with exit 0, 1 or 2 (never 3) when a mutated spec is still valid', { timeout: scaled(60_000, 30 * 60_000) }, async () => {
    const dir = mkdtempSync(join(tmpdir(), 'benchproof-specfuzz-'));
    // The texts parseSpec accepts (each parsed once: one it accepts is one judge() finds no problem in).
    const valid = fc.sample(specText, { seed: seedFor(5), numRuns: scaled(300, 6000) }).filter(parses);
    for (const [n, text] of valid.slice(0, scaled(6, 200)).entries()) {
      const file = join(dir, `spec-${n}.yaml`);
      writeFileSync(file, text);
      tally.inputs++;
      const r = await runCli(['check', resolve('samples/captures/FK-0104_mid.csv'), '--spec', file, '--unit', 'FK-0104', '--condition', 'mid', '--no-store'], { cwd: dir, env: { BENCHPROOF_DATA: join(dir, 'data') } });
      if (r.code === 3) {
        tally.crashes++;
        tally.notes.push(`check with a mutated spec (${file}) exit 3: ${r.stderr.split('\n')[0]}`);
        writeFileSync(join(tmpdir(), `benchproof-hardening-spec-${process.pid}-${n}.yaml`), text);
      }
      expect([0, 1, 2], r.stderr).toContain(r.code);
    }
    rmSync(dir, { recursive: true, force: true });
  });
});

function parses(text: string): boolean {
  try {
    parseSpec(text, 'fuzzed-spec.yaml');
    return true;
  } catch {
    return false;
  }
}
