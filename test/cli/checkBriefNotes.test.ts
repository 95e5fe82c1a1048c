/**
 * The default `check` view leaves the notes to --detail, except where the line would otherwise
 * contradict itself: a FAIL whose value lies inside its limits says why it fails (here FK-0105's
 * triangle buffer saturates, so every level it reads describes the flattened waveform). Project rule
 * (no source).
 */
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';

describe('check default view', () => {
  it('gives the reason on a FAIL line whose margin is positive, and none on a FAIL outside its limits', async () => {
    const files = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0105_${c}.csv`);
    const r = await runCli(['check', ...files, '--spec', 'samples/fh210-spec.yaml', '--no-store'], { env: { COLUMNS: '200' } });
    const lines = r.stdout.split('\n');
    const offset = lines.find((l) => l.includes('low · triangle · DC offset'))!;
    expect(offset).toMatch(/margin \+.*: the output saturates/);
    const swing = lines.find((l) => l.includes('low · triangle · peak-to-peak'))!;
    expect(swing).toMatch(/margin −/);
    expect(swing).not.toContain('the output saturates');
  });
});
