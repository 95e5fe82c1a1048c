/**
 * The shared store's address (`--store URL` / BENCHPROOF_STORE): a `postgres://` or `postgresql://`
 * URL in the libpq form the `pg` driver reads (PostgreSQL docs, "Connection URIs", 34.1.1). The
 * password may come from the URL, PGPASSWORD or the password file (~/.pgpass, PGPASSFILE), which the
 * driver reads itself; `sslmode` and the other query parameters are passed through unchanged.
 *
 * The URL is never shown as given: `shownStore` drops the password (and any password parameter),
 * and every message about the store names it that way.
 */
import { BenchError } from '../../types/index.js';

const SECRET_PARAMS = new Set(['password', 'sslpassword', 'sslkey']);

/** True for an address of a shared store (a URL), false for a data folder. */
export function isStoreUrl(text: string): boolean {
  return /^postgres(ql)?:\/\//i.test(text);
}

/** The store as it may be printed: user, host, port, database and harmless parameters, never a secret. */
export function shownStore(url: string): string {
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    return 'the shared store (its address could not be read)';
  }
  u.password = '';
  for (const key of [...u.searchParams.keys()]) if (SECRET_PARAMS.has(key.toLowerCase())) u.searchParams.set(key, '***');
  return decodeURIComponent(u.toString());
}

/** Check the address before connecting; a malformed one is the user's input error. */
export function checkStoreUrl(url: string, source: string): void {
  let problem: string | undefined;
  try {
    const u = new URL(url);
    if (!isStoreUrl(url)) problem = `"${u.protocol}" is not a PostgreSQL address`;
    else if (u.pathname.replace(/^\//, '') === '') problem = 'the address names no database';
  } catch {
    problem = 'the address is not a URL';
  }
  if (problem === undefined) return;
  throw new BenchError({
    code: 'store.bad-address',
    file: source,
    problem: `${problem}: ${shownStore(url)}`,
    expected: 'postgres://USER@HOST[:PORT]/DATABASE, optionally with ?sslmode=… (the password from PGPASSWORD or ~/.pgpass)',
    fix: 'correct the address, e.g. --store postgres://bench@records.local/benchproof',
  });
}
