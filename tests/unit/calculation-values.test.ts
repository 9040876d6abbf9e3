/**
 * "Where the inputs came from" shows the test settings in words: a consultant read
 * "Sides of the test 2" and "Adjustment for several outcomes bonferroni".
 */
import { describe, expect, it } from 'vitest';
import { formatValue } from '@/components/calculations/format';

describe('test settings in words', () => {
  it('names the sides of the test', () => {
    expect(formatValue('sides', 2)).toBe('two-sided');
    expect(formatValue('sides', 1)).toBe('one-sided');
  });

  it('names the adjustment for several outcomes as the form does', () => {
    expect(formatValue('multiplicity', 'bonferroni')).toBe('Bonferroni');
    expect(formatValue('multiplicity', 'holm')).toBe('Holm');
  });

  it('leaves every other number as a number', () => {
    expect(formatValue('clusterSize', 2)).toBe('2');
    expect(formatValue('', 2)).toBe('2');
  });
});
