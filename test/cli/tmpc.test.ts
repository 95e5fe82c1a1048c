import { it } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';
it('x', async () => {
  const r = await runCli(['check', 'samples/captures/FK-0106_low.csv', 'samples/captures/FK-0106_mid.csv', 'samples/captures/FK-0106_high.csv', '--spec', 'samples/fh210-spec.yaml']);
  console.log(r.stdout.split('\n').slice(-22).join('\n'));
});
