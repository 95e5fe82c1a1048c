/**
 * Long cases of the reader's bounds (issue 22), run only by `npm run hardening`: a .gz of data rows
 * that unpacks past the default limit (100× its stored size, at least 256 MiB) stops there with
 * capture.unpack-limit, and reads whole once --unpack-limit is raised above its size. The short
 * cases are in test/capture/readerBounds.test.ts. The limits are our own (src/capture/readerLimits.ts).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { readCapture } from '../../src/capture/index.js';
import { UNPACK_FLOOR } from '../../src/capture/readerLimits.js';
import { isBenchError } from '../../src/types/index.js';
import { LONG } from './budget.js';

const dir = mkdtempSync(join(tmpdir(), 'benchproof-bounds-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('reader bounds on large compressed captures (long run)', () => {
  it.runIf(LONG)('stops a .gz of rows that unpacks past 256 MiB, and reads it with --unpack-limit above its size', { timeout: 20 * 60_000 }, async () => {
    // 24 gzip members of 16 MiB of rows each (RFC 1952 §2.2: members concatenate into one stream): 384 MiB.
    const member = gzipSync(Buffer.from('1,2\n'.repeat(2 ** 22)), { level: 9 });
    const path = join(dir, 'rows-bomb.csv.gz');
    // Two channels named as channels, so neither is taken for a time column (the rows never rise).
    writeFileSync(path, Buffer.concat([gzipSync('CH1,CH2\n'), ...Array.from({ length: 24 }, () => member)]));
    const code = await readCapture(path, { sampleRate: 1e6 }).then(
      () => 'none',
      (e: unknown) => (isBenchError(e) ? e.code : String(e)),
    );
    expect(code).toBe('capture.unpack-limit');
    const capture = await readCapture(path, { sampleRate: 1e6, unpackLimitMB: Math.ceil((24 * 2 ** 24 + 4) / 1e6) });
    expect(capture.channels[0].samples.length).toBe(24 * 2 ** 22);
    expect(UNPACK_FLOOR).toBe(256 * 2 ** 20);
  });
});
