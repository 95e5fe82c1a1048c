/**
 * The unit's record carries the circuit view of its latest run (issue: design-aware diagnosis), in
 * Markdown and HTML, with the same figures `check` printed. Demo data: FK-0104 of the invented
 * scenario has a timing capacitor 6 % high.
 */
import { describe, it, expect } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';
import { tempFolder } from '../helpers/tempFolders.js';

describe('benchproof record with a design section in the spec', () => {
  it('shows the back-computed circuit figures of the latest run in Markdown and HTML', async () => {
    const env = { BENCHPROOF_DATA: tempFolder('benchproof-circuit-') };
    const files = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0104_${c}.csv`);
    const check = await runCli(['check', ...files, '--spec', 'samples/fh210-spec.yaml', '--json'], { env });
    expect(check.code).toBe(1);
    const capacitance = JSON.parse(check.stdout).units[0].diagnosis.circuit
      .find((v: { condition: string }) => v.condition === 'mid')
      .figures.find((f: { id: string; label: string }) => /capacitance/.test(f.label));
    const md = await runCli(['record', 'FK-0104', '--format', 'md'], { env });
    expect(md.code).toBe(0);
    expect(md.stdout).toContain('### Circuit figures at mid');
    expect(md.stdout).toMatch(/\| timing capacitance, I\/\(dV\/dt\) from both ramps \| 4\.9\d\d nF ± /);
    const html = await runCli(['record', 'FK-0104', '--format', 'html'], { env });
    expect(html.stdout).toContain('Circuit figures at mid');
    expect(html.stdout).toContain(`data-value="${String(capacitance.value)}"`);
  });
});
