/**
 * Spec text (YAML, or JSON, which YAML 1.2 reads as well) → Spec. Every problem is collected in one
 * pass (syntax, structure, units, limits, references) and thrown as one BenchError whose issues each
 * carry the dotted path and the line in the file.
 */
import { createHash } from 'node:crypto';
import { LineCounter, isMap, isScalar, parseDocument, visit } from 'yaml';
import type { BenchErrorFields } from '../types/index.js';
import { specFileSchema } from './specSchema.js';
import { formatPath, fromZodIssues, lineOf, specError } from './specIssues.js';
import type { SpecIssue } from './specIssues.js';
import { resolveSpec } from './resolveSpec.js';
import { yamlSyntaxIssues } from './yamlErrors.js';
import type { Spec } from './specTypes.js';

/**
 * The largest spec read, in bytes of UTF-8. A module spec is a few KiB; the limit keeps parsing and
 * validation of a wrong or hostile file short (common practice, no source).
 */
export const SPEC_MAX_BYTES = 1 << 20;

export function parseSpec(text: string, file: string): Spec {
  // Characters are at most as many as UTF-8 bytes, so only a long text needs counting.
  if (text.length > SPEC_MAX_BYTES / 4 && Buffer.byteLength(text) > SPEC_MAX_BYTES) {
    throw specError(file, [{
      code: 'spec.too-large',
      file,
      problem: `the spec is larger than ${SPEC_MAX_BYTES / 1024 / 1024} MiB, the largest spec benchproof reads`,
      expected: `a spec of at most ${SPEC_MAX_BYTES} bytes (a full module spec is a few KiB)`,
      fix: 'check that this is the spec and not a capture or another file; split a huge spec per module',
    }]);
  }
  const counter = new LineCounter();
  // logLevel 'error': yaml's own warnings (e.g. a map used as a key) would go to stderr unasked.
  // uniqueKeys off: yaml compares each key with every earlier one (quadratic in a map's size, minutes
  // for a large hostile spec); duplicateKeys() finds the same mistakes with one set per map.
  const doc = parseDocument(text, { lineCounter: counter, uniqueKeys: false, logLevel: 'error' });
  const duplicates = doc.errors.length > 0 ? [] : duplicateKeys(doc, counter, file);
  if (duplicates.length > 0) throw specError(file, duplicates);
  // In plain words with line and column, one problem per mistake (yamlErrors.ts).
  if (doc.errors.length > 0) throw specError(file, yamlSyntaxIssues(text, doc.errors, file));
  const raw = specValue(doc, file);
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) {
    throw specError(file, [{ code: 'spec.not-a-map', file, line: 1, problem: 'the spec is not a map of fields', expected: 'a YAML map with name, revision, outputs …', fix: 'start from `benchproof spec init` or samples/fh210-spec.yaml' }]);
  }
  const issues: SpecIssue[] = [];
  const parsed = specFileSchema.safeParse(raw);
  if (!parsed.success) issues.push(...fromZodIssues(parsed.error.issues, raw));
  const sha256 = createHash('sha256').update(text).digest('hex');
  const spec = resolveSpec(raw, file, sha256, issues);
  if (issues.length === 0) return spec;
  const seen = new Set<string>();
  const fields: BenchErrorFields[] = [];
  for (const i of issues) {
    const key = `${formatPath(i.path)}\u0000${i.problem}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const line = lineOf(doc, counter, i.path, i.atKey);
    fields.push({ code: i.code, file, ...(line !== undefined ? { line } : {}), problem: i.problem, expected: i.expected, fix: i.fix });
  }
  throw specError(file, fields);
}

/**
 * The document as plain data. yaml throws here, not in `errors`, for an alias to an anchor that is
 * not set and for aliases that expand too far (a few lines that would become millions of nodes).
 */
function specValue(doc: ReturnType<typeof parseDocument>, file: string): unknown {
  try {
    return doc.toJS({ maxAliasCount: 100 });
  } catch (err) {
    const bomb = /alias count/i.test((err as Error).message);
    throw specError(file, [{
      code: 'spec.syntax',
      file,
      problem: bomb ? 'YAML aliases (*name) expand to too many copies' : `not valid YAML: ${(err as Error).message.split('\n')[0]}`,
      expected: 'a spec that writes each value out, or uses an alias (*name) only after its anchor (&name)',
      fix: bomb ? 'write the repeated parts out instead of nesting aliases' : 'set the anchor (&name) before the alias that uses it, or write the value out',
    }]);
  }
}

/** Keys given twice in one map, each with its line: linear, one set of key texts per map. */
function duplicateKeys(doc: ReturnType<typeof parseDocument>, counter: LineCounter, file: string): BenchErrorFields[] {
  const found: BenchErrorFields[] = [];
  visit(doc, {
    Map(_key, map) {
      if (!isMap(map)) return;
      const seen = new Set<string>();
      for (const pair of map.items) {
        const key = isScalar(pair.key) ? String(pair.key.value) : String(pair.key);
        if (!seen.has(key)) {
          seen.add(key);
          continue;
        }
        const offset = isScalar(pair.key) ? pair.key.range?.[0] : undefined;
        found.push({
          code: 'spec.syntax',
          file,
          ...(offset !== undefined ? { line: counter.linePos(offset).line } : {}),
          problem: `the key "${key}" is given twice in the same map`,
          expected: 'each key once per map',
          fix: 'remove or rename one of the two',
        });
      }
    },
  });
  return found;
}
