import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';

// The two good demo units (samples/: FK-0101, FK-0102) read several quantities to within their own
// measurement uncertainty of each other. Cp = (USL − LSL)/6s (NIST/SEMATECH e-Handbook §6.1.6) from
// such a spread would describe the measurement, not the units: the batch withholds it and says why.
// The rule checked here, written out independently: s < u, u = median U / 2 (GUM §6.2.1, k = 2).
let data: string;
const env = (): { env: Record<string, string> } => ({ env: { BENCHPROOF_DATA: data } });
const files = (unit: string): string[] => ['low', 'mid', 'high'].map((c) => `samples/captures/${unit}_${c}.csv`);

interface Check { condition: string; output: string; measurement: string; expandedUncertainty: number | null }
interface Stats { condition: string; output: string; measurement: string; count: number; sd: number | null; cp: number | null; cpk: number | null; lower: number | null; upper: number | null; notes: string[] }

beforeAll(() => {
  data = mkdtempSync(join(tmpdir(), 'benchproof-cap-'));
});
afterAll(() => rmSync(data, { recursive: true, force: true }));

describe('batch capability withheld when the spread is below the measurement uncertainty', () => {
  it('gives no Cp/Cpk, with the reason, exactly where s < u, and gives them elsewhere', async () => {
    const us = new Map<string, number[]>();
    for (const unit of ['FK-0101', 'FK-0102']) {
      const r = await runCli(['check', ...files(unit), '--spec', 'samples/fh210-spec.yaml', '--json'], env());
      const doc = JSON.parse(r.stdout) as { units: { verdict: { conditions: { checks: Check[] }[] } }[] };
      for (const c of doc.units[0].verdict.conditions.flatMap((x) => x.checks)) {
        const key = `${c.condition}/${c.output}/${c.measurement}`;
        if (c.expandedUncertainty) us.set(key, [...(us.get(key) ?? []), c.expandedUncertainty]);
      }
    }
    const batch = JSON.parse((await runCli(['batch', '--json'], env())).stdout) as { specs: { measurements: Stats[] }[] };
    let withheld = 0;
    let given = 0;
    for (const m of batch.specs[0].measurements) {
      const Us = (us.get(`${m.condition}/${m.output}/${m.measurement}`) ?? []).sort((a, b) => a - b);
      const u = Us.length === 2 ? (Us[0] + Us[1]) / 4 : 0;
      if (m.count !== 2 || m.sd === null || m.sd === 0 || m.lower === null || m.upper === null) continue;
      if (m.sd < u) {
        withheld += 1;
        expect(m.cp).toBeNull();
        expect(m.cpk).toBeNull();
        expect(m.notes.join(' ')).toMatch(/below the measurement's standard uncertainty \(u = .*\): no Cp\/Cpk/);
      } else {
        given += 1;
        expect(m.cp).not.toBeNull();
      }
    }
    // The demo makes both cases happen, so neither branch above is empty.
    expect(withheld).toBeGreaterThan(0);
    expect(given).toBeGreaterThan(0);
  });
});
