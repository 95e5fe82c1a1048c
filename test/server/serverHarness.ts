/** One bench-page server per test file, on 127.0.0.1 and a free port, with its records in a temporary folder. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createContext } from '../../src/cli/context.js';
import type { CliIo } from '../../src/cli/io.js';
import { startBenchServer } from '../../src/server/benchServer.js';
import type { BenchServer, BenchServerOptions } from '../../src/server/benchServer.js';

export interface TestServer {
  readonly server: BenchServer;
  readonly base: string;
  readonly dataDir: string;
  readonly stderr: () => string;
  stop(): Promise<void>;
}

export const SPEC = 'samples/fh210-spec.yaml';

export async function startTestServer(options: Partial<BenchServerOptions> = {}): Promise<TestServer> {
  const dataDir = mkdtempSync(join(tmpdir(), 'benchproof-serve-'));
  let err = '';
  const io: CliIo = { stdout: () => {}, stderr: (s) => void (err += s), stdoutIsTTY: false, stderrIsTTY: false, env: { BENCHPROOF_OPERATOR: 'page test' }, cwd: process.cwd() };
  const server = await startBenchServer(createContext(io), { host: '127.0.0.1', port: 0, flags: { data: dataDir }, specFile: SPEC, markerMs: 100, ...options });
  const base = server.url.replace(/\/(\?.*)?$/, '');
  return {
    server,
    base,
    dataDir,
    stderr: () => err,
    async stop() {
      await server.close();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** A multipart body of files as a browser sends it. */
export function filesForm(files: readonly { name: string; bytes: Uint8Array | string }[]): FormData {
  const form = new FormData();
  for (const f of files) form.append('file', new Blob([f.bytes]), f.name);
  return form;
}

/** Reads the event stream until an event of this name arrives (or the time runs out). */
export async function nextEvent(base: string, name: string, trigger: () => Promise<unknown>, timeoutMs = 8000): Promise<unknown> {
  const abort = new AbortController();
  const timer = setTimeout(() => abort.abort(), timeoutMs);
  try {
    const res = await fetch(`${base}/api/events`, { signal: abort.signal });
    const reader = res.body!.getReader();
    const decoder = new TextDecoder();
    let text = '';
    await reader.read(); // the opening `retry:` line: the stream is attached
    await trigger();
    for (;;) {
      const { value, done } = await reader.read();
      if (done) throw new Error(`the stream ended before a "${name}" event`);
      text += decoder.decode(value, { stream: true });
      const m = new RegExp(`event: ${name}\\ndata: (.*)\\n\\n`).exec(text);
      if (m) return JSON.parse(m[1]);
    }
  } finally {
    clearTimeout(timer);
    abort.abort();
  }
}
