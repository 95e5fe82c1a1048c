/**
 * The bench session end to end: a good unit's three captures landing in a watched folder make one
 * complete attempt and a first-pass yield of 100 %; a unit with one capture is INCOMPLETE, waiting for
 * two; a failed unit re-tested after a repair note shows both attempts, the note, and yields that count
 * attempts. Captures are the shipped demo files (invented scenario, src/syntheticCaptures/scenario.ts): FK-0101 is
 * built good, FK-0106 has a slow comparator (FAIL), FK-0102 good. Expected statements are the
 * scenario's, as the README's demo lists them; yields are counted by hand from them.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { openStore, summarizeBatch } from '../../src/records/index.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { copySample, makeDrop, startSession, waitFor } from '../watch/helpers/session.js';
import { runCli } from '../helpers/cliHarness.js';

const SPEC = 'samples/fh210-spec.yaml';
let root: string;
let drop: string;
beforeEach(() => {
  root = makeTempDir('benchproof-attempts-');
  drop = makeDrop(root);
});
afterEach(() => removeTempDir(root));

describe('a bench session with test attempts', { timeout: 240_000 }, () => {
  it('gives one complete attempt and first-pass yield 100 % when a good unit’s three captures land, and lists a one-capture unit as waiting for two', async () => {
    const s = startSession(root);
    await s.ready;
    for (const [i, name] of ['FK-0101_low.csv', 'FK-0101_mid.csv', 'FK-0101_high.csv', 'FK-0102_mid.csv'].entries()) {
      copySample(name, drop);
      await waitFor(() => s.lines().length >= i + 1, `status line ${i + 1}`, s.err);
    }
    await s.stop();
    const data = join(root, 'data');
    const store = openStore(data, { mode: 'read' });
    try {
      const rec = store.unitRecord('FK-0101')!;
      expect(rec.attempts!.map((a) => [a.number, a.state, a.statement, a.runIds.length])).toEqual([[1, 'complete', 'pass', 3]]);
      const [spec] = summarizeBatch(store.runs()).specs;
      expect(spec.firstPass).toMatchObject({ units: 1, accepted: 1, fraction: 1 });
      expect(spec.incomplete).toEqual([{ unit: 'FK-0102', waitingFor: ['low', 'high'] }]);
    } finally {
      store.close();
    }

    const waiting = await runCli(['units', '--waiting', '--data', data]);
    expect(waiting.code).toBe(0);
    expect(waiting.stdout.trim().split('\n')).toHaveLength(2);
    expect(waiting.stdout).toMatch(/^FK-0102 {2}INCOMPLETE {2}low, high {3}/m);
    const json = await runCli(['record', 'FK-0102', '--format', 'json', '--data', data]);
    expect(JSON.parse(json.stdout)).toMatchObject({ state: 'incomplete', waitingFor: ['low', 'high'] });
    const md = await runCli(['record', 'FK-0102', '--format', 'md', '--data', data]);
    expect(md.stdout).toContain('## Current status: **INCOMPLETE, waiting for low, high (so far PASS)**');
  });

  it('shows both attempts of a failed unit re-tested after a repair note, with the note, and counts first-pass and final yield per attempt', async () => {
    const data = join(root, 'data');
    const files = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0106_${c}.csv`);
    const good = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0101_${c}.csv`);
    const first = await runCli(['check', ...files, '--spec', SPEC, '--data', data, '--summary']);
    expect(first.code).toBe(1);
    // The next step after a FAIL names the first cause and the re-check with a note.
    expect(first.stderr).toMatch(/next: look at comparator and switching delay.*after the repair, re-capture and benchproof check .*FK-0106_low\.csv.* --spec samples\/fh210-spec\.yaml --note "what was changed"/);
    // The repaired unit is re-captured; FK-0101's captures stand in for a unit that now passes.
    const again = await runCli(['check', ...good, '--spec', SPEC, '--data', data, '--unit', 'FK-0106', '--force-unit', '--note', 'U3 comparator replaced']);
    expect(again.code).toBe(0);
    expect(again.stderr).toContain('stored run 2 of FK-0106, attempt #2 (PASS)');

    const store = openStore(data, { mode: 'read' });
    try {
      const rec = store.unitRecord('FK-0106')!;
      expect(rec.attempts!.map((a) => [a.number, a.reason, a.statement, a.notes])).toEqual([
        [1, 'first', 'fail', []],
        [2, 'note', 'pass', ['U3 comparator replaced']],
      ]);
      // The file names are kept as given, under the unit --unit named.
      expect(rec.runs[1].captures.map((c) => c.path)).toEqual(good);
      const [spec] = summarizeBatch(store.runs()).specs;
      expect(spec.firstPass).toMatchObject({ units: 1, accepted: 0, fraction: 0 });
      expect(spec.final).toMatchObject({ units: 1, accepted: 1, fraction: 1 });
    } finally {
      store.close();
    }
    const md = await runCli(['record', 'FK-0106', '--format', 'md', '--data', data]);
    expect(md.stdout).toMatch(/\| #2 \| [^|]+ \| after the work in the note \| PASS \| 2 \| 0 \| U3 comparator replaced \|/);
  });

  it('refuses a capture whose name says another unit than --unit, unless --force-unit confirms it', async () => {
    const r = await runCli(['check', 'samples/captures/FK-0102_mid.csv', '--spec', SPEC, '--unit', 'FK-0103', '--no-store']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "samples/captures/FK-0102_mid.csv: the file name says unit FK-0102, but --unit says FK-0103
        expected: captures of FK-0103, or file names without a unit
        fix: leave out --unit to record it under FK-0102, or add --force-unit to record it under FK-0103 (the file name is kept)
      "
    `);
  });

  it('continues a unit’s open attempt with a later check and exits 4 while conditions are still waiting', async () => {
    const data = join(root, 'data');
    const one = await runCli(['check', 'samples/captures/FK-0101_mid.csv', '--spec', SPEC, '--data', data, '--summary']);
    expect(one.code).toBe(4);
    expect(one.stdout).toMatch(/^FK-0101 {2}… INCOMPLETE +waiting for low, high; so far PASS/);
    const two = await runCli(['check', 'samples/captures/FK-0101_low.csv', 'samples/captures/FK-0101_high.csv', '--spec', SPEC, '--data', data, '--json']);
    expect(two.code).toBe(0);
    expect(two.stderr).toContain('FK-0101: checked together with FK-0101_mid.csv from its open attempt #1');
    const doc = JSON.parse(two.stdout);
    expect(doc.units[0]).toMatchObject({ unit: 'FK-0101', statement: 'pass', state: 'complete', waitingFor: [] });
  });
});
