/**
 * Reader fuzzing: generated and damaged capture files, each read, checked and measured in-process,
 * and a share of them through `benchproof measure` for the exit status. The contract under test is
 * this project's own (STYLE.md §13–15): a Capture or a BenchError with exit 2, never an uncaught
 * exception, an internal error (exit 3), a hang, or NaN in a report. Cutting a file at any byte and
 * invalid UTF-8 are what USB copies and old exports do (common practice (no source)).
 */
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { runCli } from '../helpers/cliHarness.js';
import { LONG, newTally, saveTally, scaled, seedFor, timeBudget } from './budget.js';
import { applyDamage, csvLayout, damage, describeDamage, layoutText } from './hostileCsv.js';
import type { Damage } from './hostileCsv.js';
import { judgeCapture } from './fuzzTarget.js';

const dir = mkdtempSync(join(tmpdir(), 'benchproof-fuzz-'));
/** Failing inputs are kept here (outside the temporary folder) for replay. */
const failures = join(tmpdir(), 'benchproof-hardening-failures');
const tally = newTally();
const codes = new Map<string, number>();
afterAll(() => {
  saveTally('reader', tally);
  rmSync(dir, { recursive: true, force: true });
});

const SAMPLES = ['FK-0101_mid', 'FK-0102_low', 'FK-0103_high', 'FK-0104_mid', 'FK-0105_low', 'FK-0106_high'].map((n) => readFileSync(`samples/captures/${n}.csv`));
const PER_INPUT_MS = 20_000;
let counter = 0;

interface Input {
  readonly base: Buffer;
  readonly label: string;
  readonly gzip: 'no' | 'before-damage' | 'after-damage';
  readonly damages: readonly Damage[];
}

const input: fc.Arbitrary<Input> = fc.record({
  source: fc.oneof(
    { weight: 4, arbitrary: csvLayout.map((l) => ({ base: Buffer.from(layoutText(l), 'utf8'), label: 'generated' })) },
    { weight: 1, arbitrary: fc.nat(SAMPLES.length - 1).map((i) => ({ base: SAMPLES[i], label: `sample ${i}` })) },
  ),
  gzip: fc.constantFrom<Input['gzip']>('no', 'no', 'no', 'no', 'before-damage', 'after-damage'),
  damages: fc.array(damage(LONG ? 1_200_000 : 40_000), { maxLength: 4 }),
}).map(({ source, gzip, damages }) => ({ ...source, gzip, damages, [fc.toStringMethod]: () => `${source.label}, gzip ${gzip}, damage [${damages.map(describeDamage).join(' ')}]` }));

function bytesOf(i: Input): Buffer {
  let b = i.gzip === 'before-damage' ? gzipSync(i.base) : i.base;
  for (const d of i.damages) b = applyDamage(b, d);
  return i.gzip === 'after-damage' ? gzipSync(b) : b;
}

async function tryInput(i: Input): Promise<boolean> {
  const bytes = bytesOf(i);
  const path = join(dir, `fuzz-${counter++}.csv${i.gzip === 'no' ? '' : '.gz'}`);
  writeFileSync(path, bytes);
  tally.inputs++;
  const outcome = await judgeCapture(path, bytes, PER_INPUT_MS);
  if (outcome.kind === 'crash' || outcome.kind === 'hang') {
    if (outcome.kind === 'crash') tally.crashes++;
    else tally.hangs++;
    mkdirSync(failures, { recursive: true });
    const kept = join(failures, `reader-${process.pid}-${counter}.csv${i.gzip === 'no' ? '' : '.gz'}`);
    writeFileSync(kept, bytes);
    tally.notes.push(`reader ${outcome.kind}: ${kept}: ${outcome.detail.split('\n')[0]}`);
    throw new Error(`${outcome.kind} on ${kept}: ${outcome.detail}`);
  }
  if (outcome.kind === 'bench-error') codes.set(outcome.code, (codes.get(outcome.code) ?? 0) + 1);
  rmSync(path);
  return true;
}

describe('capture reader under hostile input', () => {
  it('yields a Capture or a capture BenchError for every generated or damaged file, never a crash or hang', { timeout: scaled(60_000, 30 * 60_000) }, async () => {
    const details = await fc.check(fc.asyncProperty(input, tryInput), {
      seed: seedFor(1),
      numRuns: scaled(120, 6000),
      ...timeBudget(15 * 60_000),
      endOnFailure: true,
    });
    expect(details.failed, fc.defaultReportMessage(details) ?? '').toBe(false);
    // The generator reaches both outcomes, and a spread of error codes, or the test proves little.
    expect(codes.size, [...codes.keys()].join(', ')).toBeGreaterThanOrEqual(3);
  });

  it('ends `measure` with exit 0 or 2 (never 3) and a one-object JSON error on damaged files', { timeout: scaled(60_000, 30 * 60_000) }, async () => {
    const files = fc.sample(input, { seed: seedFor(2), numRuns: scaled(12, 300) });
    const exits: number[] = [];
    for (const i of files) {
      const path = join(dir, `cli-${counter++}.csv${i.gzip === 'no' ? '' : '.gz'}`);
      writeFileSync(path, bytesOf(i));
      tally.inputs++;
      const r = await runCli(['measure', '--json', path], { cwd: dir, env: { BENCHPROOF_DATA: join(dir, 'data') } });
      exits.push(r.code);
      if (r.code !== 0 && r.code !== 2) {
        tally.crashes++;
        tally.notes.push(`measure exit ${r.code}: ${r.stderr.split('\n')[0]}`);
        continue;
      }
      if (r.code === 2) {
        expect(r.stdout).toBe('');
        const err = JSON.parse(r.stderr) as { error: { code: string; fix: string } };
        expect(err.error.code).toMatch(/^capture\./);
        expect(err.error.fix.length).toBeGreaterThan(0);
      } else expect(() => JSON.parse(r.stdout) as unknown).not.toThrow();
      rmSync(path);
    }
    expect(exits.filter((c) => c !== 0 && c !== 2)).toEqual([]);
  });
});
