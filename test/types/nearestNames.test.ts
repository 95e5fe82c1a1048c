import { describe, expect, it } from 'vitest';
import { distance } from 'fastest-levenshtein';
import { nearestName, nearestNames, suggestionReach } from '../../src/types/index.js';

describe('nearestNames', () => {
  it('the edit distance is Levenshtein\'s: kitten → sitting takes 3 edits, flaw → lawn 2', () => {
    // Textbook examples of the Levenshtein distance (e.g. Wikipedia "Levenshtein distance"; from memory).
    expect(distance('kitten', 'sitting')).toBe(3);
    expect(distance('flaw', 'lawn')).toBe(2);
  });

  it('suggestionReach is a third of the typed length rounded up, and at least one edit', () => {
    expect([1, 2, 3, 4, 6, 7, 9, 10].map((n) => suggestionReach('x'.repeat(n)))).toEqual([1, 1, 1, 2, 2, 3, 3, 4]);
  });

  it('nearestName finds a misspelt spec word, ignoring case, and nothing for an unrelated one', () => {
    const ids = ['frequency', 'period', 'dutyCycle', 'thd'];
    expect(nearestName('frequncy', ids)).toBe('frequency');
    expect(nearestName('dutycycle', ids)).toBe('dutyCycle');
    expect(nearestName('triangel', ['sine', 'triangle', 'square'])).toBe('triangle');
    expect(nearestName('voltage', ids)).toBeNull();
    expect(nearestName('rms', ['thd'])).toBeNull();
  });

  it('nearestNames gives the closest serials first, ties in the order given, at most three', () => {
    const serials = ['FK-0101', 'FK-0102', 'FK-0103', 'FK-0104', 'FK-0110'];
    // FK-0140 is one edit from FK-0110 and two from each of FK-0101…FK-0104.
    expect(nearestNames('FK-0140', serials)).toEqual(['FK-0110', 'FK-0101', 'FK-0102']);
    expect(nearestNames('FK-0103', serials, 2)).toEqual(['FK-0103', 'FK-0101']);
    expect(nearestNames('XY-9', serials)).toEqual([]);
  });

  it('nearestNames leaves the list of known names as it was', () => {
    const known = ['b', 'a', 'c'];
    nearestNames('a', known);
    expect(known).toEqual(['b', 'a', 'c']);
  });
});
