/**
 * The order test files start in (vitest's `sequence.sequencer`, see vitest.config.ts): the files
 * known to take long start first, in the order of the patterns given, then every other file in
 * vitest's own order (failed first, then longest first from its timing cache, or largest first on a
 * clean clone, where there is no cache). Files are handed to the workers one at a time in this
 * order, so a long file that started last would keep one worker busy after the others ran dry; on a
 * clean clone vitest knows no durations, and file size says little about time (a short file that
 * drives a browser or a database server outlasts a long file of closed forms).
 */
import { BaseSequencer } from 'vitest/node';
import type { TestSpecification, Vitest } from 'vitest/node';

/** A sequencer class that starts the files matching `patterns` first, in the patterns' order. */
export function slowFirst(patterns: readonly RegExp[]): new (ctx: Vitest) => BaseSequencer {
  return class SlowFirstSequencer extends BaseSequencer {
    override async sort(files: TestSpecification[]): Promise<TestSpecification[]> {
      const sorted = await super.sort(files);
      const rank = (spec: TestSpecification): number => {
        const path = spec.moduleId.replace(/\\/g, '/');
        const i = patterns.findIndex((p) => p.test(path));
        return i === -1 ? patterns.length : i;
      };
      // Array.prototype.sort is stable: files of equal rank keep vitest's order.
      return sorted.map((spec) => ({ spec, rank: rank(spec) })).sort((a, b) => a.rank - b.rank).map((x) => x.spec);
    }
  };
}
