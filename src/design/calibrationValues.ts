/**
 * Values particular to the calibration section: a law's scale ("1 octave/V", "1 V/octave",
 * "100 Hz/V"), limits in cents ("5 cents", "5 ct" or a bare number), and control values ("2 V", or a
 * bare number in the spec's own control unit). Octaves and cents as units of pitch interval:
 * REFERENCES.md §9; "V/octave" as the trade writes it: common practice (no source).
 */
import { parseQuantity } from './quantity.js';

/** Octaves per control unit from "1 octave/V", "1 oct/V", "1 V/octave" or a bare number; null when not one. */
export function parseOctaveScale(raw: string | number): { value: number; controlUnit: string } | null {
  if (typeof raw === 'number') return raw > 0 ? { value: raw, controlUnit: '' } : null;
  const text = raw.trim();
  const perControl = /^([+-]?\d*\.?\d+(?:[eE][+-]?\d+)?)\s*oct(?:aves?)?\s*\/\s*(m?V)$/.exec(text);
  if (perControl) return positiveScale(Number(perControl[1]) / (perControl[2] === 'mV' ? 1e-3 : 1), 'V');
  const perOctave = /^([+-]?\d*\.?\d+(?:[eE][+-]?\d+)?)\s*(m?V)\s*\/\s*oct(?:aves?)?$/.exec(text);
  if (perOctave) return positiveScale(1 / (Number(perOctave[1]) * (perOctave[2] === 'mV' ? 1e-3 : 1)), 'V');
  const bare = parseQuantity(text);
  return bare && bare.unit === '' ? positiveScale(bare.value, '') : null;
}

/** Hz per control unit from "100 Hz/V", "1 kHz/V" or a bare number; null when not one. */
export function parseLinearScale(raw: string | number): { value: number; controlUnit: string } | null {
  if (typeof raw === 'number') return raw !== 0 && Number.isFinite(raw) ? { value: raw, controlUnit: '' } : null;
  const m = /^(.*Hz)\s*\/\s*V$/.exec(raw.trim());
  const q = parseQuantity(m ? m[1] : raw);
  if (!q || (m ? q.unit !== 'Hz' : q.unit !== '') || q.value === 0) return null;
  return { value: q.value, controlUnit: m ? 'V' : '' };
}

function positiveScale(value: number, controlUnit: string): { value: number; controlUnit: string } | null {
  return value > 0 && Number.isFinite(value) ? { value, controlUnit } : null;
}

/** Cents from "5 cents", "5 ct" or a bare number; null when not a positive number of cents. */
export function parseCents(raw: string | number): number | null {
  const text = typeof raw === 'number' ? String(raw) : raw.trim().replace(/\s*(cents?|ct)$/, '');
  const q = parseQuantity(text);
  return q && q.unit === '' && q.value > 0 ? q.value : null;
}

/** A control value: "2 V", "500 mV" or a bare number; null when it is not one. */
export function parseControl(raw: string | number): { value: number; unit: string } | null {
  const q = parseQuantity(raw);
  if (!q || (q.unit !== '' && q.unit !== 'V')) return null;
  return { value: q.value, unit: q.unit };
}

/** The label of a step given as a control value: the number as written, without its unit ("2 V" → "2"). */
export function controlLabel(raw: string | number): string {
  return typeof raw === 'number' ? String(raw) : raw.trim().replace(/\s*m?V$/, '');
}
