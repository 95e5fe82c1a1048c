/**
 * Spec problems as data: a dotted path into the file, what is wrong, what would be valid and one fix.
 * Zod's structural issues are reworded here; the line of each path is found in the YAML document.
 */
import type { z } from 'zod';
import { isMap, isPair, isScalar } from 'yaml';
import type { Document, LineCounter } from 'yaml';
import { BenchError } from '../types/index.js';
import type { BenchErrorFields, ErrorCode } from '../types/index.js';
import { FIELD_EXPECTS } from './specSchema.js';
import { DESIGN_KEYS } from './specTypes.js';
import { nearestName as nearest } from '../types/index.js';

export type SpecPath = readonly PropertyKey[];

export interface SpecIssue {
  readonly code: ErrorCode;
  readonly path: SpecPath;
  readonly problem: string;
  readonly expected: string;
  readonly fix: string;
  /** Point at the key itself (an unknown field) rather than its value. */
  readonly atKey?: boolean;
}

/** `outputs.triangle.checks[2].tolerance`; keys that are not plain names are quoted: `outputs["tri out"]`. */
export function formatPath(path: SpecPath): string {
  let s = '';
  for (const k of path) {
    if (typeof k === 'number') s += `[${k}]`;
    else if (/^[A-Za-z_][\w-]*$/.test(String(k))) s += s === '' ? String(k) : `.${String(k)}`;
    else s += `[${JSON.stringify(String(k))}]`;
  }
  return s === '' ? '(top level)' : s;
}

const VOCABULARY = [...Object.keys(FIELD_EXPECTS), ...Object.keys(DESIGN_KEYS), 'calibration', 'pattern'];

function expectsFor(path: SpecPath): string {
  const last = [...path].reverse().find((k) => typeof k === 'string');
  return FIELD_EXPECTS[String(last)] ?? 'a value as described in the spec reference';
}

function valueAt(raw: unknown, path: SpecPath): unknown {
  let cur: unknown = raw;
  for (const k of path) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<PropertyKey, unknown>)[k];
  }
  return cur;
}

/** Reword zod's structural issues into spec issues, one per problem (one per unknown key). */
export function fromZodIssues(issues: readonly z.core.$ZodIssue[], raw: unknown): SpecIssue[] {
  const out: SpecIssue[] = [];
  for (const i of issues) {
    const path = i.path as PropertyKey[];
    const p = formatPath(path);
    if (i.code === 'unrecognized_keys') {
      for (const key of i.keys) {
        const near = nearest(key, VOCABULARY);
        out.push({
          code: 'spec.unknown-field',
          path: [...path, key],
          atKey: true,
          problem: `${formatPath([...path, key])}: unknown field "${key}"`,
          expected: `one of the fields a spec defines at ${p}`,
          fix: near ? `did you mean "${near}"? rename the field` : `remove "${key}" or move it where it belongs`,
        });
      }
      continue;
    }
    const found = valueAt(raw, path);
    if (found === undefined) {
      out.push({ code: 'spec.missing-field', path, problem: `${p}: missing`, expected: expectsFor(path), fix: `add \`${String(path[path.length - 1])}:\` at ${p}` });
      continue;
    }
    const choices = i.code === 'invalid_value' ? (i.values as unknown[]).map(String) : null;
    const near = choices && typeof found === 'string' ? nearest(found, choices) : null;
    const expected = choices ? `one of ${choices.join(', ')}` : expectsFor(path);
    out.push({
      code: 'spec.bad-value',
      path,
      problem: `${p}: ${JSON.stringify(found) ?? String(found)} is not valid here`,
      expected,
      fix: near ? `did you mean "${near}"?` : `write ${p} as ${expected}`,
    });
  }
  return out;
}

/** 1-based line of the node at `path`, or of the nearest enclosing node that exists. */
export function lineOf(doc: Document, counter: LineCounter, path: SpecPath, atKey = false): number | undefined {
  for (let n = path.length; n >= 0; n--) {
    const sub = path.slice(0, n);
    if (atKey && n === path.length && n > 0) {
      const parent = doc.getIn(sub.slice(0, -1), true);
      if (isMap(parent)) {
        const pair = parent.items.find((it) => isPair(it) && isScalar(it.key) && String(it.key.value) === String(sub[n - 1]));
        const range = pair && isScalar(pair.key) ? pair.key.range : undefined;
        if (range) return counter.linePos(range[0]).line;
      }
      continue;
    }
    const node = n === 0 ? doc.contents : doc.getIn(sub, true);
    const range = (node as { range?: [number, number, number] } | null | undefined)?.range;
    if (range) return counter.linePos(range[0]).line;
  }
  return undefined;
}

/** One BenchError listing every problem, each with its path and line, in file order. */
export function specError(file: string, found: readonly (BenchErrorFields & { line?: number })[]): BenchError {
  const sorted = [...found].sort((a, b) => (a.line ?? 0) - (b.line ?? 0));
  const n = sorted.length;
  return new BenchError({
    code: 'spec.invalid',
    file,
    problem: `${n} problem${n === 1 ? '' : 's'} in the spec`,
    expected: 'a spec whose every field is valid (listed below with their lines)',
    fix: `correct ${n === 1 ? 'it' : 'each one'}, then run \`benchproof spec validate ${file}\``,
    issues: sorted,
  });
}
