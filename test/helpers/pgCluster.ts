/**
 * A throwaway PostgreSQL 15 cluster for the tests that need a real server: a data directory of its
 * own in a fresh folder, `pg_ctl start` listening only on a Unix socket in that folder (no TCP port at
 * all), and everything removed on stop. The server refuses to run as root, so when the tests run
 * as root the cluster is made and started as the `postgres` user (the folder handed over to it).
 *
 * Under vitest the data directory is a copy of one `initdb` made once per test run (in the run's
 * folder, pgRunFolder.ts, which also stops and removes whatever a run leaves behind); elsewhere, or
 * when that template cannot be made, each cluster runs `initdb` itself. Either way each cluster is a
 * whole server of its own, so kill() and restart() touch no other test file's cluster.
 *
 * Start one cluster per test file (beforeAll) and stop it in afterAll; without the server binaries
 * `startPgCluster` returns `{ skip: reason }` and the file's tests skip with that note.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { inject } from 'vitest';

/** Debian's layout for the `postgresql` package (postgresql-15). */
export const PG_BIN = process.env.BENCHPROOF_PG_BIN ?? '/usr/lib/postgresql/15/bin';

export interface PgCluster {
  /** The folder holding the data directory and the socket; removed by stop(). */
  readonly root: string;
  /** The folder the server's Unix socket is in (the `host` of a socket connection). */
  readonly socketDir: string;
  readonly port: number;
  /** A connection URL for database `name` (created by createDatabase), user `postgres`, over the socket. */
  url(name?: string): string;
  /** Create an empty database; returns its URL. */
  createDatabase(name: string): string;
  /** Run one SQL statement through psql as the superuser; returns its unaligned output. */
  psql(sql: string, database?: string): string;
  /**
   * Run SQL (one statement or several separated by semicolons) as the superuser over one connection
   * per database kept until kill() or stop() (the pg client, in this process: no psql process and no
   * new server backend per call); returns the rows of the last statement.
   */
  sql(text: string, database?: string): Promise<Record<string, unknown>[]>;
  /** Stop the server at once (immediate mode: like a crash, no checkpoint) without removing the folder. */
  kill(): void;
  /** Start the server again on the same data after kill(). */
  restart(): void;
  /** Stop the server and remove every file of the cluster. */
  stop(): void;
}

export type PgClusterResult = PgCluster | { readonly skip: string };

const asRoot = typeof process.getuid === 'function' && process.getuid() === 0;

/** Run a server binary, as the postgres user when we are root. */
function runAs(bin: string, args: readonly string[], input?: string): string {
  const file = join(PG_BIN, bin);
  const [cmd, argv] = asRoot ? ['runuser', ['-u', 'postgres', '--', file, ...args]] : [file, [...args]];
  return execFileSync(cmd, argv, { encoding: 'utf8', input, stdio: ['pipe', 'pipe', 'pipe'], timeout: 60_000 });
}

function pgBinariesMissing(): string | undefined {
  for (const bin of ['initdb', 'pg_ctl', 'postgres']) {
    if (!existsSync(join(PG_BIN, bin))) return `PostgreSQL server binaries not found in ${PG_BIN} (install Debian's postgresql package; .ci/run does)`;
  }
  if (asRoot && spawnSync('id', ['postgres']).status !== 0) return 'running as root and there is no postgres user to run the server as';
  return undefined;
}

let nextPort = 54_320 + (process.pid % 500) * 7;

/** The run's folder from pgRunFolder.ts, or undefined outside a vitest run with that global setup. */
function runFolder(): string | undefined {
  try {
    const dir = inject('benchproofPgRun');
    return dir && existsSync(dir) ? dir : undefined;
  } catch {
    return undefined;
  }
}

const pause = (ms: number): void => void Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);

/**
 * The run's template data directory, made by whichever worker asks first (mkdir is the lock; the
 * others wait for its `ready` or `failed` mark). Undefined when it could not be made: the caller
 * then runs initdb itself and reports what fails there.
 */
function templateData(run: string): string | undefined {
  const dir = join(run, 'template');
  const data = join(dir, 'data');
  const ready = join(dir, 'ready');
  const failed = join(dir, 'failed');
  try {
    mkdirSync(dir);
  } catch {
    for (const until = Date.now() + 120_000; Date.now() < until; pause(50)) {
      if (existsSync(ready)) return data;
      if (existsSync(failed)) return undefined;
    }
    return undefined;
  }
  try {
    chmodSync(dir, 0o700);
    if (asRoot) execFileSync('chown', ['postgres:', dir]);
    runAs('initdb', ['-D', data, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C', '--no-sync']);
    writeFileSync(ready, '');
    return data;
  } catch (err) {
    writeFileSync(failed, String((err as Error).message));
    return undefined;
  }
}

/** A new data directory at `dataDir`: a copy of the run's template (owner and modes kept), or initdb. */
function makeDataDir(dataDir: string, run: string | undefined): void {
  const template = run === undefined ? undefined : templateData(run);
  if (template) execFileSync('cp', ['-a', template, dataDir], { stdio: 'ignore' });
  else runAs('initdb', ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C', '--no-sync']);
}

export function startPgCluster(): PgClusterResult {
  const missing = pgBinariesMissing();
  if (missing) return { skip: missing };
  const run = runFolder();
  const root = mkdtempSync(join(run ?? tmpdir(), 'benchproof-pg-'));
  const dataDir = join(root, 'data');
  // The socket's port number only names the socket file (.s.PGSQL.<port>); no TCP port is opened.
  const port = nextPort++;
  chmodSync(root, 0o700);
  if (asRoot) execFileSync('chown', ['postgres:', root]);
  // fsync=off: the tests kill server processes, never the machine. A commit still writes its WAL to
  // the operating system before it returns (synchronous_commit stays on), and a killed process loses
  // nothing the kernel holds, so what a kill test checks is unchanged; only the disk-sync waits of
  // crash recovery and checkpoints go (PostgreSQL 15 docs, 20.5.1 "Settings", fsync).
  const start = (): void => {
    runAs('pg_ctl', ['-D', dataDir, '-l', join(root, 'server.log'), '-w', '-t', '60', '-o', `-c listen_addresses='' -c unix_socket_directories='${root}' -p ${port} -c fsync=off -c synchronous_commit=on`, 'start']);
  };
  try {
    makeDataDir(dataDir, run);
    start();
  } catch (err) {
    rmSync(root, { recursive: true, force: true });
    return { skip: `could not start a PostgreSQL cluster: ${(err as Error).message.split('\n')[0]}` };
  }
  let running = true;
  const psql = (sql: string, database = 'postgres'): string => runAs('psql', ['-h', root, '-p', String(port), '-U', 'postgres', '-d', database, '-At', '-v', 'ON_ERROR_STOP=1', '-c', sql]);
  const clients = new Map<string, Promise<pg.Client>>();
  const connect = async (database: string): Promise<pg.Client> => {
    const client = new pg.Client({ host: root, port, user: 'postgres', database });
    // A server killed under an idle connection: the next sql() call connects afresh.
    client.on('error', () => clients.delete(database));
    await client.connect();
    return client;
  };
  const endClients = (): void => {
    for (const c of clients.values()) void c.then((client) => client.end()).catch(() => {});
    clients.clear();
  };
  const url = (name = 'postgres'): string => `postgres://postgres@/${name}?host=${encodeURIComponent(root)}&port=${port}`;
  return {
    root,
    socketDir: root,
    port,
    url,
    createDatabase(name) {
      // FILE_COPY copies template1's files instead of writing each of its pages to the WAL (PostgreSQL
      // 15 docs, CREATE DATABASE, STRATEGY): for a small database, less of the server's time.
      psql(`CREATE DATABASE "${name}" STRATEGY FILE_COPY`);
      return url(name);
    },
    psql,
    async sql(text, database = 'postgres') {
      let client = clients.get(database);
      if (client === undefined) {
        client = connect(database);
        clients.set(database, client);
        client.catch(() => clients.delete(database));
      }
      const result = await (await client).query(text);
      const last = Array.isArray(result) ? result[result.length - 1] : result;
      return last?.rows ?? [];
    },
    kill() {
      if (!running) return;
      endClients();
      runAs('pg_ctl', ['-D', dataDir, '-m', 'immediate', '-w', 'stop']);
      running = false;
    },
    restart() {
      if (running) return;
      start();
      running = true;
    },
    stop() {
      endClients();
      try {
        if (running) runAs('pg_ctl', ['-D', dataDir, '-m', 'immediate', '-w', 'stop']);
      } finally {
        running = false;
        rmSync(root, { recursive: true, force: true });
      }
    },
  };
}

export function isSkipped(result: PgClusterResult): result is { readonly skip: string } {
  return 'skip' in result;
}
