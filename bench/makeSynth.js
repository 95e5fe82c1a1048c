// Child process: write a benchmark capture of N rows from our synthesizer, streamed in chunks.
// Usage: node bench/makeSynth.js N OUT.csv
// The signal is the demo scenario's FH-210 at its `mid` setting (261.63 Hz, 6 Vpp triangle on an
// 8-bit scale, 0…10 V pulse with 1.5 µs edges), with a fixed 50 cycles per record whatever N, as a
// scope's fixed timebase samples faster when given more memory.
import process from 'node:process';
import { closeSync, openSync, writeSync } from 'node:fs';
import { synthesize, writeCsvChunks } from '../dist/syntheticCaptures/index.js';

const CYCLES = 50;
const FREQUENCY = 261.63 * 1.0012; // Hz, FK-0101's mid frequency
const common = { frequency: FREQUENCY, phase: 0.137, startTime: -CYCLES / FREQUENCY / 2, bits: 8 };

function synthCaptureChannels(rows) {
  const sampleRate = (rows * FREQUENCY) / CYCLES;
  const triangle = synthesize({
    ...common, shape: 'triangle', amplitude: 3.0, offset: 0.01, riseFraction: 0.5, sampleRate, samples: rows,
    noise: 0.006, fullScale: 20, seed: 9101,
  });
  const pulse = synthesize({
    ...common, shape: 'pulse', amplitude: 5.0, duty: 0.5, sampleRate, samples: rows,
    edge: { tau: 1.5e-6 }, noise: 0.012, fullScale: 40, seed: 9102,
  });
  return [
    { name: 'CH1', unit: 'V', signal: triangle },
    { name: 'CH2', unit: 'V', signal: pulse },
  ];
}

function main() {
  const [rowsText, out] = process.argv.slice(2);
  const rows = Number(rowsText);
  if (!Number.isInteger(rows) || rows < 2 || !out) {
    process.stderr.write('usage: node bench/makeSynth.js N OUT.csv\n');
    process.exit(2);
  }
  const fd = openSync(out, 'w');
  try {
    // Nine significant digits keep a 10 M-row time column strictly increasing.
    for (const chunk of writeCsvChunks(synthCaptureChannels(rows), { format: 'exponential', precision: 9 })) {
      writeSync(fd, chunk);
    }
  } finally {
    closeSync(fd);
  }
}

main();
