// The runs bench/store.js fills its stores with, and the new runs of a check's store step. A kept
// store (bench/data/stores) is keyed by the SHA-256 of this file's text with the schema version and
// the size, so a change here fills new stores and a change elsewhere in the bench does not.
//
// The runs are shaped like real check runs (the demo's): three conditions with 24 checks, three
// captures whose measurement reports carry their plot data (a waveform of 710 points and a spectrum
// of 809 bins per channel, harmonics, fits), so a verdict is about 135 kB and a diagnosis about 10 kB;
// the store step stores three new captures of 237 kB, as a check of three conditions does. The
// plot arrays come from 16 templates (made once, with a seeded generator) and each run's scalars
// vary, so filling 50 000 runs does not spend its time making random numbers.
import { Buffer } from 'node:buffer';
import process from 'node:process';
import { createHash } from 'node:crypto';

const SPEC_TEXT = 'name: bench store\nrevision: A\n';
const SPEC = { name: 'bench store', revision: 'A', sha256: createHash('sha256').update(SPEC_TEXT).digest('hex'), text: SPEC_TEXT };
const CONDITIONS = ['low', 'mid', 'high'];
const OUTPUTS = ['triangle', 'pulse'];
const MEASURED = ['frequency', 'peakToPeak', 'offset', 'symmetry'];

/** A small seeded generator (mulberry32), so every run of the bench writes the same data. */
function seeded(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** 16 plot templates: per channel a waveform, a spectrum, crossings and ramp fits, as measure reports carry them. */
const TEMPLATES = Array.from({ length: 16 }, (_, k) => {
  const rnd = seeded(1000 + k);
  const channel = () => ({
    waveform: {
      t0: 0,
      dt: 2.5065753500973592e-6,
      values: Array.from({ length: 710 }, (_, i) => Math.round((3.2 * Math.sin(i / 40) + 0.01 * rnd()) * 1e6) / 1e6),
      highLevel: 3.203125,
      lowLevel: -3.203125,
      midReference: 0.03 + 0.01 * rnd(),
      crossings: Array.from({ length: 7 }, (_, i) => (i + rnd()) * 2.5e-4),
      slopeFits: Array.from({ length: 6 }, () => ({ t1: rnd() * 1e-3, v1: 1.9 + rnd(), t2: rnd() * 1e-3, v2: -1.9 - rnd(), slope: 2.6e4 * (1 + 0.01 * rnd()) })),
    },
    spectrum: { binWidth: 48.700037082571086, dbc: Array.from({ length: 809 }, () => Math.round(-120 * rnd() * 100) / 100), window: '4-term Blackman-Harris (Harris 1978)', reference: 'fundamental' },
  });
  return { triangle: channel(), pulse: channel() };
});

const METHOD = 'least-squares fit of 30 rising and 29 falling mid-reference crossings against cycle number';

function channelReport(name, plot, rnd, f) {
  const measurements = {};
  for (const id of ['frequency', 'period', 'peakToPeak', 'offset', 'symmetry', 'riseTime', 'fallTime', 'highLevel', 'lowLevel', 'dutyCycle', 'thd', 'sinad', 'enob', 'slewRise', 'slewFall', 'overshoot', 'undershoot', 'rms', 'mean', 'crest', 'hum', 'noise', 'jitter', 'drift']) {
    measurements[id] = { value: f * (1 + 0.001 * rnd()), unit: 'Hz', uncertainty: 0.04 * (1 + rnd()), method: METHOD };
  }
  const harmonics = Array.from({ length: 20 }, (_, i) => ({ n: i + 1, frequency: f * (i + 1), amplitude: 2.5 / (i + 1) ** 2, dbc: -20 * Math.log10((i + 1) ** 2) - rnd(), ...(i % 2 === 0 ? { idealDbc: -20 * Math.log10((i + 1) ** 2) } : {}) }));
  return { name, unit: 'V', shape: name === 'pulse' ? 'pulse' : 'triangle', measurements, harmonics, harmonicsMethod: 'amplitudes of the first 20 harmonics from a Blackman-Harris-windowed spectrum, parabolic peak interpolation', warnings: [], plot };
}

/** One complete check run of a unit: three conditions, 24 checks, three captures' reports; ~135 kB of verdict. */
export function benchRun(unit, attempt, when, captures = []) {
  const rnd = seeded(unit * 31 + attempt);
  const serial = `BS-${String(unit).padStart(5, '0')}`;
  const spec = { name: SPEC.name, revision: SPEC.revision, sha256: SPEC.sha256 };
  const check = (condition, output, measurement, nominal, tol) => {
    const value = nominal + tol * 0.6 * (2 * rnd() - 1);
    const U = tol / 20;
    const margin = Math.min(value - (nominal - tol), nominal + tol - value);
    return { output, condition, measurement, unit: 'Hz', lower: nominal - tol, upper: nominal + tol, nominal, value, expandedUncertainty: U, guard: U, margin, statement: margin > U ? 'pass' : margin >= 0 ? 'conditional-pass' : 'fail' };
  };
  const conditions = CONDITIONS.map((condition, ci) => {
    const checks = OUTPUTS.flatMap((output) => MEASURED.map((m, mi) => check(condition, output, m, 65.41 * 4 ** ci * (mi + 1), 1 + mi)));
    const statement = checks.some((c) => c.statement === 'fail') ? 'fail' : checks.some((c) => c.statement === 'conditional-pass') ? 'conditional-pass' : 'pass';
    return { condition, statement, checks };
  });
  const statement = conditions.some((c) => c.statement === 'fail') ? 'fail' : conditions.some((c) => c.statement === 'conditional-pass') ? 'conditional-pass' : 'pass';
  const template = TEMPLATES[(unit + attempt) % TEMPLATES.length];
  const reports = CONDITIONS.map((condition, ci) => {
    const sha256 = createHash('sha256').update(`${serial}/${attempt}/${condition}`).digest('hex');
    const f = 65.41 * 4 ** ci;
    return {
      path: `${serial}_${condition}.csv`, sha256, size: 236939, layout: 'time,triangle,pulse', unit: serial, condition,
      outputs: OUTPUTS.map((output) => ({ output, channel: output })),
      report: { schemaVersion: 1, file: `${serial}_${condition}.csv`, sha256, sampleInterval: 2.5e-6, samples: 8000, duration: 0.02, warnings: [], channels: OUTPUTS.map((o) => channelReport(o, template[o], rnd, f)) },
    };
  });
  const causes = ['switching-delay', 'current-mismatch', 'timing-capacitor'].map((id, i) => ({
    id, title: `${id.replace('-', ' ')} (bench cause ${i + 1})`, score: 1 / (i + 1),
    evidence: Array.from({ length: 8 }, (_, k) => `ramps run ${(186 + k + rnd()).toFixed(0)} mV past each threshold at the fastest condition ≈ ${(7.4 + rnd()).toFixed(1)} µs of delay per flip; seen against the design (mean over 3 condition(s)): ramp slopes against I/C −0.1 % rising, +0.0 % falling; turns +1.2 % / −0.8 % of the swing off the thresholds`),
    confirm: 'measure the comparator delay directly with a fast edge at its input',
  }));
  return {
    unit: serial, startedAt: new Date(when).toISOString(), operator: 'bench', station: 'bench-store', spec: SPEC, toolVersion: '0.1.0',
    verdict: { schemaVersion: 1, unit: serial, spec, decisionRule: 'guarded', statement, conditions, captures: reports, state: 'complete', waitingFor: [], soFar: statement },
    diagnosis: { causes },
    captures,
  };
}

/**
 * Three new capture files' bytes for a check's store step (237 kB each, like the demo's). `nonce` makes
 * them new to a store kept from an earlier bench run, so every timed step archives new bytes.
 */
export function newCaptures(i, nonce = '') {
  return CONDITIONS.map((condition) => {
    const rows = [`time,triangle,pulse,# bench store step ${nonce}${i} ${condition}`];
    for (let k = 0, size = rows[0].length; size < 236_000 && k < 8000; k++) {
      rows.push(`${(k * 2.5e-6).toExponential(6)},${(3.2 * Math.sin(k / 40 + i)).toFixed(6)},${k % 400 < 200 ? '10.000000' : '0.000000'}`);
      size += rows[rows.length - 1].length + 1;
    }
    const bytes = Buffer.from(rows.join('\n'));
    return { path: `step${i}_${condition}.csv`, sha256: createHash('sha256').update(bytes).digest('hex'), size: bytes.length, layout: 'time,triangle,pulse', condition, bytes };
  });
}

/**
 * Write `units` × `attempts` runs through the store API (saveRuns, one transaction per 500 runs:
 * each run placed, fingerprinted, summarised and chained as a check stores it). Returns seconds.
 */
export function fillStore(store, units, attempts, log = () => {}) {
  const t0 = process.hrtime.bigint();
  let batch = [];
  const start = Date.parse('2026-01-05T08:00:00Z');
  for (let a = 0; a < attempts; a++) {
    for (let u = 0; u < units; u++) {
      batch.push(benchRun(u, a, start + (a * units + u) * 1000));
      if (batch.length === 500) {
        store.saveRuns(batch);
        batch = [];
      }
    }
    log(`  ${(a + 1) * units} runs written`);
  }
  if (batch.length) store.saveRuns(batch);
  return Number(process.hrtime.bigint() - t0) / 1e9;
}
