/**
 * The bench page's guard, asserted against what the issue and common web practice ask (common
 * practice, no source beyond the CSP and Fetch specifications' header meanings): a foreign Host is
 * refused, state changes need the same origin or the token, a token-only server refuses requests
 * without it, uploads are limited, and no path leaves the page's assets or the data folder.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { request } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { filesForm, startTestServer } from './serverHarness.js';
import type { TestServer } from './serverHarness.js';

let open: TestServer;
let locked: TestServer;
const capture = readFileSync('samples/captures/FK-0101_mid.csv');

beforeAll(async () => {
  open = await startTestServer({ limits: { maxFileBytes: 400_000, maxFiles: 3 } });
  locked = await startTestServer({ requireToken: true });
});
afterAll(async () => {
  await open?.stop();
  await locked?.stop();
});

describe('the bench page guard', () => {
  it('serves the page with a Content-Security-Policy that allows no inline script', async () => {
    const res = await fetch(`${open.base}/`);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(res.status).toBe(200);
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain('unsafe-inline');
    const html = await res.text();
    // Every script is a file of the page's own: none carries its code inline.
    expect([...html.matchAll(/<script\b[^>]*>([\s\S]*?)<\/script>/g)].every((m) => m[1].trim() === '' && /\bsrc="\/assets\//.test(m[0]))).toBe(true);
  });

  it('refuses a request whose Host header names another site (DNS rebinding)', async () => {
    // fetch() may not set Host, so this request is made with node:http.
    const status = await new Promise<number>((done, fail) => {
      const req = request(`${open.base}/api/board`, { headers: { Host: `bench.example.com:${new URL(open.base).port}` } }, (res) => {
        res.resume();
        done(res.statusCode ?? 0);
      });
      req.on('error', fail);
      req.end();
    });
    expect(status).toBe(421);
  });

  it('refuses a drop without an Origin of its own and one from another origin', async () => {
    const plain = await fetch(`${open.base}/api/drop`, { method: 'POST', body: filesForm([{ name: 'FK-0101_mid.csv', bytes: capture }]) });
    expect(plain.status).toBe(403);
    const foreign = await fetch(`${open.base}/api/drop`, { method: 'POST', headers: { Origin: 'http://bench.example.com' }, body: filesForm([{ name: 'FK-0101_mid.csv', bytes: capture }]) });
    expect(foreign.status).toBe(403);
  });

  it('refuses every request without the token when the token is required, and accepts it by header or cookie', async () => {
    expect((await fetch(`${locked.base}/`)).status).toBe(401);
    expect((await fetch(`${locked.base}/api/board`)).status).toBe(401);
    expect((await fetch(`${locked.base}/api/board`, { headers: { Authorization: 'Bearer nottherighttoken' } })).status).toBe(401);
    expect((await fetch(`${locked.base}/api/board`, { headers: { Authorization: `Bearer ${locked.server.token}` } })).status).toBe(200);
    const first = await fetch(locked.server.url, { redirect: 'manual' });
    expect(first.status).toBe(303);
    const cookie = (first.headers.get('set-cookie') ?? '').split(';')[0];
    expect((await fetch(`${locked.base}/api/board`, { headers: { Cookie: cookie } })).status).toBe(200);
  });

  it('refuses paths that climb out of the page assets', async () => {
    for (const path of ['/../package.json', '/%2e%2e/%2e%2e/package.json', '/assets/..%2f..%2f..%2fpackage.json', '/..%5c..%5cpackage.json']) {
      const res = await fetch(`${open.base}${path}`);
      const text = await res.text();
      expect(text, path).not.toContain('"name": "benchproof"');
      expect(res.status, path).toBeGreaterThanOrEqual(400);
    }
  });

  it('refuses a dropped file named with a folder, and writes nothing outside its temporary folder', async () => {
    const before = readdirSync(tmpdir()).filter((n) => n.startsWith('evil')).length;
    const res = await fetch(`${open.base}/api/drop`, { method: 'POST', headers: { Origin: open.base }, body: filesForm([{ name: '../evil.csv', bytes: capture }]) });
    // Browsers send the base name only; the server takes the base name of anything else.
    const body = (await res.json()) as { units?: unknown; error?: { code: string } };
    expect(res.status).toBe(422);
    expect(body.error?.code).not.toBe('serve.internal');
    expect(readdirSync(tmpdir()).filter((n) => n.startsWith('evil')).length).toBe(before);
    const dotted = await fetch(`${open.base}/api/drop`, { method: 'POST', headers: { Origin: open.base }, body: filesForm([{ name: '..', bytes: capture }]) });
    expect(((await dotted.json()) as { error: { code: string } }).error.code).toBe('serve.bad-file-name');
  });

  it('refuses a file larger than the limit and more files than the limit, with the upload error', async () => {
    const big = new Uint8Array(500_000).fill(0x31);
    const large = await fetch(`${open.base}/api/drop`, { method: 'POST', headers: { Origin: open.base }, body: filesForm([{ name: 'FK-0101_mid.csv', bytes: big }]) });
    expect(large.status).toBe(413);
    expect(((await large.json()) as { error: { code: string } }).error.code).toBe('serve.upload-too-large');
    const many = await fetch(`${open.base}/api/drop`, { method: 'POST', headers: { Origin: open.base }, body: filesForm(['a', 'b', 'c', 'd'].map((x) => ({ name: `FK-0101_${x}.csv`, bytes: 'x' }))) });
    expect(many.status).toBe(413);
  });

  it('asks for the token on an interface other than loopback, and takes only that interface as Host', async () => {
    // fastify's inject() runs requests without a socket, so no test listens beyond 127.0.0.1.
    const { default: Fastify } = await import('fastify');
    const { installGuard } = await import('../../src/server/security.js');
    for (const host of ['192.0.2.10', '0.0.0.0']) {
      const app = Fastify();
      installGuard(app, { host, token: 'a'.repeat(64), port: () => 8400 });
      app.get('/api/board', async () => ({ ok: true }));
      const ask = (hostHeader: string, auth?: string) => app.inject({ url: '/api/board', headers: { host: hostHeader, ...(auth ? { authorization: `Bearer ${auth}` } : {}) } });
      expect((await ask('192.0.2.10:8400')).statusCode, host).toBe(401);
      expect((await ask('192.0.2.10:8400', 'b'.repeat(64))).statusCode, host).toBe(401);
      expect((await ask('192.0.2.10:8400', 'a'.repeat(64))).statusCode, host).toBe(200);
      expect((await ask('bench.example.com:8400', 'a'.repeat(64))).statusCode, host).toBe(421);
      expect((await ask('192.0.2.10:9999', 'a'.repeat(64))).statusCode, host).toBe(421);
      await app.close();
    }
  });

  it('refuses a stored capture path outside the archive', async () => {
    const { insideArchive } = await import('../../src/server/captureCache.js');
    expect(() => insideArchive(open.dataDir, '../../etc/passwd')).toThrow(/outside the capture archive/);
    expect(() => insideArchive(open.dataDir, 'captures/../records.db')).toThrow(/outside the capture archive/);
  });
});
