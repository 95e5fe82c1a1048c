import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';

// The demo captures (invented scenario, samples/): FK-0101 and FK-0102 good, FK-0103…FK-0106 faulty.
// Widths are counted in code points: every character we print takes one terminal column.
const SPEC = 'samples/fh210-spec.yaml';
const unitFiles = (serial: string): string[] => ['low', 'mid', 'high'].map((c) => `samples/captures/${serial}_${c}.csv`);
const all = ['01', '02', '03', '04', '05', '06'].flatMap((n) => unitFiles(`FK-01${n}`));
let specs = 0;
function triangleSpec(dir: string, limit: string): string {
  const path = join(dir, `spec-${(specs += 1)}.yaml`);
  writeFileSync(path, `name: FH-210 Kestrel VCO\nrevision: C\noutputs:\n  triangle:\n    channel: 1\n    checks:\n      - measure: frequency\n${limit}\nconditions:\n  mid: {}\n`);
  return path;
}
const widest = (text: string): number => Math.max(...text.split('\n').map((l) => [...l].length));

describe('check sized for a bench terminal', () => {
  it('check of one good unit fits one 80-column screen: a status line with word and symbol', async () => {
    const r = await runCli(['check', '--no-store', ...unitFiles('FK-0101'), '--spec', SPEC], { env: { COLUMNS: '80' } });
    expect(r.code).toBe(0);
    expect(r.stdout.split('\n').length).toBeLessThanOrEqual(30);
    expect(widest(r.stdout)).toBeLessThanOrEqual(80);
    expect(r.stdout.split('\n')[0]).toBe('✓ PASS  FK-0101 · FH-210 Kestrel VCO rev C · 24 checks passed');
  });

  it('check of a faulty unit shows its failing checks and top causes within 80 columns', async () => {
    const r = await runCli(['check', '--no-store', ...unitFiles('FK-0104'), '--spec', SPEC], { env: { COLUMNS: '80' } });
    expect(r.code).toBe(1);
    expect(widest(r.stdout)).toBeLessThanOrEqual(80);
    expect(r.stdout).toMatch(/^✗ FAIL {2}FK-0104 · .* 6 of 24 checks did not pass$/m);
    // Every check that did not pass has its own line, starting with its mark and word.
    expect(r.stdout.match(/^ {2}✗ FAIL (low|mid|high) · (triangle|pulse) · frequency /gm)).toHaveLength(6);
    expect(r.stdout).toContain('Likely causes\n  1. timing capacitor off its value');
    // A quantity is never split over two lines.
    expect(r.stdout).not.toMatch(/\d\n +\d{3}[ .]/);
    expect(r.stdout).not.toContain('Circuit view');
  });

  it('several units end with a totals line, and narrower terminals are honoured', async () => {
    const r = await runCli(['check', '--no-store', ...all, '--spec', SPEC], { env: { COLUMNS: '60' } });
    expect(widest(r.stdout)).toBeLessThanOrEqual(60);
    expect(r.stdout).toContain('\n6 units: 2 ✓ PASS, 4 ✗ FAIL\n');
  });

  it('--detail shows the full tables and the circuit view, fitted to 80 columns with each ± still named', async () => {
    const r = await runCli(['check', '--no-store', ...unitFiles('FK-0104'), '--spec', SPEC, '--detail'], { env: { COLUMNS: '80' } });
    expect(r.stdout).toContain('Circuit view');
    expect(r.stdout).toContain('measured ± U (k = 2)');
    expect(r.stdout).toMatch(/FK-0104: ✗ FAIL/);
    expect(widest(r.stdout)).toBeLessThanOrEqual(80);
    // A row too wide for the terminal stacks: its limits and margin on the line below, quantities whole.
    expect(r.stdout).toMatch(/^ {2}frequency {2}61\.7006 Hz ± 0\.0031 Hz {2}✗ FAIL\n {6}limits 64\.4288 Hz … 66\.3911 Hz; margin −2\.73 Hz$/m);
    expect(r.stdout).toMatch(/· timing capacitor, effective: 4\.98\d+ nF ± 0\.0034 nF \(U, k = 2\) against/);
  });

  it('--detail piped with no known width keeps its tables whole, one row per check', async () => {
    const r = await runCli(['check', '--no-store', ...unitFiles('FK-0104'), '--spec', SPEC, '--detail']);
    expect(r.stdout).toMatch(/^ {2}check +measured ± U \(k = 2\) +limits +margin +statement$/m);
    expect(widest(r.stdout)).toBeGreaterThan(80);
  });

  it('--summary counts a conditional pass apart, not as "not passed" (ILAC-G8:09/2019 §4.2.3)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'benchproof-width-'));
    try {
      const probe = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', triangleSpec(dir, '        nominal: 261.63 Hz\n        tolerance: 10 %'), '--json']);
      const f = JSON.parse(probe.stdout).units[0].verdict.conditions[0].checks[0] as { value: number; expandedUncertainty: number };
      // Upper limit half a guard band above the measured value: a conditional pass (ILAC-G8 §4.2.3).
      const tight = triangleSpec(dir, `        max: ${f.value + f.expandedUncertainty / 2} Hz`);
      const r = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', tight, '--summary'], { env: { COLUMNS: '80' } });
      expect(r.stdout).toBe('FK-0101  (✓) COND. PASS   0 of 1 checks not passed, 1 passed conditionally\n');
      const brief = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', tight], { env: { COLUMNS: '100' } });
      expect(brief.stdout.split('\n')[0]).toBe('(✓) COND. PASS  FK-0101 · FH-210 Kestrel VCO rev C · 1 check passed, 1 of them only conditionally');
      expect(brief.stdout).toMatch(/^ {2}\(✓\) COND\. PASS mid · triangle · frequency /m);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('check through a real terminal of 80 columns (tmux) prints nothing wider than the terminal', () => {
    const screen = inTerminal(['check', '--no-store', ...unitFiles('FK-0104'), '--spec', SPEC]);
    expect(screen).toContain('✗ FAIL  FK-0104');
    expect(screen).toContain('Likely causes');
    expect(widest(screen)).toBeLessThanOrEqual(80);
  }, 90_000);

  it('check of a good unit through a real 80-column terminal fits one screen (at most 30 lines)', () => {
    const screen = inTerminal(['check', '--no-store', ...unitFiles('FK-0101'), '--spec', SPEC]);
    expect(screen).toContain('✓ PASS  FK-0101');
    expect(screen.split('\n').length).toBeLessThanOrEqual(30);
    expect(widest(screen)).toBeLessThanOrEqual(80);
  }, 90_000);

  it('check --detail through a real 80-column terminal (width from the terminal, no COLUMNS) wraps its tables and causes', () => {
    const screen = inTerminal(['check', '--no-store', ...unitFiles('FK-0104'), '--spec', SPEC, '--detail']);
    expect(screen).toContain('Circuit view');
    expect(screen).toContain('FK-0104: ✗ FAIL');
    expect(widest(screen)).toBeLessThanOrEqual(80);
  }, 90_000);
});

/**
 * The built CLI run in a detached tmux session of 80 × 60 cells with COLUMNS unset, so the width comes
 * from the terminal itself; the whole scrollback is captured with -J, which joins lines the terminal
 * wrapped, so a line wider than 80 columns would show as one.
 */
function inTerminal(args: readonly string[]): string {
  if (spawnSync('tmux', ['-V']).status !== 0) return expect.fail('tmux is needed for this test (Debian package tmux)');
  const bin = resolve('bin/benchproof.js');
  if (!existsSync(resolve('dist/cli/main.js'))) return expect.fail('run npm run build first: the terminal test runs the built CLI');
  const sock = `bp-width-${process.pid}-${(specs += 1)}`;
  const dir = mkdtempSync(join(tmpdir(), 'benchproof-tty-'));
  const quoted = args.map((a) => (a.endsWith('.csv') || a.endsWith('.yaml') ? resolve(a) : a)).join(' ');
  const cmd = `cd ${dir} && env -u COLUMNS NO_COLOR=1 node ${bin} ${quoted}; tmux -L ${sock} wait-for -S done; sleep 60`;
  try {
    execFileSync('tmux', ['-L', sock, 'new-session', '-d', '-x', '80', '-y', '60', cmd]);
    execFileSync('tmux', ['-L', sock, 'wait-for', 'done'], { timeout: 60_000 });
    return execFileSync('tmux', ['-L', sock, 'capture-pane', '-p', '-J', '-S', '-5000']).toString().trimEnd();
  } finally {
    spawnSync('tmux', ['-L', sock, 'kill-server']);
    rmSync(dir, { recursive: true, force: true });
  }
}
