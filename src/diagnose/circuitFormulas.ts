/**
 * Closed forms of an integrator-and-comparator (triangle) core, with their standard uncertainties.
 *
 * - Capacitor law i = C·dV/dt (elementary circuit theory): a constant current I into the timing
 *   capacitor C ramps it at dV/dt = I/C, so I = C·|dV/dt| and C = I/|dV/dt|.
 * - Each ramp covers the swing Vpp, so the period is T = C·Vpp/I_charge + C·Vpp/I_discharge, i.e.
 *   1/f = C·Vpp·(1/I_charge + 1/I_discharge), and f = I/(2·C·Vpp) for matched currents (textbook
 *   relaxation-oscillator result, e.g. Sedra & Smith, "Microelectronic Circuits" — from memory).
 * - Uncertainty: law of propagation of uncertainty for uncorrelated inputs, JCGM 100:2008 (GUM)
 *   §5.1.2 eq. (10); for products and quotients of powers the relative uncertainties add in
 *   quadrature weighted by the exponents (§5.1.6 eq. (12)). A design tolerance ±a is read as a
 *   rectangular distribution, u = a/√3 (GUM §4.3.7).
 * - 1 V/octave: the charge current sets the frequency (f ∝ I), so a current given at one condition
 *   scales to another by the ratio of their nominal frequencies (common practice, no source).
 */
import type { DesignValue } from '../design/index.js';

/** A value with its standard uncertainty (k = 1). */
export interface Estimate {
  readonly value: number;
  readonly u: number;
}

/** Standard uncertainty of a design value from its tolerance band, rectangular (GUM §4.3.7). */
export function toleranceU(design: DesignValue): number {
  return (design.upper - design.lower) / 2 / Math.sqrt(3);
}

/** The design value as an estimate: nominal ± tolerance read as rectangular. */
export function designEstimate(design: DesignValue): Estimate {
  return { value: design.nominal, u: toleranceU(design) };
}

const rel = (e: Estimate): number => (e.value === 0 ? 0 : e.u / Math.abs(e.value));

function check(name: string, ...xs: Estimate[]): void {
  for (const x of xs) {
    if (!Number.isFinite(x.value) || !Number.isFinite(x.u) || x.u < 0) throw new RangeError(`${name}: bad estimate ${JSON.stringify(x)}`);
  }
}

/** Current from a ramp slope and a capacitance: I = C·|dV/dt| (GUM §5.1.6 for the product). */
export function currentFromSlope(slope: Estimate, capacitance: Estimate): Estimate {
  check('currentFromSlope', slope, capacitance);
  const value = capacitance.value * Math.abs(slope.value);
  return { value, u: Math.abs(value) * Math.hypot(rel(slope), rel(capacitance)) };
}

/** Capacitance from a ramp slope and a current: C = I/|dV/dt| (GUM §5.1.6 for the quotient). */
export function capacitanceFromSlope(current: Estimate, slope: Estimate): Estimate {
  check('capacitanceFromSlope', current, slope);
  if (slope.value === 0) throw new RangeError('capacitanceFromSlope: zero slope');
  const value = current.value / Math.abs(slope.value);
  return { value, u: Math.abs(value) * Math.hypot(rel(current), rel(slope)) };
}

/**
 * Capacitance from both ramps at once, C = (I_charge + I_discharge)/(|s_rise| + |s_fall|): a current
 * mismatch that leaves the mean current alone leaves it alone too. GUM §5.1.2 with the sensitivities
 * ∂C/∂I = 1/S and ∂C/∂s = −C/S (S = |s_rise| + |s_fall|).
 */
export function capacitanceFromRamps(charge: Estimate, discharge: Estimate, rise: Estimate, fall: Estimate): Estimate {
  check('capacitanceFromRamps', charge, discharge, rise, fall);
  const S = Math.abs(rise.value) + Math.abs(fall.value);
  if (S === 0) throw new RangeError('capacitanceFromRamps: zero slopes');
  const value = (charge.value + discharge.value) / S;
  return { value, u: Math.hypot(charge.u / S, discharge.u / S, (value * rise.u) / S, (value * fall.u) / S) };
}

/**
 * Frequency of the core: 1/f = C·Vpp·(1/I_charge + 1/I_discharge). Sensitivities (GUM §5.1.2) in
 * relative terms: −1 for C and Vpp, −I_d/(I_c + I_d) for I_c and −I_c/(I_c + I_d) for I_d.
 */
export function coreFrequency(capacitance: Estimate, swing: Estimate, charge: Estimate, discharge: Estimate): Estimate {
  check('coreFrequency', capacitance, swing, charge, discharge);
  const [ic, id] = [charge.value, discharge.value];
  if (!(capacitance.value > 0 && swing.value > 0 && ic > 0 && id > 0)) {
    throw new RangeError(`coreFrequency: C ${capacitance.value}, Vpp ${swing.value}, I ${ic}/${id} must all be positive`);
  }
  const value = 1 / (capacitance.value * swing.value * (1 / ic + 1 / id));
  const r = Math.hypot(rel(capacitance), rel(swing), (id / (ic + id)) * rel(charge), (ic / (ic + id)) * rel(discharge));
  return { value, u: value * r };
}

/** Octaves spanned by a ratio (1 V/octave: one volt of control per octave). */
export function octaves(ratio: number): number {
  if (!(ratio > 0)) throw new RangeError(`octaves: ratio ${ratio} must be positive`);
  return Math.log2(ratio);
}

/**
 * A design value given at condition `at` (nominal frequency fAt), carried to a condition of nominal
 * frequency f: under 1 V/octave the current is proportional to the frequency, so value and tolerance
 * scale by f/fAt (common practice, no source).
 */
export function scaleToCondition(design: Estimate, fAt: number, f: number): Estimate {
  if (!(fAt > 0 && f > 0)) throw new RangeError(`scaleToCondition: frequencies ${fAt} and ${f} must be positive`);
  const k = f / fAt;
  return { value: design.value * k, u: design.u * k };
}
