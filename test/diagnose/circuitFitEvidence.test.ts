/**
 * The part attribution must explain every observation a part predicts. Closed form of the core
 * (1/f = C·Vpp·(1/I_charge + 1/I_discharge), the textbook relaxation-oscillator result, from memory):
 * a threshold divider that shrinks the swing by a share θ raises the frequency by the same share, so a
 * move of one turn alone, with the frequency on design, is not the divider.
 */
import { describe, expect, it } from 'vitest';
import type { Observation } from '../../src/diagnose/circuitFit.js';
import { attributeParts } from '../../src/diagnose/circuitFit.js';

const at = (kind: Observation['kind'], y: number): Observation => ({ kind, condition: 'mid', y, u: 0.002, g: 1, wc: 0.5 });

describe('attributeParts with the frequency as evidence', () => {
  it('attributeParts does not blame the threshold divider for one turn moved with the frequency on design', () => {
    const steps = attributeParts([at('rise', 0), at('fall', 0), at('top', -0.1), at('bottom', 0), at('frequency', 0)]);
    expect(steps[0].group[0].part).not.toBe('threshold-divider');
    expect(steps[0].group.map((p) => p.part)).not.toContain('threshold-divider');
  });

  it('attributeParts blames the threshold divider when both turns and the frequency move as it predicts', () => {
    // Swing 5 % small: turns move in by 2.5 % of the swing each, the frequency up by 5 % (d ln f = −d ln Vpp).
    const steps = attributeParts([at('rise', 0), at('fall', 0), at('top', -0.025), at('bottom', 0.025), at('frequency', 0.05)]);
    expect(steps[0].group[0].part).toBe('threshold-divider');
    expect(steps[0].share).toBeGreaterThan(0.99);
  });
});
