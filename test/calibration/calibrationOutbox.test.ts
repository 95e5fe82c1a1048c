// A calibration session kept on a bench while the shared store was out of reach, then sent: the
// shared store groups the iterations by its own rule (continue the unit's open run under the same
// spec text), so one session stays one calibration run there, and only a new run the operator asked
// for (--new-run) is asked for again. The shared side here is a second embedded store: pushOutbox
// takes any RecordStore and both engines apply the same grouping rule (test/records/storeEngines).
// Expected groupings: common practice (no source) — one trim session is one calibration run.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { openStore, pushOutbox } from '../../src/records/index.js';
import type { RecordStore } from '../../src/records/index.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { calibrationIteration } from './calibrationIterations.js';

let root: string;
let benchDir: string;
let sharedDir: string;
beforeEach(() => {
  root = makeTempDir();
  benchDir = join(root, 'bench-data');
  sharedDir = join(root, 'shared-data');
});
afterEach(() => removeTempDir(root));

// Demo values (invented): sets 1.3 % and 0.6 % low in scale (outside the limits), then one on the law.
const asFound = (at: string) => calibrationIteration('FK-0104', at, 0.987, -100.9, 'as found');
const halfway = (at: string) => calibrationIteration('FK-0104', at, 0.994, -48.2, 'first trim');
const onLaw = (at: string) => calibrationIteration('FK-0104', at, 1, 0.4, 'after trims');

let uid = 0;
/** The hooks the bench's outbox store saves with (src/cli/store.ts): listed as waiting, with the bench's id. */
const queued = () => ({ outbox: true, uid: `bench-${++uid}` });

/** Push the bench's outbox; the shared store's calibration runs of the unit, as iteration counts. */
function sent(bench: RecordStore, shared: RecordStore): number[] {
  const waiting = bench.unsent().length;
  bench.close();
  expect(pushOutbox(benchDir, benchDir, shared).pushed).toHaveLength(waiting);
  const again = openStore(benchDir);
  expect(again.unsent()).toEqual([]);
  again.close();
  return shared.calibrations('FK-0104').map((r) => r.iterations.length);
}

describe('calibration iterations kept offline and sent later', () => {
  it('a session begun on the shared store and continued offline stays one calibration run there', () => {
    const shared = openStore(sharedDir);
    shared.saveCalibration(asFound('2026-03-03T10:00:00.000Z'));
    const bench = openStore(benchDir);
    bench.saveCalibration(halfway('2026-03-03T10:10:00.000Z'), queued());
    bench.saveCalibration(onLaw('2026-03-03T10:20:00.000Z'), queued());
    expect(sent(bench, shared)).toEqual([3]);
    const [run] = shared.calibrations('FK-0104');
    expect(run.iterations.map((i) => i.number)).toEqual([1, 2, 3]);
    expect(run.complete).toBe(true);
    shared.close();
  });

  it('a session begun offline after a complete run starts one new run on the shared store', () => {
    const shared = openStore(sharedDir);
    shared.saveCalibration(onLaw('2026-03-02T09:00:00.000Z'));
    const bench = openStore(benchDir);
    bench.saveCalibration(asFound('2026-03-03T10:00:00.000Z'), queued());
    bench.saveCalibration(onLaw('2026-03-03T10:20:00.000Z'), queued());
    expect(sent(bench, shared)).toEqual([1, 2]);
    shared.close();
  });

  it('a new run the operator asked for offline is a new run on the shared store too', () => {
    const shared = openStore(sharedDir);
    const bench = openStore(benchDir);
    bench.saveCalibration(asFound('2026-03-03T10:00:00.000Z'), queued());
    bench.saveCalibration({ ...asFound('2026-03-03T11:00:00.000Z'), newRun: true }, queued());
    bench.saveCalibration(onLaw('2026-03-03T11:20:00.000Z'), queued());
    expect(sent(bench, shared)).toEqual([1, 2]);
    shared.close();
  });

  it('a spec changed offline starts a new run on the shared store by the shared store\'s own rule', () => {
    const shared = openStore(sharedDir);
    shared.saveCalibration(asFound('2026-03-03T10:00:00.000Z'));
    const bench = openStore(benchDir);
    const changed = halfway('2026-03-03T10:10:00.000Z');
    bench.saveCalibration({ ...changed, spec: { name: changed.spec.name, revision: 'D', sha256: 'b'.repeat(64) } }, queued());
    expect(sent(bench, shared)).toEqual([1, 1]);
    shared.close();
  });
});
