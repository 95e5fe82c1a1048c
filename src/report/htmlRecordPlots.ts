/** Plot sections of the HTML record: waveform and spectrum per captured channel, and trends across runs. */
import type { ChannelReport, StoredRun, UnitRecord } from '../types/index.js';
import { esc } from './htmlPage.js';
import { renderSpectrumSvg } from './svgSpectrum.js';
import { renderTrendSvg } from './svgTrend.js';
import { renderWaveformSvg } from './svgWaveform.js';
import { formatDate, measurementLabel } from './reportNumbers.js';

function channelFigures(rec: UnitRecord, condition: string, file: string, ch: ChannelReport, output: string): string {
  const name = `${rec.unit} · ${condition} · ${ch.name}${output ? ` (${output})` : ''}`;
  const figs: string[] = [];
  const wave = ch.plot?.waveform;
  if (wave) {
    const svg = renderWaveformSvg(wave, `Waveform: ${name}`, ch.unit);
    if (svg) figs.push(`<figure>${svg}<figcaption>Waveform, ${esc(name)}, from <code>${esc(file)}</code>: state levels dashed, mid-reference crossings circled, slope fits drawn thick.</figcaption></figure>`);
  }
  if (ch.plot?.spectrum || ch.harmonics.length) {
    const svg = renderSpectrumSvg(ch.plot?.spectrum, ch.harmonics, `Spectrum: ${name}`, ch.shape);
    if (svg) figs.push(`<figure>${svg}<figcaption>Spectrum, ${esc(name)}: measured harmonics numbered${ch.harmonics.some((h) => h.idealDbc !== undefined) ? `, ideal ${esc(ch.shape)} series as squares beside them` : ''}${ch.plot?.spectrum ? `; ${esc(ch.plot.spectrum.window)} window` : ''}${ch.harmonicsMethod ? `; harmonics by ${esc(ch.harmonicsMethod)}` : ''}.</figcaption></figure>`);
  }
  return figs.join('');
}

export function renderPlotsSection(rec: UnitRecord): string {
  const last = rec.runs[rec.runs.length - 1];
  const blocks = last.verdict.captures.map((c) => {
    const figs = c.report.channels
      .map((ch) => channelFigures(rec, c.condition, c.path, ch, c.outputs.find((o) => o.channel === ch.name)?.output ?? ''))
      .join('');
    return figs ? `<h3>${esc(c.condition)} — <code>${esc(c.path)}</code></h3><div class="plots">${figs}</div>` : '';
  });
  const body = blocks.join('') || '<p class="note">The latest run stored no plot data.</p>';
  return `<section id="plots"><h2>Waveforms and spectra (run #${last.id})</h2>${body}</section>`;
}

/** One trend per quantity checked in the latest run, across every run that checked it. */
export function renderTrendsSection(rec: UnitRecord): string {
  if (rec.runs.length < 2) {
    return '<section id="trends"><h2>Trends across runs</h2><p class="note">One run so far; trends appear after a re-test.</p></section>';
  }
  const last = rec.runs[rec.runs.length - 1];
  const figs = last.verdict.conditions.flatMap((c) =>
    c.checks.map((k) => {
      const points = rec.runs.map((r: StoredRun) => {
        const found = r.verdict.conditions.find((x) => x.condition === k.condition)?.checks.find((x) => x.output === k.output && x.measurement === k.measurement);
        return { label: `#${r.id} ${formatDate(r.startedAt).slice(5)}`, value: found?.value ?? null, expandedUncertainty: found?.expandedUncertainty ?? null };
      });
      const title = `${k.condition} · ${k.output} · ${measurementLabel(k.measurement)}`;
      const svg = renderTrendSvg({ title, unit: k.unit, lower: k.lower, upper: k.upper, nominal: k.nominal, points });
      return svg ? `<figure>${svg}<figcaption>${esc(title)} across runs; band: limits of the latest run's spec.</figcaption></figure>` : '';
    }),
  );
  return `<section id="trends"><h2>Trends across runs</h2><div class="plots">${figs.join('')}</div></section>`;
}
