// Placeholder until the capture reader lands (being written now); replaced, not kept.
import type { Capture, ReadCaptureOptions } from '../types/index.js';
export async function readCapture(_path: string, _options: ReadCaptureOptions = {}): Promise<Capture> {
  throw new Error('capture reader not written yet');
}
