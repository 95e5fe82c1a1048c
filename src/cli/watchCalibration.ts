/**
 * `watch --calibrate`: the per-file strategy while a calibration is in progress. Each landed capture
 * is placed at its step by the spec's calibration pattern and measured (error in cents); when every
 * step has a capture, the iteration is decided, guided and stored exactly as `benchproof calibrate`
 * would, and the next set starts. The unit is the session's --unit.
 */
import type { CaptureHandlerFactory } from './watchCapture.js';
import { calibrateCapture } from './calibrateRun.js';
import type { CalibrationFlags, CalibrationSession } from './calibrateRun.js';

export function calibrateEachCapture(unit: string, flags: CalibrationFlags, label?: string, note?: string): CaptureHandlerFactory {
  return (env) => {
    const steps = new Map();
    // The note says what was done before this session: it goes with the first iteration stored.
    let noteLeft = note;
    return async (file) => {
      try {
        const session: CalibrationSession = { spec: env.spec, specText: env.specText, unit, timing: env.timing, flags, steps, ...(label ? { label } : {}), ...(noteLeft !== undefined ? { note: noteLeft } : {}) };
        const out = await calibrateCapture(env.ctx, session, file);
        const it = out.iteration;
        if (it) noteLeft = undefined;
        return {
          status: 'calibration-step',
          file,
          unit,
          step: out.step.label,
          statement: out.step.statement ?? 'not-measured',
          cents: out.step.cents,
          missing: out.missing,
          ...(it
            ? {
                iteration: {
                  statement: it.statement,
                  meetsLimits: it.meetsLimits,
                  guidance: it.guidance.map((g) => g.text),
                  ...(out.place ? { calibrationId: out.place.calibrationId, number: out.place.number } : {}),
                },
              }
            : {}),
        };
      } catch (err) {
        return { status: 'error', file, error: err as Error };
      }
    };
  };
}
