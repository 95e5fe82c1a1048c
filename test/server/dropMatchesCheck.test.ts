/**
 * The page's drop zone and `benchproof check` run one function (checkAndStore), so the same files in
 * the same order leave the same runs: the same verdicts, causes, captures, attempts and notes, run
 * for run. Only who stored them (operator), when, and the data folder differ. The reference is the
 * command line itself, run in-process on copies of the files under the names the page sends.
 */
import { copyFileSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openStore } from '../../src/records/index.js';
import type { StoredRun } from '../../src/types/index.js';
import { runCli } from '../helpers/cliHarness.js';
import { SPEC, filesForm, startTestServer } from './serverHarness.js';
import type { TestServer } from './serverHarness.js';

let t: TestServer;
let work: string;
const spec = resolve(SPEC);

beforeAll(async () => {
  t = await startTestServer();
  work = mkdtempSync(join(tmpdir(), 'benchproof-same-'));
  for (const c of ['low', 'mid', 'high']) copyFileSync(`samples/captures/FK-0104_${c}.csv`, join(work, `FK-0104_${c}.csv`));
});
afterAll(async () => {
  await t?.stop();
  rmSync(work, { recursive: true, force: true });
});

const steps: { files: string[]; note?: string }[] = [
  { files: ['FK-0104_mid.csv'] },
  { files: ['FK-0104_low.csv', 'FK-0104_high.csv'] },
  { files: ['FK-0104_mid.csv'], note: 'R7 trimmed' },
];

/** What a stored run says, without who stored it, when, or where its archive lies. */
function comparable(r: StoredRun) {
  return {
    unit: r.unit,
    statement: r.statement,
    attempt: r.attempt,
    attemptReason: r.attemptReason,
    note: r.note,
    spec: r.spec,
    verdict: r.verdict,
    diagnosis: r.diagnosis,
    captures: r.captures.map((c) => ({ path: c.path, sha256: c.sha256, size: c.size, condition: c.condition })),
  };
}

describe('a drop on the page and check on the command line', () => {
  it('store the same runs for the same files, attempt by attempt', async () => {
    const dataDir = join(work, 'cli-data');
    for (const step of steps) {
      const form = filesForm(step.files.map((name) => ({ name, bytes: readFileSync(join(work, name)) })));
      if (step.note) form.append('note', step.note);
      const res = await fetch(`${t.base}/api/drop`, { method: 'POST', headers: { Origin: t.base }, body: form });
      expect(res.status).toBe(200);
      const cli = await runCli(['check', ...step.files, '--spec', spec, '--data', dataDir, ...(step.note ? ['--note', step.note] : [])], { cwd: work, env: { BENCHPROOF_OPERATOR: 'cli test' } });
      expect([0, 1, 4]).toContain(cli.code);
    }
    const page = openStore(t.dataDir, { mode: 'read' });
    const cli = openStore(dataDir, { mode: 'read' });
    try {
      const fromPage = page.runs({ unit: 'FK-0104' });
      const fromCli = cli.runs({ unit: 'FK-0104' });
      expect(fromPage).toHaveLength(steps.length);
      expect(fromPage.map(comparable)).toEqual(fromCli.map(comparable));
      // The second drop completed the first attempt with the open attempt's mid capture; the note opened a new one.
      expect(fromPage.map((r) => r.attempt)).toEqual([1, 1, 2]);
      expect(fromPage[1].captures.map((c) => c.condition).sort()).toEqual(['high', 'low', 'mid']);
    } finally {
      page.close();
      cli.close();
    }
  }, 120_000);
});
