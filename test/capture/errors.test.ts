import { describe, expect, it } from 'vitest';
import { chmodSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { readCapture } from '../../src/capture/index.js';
import { isBenchError } from '../../src/types/index.js';
import { tempFolder } from './tempFiles.js';

const bad = (name: string): string => fileURLToPath(new URL(`../fixtures/capture/bad/${name}`, import.meta.url));
const write = tempFolder();

async function failure(path: string, options = {}): Promise<{ code: string; line?: number; message: string }> {
  try {
    await readCapture(path, options);
  } catch (e) {
    if (!isBenchError(e)) throw e;
    expect(e.exitCode).toBe(2);
    expect(e.problem.length * e.expected.length * e.fix.length).toBeGreaterThan(0);
    return { code: e.code, line: e.line, message: e.message };
  }
  throw new Error(`${path} was read without an error`);
}

describe('readCapture refuses bad input with a BenchError naming file, line and fix', () => {
  const cases: [string, string, number | undefined][] = [
    ['empty.csv', 'capture.empty', undefined],
    ['header_only.csv', 'capture.header-only', 2],
    ['settings_only.csv', 'capture.no-numeric-data', 5],
    ['binary.bin', 'capture.binary', undefined],
    ['utf16.csv', 'capture.unsupported-encoding', 1],
    ['ragged.csv', 'capture.ragged-row', 7],
    ['text_in_data.csv', 'capture.text-in-data', 7],
    ['time_backwards.csv', 'capture.time-backwards', 9],
    ['invalid_time.csv', 'capture.invalid-time', 5],
    ['ambiguous.csv', 'capture.ambiguous-layout', 1],
    ['no_time_base.csv', 'capture.no-time-base', 2],
  ];
  for (const [file, code, line] of cases) {
    it(`gives ${code}${line ? ` at line ${line}` : ''} for ${file}`, async () => {
      const f = await failure(bad(file));
      expect([f.code, f.line]).toEqual([code, line]);
      expect(f.message.split('\n')).toHaveLength(3);
      expect(f.message).toContain(bad(file));
    });
  }

  it('gives capture.unreadable for a missing file, a folder and a file without read permission', async () => {
    expect((await failure(bad('no-such-file.csv'))).code).toBe('capture.unreadable');
    expect((await failure(fileURLToPath(new URL('../fixtures/capture/bad', import.meta.url)))).code).toBe('capture.unreadable');
    const locked = write('locked.csv', 'Time (s),CH1 (V)\n0,1\n1,2\n');
    chmodSync(locked, 0o000);
    // root reads any file whatever its mode; the check means something only for other users.
    if (process.getuid?.() !== 0) expect((await failure(locked)).code).toBe('capture.unreadable');
  });

  it('gives capture.unknown-channel listing the channels there are', async () => {
    const f = await failure(write('two.csv', 'Time (s),Triangle (V),Pulse (V)\n0,1,2\n1e-5,2,3\n2e-5,3,4\n'), { channel: 'saw' });
    expect(f.code).toBe('capture.unknown-channel');
    expect(f.message).toContain('1 = Triangle, 2 = Pulse');
    expect((await failure(write('two-b.csv', 'Time (s),A (V)\n0,1\n1e-5,2\n'), { channel: '2' })).code).toBe('capture.unknown-channel');
  });

  it('gives capture.line-too-long for a line over 1 MiB and capture.too-many-columns past 1024', async () => {
    const long = `Time (s),CH1 (V)\n0,${'1'.repeat(1.2 * 2 ** 20)}\n`;
    expect(await failure(write('long.csv', long))).toMatchObject({ code: 'capture.line-too-long', line: 2 });
    const wide = Array.from({ length: 3 }, (_, r) => Array.from({ length: 1100 }, (_, c) => r + c).join(',')).join('\n');
    expect(await failure(write('wide.csv', wide))).toMatchObject({ code: 'capture.too-many-columns', line: 1 });
  });

  it('gives capture.corrupt-gzip for a gzip file cut short', async () => {
    const { gzipSync } = await import('node:zlib');
    const gz = gzipSync(Buffer.from('Time (s),CH1 (V)\n' + Array.from({ length: 5000 }, (_, i) => `${i * 1e-5},${Math.sin(i)}`).join('\n')));
    expect((await failure(write('cut.csv.gz', gz.subarray(0, gz.length - 40)))).code).toBe('capture.corrupt-gzip');
  });

  it('gives capture.time-repeated when a time value repeats and capture.too-few-rows for one row', async () => {
    expect(await failure(write('rep.csv', 'Time (s),CH1 (V)\n0,1\n1e-5,2\n1e-5,3\n'))).toMatchObject({ code: 'capture.time-repeated', line: 4 });
    expect(await failure(write('one.csv', 'Time (s),CH1 (V)\n0,1\n'))).toMatchObject({ code: 'capture.too-few-rows', line: 2 });
  });

  it('gives capture.resample-too-large when the median step would need a grid far larger than the rows', async () => {
    const rows = ['Time (s),CH1 (V)'];
    let t = 0;
    for (let i = 0; i < 200; i++) rows.push(`${(t += i % 4 === 0 ? 1e-3 : 1e-9)},${i}`);
    expect((await failure(write('spiky.csv', rows.join('\n')))).code).toBe('capture.resample-too-large');
  });

  it('gives capture.ragged-row with its line from the papaparse path (quoted fields holding the delimiter)', async () => {
    const rows = ['"Time (s)","CH1 (V)"', ...Array.from({ length: 8 }, (_, i) => `"${i},0e-5","${i},25"`)];
    rows[5] = '"4,0e-5"';
    expect(await failure(write('quoted-ragged.csv', `${rows.join('\n')}\n`))).toMatchObject({ code: 'capture.ragged-row', line: 6 });
  });

  it('pins the wording a user sees for a capture without a time base', async () => {
    const f = await failure(bad('no_time_base.csv'));
    expect(f.message.replace(bad('no_time_base.csv'), '<file>')).toMatchInlineSnapshot(`
      "<file>:2: the capture has no time column and states no sample interval or rate
        expected: a time column (header such as "Time (s)"), a preamble line such as "sample interval,1e-6", or a flag
        fix: give the rate the capture was taken at: --sample-rate 1e6 (Hz) or --interval 1e-6 (s)"
    `);
  });
});
