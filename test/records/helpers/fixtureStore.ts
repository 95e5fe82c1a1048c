/** A data folder with the demo units (fictional FH-210 Kestrel VCOs) stored through the real store. */
import { join } from 'node:path';
import { openStore } from '../../../src/records/index.js';
import { kestrelRun } from '../fixtures/kestrelRun.js';

export const day = (d: number, h = 9): string => new Date(Date.UTC(2026, 2, d, h)).toISOString();

/** FK-0101/0102 pass; FK-0103 current mismatch (fails); FK-0104 capacitor high, re-tested after a fix. */
export function fillDemoStore(root: string): string {
  const dir = join(root, 'benchproof-data');
  const store = openStore(dir);
  store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: day(2), frequencyScale: 1.002 }));
  store.saveRun(kestrelRun({ unit: 'FK-0102', startedAt: day(2, 10), frequencyScale: 0.997 }));
  store.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: day(3), riseFraction: 0.48 }));
  store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: day(3, 11), frequencyScale: 0.943 }));
  store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: day(5), frequencyScale: 1.004, operator: 'M. Lindqvist' }));
  store.close();
  return dir;
}
