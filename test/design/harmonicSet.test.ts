/**
 * A spec may state the harmonics its distortion figures take (`harmonics: count` or `bandwidth`),
 * where a design is specified that way; without it every harmonic below Nyquist counts. Expected
 * THD of an ideal square wave from its Fourier series, amplitudes 4/(πk) for odd k (Oppenheim &
 * Willsky, Signals and Systems, 2nd ed., Example 3.5): over harmonics up to N,
 * THD_N = sqrt(Σ_{odd k=3..N} 1/k²); over the full series sqrt(π²/8 − 1) = 48.34 %.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseSpec } from '../../src/design/index.js';
import { synthesize, writeCsv } from '../../src/syntheticCaptures/index.js';
import { BenchError } from '../../src/types/index.js';
import { runCli } from '../helpers/cliHarness.js';
import { expectWithin } from '../helpers/expectWithin.js';

const specText = (harmonics: string): string => `format: 1
name: square test
revision: A
captures: { pattern: "{unit}_{condition}.csv" }
${harmonics}
outputs:
  out:
    channel: 1
    shape: square
    checks:
      - measure: thd
        max: 60 %
`;

const thdUpTo = (n: number): number => {
  let sum = 0;
  for (let k = 3; k <= n; k += 2) sum += 1 / (k * k);
  return Math.sqrt(sum);
};

function issueCodes(text: string): string[] {
  try {
    parseSpec(text, 'h.yaml');
    return [];
  } catch (e) {
    if (!(e instanceof BenchError)) throw e;
    return (e.issues ?? [e]).map((i) => i.code);
  }
}

describe('spec harmonics', () => {
  it('reads a harmonic count or a bandwidth in Hz, and refuses both at once or a bandwidth without a frequency unit', () => {
    expect(parseSpec(specText('harmonics: { count: 10 }'), 'h.yaml').harmonicSet).toEqual({ harmonics: 10 });
    expect(parseSpec(specText('harmonics: { bandwidth: 20 kHz }'), 'h.yaml').harmonicSet).toEqual({ bandwidth: 20_000 });
    expect(parseSpec(specText(''), 'h.yaml').harmonicSet).toBeUndefined();
    expect(issueCodes(specText('harmonics: { count: 10, bandwidth: 20 kHz }'))).toContain('spec.limit-conflict');
    expect(issueCodes(specText('harmonics: { bandwidth: 20 V }'))).toContain('spec.wrong-unit');
  });

  it('check takes THD over the stated harmonics, and over the full series without them', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'benchproof-harmonics-'));
    try {
      // 1 kHz square, 1 MHz sampling, 40 cycles: ~500 harmonics below Nyquist, about 250 of them odd.
      const signal = synthesize({ shape: 'square', frequency: 1000, amplitude: 5, sampleRate: 1e6, samples: 40_000 });
      writeFileSync(join(dir, 'SQ-1_only.csv'), writeCsv([{ name: 'out', unit: 'V', signal }]));
      const thd = async (harmonics: string): Promise<number> => {
        writeFileSync(join(dir, 'spec.yaml'), specText(harmonics));
        const r = await runCli(['check', join(dir, 'SQ-1_only.csv'), '--spec', join(dir, 'spec.yaml'), '--no-store', '--json']);
        const checks = JSON.parse(r.stdout).units[0].verdict.conditions[0].checks as { measurement: string; value: number }[];
        return checks.find((c) => c.measurement === 'thd')!.value;
      };
      expectWithin(await thd('harmonics: { count: 10 }'), 100 * thdUpTo(10), { rel: 0.005 }, 'Fourier series of a square wave, harmonics 3–9');
      expectWithin(await thd('harmonics: { bandwidth: 20 kHz }'), 100 * thdUpTo(20), { rel: 0.005 }, 'Fourier series of a square wave, harmonics 3–19');
      expectWithin(await thd(''), 100 * Math.sqrt((Math.PI * Math.PI) / 8 - 1), { rel: 0.01 }, 'Fourier series of a square wave, full series (about 250 odd harmonics below Nyquist)');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
