import { describe, expect, it } from 'vitest';
import { fmtSeconds, markdownTable, median, ratio } from '../../bench/lib/stats.js';
import { expectWithin } from '../helpers/expectWithin.js';

describe('median of run times', () => {
  it('median picks the middle value of an odd count and the mean of the two middle values of an even count', () => {
    expectWithin(median([3, 1, 2]), 2, { abs: 0 }, 'definition of the median');
    expectWithin(median([4, 1, 3, 2]), 2.5, { abs: 0 }, 'definition of the median');
  });

  it('median ignores failed runs (non-finite) and gives null when none is left', () => {
    expectWithin(median([Number.NaN, 5, Infinity, 1]), 3, { abs: 0 }, 'definition of the median');
    expect(median([])).toBeNull();
    expect(median([Number.NaN])).toBeNull();
  });

  it('median leaves its input unmodified', () => {
    const runs = [3, 1, 2];
    median(runs);
    expect(runs).toEqual([3, 1, 2]);
  });

  it('ratio is null when the peer time is missing or zero', () => {
    expectWithin(ratio(1, 4), 0.25, { rel: 1e-15 }, 'closed form');
    expect(ratio(1, 0)).toBeNull();
    expect(ratio(1, null)).toBeNull();
    expect(ratio(undefined, 2)).toBeNull();
  });
});

describe('figure formatting', () => {
  it('fmtSeconds switches from milliseconds to seconds at one second and shows a dash for a missing time', () => {
    expect(fmtSeconds(0.25)).toBe('250 ms');
    expect(fmtSeconds(1.234)).toBe('1.23 s');
    expect(fmtSeconds(Number.NaN)).toBe('—');
  });

  it('markdownTable writes a header, a rule and one line per row', () => {
    expect(markdownTable(['a', 'b'], [['1', '2']])).toBe('| a | b |\n| --- | --- |\n| 1 | 2 |');
  });
});
