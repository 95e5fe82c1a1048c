/**
 * Child process for the store's reliability tests: `writer.ts DATA_DIR UNIT_PREFIX COUNT MODE [START_AT]`.
 * START_AT (epoch ms) holds the first write until then, so two writers really overlap.
 * MODE `loop` stores COUNT runs and prints `stored <id>` after each commit.
 * MODE `hang` stores one run but stops inside its transaction (all rows written, not committed),
 * prints `in-transaction` and waits there to be killed.
 */
import { writeSync } from 'node:fs';
import { openStore } from '../../../src/records/index.js';
import { kestrelRun } from '../fixtures/kestrelRun.js';

const [dataDir, prefix, countText, mode, startAt] = process.argv.slice(2);
const store = openStore(dataDir);
const wait = Number(startAt ?? 0) - Date.now();
if (wait > 0) Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, wait);
const count = Number(countText);
for (let i = 0; i < count; i++) {
  const run = kestrelRun({
    unit: `${prefix}-${String(i).padStart(3, '0')}`,
    startedAt: new Date(Date.UTC(2026, 2, 2, 9, 0, i)).toISOString(),
    seed: 100 + i,
    frequencyScale: 1 + (i % 5) * 0.002,
  });
  if (mode === 'hang') {
    store.saveRun(run, {
      beforeCommit: () => {
        writeSync(1, 'in-transaction\n');
        Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 120_000);
      },
    });
  } else {
    const saved = store.saveRun(run);
    writeSync(1, `stored ${saved.id}\n`);
  }
}
store.close();
