import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';

// The demo spec's calibration section (samples/fh210-spec.yaml) with one step entered twice: the fix
// named must be the one that corrects that mistake (common practice, no source).
let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'benchproof-steps-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function specWith(steps: string): string {
  const text = readFileSync('samples/fh210-spec.yaml', 'utf8').replace('  steps: [0 V, 1 V, 2 V, 3 V, 4 V, 5 V]', `  steps: ${steps}`);
  const path = join(dir, `spec-${steps.length}.yaml`);
  writeFileSync(path, text);
  return path;
}

describe('a duplicated calibration step', () => {
  it('a control value entered twice asks for the right value, not for a label', async () => {
    const r = await runCli(['spec', 'validate', specWith('[0 V, 1 V, 2 V, 2 V, 4 V, 5 V]'), '--json']);
    expect(r.code).toBe(2);
    const issue = (JSON.parse(r.stderr) as { error: { issues: { code: string; problem: string; fix: string }[] } }).error.issues.find((i) => i.code === 'spec.duplicate-step')!;
    expect(issue.problem).toBe('calibration.steps[3]: step 4 repeats step 3 ("2")');
    expect(issue.fix).toBe('change step 4 to the control value it is taken at, or delete it if it was entered twice');
    expect(issue.fix).not.toContain('label');
  });

  it('a label written twice asks for another label', async () => {
    const r = await runCli(['spec', 'validate', specWith('[{ label: low, control: 0 V }, { label: low, control: 1 V }, 2 V]'), '--json']);
    expect(r.code).toBe(2);
    const issue = (JSON.parse(r.stderr) as { error: { issues: { code: string; problem: string; fix: string }[] } }).error.issues.find((i) => i.code === 'spec.duplicate-step')!;
    expect(issue.problem).toBe('calibration.steps[1]: step label "low" is used twice (steps 1 and 2)');
    expect(issue.fix).toBe('give this step its own `label:`');
  });
});
