// The fixed cost of a run (issue 21): `benchproof measure --json` on a 2 000-row capture, timed as
// a whole process, alternating with bare `node -e 0` so that both see the same load; medians.
import process from 'node:process';
import { join } from 'node:path';
import { ensureCapture, warmPageCache } from './data.js';
import { parseJson, runTimed } from './proc.js';
import { median } from './stats.js';

export const FIXED_ROWS = 2000;
const RUNS = 15;

export async function measureFixedCost(ctx, log) {
  const cap = await ensureCapture('gen', FIXED_ROWS, ctx);
  if (!cap.ok) return { ok: false, error: cap.error };
  await warmPageCache(cap.file);
  log(`fixed cost: ${RUNS} runs of measure --json on ${FIXED_ROWS} rows, alternating with node -e 0`);
  const bp = [];
  const bare = [];
  for (let i = 0; i < RUNS; i++) {
    const a = await runTimed(process.execPath, [join(ctx.root, 'bin', 'benchproof.js'), 'measure', cap.file, '--json'], { cwd: ctx.root, useTime: ctx.useTime });
    if (!a.ok || parseJson(a.stdout) === null) return { ok: false, error: a.error ?? 'stdout is not one JSON document' };
    bp.push(a);
    bare.push(await runTimed(process.execPath, ['-e', '0'], { cwd: ctx.root, useTime: ctx.useTime }));
  }
  const cpus = (runs) => runs.map((r) => r.cpu).filter(Number.isFinite);
  return {
    ok: true,
    rows: FIXED_ROWS,
    bytes: cap.bytes,
    runs: RUNS,
    medianWall: median(bp.map((r) => r.wall)),
    medianCpu: cpus(bp).length ? median(cpus(bp)) : null,
    maxRss: Math.max(...bp.map((r) => r.maxRss ?? 0)) || null,
    nodeWall: median(bare.map((r) => r.wall)),
    nodeCpu: cpus(bare).length ? median(cpus(bare)) : null,
  };
}
