import { describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';

const dir = mkdtempSync(join(tmpdir(), 'benchproof-inspect-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const file = (name: string, text: string): string => {
  writeFileSync(join(dir, name), text);
  return join(dir, name);
};
// FH-210 Kestrel demo scenario (ours): raw converter codes of a ±3 V triangle, 40 mV per code.
const codes = Array.from({ length: 400 }, (_, i) => String(Math.round((3 - Math.abs(((i * 0.026163) % 2) - 1) * 6) / 0.04)));

describe('benchproof inspect', () => {
  it('shows each opening line with its role, the time base and where it came from, units and warnings', async () => {
    const path = file('codes.csv', ['Kestrel bench logger', 'Sampling period,2.0E-05', 'Volts per division,0.2', ...codes].join('\n'));
    const r = await runCli(['inspect', path]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).toMatch(/2 {2}preamble +Sampling period,2\.0E-05/);
    expect(r.stdout).toContain('Sampling period → sample interval (s): 0.00002');
    expect(r.stdout).toContain('from preamble key "Sampling period"');
    expect(r.stdout).toContain('unit from none stated: converter counts');
    expect(r.stdout).toContain('raw-counts');
    expect(r.stdout).toMatch(/readings weighed\n {4}\* 1 column\(s\), "," between fields, decimal "\.", data from line 4 \(397 of 400 lines\)\n {4}\* header: no header row/);
  });

  it('prints one JSON document with the lines, their roles and the first samples, and follows a reading profile', async () => {
    const path = file('codes2.csv', ['Sampling period,2.0E-05', ...codes].join('\n'));
    const profile = file('logger.yaml', 'reading: 1\nname: Kestrel bench logger\nscale: 0.04\nchannelUnit: V\n');
    const r = await runCli(['inspect', path, '--profile', profile, '--json']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout) as { capture: { channels: { unit: string }[]; layout: { reading: { profile: string } } }; lines: { line: number; role: string }[]; firstRows: { values: number[] }[] };
    expect(doc.capture.channels[0].unit).toBe('V');
    expect(doc.capture.layout.reading.profile).toBe(`Kestrel bench logger (${profile})`);
    expect(doc.lines.slice(0, 2).map((l) => l.role)).toEqual(['preamble', 'data']);
    // 40 mV per code, as the profile says: the first code times 0.04 (as written).
    expect(doc.firstRows[0].values[0]).toBe(Number(codes[0]) * 0.04);
  });

  it('refuses a profile with a wrong setting, naming every mistake', async () => {
    const path = file('codes3.csv', ['Sampling period,2.0E-05', ...codes].join('\n'));
    const profile = file('bad.yaml', 'reading: 1\ndelimiter: pipe\nheaderRows: 5\ncolour: red\n');
    const r = await runCli(['inspect', path, '--profile', profile]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(JSON.parse((await runCli(['inspect', path, '--profile', profile, '--json'])).stderr).error.code).toBe('capture.bad-profile');
    expect(r.stderr).toContain('"colour" is not a reading setting');
    expect(r.stderr).toContain('delimiter: "pipe" is not a delimiter');
  });

  it('shows the opening lines of a file it cannot read, with their roles, above the error (stdout stays empty)', async () => {
    const path = file('no-base.csv', ['Kestrel bench export', 'Triangle (V)', ...codes.slice(0, 20)].join('\n'));
    const r = await runCli(['inspect', path]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/not read \(capture\.no-time-base\)/);
    expect(r.stderr).toMatch(/2 {2}header +Triangle \(V\)/);
    expect(r.stderr).toContain('fix: give the rate the capture was taken at');
  });
});
