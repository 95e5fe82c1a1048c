/**
 * The optional `design:` section: circuit values with their tolerances (timing capacitance,
 * charge/discharge currents, swing and thresholds, rails, logic levels), read with the same limit
 * rules as checks. The diagnosis uses them to say whether a back-computed figure is plausible.
 */
import { fieldsAt, resolveLimit } from './limits.js';
import { formatPath } from './specIssues.js';
import type { SpecIssue } from './specIssues.js';
import { DESIGN_KEYS } from './specTypes.js';
import type { DesignKey, DesignSection, DesignValue } from './specTypes.js';

export function resolveDesign(raw: Record<string, unknown>, conditions: readonly string[], issues: SpecIssue[]): DesignSection {
  const out: Partial<Record<DesignKey, DesignValue>> = {};
  for (const key of Object.keys(DESIGN_KEYS) as DesignKey[]) {
    const entry = raw[key];
    if (entry === null || typeof entry !== 'object') continue;
    const path = ['design', key];
    const unit = DESIGN_KEYS[key];
    const limit = resolveLimit(fieldsAt(entry, path), unit, key, path, issues);
    const at = (entry as Record<string, unknown>).at;
    if (typeof at === 'string' && !conditions.includes(at)) {
      issues.push({ code: 'spec.unknown-condition', path: [...path, 'at'], problem: `${formatPath([...path, 'at'])}: no condition named "${at}"`, expected: `one of ${conditions.join(', ') || '(no conditions defined)'}`, fix: 'name a condition from `conditions:`' });
    }
    if (!limit || limit.lower === null || limit.upper === null) continue;
    const nominal = limit.nominal ?? (limit.lower + limit.upper) / 2;
    out[key] = { nominal, unit, lower: limit.lower, upper: limit.upper, ...(typeof at === 'string' ? { at } : {}) };
  }
  return out;
}
