// Child process: time benchproof's stages from inside, with performance.now().
//   node bench/stages.js FILE      read+parse, time-domain analysis and spectrum of every channel
//   node bench/stages.js --fft N   the FFT wrapper on one N-point channel (padded to a power of two)
//   node bench/stages.js --read-one-thread FILE   read+parse only, in one thread (no worker threads)
// Prints one JSON object on stdout. Stages are called in the order and with the options that
// src/analysis/measureCapture.ts uses (kept in step by hand: check it when that file changes).
import process from 'node:process';
import { performance } from 'node:perf_hooks';
import { statSync } from 'node:fs';

const seconds = (t0) => (performance.now() - t0) / 1000;
// CPU time of the whole process (all threads) since `c0`, in seconds: steadier than wall time on a
// shared machine, as time spent waiting for another process's turn on the CPU is not counted.
const cpuSeconds = (c0) => {
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1e6;
};

async function stages(file) {
  const { readCapture } = await import('../dist/capture/index.js');
  const analysis = await import('../dist/analysis/index.js');
  const spectral = await import('../dist/analysis/spectrum/spectralAnalysis.js');
  const { analyzeSpectrum } = spectral;
  // Read as `measure` reads: with its worker threads (started when the command starts, so that they
  // load while the file is opened and sniffed) on captures of 64 MiB and more, when this build has them.
  const measureWorkers = await import('../dist/cli/measureWorkers.js').catch(() => null);
  let t = performance.now();
  let c = process.cpuUsage();
  const bytes = statSync(file).size;
  const workers = measureWorkers?.startMeasureWorkers(bytes) ?? null;
  const capture = await readCapture(file, {}, workers?.pieceOptions(bytes));
  const read = seconds(t);
  const readCpu = cpuSeconds(c);
  await workers?.close();
  const dt = capture.sampleInterval;
  let timeDomain = 0;
  let spectrum = 0;
  let timeDomainCpu = 0;
  let spectrumCpu = 0;
  let analysisTotal;
  let method;
  if (typeof analysis.measureChannel === 'function') {
    method = 'measureChannel + analyzeSpectrum per channel';
    // As measureCapture does: one transform buffer lent to every channel (when this build has it).
    const buffer = spectral.spectralBufferLength ? new Float64Array(spectral.spectralBufferLength(capture.length)) : undefined;
    for (const ch of capture.channels) {
      const clipped = ch.clipped && ch.clipped.high + ch.clipped.low > 0 ? ch.clipped : undefined;
      t = performance.now();
      c = process.cpuUsage();
      const a = analysis.measureChannel(ch.samples, dt, { unit: ch.unit, clipped });
      timeDomain += seconds(t);
      timeDomainCpu += cpuSeconds(c);
      t = performance.now();
      c = process.cpuUsage();
      const duty = a.results?.dutyCycle;
      analyzeSpectrum(ch.samples, dt, a.fundamental, a.shape, {
        clipped: clipped !== undefined,
        ...(buffer ? { buffer } : {}),
        ...(a.shape === 'pulse' && duty?.ok ? { dutyCycle: duty.value } : {}),
      });
      spectrum += seconds(t);
      spectrumCpu += cpuSeconds(c);
    }
    analysisTotal = timeDomain + spectrum;
  } else {
    // Fallback: the whole analysis, with the spectrum timed again afterwards (warm FFT tables).
    method = 'measureCapture (time domain = total − spectrum re-run)';
    t = performance.now();
    const report = analysis.measureCapture(capture);
    analysisTotal = seconds(t);
    for (const [i, ch] of capture.channels.entries()) {
      const f = report.channels[i].measurements.frequency?.value;
      t = performance.now();
      analyzeSpectrum(ch.samples, dt, f ? f * dt : null, report.channels[i].shape, {});
      spectrum += seconds(t);
    }
    timeDomain = Math.max(0, analysisTotal - spectrum);
  }
  return {
    file, bytes, readWith: workers ? 'measure worker threads' : 'readCapture defaults', rows: capture.length, channels: capture.channels.length, method,
    read, timeDomain, spectrum, analysis: analysisTotal,
    cpu: { read: readCpu, timeDomain: timeDomainCpu, spectrum: spectrumCpu },
    maxRss: process.resourceUsage().maxRSS * 1024,
  };
}

async function fftProbe(points) {
  const { realSpectrum, nextPowerOfTwo } = await import('../dist/analysis/spectrum/spectrum.js');
  const size = nextPowerOfTwo(points);
  const x = new Float64Array(size);
  for (let i = 0; i < points; i++) x[i] = Math.sin((2 * Math.PI * 1000.5 * i) / points);
  let t = performance.now();
  let c = process.cpuUsage();
  realSpectrum(x);
  const cold = seconds(t);
  const coldCpu = cpuSeconds(c);
  t = performance.now();
  c = process.cpuUsage();
  realSpectrum(x);
  const warm = seconds(t);
  const warmCpu = cpuSeconds(c);
  return { points, size, cold, warm, cpu: { cold: coldCpu, warm: warmCpu }, wrapper: 'realSpectrum (src/analysis/spectrum/spectrum.ts)' };
}

/** The reader in one thread, for comparison with the default (worker threads on large files). */
async function readOneThread(file) {
  const { readCaptureLines } = await import('../dist/capture/readCapture.js');
  const t = performance.now();
  const c = process.cpuUsage();
  await readCaptureLines(file, {}, { helpers: null, pieceBytes: 0 });
  return { file, bytes: statSync(file).size, readOneThread: seconds(t), cpu: { readOneThread: cpuSeconds(c) } };
}

async function main() {
  const args = process.argv.slice(2);
  const result = args[0] === '--fft' ? await fftProbe(Number(args[1])) : args[0] === '--read-one-thread' ? await readOneThread(args[1]) : await stages(args[0]);
  process.stdout.write(`${JSON.stringify(result)}\n`);
}

main().catch((e) => {
  process.stderr.write(`${e?.message ?? e}\n`);
  process.exit(1);
});
