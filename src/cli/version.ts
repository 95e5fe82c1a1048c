import { readFileSync } from 'node:fs';

/** The tool version from package.json, stored with every record. */
export const TOOL_VERSION: string = (
  JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }
).version;
