/**
 * A synchronous client for PostgreSQL, so the store's callers stay synchronous on both engines.
 * node-postgres (`pg`) only speaks asynchronously; it runs in a worker thread, and each call here
 * posts the request to the worker, then blocks on `Atomics.wait` over a SharedArrayBuffer until the
 * worker has posted its answer on a channel kept for answers and notified, and takes the answer from
 * that channel with `receiveMessageOnPort`
 * (the pattern of the synckit package, written here in a few lines). Every wait is bounded: a server
 * that does not answer within the timeout ends the call with an error, never a hang.
 *
 * The worker's code is a string (eval), so it runs the same from the compiled build and from the
 * TypeScript sources under test; it loads `pg` by the absolute path resolved here.
 */
import { MessageChannel, Worker, receiveMessageOnPort } from 'node:worker_threads';
import type { MessagePort } from 'node:worker_threads';
import { createRequire } from 'node:module';

export interface PgRows<R> {
  readonly rows: R[];
  readonly rowCount: number;
}

/** What went wrong in the worker: the driver's message and PostgreSQL's SQLSTATE or Node's errno code. */
export class PgCallError extends Error {
  constructor(
    message: string,
    readonly code: string | undefined,
    readonly kind: 'server' | 'connection' | 'timeout',
  ) {
    super(message);
    this.name = 'PgCallError';
  }
}

export interface PgSyncOptions {
  /** Longest wait for the server to accept the connection, ms (default 10 000). */
  readonly connectTimeoutMs?: number;
  /** Longest wait for one statement, ms (default 60 000). */
  readonly callTimeoutMs?: number;
}

const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const port = workerData.port;
const pg = require(workerData.pgPath);
const flag = new Int32Array(workerData.shared);
let client;
const answer = (body) => { port.postMessage(body); Atomics.store(flag, 0, 1); Atomics.notify(flag, 0); };
const failure = (err, kind) => ({ ok: false, message: String(err && err.message || err), code: err && err.code, kind });
parentPort.on('message', async ({ op, sql, params }) => {
  try {
    if (op === 'connect') {
      client = new pg.Client({ connectionString: workerData.url, connectionTimeoutMillis: workerData.connectTimeoutMs });
      // A connection lost between calls is reported at the next call, not thrown here.
      client.on('error', () => {});
      await client.connect();
      answer({ ok: true });
    } else if (op === 'query' || op === 'arrays') {
      const r = await client.query({ text: sql, values: params, ...(op === 'arrays' ? { rowMode: 'array' } : {}) });
      answer({ ok: true, rows: r.rows, rowCount: r.rowCount ?? 0 });
    } else if (op === 'batch') {
      // Several statements in order, one answer: stops at the first that fails.
      const results = [];
      for (const item of params) {
        const r = await client.query({ text: item.sql, values: item.params });
        results.push({ rows: r.rows, rowCount: r.rowCount ?? 0 });
      }
      answer({ ok: true, rows: results, rowCount: results.length });
    } else if (op === 'end') {
      if (client) await client.end().catch(() => {});
      answer({ ok: true });
    }
  } catch (err) {
    const server = err && typeof err.code === 'string' && /^[0-9A-Z]{5}$/.test(err.code) && err.severity !== undefined;
    answer(failure(err, server ? 'server' : 'connection'));
  }
});
`;

type Answer = { ok: true; rows?: unknown[]; rowCount?: number } | { ok: false; message: string; code?: string; kind: 'server' | 'connection' };

export class PgSyncClient {
  private readonly worker: Worker;
  private readonly flag: Int32Array;
  /** The one channel every answer comes back on, read synchronously with receiveMessageOnPort. */
  private readonly answers: MessagePort;
  private readonly callTimeoutMs: number;
  private closed = false;

  /** Connects at once; throws PgCallError when the server cannot be reached or refuses the login. */
  constructor(url: string, options: PgSyncOptions = {}) {
    const { connectTimeoutMs = 10_000, callTimeoutMs = 60_000 } = options;
    this.callTimeoutMs = callTimeoutMs;
    const shared = new SharedArrayBuffer(4);
    this.flag = new Int32Array(shared);
    const pgPath = createRequire(import.meta.url).resolve('pg');
    const { port1, port2 } = new MessageChannel();
    this.answers = port1;
    this.worker = new Worker(WORKER_SOURCE, { eval: true, workerData: { shared, pgPath, url, connectTimeoutMs, port: port2 }, transferList: [port2] });
    // The worker must not keep a command alive once its work is done.
    this.worker.unref();
    try {
      this.call('connect', undefined, undefined, connectTimeoutMs + 2_000);
    } catch (err) {
      this.terminate();
      throw err;
    }
  }

  query<R = Record<string, unknown>>(sql: string, params: readonly unknown[] = []): PgRows<R> {
    const a = this.call('query', sql, params, this.callTimeoutMs);
    return { rows: (a.rows ?? []) as R[], rowCount: a.rowCount ?? 0 };
  }

  /**
   * A query whose rows come back as arrays of column values (in the statement's column order): for
   * long listings, whose row objects cost more to build and to copy from the worker than the values.
   */
  queryArrays(sql: string, params: readonly unknown[] = []): unknown[][] {
    return (this.call('arrays', sql, params, this.callTimeoutMs).rows ?? []) as unknown[][];
  }

  /**
   * Several statements run in order in one call: one hop to the worker instead of one per statement
   * (each hop costs a thread wake-up, which on a busy machine is most of a statement's time). Stops
   * at the first statement that fails and throws its error; inside a transaction, the caller rolls back.
   */
  batch(items: readonly { readonly sql: string; readonly params?: readonly unknown[] }[]): PgRows<Record<string, unknown>>[] {
    if (items.length === 0) return [];
    const a = this.call('batch', undefined, items.map((i) => ({ sql: i.sql, params: i.params ?? [] })), this.callTimeoutMs);
    return (a.rows ?? []) as PgRows<Record<string, unknown>>[];
  }

  /** Run `fn` inside BEGIN … COMMIT; any throw rolls back (when the connection still answers) and is rethrown. */
  transaction<T>(fn: () => T): T {
    this.query('BEGIN');
    let result: T;
    try {
      result = fn();
    } catch (err) {
      try {
        this.query('ROLLBACK');
      } catch {
        // The connection is gone: the server rolls the transaction back itself.
      }
      throw err;
    }
    this.query('COMMIT');
    return result;
  }

  /** False once closed, or once the connection was found lost (it is not used again then). */
  get open(): boolean {
    return !this.closed;
  }

  close(): void {
    if (this.closed) return;
    try {
      this.call('end', undefined, undefined, 5_000);
    } catch {
      // Closing a dead connection: nothing left to release but the worker.
    }
    this.terminate();
  }

  private terminate(): void {
    this.closed = true;
    this.answers.close();
    void this.worker.terminate();
  }

  private call(op: string, sql: string | undefined, params: readonly unknown[] | undefined, timeoutMs: number): Answer & { ok: true } {
    if (this.closed) throw new PgCallError('the connection to the store is closed', undefined, 'connection');
    Atomics.store(this.flag, 0, 0);
    this.worker.postMessage({ op, sql, params });
    const waited = Atomics.wait(this.flag, 0, 0, timeoutMs);
    const got = receiveMessageOnPort(this.answers);
    if (!got) {
      // The worker may still be inside the call; it is not trusted with another one.
      this.terminate();
      throw new PgCallError(waited === 'timed-out' ? `no answer within ${timeoutMs} ms` : 'the store connection stopped answering', 'ETIMEDOUT', 'timeout');
    }
    const a = got.message as Answer;
    if (!a.ok) {
      // A lost connection is not used again: later calls fail at once instead of waiting on it.
      if (a.kind === 'connection' || /^(08|57P0[123])/.test(a.code ?? '')) this.terminate();
      throw new PgCallError(a.message, a.code, a.kind);
    }
    return a;
  }
}
