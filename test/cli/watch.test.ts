/**
 * `benchproof watch` from the command line: usage mistakes in-process (exit 2, pinned text), and real
 * child processes stopped with SIGTERM and SIGINT as a terminal or a service manager would.
 * Captures are copies of the demo files (invented scenario): FK-0101 is built good.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { copySample, makeDrop, SPEC, waitFor } from '../watch/helpers/session.js';
import { spawnWatch } from '../watch/helpers/child.js';

let root: string;
let drop: string;
beforeEach(() => {
  root = makeTempDir('benchproof-watch-cli-');
  drop = makeDrop(root);
});
afterEach(() => removeTempDir(root));

describe('benchproof watch, usage', () => {
  it('exits 2 naming the folder when the watched folder does not exist', async () => {
    const r = await runCli(['watch', join(root, 'nowhere'), '--spec', SPEC]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.replace(root, '<tmp>')).toMatchInlineSnapshot(`
      "<tmp>/nowhere: no such folder
        expected: the folder the scope or copy tool saves captures into
        fix: give an existing folder, e.g. benchproof watch /media/usb-stick --spec samples/fh210-spec.yaml
      "
    `);
  });

  it('exits 2 before watching when --settle is not a positive number or --condition is not in the spec', async () => {
    const settle = await runCli(['watch', drop, '--spec', SPEC, '--settle', 'soon']);
    expect(settle.code).toBe(2);
    expect(settle.stderr).toContain('--settle got "soon", which is not a positive number');
    const cond = await runCli(['watch', drop, '--spec', SPEC, '--condition', 'middle']);
    expect(cond.code).toBe(2);
    expect(cond.stderr).toContain('--condition "middle" is not a condition of samples/fh210-spec.yaml');
    expect(cond.stdout).toBe('');
  });

  it('leads its help with examples on the demo files', async () => {
    const r = await runCli(['watch', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('benchproof watch samples/captures --spec samples/fh210-spec.yaml --new-only');
    expect(r.stdout).toContain('--settle <ms>');
  });
});

// Each child is the built command line, or the TypeScript sources when the build is older than them
// (test/watch/helpers/child.ts); the limits below bound a hung test, they are not expectations about speed.
describe('benchproof watch as a process', () => {
  it('prints the summary and exits 0 on SIGTERM, after checking a capture that landed', async () => {
    const data = join(root, 'data');
    const w = spawnWatch([drop, '--spec', SPEC, '--data', data, '--settle', '400']);
    await w.ready();
    copySample('FK-0101_mid.csv', drop);
    await waitFor(() => w.out().includes('\n'), 'the status line', () => w.err(), 120_000);
    w.child.kill('SIGTERM');
    const end = await w.exited;
    expect(end, w.err()).toEqual({ code: 0, signal: null });
    // One capture of three: the unit's first attempt waits for the other two conditions.
    expect(w.out()).toMatch(/^FK-0101_mid\.csv {2}FK-0101 {2}mid {2}PASS {2}\(FK-0101 1\/3, waiting for low, high; so far PASS; run 1 of attempt #1\)\n$/);
    expect(w.err()).toContain('benchproof: watch stopped: 1 file(s) checked (1 PASS, 0 FAIL); runs in ');
  }, 300_000);

  it('on a restart with --json reports the recorded file as already recorded, and exits 0 on SIGINT', async () => {
    const data = join(root, 'data');
    copySample('FK-0101_low.csv', drop);
    const first = spawnWatch([drop, '--spec', SPEC, '--data', data, '--settle', '400', '--json']);
    await waitFor(() => first.out().includes('\n'), 'the first status line', () => first.err(), 120_000);
    first.child.kill('SIGINT');
    expect((await first.exited).code).toBe(0);
    const second = spawnWatch([drop, '--spec', SPEC, '--data', data, '--settle', '400', '--json']);
    await waitFor(() => second.err().includes('recorded-already'), 'the already-recorded event', () => second.err(), 120_000);
    second.child.kill('SIGINT');
    expect((await second.exited).code).toBe(0);
    expect(JSON.parse(first.out())).toMatchObject({ event: 'checked', unit: 'FK-0101', condition: 'low', statement: 'pass', runId: 1 });
    expect(second.out()).toBe('');
    const events = second.err().trim().split('\n').map((l) => JSON.parse(l));
    expect(events.map((e) => e.event)).toEqual(['watching', 'recorded-already', 'summary']);
    expect(events[1]).toMatchObject({ unit: 'FK-0101', condition: 'low', runId: 1 });
    expect(events[2]).toMatchObject({ checked: 0, recordedAlready: 1, errors: 0 });
  }, 300_000);
});
