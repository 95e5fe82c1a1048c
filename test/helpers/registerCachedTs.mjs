// `node --import ./test/helpers/registerCachedTs.mjs script.ts`: TypeScript sources with a transpile cache (cachedTsHooks.mjs).
import { register } from 'node:module';

register('./cachedTsHooks.mjs', import.meta.url);
