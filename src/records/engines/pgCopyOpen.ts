/** `store copy`'s entry: connect to the shared store, copy the bench's records into it, verify the result. */
import type { CopyResult } from './pgCopy.js';
import { copyIntoShared } from './pgCopy.js';
import { pgStoreError } from './pgErrors.js';
import { shownStore } from './pgLocation.js';
import { openPgStore } from './pgStore.js';
import { PgSyncClient } from './pgSync.js';
import type { StoreAudit } from '../auditStore.js';
import { unverifiedError } from '../storeErrors.js';

export function openSharedCopy(fromDir: string, label: string, url: string, onEach?: (done: number, total: number) => void): CopyResult & { readonly audit: StoreAudit } {
  const shown = shownStore(url);
  let client: PgSyncClient;
  try {
    client = new PgSyncClient(url);
  } catch (err) {
    throw pgStoreError(err, shown);
  }
  let result: CopyResult;
  try {
    result = copyIntoShared(fromDir, label, client, shown, onEach);
  } catch (err) {
    throw pgStoreError(err, shown);
  } finally {
    client.close();
  }
  // What arrived is read back and verified whole: fingerprints, chain, every capture's chunks.
  const shared = openPgStore(url, { cacheDir: fromDir });
  try {
    const audit = shared.audit();
    if (audit.problems.length > 0) throw unverifiedError(shown, audit);
    return { ...result, audit };
  } finally {
    shared.close();
  }
}
