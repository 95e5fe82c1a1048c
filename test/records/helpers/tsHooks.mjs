// Module hooks that let a plain `node` child process run this repository's TypeScript sources:
// `./x.js` imports resolve to `./x.ts` when that exists, and .ts files are transpiled with the
// TypeScript compiler's own transpileModule (types erased, no type check). Used only by tests that
// need real separate processes (concurrent writers, a process killed mid-write).
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { URL, fileURLToPath, pathToFileURL } from 'node:url';
import ts from 'typescript';

export async function resolve(specifier, context, next) {
  if (context.parentURL?.startsWith('file:') && /^(\.{1,2})?\//.test(specifier) && specifier.endsWith('.js')) {
    const tsPath = fileURLToPath(new URL(specifier, context.parentURL)).replace(/\.js$/, '.ts');
    if (existsSync(tsPath)) return { url: pathToFileURL(tsPath).href, shortCircuit: true };
  }
  return next(specifier, context);
}

export async function load(url, context, next) {
  if (!url.startsWith('file:') || !url.endsWith('.ts')) return next(url, context);
  const source = await readFile(fileURLToPath(url), 'utf8');
  const out = ts.transpileModule(source, {
    fileName: fileURLToPath(url),
    compilerOptions: { module: ts.ModuleKind.ESNext, target: ts.ScriptTarget.ES2022, sourceMap: false },
  });
  return { format: 'module', source: out.outputText, shortCircuit: true };
}
