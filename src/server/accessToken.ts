/**
 * The access token for `serve --host`: 32 random bytes as hex, made once and kept in the data folder
 * (readable by this user only), so a bookmarked address keeps working across restarts.
 */
import { randomBytes } from 'node:crypto';
import { chmodSync, existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

export const TOKEN_FILE = 'serve-token';

export function accessToken(dataDir: string): string {
  const file = join(dataDir, TOKEN_FILE);
  if (existsSync(file)) {
    const kept = readFileSync(file, 'utf8').trim();
    if (/^[0-9a-f]{64}$/.test(kept)) return kept;
  }
  const token = randomBytes(32).toString('hex');
  writeFileSync(file, `${token}\n`, { mode: 0o600 });
  chmodSync(file, 0o600);
  return token;
}
