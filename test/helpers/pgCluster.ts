/**
 * A throwaway PostgreSQL 15 cluster for the tests that need a real server: `initdb` into a fresh
 * temporary folder, `pg_ctl start` listening only on a Unix socket in that folder (no TCP port at
 * all), and everything removed on stop. The server refuses to run as root, so when the tests run
 * as root the cluster is made and started as the `postgres` user (the folder handed over to it).
 *
 * Start one cluster per test file (beforeAll) and stop it in afterAll; without the server binaries
 * `startPgCluster` returns `{ skip: reason }` and the file's tests skip with that note.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

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

export function startPgCluster(): PgClusterResult {
  const missing = pgBinariesMissing();
  if (missing) return { skip: missing };
  const root = mkdtempSync(join(tmpdir(), 'benchproof-pg-'));
  const dataDir = join(root, 'data');
  // The socket's port number only names the socket file (.s.PGSQL.<port>); no TCP port is opened.
  const port = nextPort++;
  chmodSync(root, 0o700);
  if (asRoot) execFileSync('chown', ['postgres:', root]);
  const start = (): void => {
    runAs('pg_ctl', ['-D', dataDir, '-l', join(root, 'server.log'), '-w', '-t', '60', '-o', `-c listen_addresses='' -c unix_socket_directories='${root}' -p ${port} -c fsync=on`, 'start']);
  };
  try {
    runAs('initdb', ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C', '--no-sync']);
    start();
  } catch (err) {
    rmSync(root, { recursive: true, force: true });
    return { skip: `could not start a PostgreSQL cluster: ${(err as Error).message.split('\n')[0]}` };
  }
  let running = true;
  const psql = (sql: string, database = 'postgres'): string => runAs('psql', ['-h', root, '-p', String(port), '-U', 'postgres', '-d', database, '-At', '-v', 'ON_ERROR_STOP=1', '-c', sql]);
  const url = (name = 'postgres'): string => `postgres://postgres@/${name}?host=${encodeURIComponent(root)}&port=${port}`;
  return {
    root,
    socketDir: root,
    port,
    url,
    createDatabase(name) {
      psql(`CREATE DATABASE "${name}"`);
      return url(name);
    },
    psql,
    kill() {
      if (!running) return;
      runAs('pg_ctl', ['-D', dataDir, '-m', 'immediate', '-w', 'stop']);
      running = false;
    },
    restart() {
      if (running) return;
      start();
      running = true;
    },
    stop() {
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
