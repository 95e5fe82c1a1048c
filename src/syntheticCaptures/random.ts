/**
 * Seeded pseudo-random numbers for synthetic captures: mulberry32 (a 32-bit generator in the public
 * domain, by T. Ettinger) and the Box–Muller transform for Gaussian noise (Box & Muller, Ann. Math.
 * Statist. 29(2), 1958). Never Math.random: every synthetic capture must be reproducible.
 */
export interface Random {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal (mean 0, sd 1). */
  gaussian(): number;
}

export function createRandom(seed: number): Random {
  let a = seed >>> 0;
  let spare: number | null = null;
  const uniform = (): number => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const gaussian = (): number => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = 0;
    while (u <= Number.MIN_VALUE) u = uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
  return { uniform, gaussian };
}
