/**
 * The one-line notice a command prints on stderr after it changed something (what was stored and
 * the next command) fits the terminal: wrapped at spaces to its width on a terminal, one line when
 * piped. 80 columns is the classic terminal width (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';

const files = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0106_${c}.csv`);

describe('the stored-run notice', () => {
  it('wraps to 80 columns on a terminal, keeping every word whole', async () => {
    const r = await runCli(['check', ...files, '--spec', 'samples/fh210-spec.yaml'], { tty: true, env: { COLUMNS: '80' } });
    const notice = r.stderr.split('benchproof: stored run')[1];
    expect(notice).toBeDefined();
    const lines = `benchproof: stored run${notice}`.split('\n\n')[0].split('\n').filter((l) => l !== '');
    expect(lines.length).toBeGreaterThan(1);
    for (const line of lines) expect([...line].length).toBeLessThanOrEqual(80);
    // The command to copy survives whole: its words are all there, in order.
    expect(lines.join(' ').replace(/ {2,}/g, ' ')).toContain('--spec samples/fh210-spec.yaml --note "what was changed"');
  });

  it('stays on one line when stderr is piped', async () => {
    const r = await runCli(['check', ...files, '--spec', 'samples/fh210-spec.yaml']);
    const line = r.stderr.split('\n').find((l) => l.startsWith('benchproof: stored run'));
    expect(line).toContain('--note "what was changed"');
  });
});
