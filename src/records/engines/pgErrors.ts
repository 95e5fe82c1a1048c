/**
 * What a failed call to the shared store means to the user. The codes a server sends are SQLSTATEs
 * (PostgreSQL docs, Appendix A "PostgreSQL Error Codes"): class 28 is a refused login, class 08 a
 * lost connection, 57P01–57P03 a server shutting down or starting. Messages name the store without
 * its password (pgLocation.ts) and never repeat the driver's text when it could hold one.
 */
import { BenchError } from '../../types/index.js';
import { PgCallError } from './pgSync.js';

/** True when the server could not be reached or dropped the connection: the run may go to the outbox. */
export function isUnreachable(err: unknown): boolean {
  if (!(err instanceof PgCallError)) return false;
  if (err.kind !== 'server') return true;
  return err.code !== undefined && (err.code.startsWith('08') || ['57P01', '57P02', '57P03'].includes(err.code));
}

export function pgStoreError(err: unknown, shown: string): BenchError {
  if (err instanceof BenchError) return err;
  if (isUnreachable(err)) {
    const e = err as PgCallError;
    return new BenchError({
      code: 'store.unreachable',
      file: shown,
      problem: `the shared store did not answer (${e.code ?? e.kind})`,
      expected: 'a PostgreSQL server answering at this address',
      fix: 'check the network and that the server runs; runs checked meanwhile wait on this bench until `benchproof sync`',
    });
  }
  if (err instanceof PgCallError && err.code?.startsWith('28')) {
    return new BenchError({
      code: 'store.login-refused',
      file: shown,
      problem: `the shared store refused the login (SQLSTATE ${err.code})`,
      expected: 'a user the server lets in, with its password in the URL, PGPASSWORD or ~/.pgpass',
      fix: 'check the user name in --store / BENCHPROOF_STORE and the password in PGPASSWORD or ~/.pgpass',
    });
  }
  const code = err instanceof PgCallError ? err.code : undefined;
  return new BenchError({
    code: 'store.server-error',
    file: shown,
    problem: `the shared store refused a request${code ? ` (SQLSTATE ${code})` : ''}: ${err instanceof Error ? err.message.split('\n')[0] : String(err)}`,
    expected: 'a PostgreSQL database this user may create tables in and write to',
    fix: 'ask the store\'s administrator to grant the benchproof user CREATE and write on this database',
  });
}
