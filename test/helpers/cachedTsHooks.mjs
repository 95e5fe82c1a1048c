// Module hooks that let a plain `node` child run this repository's TypeScript sources (`./x.js` resolves to `./x.ts`; .ts files
// transpiled with TypeScript's transpileModule, types erased), with the transpiled text kept in a
// folder under the system's temporary folder, keyed by the SHA-256 of the file name and source. A
// spawned child (a `watch`, a store writer) then loads the TypeScript compiler only for sources changed since the last
// child, instead of transpiling the whole tree in every process (most of a child's start-up).
import { createHash } from 'node:crypto';
import process from 'node:process';
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { URL, fileURLToPath, pathToFileURL } from 'node:url';

const CACHE = join(tmpdir(), 'benchproof-test-ts-cache-v1');
let ts;

export async function resolve(specifier, context, next) {
  if (context.parentURL?.startsWith('file:') && /^(\.{1,2})?\//.test(specifier) && specifier.endsWith('.js')) {
    const tsPath = fileURLToPath(new URL(specifier, context.parentURL)).replace(/\.js$/, '.ts');
    if (existsSync(tsPath)) return { url: pathToFileURL(tsPath).href, shortCircuit: true };
  }
  return next(specifier, context);
}

export async function load(url, context, next) {
  if (!url.startsWith('file:') || !url.endsWith('.ts')) return next(url, context);
  const fileName = fileURLToPath(url);
  const source = await readFile(fileName, 'utf8');
  const cached = join(CACHE, `${createHash('sha256').update(fileName).update('\0').update(source).digest('hex')}.js`);
  try {
    return { format: 'module', source: readFileSync(cached, 'utf8'), shortCircuit: true };
  } catch {
    // not transpiled yet
  }
  ts ??= (await import('typescript')).default;
  const out = ts.transpileModule(source, { fileName, compilerOptions: { module: ts.ModuleKind.ESNext, target: ts.ScriptTarget.ES2022, sourceMap: false } });
  try {
    mkdirSync(CACHE, { recursive: true });
    const temp = `${cached}.${process.pid}.part`;
    writeFileSync(temp, out.outputText);
    renameSync(temp, cached);
  } catch {
    // a cache that cannot be written only costs time
  }
  return { format: 'module', source: out.outputText, shortCircuit: true };
}
