import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { closeSync, openSync, readFileSync, statSync, writeSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { readCapture } from '../../src/capture/index.js';
import { synthesize, writeCsvChunks } from '../../src/syntheticCaptures/index.js';
import type { CsvLayoutOptions } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { tempFolder } from './tempFiles.js';

const write = tempFolder();
// 90 000 rows of two channels: about 3.5 MiB, so 1 MiB chunks end inside rows (and between CR and LF).
const rows = 90_000;
const tri = synthesize({ shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 1e6, samples: rows, noise: 0.01, bits: 8, fullScale: 20, seed: 5 });
const pulse = synthesize({ shape: 'pulse', frequency: 261.63, amplitude: 5, sampleRate: 1e6, samples: rows, edge: { tau: 2e-6 }, seed: 6 });

function writeBig(name: string, layout: CsvLayoutOptions): string {
  const path = write(name, '');
  const fd = openSync(path, 'w');
  for (const chunk of writeCsvChunks([{ name: 'tri', unit: 'V', signal: tri }, { name: 'pulse', unit: 'V', signal: pulse }], { ...layout, rowsPerChunk: 7000 })) writeSync(fd, chunk);
  closeSync(fd);
  return path;
}

function maxError(a: Float64Array, b: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

const sha256 = (path: string): string => createHash('sha256').update(readFileSync(path)).digest('hex');

describe('readCapture streaming', () => {
  for (const [label, layout] of [
    ['CRLF', { lineEnding: 'crlf' }],
    ['semicolons and decimal commas', { delimiter: ';', decimalMark: ',' }],
    ['runs of spaces', { delimiter: ' ' }],
  ] as const) {
    it(`reads a multi-chunk file with ${label} row for row, hashing exactly the stored bytes`, async () => {
      const path = writeBig(`${label.replace(/\W+/g, '_')}.csv`, layout);
      expect(statSync(path).size).toBeGreaterThan(3 * 2 ** 20);
      const c = await readCapture(path);
      expect(c.length).toBe(rows);
      expectWithin(maxError(c.channels[0].samples, tri.values), 0, { abs: 1.5e-8 }, 'rounding to 9 significant digits');
      expectWithin(maxError(c.channels[1].samples, pulse.values), 0, { abs: 5e-8 }, 'rounding to 9 significant digits');
      expect(c.sha256).toBe(sha256(path));
      expect(c.layout.lastDataLine).toBe(rows + 1);
    });
  }

  it('reads a file with CR-only line ends', async () => {
    const text = readFileSync(writeBig('lf.csv', {}), 'latin1').replace(/\n/g, '\r');
    const c = await readCapture(write('cr.csv', text));
    expect(c.layout.lineEnding).toBe('cr');
    expect(c.length).toBe(rows);
  });

  it('reads a multi-chunk .csv.gz the same as the plain file', async () => {
    const plain = writeBig('plain.csv', {});
    const gz = write('plain.csv.gz', gzipSync(readFileSync(plain)));
    const a = await readCapture(plain);
    const b = await readCapture(gz);
    expect(b.length).toBe(a.length);
    expectWithin(maxError(a.channels[0].samples, b.channels[0].samples), 0, { abs: 0 }, 'same text, same numbers');
    expect(b.sha256).toBe(sha256(gz));
  });

  it('reports progress in stored bytes up to the file size and leaves the file untouched', async () => {
    const path = writeBig('progress.csv', {});
    const before = { hash: sha256(path), mtime: statSync(path).mtimeMs };
    const seen: [number, number][] = [];
    await readCapture(path, { onProgress: (done, total) => seen.push([done, total]) });
    const size = statSync(path).size;
    expect(seen.length).toBeGreaterThan(2);
    expect(seen[seen.length - 1]).toEqual([size, size]);
    expect(seen.every(([d], i) => i === 0 || d > seen[i - 1][0])).toBe(true);
    expect({ hash: sha256(path), mtime: statSync(path).mtimeMs }).toEqual(before);
  });

  it('keeps only the selected channel’s samples', async () => {
    const c = await readCapture(writeBig('select.csv', {}), { channel: 'pulse' });
    expect(c.channels).toHaveLength(1);
    expectWithin(maxError(c.channels[0].samples, pulse.values), 0, { abs: 5e-8 }, 'rounding to 9 significant digits');
  });
});
