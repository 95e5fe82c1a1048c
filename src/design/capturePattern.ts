/**
 * File-name patterns such as `{unit}_{condition}.csv` or `{unit}_{condition}_{output}.csv`: which
 * unit, condition and output a capture belongs to. Conditions and outputs match only names the spec
 * knows (case-insensitive), so `FK-0101_mid_tri.csv` splits without guessing; a pattern ending in
 * `.csv` also takes the compressed `.csv.gz`.
 */
import type { SpecIssue, SpecPath } from './specIssues.js';
import { formatPath } from './specIssues.js';

const TOKENS = ['unit', 'condition', 'output'] as const;
export type PatternToken = (typeof TOKENS)[number];

export interface NameMatch {
  readonly unit?: string;
  readonly condition?: string;
  readonly output?: string;
}

export function patternTokens(pattern: string): string[] {
  return [...pattern.matchAll(/\{([^}]*)\}/g)].map((m) => m[1]);
}

export function checkPattern(pattern: string, needsCondition: boolean, path: SpecPath, issues: SpecIssue[]): void {
  const tokens = patternTokens(pattern);
  const at = formatPath(path);
  const push = (problem: string, fix: string): void => {
    issues.push({ code: 'spec.bad-pattern', path, problem: `${at}: ${problem}`, expected: 'a pattern with {unit}, {condition} and optionally {output}, e.g. "{unit}_{condition}.csv"', fix });
  };
  for (const t of tokens) {
    if (!(TOKENS as readonly string[]).includes(t)) push(`unknown token {${t}}`, 'use only {unit}, {condition} and {output}');
  }
  if (tokens.length !== new Set(tokens).size) push('a token appears twice', 'keep each token once');
  if (!tokens.includes('unit')) push('no {unit} token', 'add {unit} where the serial number sits in the file name');
  // Names are matched as base names: a folder part, a parent reference or a control character can
  // never be in one, so such a pattern would match no capture ever.
  const literal = pattern.replace(/\{[^}]*\}/g, '');
  if (/[/\\]/.test(literal)) push('it holds a folder separator (/ or \\), but captures are matched by file name only', 'drop the folder part; give the folder on the command line instead');
  if (literal.includes('..')) push('it holds "..", which no capture file name has', 'write the pattern as a plain file name, e.g. "{unit}_{condition}.csv"');
  // eslint-disable-next-line no-control-regex -- finding control characters is the point
  if (/[\u0000-\u001f\u007f]/.test(pattern)) push('it holds a control character', 'retype the pattern with letters, digits, - and _ only');
  if (needsCondition && !tokens.includes('condition')) push('no {condition} token, but the spec has several conditions', 'add {condition} where the condition name sits in the file name');
}

const escape = (s: string): string => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
const alternatives = (names: readonly string[]): string => [...names].sort((a, b) => b.length - a.length).map(escape).join('|');

/** Match a file's base name against the pattern; null when it does not fit. */
export function matchCaptureName(pattern: string, baseName: string, conditions: readonly string[], outputTags: readonly string[]): NameMatch | null {
  let source = '';
  for (const part of pattern.split(/(\{[^}]*\})/)) {
    if (part === '{unit}') source += '(?<unit>[^/\\\\]+?)';
    else if (part === '{condition}') source += `(?<condition>${alternatives(conditions) || '[^/\\\\]+?'})`;
    else if (part === '{output}') source += `(?<output>${alternatives(outputTags) || '[^/\\\\]+?'})`;
    else source += escape(part);
  }
  if (/\.csv$/i.test(pattern)) source += '(?:\\.gz)?';
  const m = new RegExp(`^${source}$`, 'i').exec(baseName);
  if (!m?.groups) return m ? {} : null;
  // A serial that is blank or holds control characters (" _mid.csv") names no unit: the name does not fit.
  // eslint-disable-next-line no-control-regex -- finding control characters is the point
  if (m.groups.unit !== undefined && (m.groups.unit.trim() === '' || /[\u0000-\u001f\u007f]/.test(m.groups.unit))) return null;
  const canonical = (found: string | undefined, names: readonly string[]): string | undefined =>
    found === undefined ? undefined : (names.find((n) => n.toLowerCase() === found.toLowerCase()) ?? found);
  return {
    ...(m.groups.unit !== undefined ? { unit: m.groups.unit } : {}),
    ...(m.groups.condition !== undefined ? { condition: canonical(m.groups.condition, conditions) } : {}),
    ...(m.groups.output !== undefined ? { output: canonical(m.groups.output, outputTags) } : {}),
  };
}
