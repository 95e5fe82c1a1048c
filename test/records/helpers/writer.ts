/**
 * Child process for the store's reliability tests: `writer.ts DATA_DIR UNIT_PREFIX COUNT MODE [BARRIER_DIR]`.
 * MODE `loop` stores COUNT runs and prints `stored <id> <began ms> <committed ms>` after each commit.
 * MODE `hang` stores one run but stops inside its transaction (all rows written, not committed),
 * prints `in-transaction` and waits there to be killed.
 * With BARRIER_DIR, two writers meet twice before going on: once loaded (then both open the store at
 * the same moment, racing to create the folder, switch to WAL and migrate), and once opened (then both
 * write at the same moment).
 */
import { existsSync, readdirSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { openStore } from '../../../src/records/index.js';
import { kestrelRun } from '../fixtures/kestrelRun.js';

const [dataDir, prefix, countText, mode, barrierDir] = process.argv.slice(2);

function meet(stage: string): void {
  if (!barrierDir || !existsSync(barrierDir)) return;
  writeFileSync(join(barrierDir, `${prefix}.${stage}`), '');
  const cell = new Int32Array(new SharedArrayBuffer(4));
  const deadline = Date.now() + 60_000;
  while (readdirSync(barrierDir).filter((n) => n.endsWith(`.${stage}`)).length < 2 && Date.now() < deadline) Atomics.wait(cell, 0, 0, 2);
}

meet('loaded');
const store = openStore(dataDir);
meet('opened');
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
    const began = Date.now();
    const saved = store.saveRun(run);
    writeSync(1, `stored ${saved.id} ${began} ${Date.now()}\n`);
  }
}
store.close();
