/**
 * One seed for every property-based run (vitest setup file, see vitest.config.ts). fast-check reads
 * it through `configureGlobal`, so a property without a seed of its own draws the same inputs on
 * every run and every machine; a test that needs other inputs passes its own `seed`.
 *
 * BENCHPROOF_PROPERTY_SEED=<integer> moves every such property to fresh inputs. When a property fails,
 * the seed in force is printed with the command that replays it; fast-check's own failure message
 * adds the `path` of the shrunk counterexample.
 */
import fc from 'fast-check';
import { beforeEach } from 'vitest';

/** The fixed default: any integer works; this one is the day the rule was made (2026-12-05). */
const DEFAULT_SEED = 20261205;

function seedFromEnvironment(raw: string | undefined): number {
  if (raw === undefined || raw.trim() === '') return DEFAULT_SEED;
  const seed = Number(raw);
  if (!Number.isSafeInteger(seed)) {
    throw new Error(`BENCHPROOF_PROPERTY_SEED must be an integer, got "${raw}"; unset it to use the default ${DEFAULT_SEED}`);
  }
  return seed;
}

export const PROPERTY_SEED = seedFromEnvironment(process.env.BENCHPROOF_PROPERTY_SEED);

fc.configureGlobal({ ...fc.readConfigureGlobal(), seed: PROPERTY_SEED });

beforeEach((context) => {
  context.onTestFailed(() => {
    // Only a property's failure depends on the seed; fast-check's message starts "Property failed".
    const errors = context.task.result?.errors ?? [];
    if (!errors.some((e) => /Property failed/.test(String(e.message)))) return;
    const file = context.task.file.name;
    process.stderr.write(
      `property seed in force: ${PROPERTY_SEED} (replay: BENCHPROOF_PROPERTY_SEED=${PROPERTY_SEED} npx vitest run ${file} -t ${JSON.stringify(context.task.name)})\n`,
    );
  });
});
