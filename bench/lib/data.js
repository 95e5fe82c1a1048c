// Benchmark captures, written once and reused from bench/data/ (git-ignored). A file counts as cached
// only when its side marker matches how it was made, so an interrupted write is never reused.
import process from 'node:process';
import { createReadStream, existsSync, mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { sizeLabel } from './args.js';
import { runTimed } from './proc.js';

/** Bump when a generator's output changes, so cached files are written again. */
const RECIPE = { gen: 'gen_capture.py --seed 12345 v1', synth: 'makeSynth.js FH-210 mid v1' };

export function captureName(kind, rows) {
  return `${kind}-${sizeLabel(rows)}.csv`;
}

/**
 * Make sure the capture exists; returns { ok, file, bytes, made, seconds } or { ok: false, error }.
 * kind 'gen' runs the peer's gen_capture.py, kind 'synth' our synthesizer (bench/makeSynth.js).
 */
export async function ensureCapture(kind, rows, { root, dataDir, peerDir, python, regenerate }) {
  mkdirSync(dataDir, { recursive: true });
  const file = join(dataDir, captureName(kind, rows));
  const marker = `${file}.done`;
  const stamp = JSON.stringify({ recipe: RECIPE[kind], rows });
  if (!regenerate && existsSync(file) && existsSync(marker) && readFileSync(marker, 'utf8') === stamp) {
    return { ok: true, file, bytes: statSync(file).size, made: false, seconds: 0 };
  }
  rmSync(marker, { force: true });
  const part = `${file}.part`;
  const [cmd, args] =
    kind === 'gen'
      ? [python, [join(peerDir, 'gen_capture.py'), String(rows), part]]
      : [process.execPath, [join(root, 'bench', 'makeSynth.js'), String(rows), part]];
  const r = await runTimed(cmd, args, { cwd: root, useTime: false, timeoutMs: 30 * 60_000 });
  if (!r.ok) {
    rmSync(part, { force: true });
    return { ok: false, file, error: `could not write ${captureName(kind, rows)}: ${r.error}` };
  }
  renameSync(part, file);
  writeFileSync(marker, stamp);
  return { ok: true, file, bytes: statSync(file).size, made: true, seconds: r.wall };
}

/** Read the file once so every timed run starts from the page cache, not the disk. */
export async function warmPageCache(file) {
  await new Promise((resolve) => {
    const s = createReadStream(file, { highWaterMark: 1 << 20 });
    s.on('data', () => {});
    s.on('error', resolve);
    s.on('close', resolve);
  });
}
