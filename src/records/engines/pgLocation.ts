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

/** True for an address of a shared store (a URL), false for a data folder. */
export function isStoreUrl(text: string): boolean {
  return /^postgres(ql)?:\/\//i.test(text);
}

const SECRET_PARAMS = new Set(['password', 'sslpassword', 'sslkey']);

/**
 * The store's address as it may be printed: the password and password-like parameters replaced.
 * Read by hand rather than with URL, which refuses libpq's socket form with no host
 * (`postgres://bench@/benchproof?host=/var/run/postgresql`, PostgreSQL docs 34.1.1.2).
 */
export function shownStore(url: string): string {
  const m = /^([a-z][a-z0-9+.-]*):\/\/(?:([^@/?#]*)@)?([^/?#]*)([^?#]*)(?:\?([^#]*))?/i.exec(url.trim());
  if (!m) return 'the shared store (its address could not be read)';
  const [, scheme, userinfo, host, path, query] = m;
  const user = userinfo === undefined ? '' : `${userinfo.split(':')[0]}@`;
  const params = query === undefined ? '' : `?${query.split('&').map((pair) => (SECRET_PARAMS.has(safeDecode(pair.split('=')[0]).toLowerCase()) ? `${pair.split('=')[0]}=***` : pair)).join('&')}`;
  return safeDecode(`${scheme}://${user}${host}${path}${params}`);
}

function safeDecode(text: string): string {
  try {
    return decodeURIComponent(text);
  } catch {
    return text;
  }
}

/** Check the address before connecting; a malformed one is the user's input error. */
export function checkStoreUrl(url: string, source: string): void {
  let problem: string | undefined;
  const m = /^([a-z][a-z0-9+.-]*):\/\/(?:[^@/?#]*@)?[^/?#]*([^?#]*)/i.exec(url.trim());
  if (!m) problem = 'the address is not a URL';
  else if (!isStoreUrl(url)) problem = `"${m[1]}:" is not a PostgreSQL address`;
  else if (m[2].replace(/^\//, '') === '') problem = 'the address names no database';
  if (problem === undefined) return;
  throw new BenchError({
    code: 'store.bad-address',
    file: source,
    problem: `${problem}: ${shownStore(url)}`,
    expected: 'postgres://USER@HOST[:PORT]/DATABASE, optionally with ?sslmode=… (the password from PGPASSWORD or ~/.pgpass)',
    fix: 'correct the address, e.g. --store postgres://bench@records.local/benchproof',
  });
}
