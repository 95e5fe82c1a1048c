/**
 * The reader's bounds (issue 22): inputs that are not regular files, .gz bombs, runs of blank lines
 * and records larger than memory are refused early with a BenchError, before the time or the memory
 * is spent. The limits are our own choice (common practice, no source); readerLimits.ts states them.
 */
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { closeSync, openSync, writeSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { readCapture } from '../../src/capture/index.js';
import { MAX_BLANK_RUN, UNPACK_FLOOR, UNPACK_RATIO, unpackLimitBytes } from '../../src/capture/readerLimits.js';
import { isBenchError } from '../../src/types/index.js';
import { tempFolder } from './tempFiles.js';

const write = tempFolder();

async function refusal(path: string, options = {}): Promise<{ code: string; line?: number; message: string; ms: number }> {
  const t0 = performance.now();
  try {
    await readCapture(path, options);
  } catch (e) {
    if (!isBenchError(e)) throw e;
    expect(e.exitCode).toBe(2);
    return { code: e.code, line: e.line, message: e.message, ms: performance.now() - t0 };
  }
  throw new Error(`${path} was read without an error`);
}

const rows = (n: number, from = 0): string => Array.from({ length: n }, (_, i) => `${(from + i) * 1e-6},${Math.sin((from + i) / 7).toFixed(4)}`).join('\n');

describe('readCapture refuses what is not a regular file', () => {
  it('gives capture.unreadable for a device without reading from it', async () => {
    const r = await refusal('/dev/zero');
    expect(r.code).toBe('capture.unreadable');
    expect(r.message).toContain('this is a device, not a capture file');
  });

  it.runIf(process.platform !== 'win32')('gives capture.unreadable for a named pipe without waiting for a writer', async () => {
    const fifo = write('pipe-placeholder', '').replace(/pipe-placeholder$/, 'capture.fifo');
    execFileSync('mkfifo', [fifo]);
    const r = await refusal(fifo);
    expect(r.code).toBe('capture.unreadable');
    expect(r.message).toContain('this is a named pipe, not a capture file');
  });
});

describe('readCapture bounds .csv.gz decompression', () => {
  it('sets the limit at 100× the stored size with a 256 MiB floor, or at --unpack-limit', () => {
    expect(unpackLimitBytes(1000, undefined)).toBe(UNPACK_FLOOR);
    expect(unpackLimitBytes(10e6, undefined)).toBe(UNPACK_RATIO * 10e6);
    expect(unpackLimitBytes(10e6, 5)).toBe(5e6);
  });

  it('stops a .gz that unpacks past --unpack-limit with capture.unpack-limit naming the option', async () => {
    const text = `t,v\n${rows(100_000)}\n`; // about 1.5 MB unpacked
    const path = write('long.csv.gz', gzipSync(text));
    const r = await refusal(path, { unpackLimitMB: 1 });
    expect(r.code).toBe('capture.unpack-limit');
    expect(r.message).toContain('more than 1 MB');
    expect(r.message).toContain('--unpack-limit');
    // The same file reads whole under a limit above its size.
    const capture = await readCapture(path, { unpackLimitMB: 10 });
    expect(capture.channels[0].samples.length).toBe(100_000);
  });

  it('stops a gzip bomb of blank lines at the default limit instead of unpacking it all', async () => {
    // 1 GiB of line feeds as 64 gzip members of 16 MiB each (RFC 1952 §2.2: a file may hold several
    // members, read as one stream): about 1 MB stored, so the 256 MiB floor is the limit.
    const member = gzipSync(Buffer.alloc(2 ** 24, 10), { level: 9 });
    const bomb = Buffer.concat([gzipSync(`t,v\n${rows(100)}\n`), ...Array.from({ length: 64 }, () => member)]);
    const path = write('bomb.csv.gz', bomb);
    const r = await refusal(path);
    // The blank-line bound speaks first (after 100 000 lines of 1 byte): the read stops long before 1 GiB.
    expect([r.code, r.line]).toEqual(['capture.blank-run', 102]);
  });
});

describe('readCapture bounds runs of blank and comment lines', () => {
  it(`gives capture.blank-run at the first line of a run longer than ${MAX_BLANK_RUN} lines`, async () => {
    const head = `t,v\n${rows(100)}\n`;
    const path = write('padded.csv', `${head}${'\n'.repeat(MAX_BLANK_RUN + 10)}${rows(10, 100)}\n`);
    const r = await refusal(path);
    expect([r.code, r.line]).toEqual(['capture.blank-run', 102]);
  });

  it('counts comment lines with blank ones, and reads a file whose runs stay under the bound', async () => {
    const run = '# note\n\n'.repeat(MAX_BLANK_RUN / 4);
    const path = write('commented.csv', `t,v\n${rows(100)}\n${run}${rows(100, 100)}\n`);
    const capture = await readCapture(path);
    expect(capture.channels[0].samples.length).toBe(200);
    const over = write('over.csv', `t,v\n${rows(100)}\n${run}${run}${run}\n${rows(10, 100)}\n`);
    expect((await refusal(over)).code).toBe('capture.blank-run');
  });
});

describe('readCapture refuses a record beyond memory before taking the memory', () => {
  it('gives capture.too-large at once for a sparse file of 1 TB, from its size and row length', async () => {
    // More rows than the 64 KiB the layout is sniffed from, so that the sniffed part is all text.
    const path = write('huge.csv', `t,a,b\n${Array.from({ length: 10_000 }, (_, i) => `${i * 1e-6},0.5,0.25`).join('\n')}\n`);
    // A sparse file: the size is there, no byte of it is stored or read.
    const fd = openSync(path, 'r+');
    writeSync(fd, Buffer.from('\n'), 0, 1, 1e12);
    closeSync(fd);
    const before = process.memoryUsage().arrayBuffers;
    const r = await refusal(path);
    expect([r.code, r.line]).toEqual(['capture.too-large', 2]);
    expect(r.message).toContain('--channel');
    // Nothing near a column of that size was allocated (common practice: 64 MiB is far below 2^28 samples).
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(64 * 2 ** 20);
  });
});
