import { it } from 'vitest';
import { readCapture } from '../../src/capture/index.js';
it('smoke', async () => {
  const c = await readCapture(process.env.CAP_FILE!, {});
  console.log(JSON.stringify({ ...c, channels: c.channels.map((ch) => ({ ...ch, samples: [ch.samples.length, ch.samples[0], ch.samples[1], ch.samples[ch.samples.length-1]] })) }, null, 1));
});
