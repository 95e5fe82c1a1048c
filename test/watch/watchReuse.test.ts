/**
 * What a `watch` session reuses of the captures it checked before (src/cli/watchReuse.ts): the
 * same bytes under the same plan only, within a bound, and the unit decided from reused results is
 * the unit decided from a fresh reading. Captures are the demo files (invented scenario): FK-0103
 * has a charge/discharge current mismatch. Project rules (no source).
 */
import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkedCache } from '../../src/cli/watchReuse.js';
import { checkPlans, loadSpec, planCapture } from '../../src/cli/checkRun.js';
import type { SourcedPlan } from '../../src/cli/checkRun.js';
import { createContext } from '../../src/cli/context.js';
import type { CheckedCapture } from '../../src/types/index.js';
import { SAMPLES, SPEC } from './helpers/session.js';

const plan = (over: Partial<SourcedPlan> = {}): SourcedPlan => ({
  path: 'drop/FK-0101_mid.csv', unit: 'FK-0101', condition: 'mid', outputs: [{ output: 'triangle', channel: 1 }], perOutput: false, ...over,
});
const capture = (sha256: string, size = 1000): CheckedCapture =>
  ({ path: 'drop/FK-0101_mid.csv', sha256, size, layout: 'csv', unit: 'FK-0101', condition: 'mid', outputs: [], report: {} }) as unknown as CheckedCapture;
const SHA_A = 'a'.repeat(64);
const SHA_B = 'b'.repeat(64);
const ARCHIVE_A = '/data/captures/aa/a.csv';

describe('checkedCache', () => {
  it('checkedCache reuses a result only for a companion with the same bytes and the same plan', () => {
    const cache = checkedCache();
    const c = capture(SHA_A);
    cache.forCheck(undefined).checked(plan(), c);
    const hooks = cache.forCheck(new Map([[SHA_A, ARCHIVE_A], [SHA_B, '/data/captures/bb/b.csv']]));
    expect(hooks.reused(plan({ readFrom: ARCHIVE_A }))).toBe(c);
    // The landed file itself (not read from the archive), other bytes, another plan: read afresh.
    expect(hooks.reused(plan())).toBeUndefined();
    expect(hooks.reused(plan({ readFrom: '/data/captures/bb/b.csv' }))).toBeUndefined();
    expect(hooks.reused(plan({ readFrom: ARCHIVE_A, unit: 'FK-0102' }))).toBeUndefined();
    expect(hooks.reused(plan({ readFrom: ARCHIVE_A, condition: 'high' }))).toBeUndefined();
    expect(hooks.reused(plan({ readFrom: ARCHIVE_A, path: 'drop/other.csv' }))).toBeUndefined();
    expect(hooks.reused(plan({ readFrom: ARCHIVE_A, outputs: [{ output: 'triangle', channel: 2 }] }))).toBeUndefined();
    expect(cache.forCheck(undefined).reused(plan({ readFrom: ARCHIVE_A }))).toBeUndefined();
  });

  it('checkedCache keeps at most its bound, dropping the least recently used first', () => {
    const cache = checkedCache({ entries: 2 });
    const shas = ['1', '2', '3'].map((d) => d.repeat(64));
    const sources = new Map(shas.map((s) => [s, `/archive/${s}`]));
    const hooks = cache.forCheck(sources);
    hooks.checked(plan(), capture(shas[0]));
    hooks.checked(plan(), capture(shas[1]));
    expect(hooks.reused(plan({ readFrom: `/archive/${shas[0]}` }))).toBeDefined(); // now the most recent
    hooks.checked(plan(), capture(shas[2]));
    expect(cache.size()).toBe(2);
    expect(hooks.reused(plan({ readFrom: `/archive/${shas[1]}` }))).toBeUndefined();
    expect(hooks.reused(plan({ readFrom: `/archive/${shas[0]}` }))).toBeDefined();
    expect(hooks.reused(plan({ readFrom: `/archive/${shas[2]}` }))).toBeDefined();
  });

  it('checkedCache keeps nothing of a capture larger than its byte bound, and nothing once cleared', () => {
    const cache = checkedCache({ maxBytes: 1000 });
    const hooks = cache.forCheck(new Map([[SHA_A, ARCHIVE_A]]));
    hooks.checked(plan(), capture(SHA_A, 1001));
    expect(cache.size()).toBe(0);
    hooks.checked(plan(), capture(SHA_A, 1000));
    expect(cache.size()).toBe(1);
    cache.clear();
    expect(cache.size()).toBe(0);
    expect(hooks.reused(plan({ readFrom: ARCHIVE_A }))).toBeUndefined();
  });

  it('checkedCache gives the same unit decision as reading every capture afresh', async () => {
    const ctx = createContext({ stdout: () => undefined, stderr: () => undefined, stdoutIsTTY: false, stderrIsTTY: false, env: {}, cwd: process.cwd() });
    const { spec } = loadSpec(ctx, SPEC);
    const file = (c: string): string => join(SAMPLES, `FK-0103_${c}.csv`);
    const sha = (path: string): string => createHash('sha256').update(readFileSync(path)).digest('hex');
    const plans = ['low', 'mid'].map((c) => planCapture(spec, file(c), {}));
    // The low capture lands first; then mid lands and low joins it from the "archive" (here its own file).
    const cache = checkedCache();
    await checkPlans(ctx, spec, [plans[0]], {}, undefined, cache.forCheck(undefined));
    const companion: SourcedPlan = { ...plans[0], readFrom: file('low') };
    const hooks = cache.forCheck(new Map([[sha(file('low')), file('low')]]));
    let hits = 0;
    const counted = { reused: (p: SourcedPlan) => (hooks.reused(p) ? (hits += 1, hooks.reused(p)) : undefined), checked: hooks.checked };
    const reused = await checkPlans(ctx, spec, [plans[1], companion], {}, undefined, counted);
    expect(hits).toBe(1);
    const fresh = await checkPlans(ctx, spec, [plans[1], companion], {});
    expect(cache.size()).toBe(2);
    expect(JSON.parse(JSON.stringify(reused))).toEqual(JSON.parse(JSON.stringify(fresh)));
    expect(reused[0].verdict.statement).toBe('fail');
  });
});
