/**
 * The reader's explicit limits, each met with its own clear BenchError: a line over 1 MiB
 * (`capture.line-too-long`), over 1024 columns (`capture.too-many-columns`), and more samples than
 * it keeps in memory (`capture.too-large`; with a small limit here, and in the long run through a
 * small .gz that unpacks to 2^28 rows — the "zip bomb" a USB stick can carry). The limits are this
 * project's own choices (src/capture/lines.ts, sniff.ts, rowSink.ts); nothing outside sets them.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { readCapture } from '../../src/capture/index.js';
import { MAX_SAMPLES, RowSink, SKIP } from '../../src/capture/rowSink.js';
import { NUMBER } from '../../src/capture/scanNumber.js';
import { isBenchError } from '../../src/types/index.js';
import { LONG, newTally, saveTally } from './budget.js';

const tally = newTally();
const dir = mkdtempSync(join(tmpdir(), 'benchproof-limits-'));
afterAll(() => {
  saveTally('limits', tally);
  rmSync(dir, { recursive: true, force: true });
});

async function codeOf(name: string, bytes: Buffer | string, options: { sampleRate?: number; unpackLimitMB?: number } = {}): Promise<{ code: string; line?: number; message: string }> {
  const path = join(dir, name);
  writeFileSync(path, bytes);
  tally.inputs++;
  try {
    await readCapture(path, options);
    return { code: 'none', message: '' };
  } catch (err) {
    if (!isBenchError(err)) {
      tally.crashes++;
      tally.notes.push(`limits: ${name}: ${String(err)}`);
      throw err;
    }
    return { code: err.code, ...(err.line !== undefined ? { line: err.line } : {}), message: err.message };
  } finally {
    rmSync(path, { force: true });
  }
}

const rows = (n: number, from = 0): string => Array.from({ length: n }, (_, i) => `${(from + i) * 1e-6},${Math.sin(i / 10).toFixed(4)}`).join('\n');

describe('capture reader limits', () => {
  it('stops at a line over 1 MiB with capture.line-too-long and its line number, in the sniffed part and after it', async () => {
    const long = '1,'.repeat(600_000);
    const early = await codeOf('early.csv', `t,v\n${rows(10)}\n${long}\n${rows(10, 10)}\n`);
    expect([early.code, early.line]).toEqual(['capture.line-too-long', 12]);
    const late = await codeOf('late.csv', `t,v\n${rows(20_000)}\n${long}\n${rows(10, 20_000)}\n`);
    expect([late.code, late.line]).toEqual(['capture.line-too-long', 20_002]);
    const unended = await codeOf('unended.csv', `t,v\n${rows(10)}\n${'5'.repeat(3 << 20)}`);
    expect(unended.code).toBe('capture.line-too-long');
  });

  it('stops at more than 1024 columns with capture.too-many-columns', async () => {
    const wide = Array.from({ length: 6 }, (_, r) => Array.from({ length: 1100 }, (_, c) => (c === 0 ? r : c % 5)).join(',')).join('\n');
    const r = await codeOf('wide.csv', `${wide}\n`);
    expect(r.code).toBe('capture.too-many-columns');
    expect(r.message).toContain('1100 columns');
  });

  it('stops with capture.too-large once the rows pass the sample limit, naming --channel when several channels are kept', () => {
    const sink = new RowSink({
      file: 'long.csv', columnCount: 3, trailingDelimiter: false, targets: Int32Array.of(SKIP, 0, 1),
      scales: Float64Array.of(1, 1, 1), axis: null, capacity: 16, maxSamples: 100,
    });
    const vals = Float64Array.of(0, 1, 2);
    const kinds = Uint8Array.of(NUMBER, NUMBER, NUMBER);
    const exps = new Int32Array(3);
    tally.inputs++;
    let caught: unknown;
    try {
      for (let i = 0; i < 1000; i++) sink.push(vals, kinds, exps, 3, i + 2);
    } catch (err) {
      caught = err;
    }
    expect(isBenchError(caught) && caught.code).toBe('capture.too-large');
    expect(sink.length).toBe(50);
    expect((caught as Error).message).toContain('--channel');
    expect(MAX_SAMPLES).toBe(2 ** 28);
  });

  it.runIf(LONG)('stops a small .gz that unpacks to more rows than the limit with capture.too-large, once the unpack limit is raised past it', { timeout: 20 * 60_000 }, async () => {
    const bomb = gzipSync(Buffer.alloc((MAX_SAMPLES + 1024) * 2, '0\n'), { level: 1 });
    // At the default unpack limit the same file stops earlier, with capture.unpack-limit.
    expect((await codeOf('bomb.csv.gz', bomb, { sampleRate: 1e6 })).code).toBe('capture.unpack-limit');
    const r = await codeOf('bomb.csv.gz', bomb, { sampleRate: 1e6, unpackLimitMB: 4096 });
    expect(r.code).toBe('capture.too-large');
  });
});

describe('capture errors quoting the file', () => {
  it('keeps the quoted row on one line when a quoted field holds a line break', async () => {
    const head = `"t","v, x"\n${Array.from({ length: 50 }, (_, i) => `"${i}","${i % 7}"`).join('\n')}\n`;
    const r = await codeOf('quoted-break.csv', `${head}"5,oops\n${Array.from({ length: 50 }, (_, i) => `"${i + 60}","${i % 7}"`).join('\n')}\n`);
    expect(r.code).toBe('capture.text-in-data');
    expect(r.message.split('\n')).toHaveLength(3);
  });
});
