import { it } from 'vitest';
import { readCapture } from '../../src/capture/index.js';
import { measureCapture } from '../../src/analysis/index.js';
it('scratch', async () => {
  const cap = await readCapture(process.env.F ?? '/tmp/ngs/core.txt');
  console.log(cap.layout, cap.sampleInterval, cap.length, cap.warnings);
  const rep = measureCapture(cap);
  for (const ch of rep.channels) console.log(ch.name, ch.shape, JSON.stringify(Object.fromEntries(Object.entries(ch.measurements).map(([k, m]) => [k, [m?.value, m?.uncertainty, m?.note]]))));
});
