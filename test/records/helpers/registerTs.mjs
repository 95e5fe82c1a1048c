// `node --import ./test/records/helpers/registerTs.mjs script.ts` runs a TypeScript script (see tsHooks.mjs).
import { register } from 'node:module';

register('./tsHooks.mjs', import.meta.url);
