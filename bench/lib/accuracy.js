// Accuracy on the gen_capture.py file, whose true values follow from the generator's constants
// (../shared/peer/gen_capture.py: F0 = 1 kHz, AMP = 5 V so 10 Vpp, RISE_FRAC = 0.55, OFFSET = +0.1 V;
// channel 2 a 0/5 V square high while channel 1 rises, with linear 5 µs edges).

const F0 = 1000;
const AMP = 5;
const RISE = 0.55;
const OFFSET = 0.1;
const SQ_HIGH = 5;

/**
 * Peak amplitude of harmonic n of a triangle of peak A rising over a share r of the period:
 * c_n = 2A·|sin(nπr)| / (π²·n²·r·(1 − r)). Closed form, derived by integrating the rectangular-wave
 * series of the slope (Fourier series of a piecewise-linear wave); it reduces to the triangle's
 * 8A/(π²n²) for odd n at r = ½ and to the sawtooth's 2A/(πn) as r → 1, the series in
 * ../shared/REFERENCES.md §4 (Smyth, UCSD "Standard periodic waveforms"); test/bench checks both.
 */
export function triangleHarmonic(n, A, r) {
  return (2 * A * Math.abs(Math.sin(n * Math.PI * r))) / (Math.PI * Math.PI * n * n * r * (1 - r));
}

/** THD_F in percent over harmonics 2…H: √(Σ c_n²) / c_1 (definition as in ../shared/REFERENCES.md §3 "THD"). */
export function triangleThdPercent(H, r) {
  let sum = 0;
  for (let n = 2; n <= H; n++) sum += triangleHarmonic(n, 1, r) ** 2;
  return (100 * Math.sqrt(sum)) / triangleHarmonic(1, 1, r);
}

/** The true values of the gen_capture.py file's two channels. */
export function genCaptureTruth() {
  const period = 1 / F0;
  return {
    ch1: {
      frequency: F0,
      peakToPeak: 2 * AMP,
      dcOffset: OFFSET, // a triangle's mean over whole cycles is its centre, whatever the rise share
      riseSlope: (2 * AMP) / (RISE * period),
      fallSlope: (2 * AMP) / ((1 - RISE) * period), // magnitude
      slopeRatio: (1 - RISE) / RISE,
    },
    // Mean of the square: the 5 µs linear edges add and remove the same half-edge area.
    ch2: { frequency: F0, peakToPeak: SQ_HIGH, dcOffset: SQ_HIGH * RISE },
  };
}

const num = (v) => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** benchproof's `measure --json` → { ch1: {...}, ch2: {...} } with the same keys as the truth. */
export function fromBenchproof(doc) {
  const out = {};
  const chans = doc?.channels ?? [];
  ['ch1', 'ch2'].forEach((key, i) => {
    const m = chans[i]?.measurements ?? {};
    const v = (id) => num(m[id]?.value);
    const fall = v('fallSlope');
    const harmonics = chans[i]?.harmonics ?? [];
    out[key] = {
      frequency: v('frequency'), peakToPeak: v('peakToPeak'), dcOffset: v('dcOffset'),
      riseSlope: v('riseSlope'), fallSlope: fall === null ? null : Math.abs(fall), slopeRatio: v('slopeRatio'),
      thd: v('thd'), harmonicsCounted: harmonics.length ? Math.max(...harmonics.map((h) => h.n)) : null,
    };
  });
  return out;
}

/** The peer's JSON → the same shape (its THD counts harmonics 2…10). */
export function fromPeer(doc) {
  const out = {};
  const chans = Object.values(doc?.channels ?? {});
  ['ch1', 'ch2'].forEach((key, i) => {
    const c = chans[i] ?? {};
    const fall = num(c.fall_slope_v_per_s);
    out[key] = {
      frequency: num(c.frequency_hz), peakToPeak: num(c.vpp), dcOffset: num(c.dc_offset),
      riseSlope: num(c.rise_slope_v_per_s), fallSlope: fall === null ? null : Math.abs(fall), slopeRatio: num(c.rise_fall_ratio),
      thd: num(c.thd_percent), harmonicsCounted: Array.isArray(c.harmonic_amplitudes_v) ? c.harmonic_amplitudes_v.length : null,
    };
  });
  return out;
}

/**
 * Below this relative error two results are a tie: 0.01 % is far finer than a bench scope's
 * vertical accuracy (±1–3 % of full scale, common practice (no source)), and one noisy record
 * cannot rank two estimators that both land closer than that.
 */
export const TIE = 1e-4;

/**
 * Compare both tools' errors against the truth, per quantity: 'better' or 'equal' when benchproof's
 * relative error is no larger than the peer's, 'tie' when both are below TIE, else 'worse'.
 * THD's truth is taken over the harmonics each tool counts.
 */
export function compareAccuracy(bp, peer) {
  const truth = genCaptureTruth();
  const rows = [];
  for (const ch of ['ch1', 'ch2']) {
    const keys = Object.keys(truth[ch]);
    if (ch === 'ch1') keys.push('thd');
    for (const key of keys) {
      const tBp = key === 'thd' ? thdTruth(bp?.[ch]?.harmonicsCounted) : truth[ch][key];
      const tPeer = key === 'thd' ? thdTruth(peer?.[ch]?.harmonicsCounted ?? 10) : truth[ch][key];
      const vBp = bp?.[ch]?.[key] ?? null;
      const vPeer = peer?.[ch]?.[key] ?? null;
      const eBp = relError(vBp, tBp);
      const ePeer = relError(vPeer, tPeer);
      const verdict = rank(eBp, ePeer);
      rows.push({ channel: ch, quantity: key, truthBenchproof: tBp, truthPeer: tPeer, benchproof: vBp, peer: vPeer, errBenchproof: eBp, errPeer: ePeer, verdict, atLeastAsAccurate: verdict !== 'worse' && verdict !== 'missing' });
    }
  }
  return rows;
}

/** How benchproof's relative error compares with the peer's. */
export function rank(eBp, ePeer) {
  if (eBp === null) return ePeer === null ? 'neither' : 'missing';
  if (ePeer === null) return 'better';
  if (eBp < ePeer * (1 - 1e-9)) return 'better';
  if (eBp <= ePeer * (1 + 1e-9)) return 'equal';
  return eBp <= TIE && ePeer <= TIE ? 'tie' : 'worse';
}

function thdTruth(H) {
  return Number.isInteger(H) && H >= 2 ? triangleThdPercent(H, RISE) : null;
}

function relError(v, t) {
  return v === null || t === null ? null : Math.abs(v - t) / Math.abs(t);
}
