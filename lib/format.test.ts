import { describe, expect, it } from 'vitest';
import { formatCount, formatDate, formatDateTime, formatNumber, formatPercent, nounFor, plural, pluralWord } from './format';

describe('one formatting module (en-GB, UTC)', () => {
  it.each([
    [0.8, '80.0%'],
    [0.2805, '28.1%'],
    [0.9996, '99.96%'],
    [0.0004, '0.04%'],
    [0, '0.0%'],
    [null, '—'],
    [Number.NaN, '—'],
  ])('percent in a table: %s → %s', (p, text) => expect(formatPercent(p)).toBe(text));

  it.each([
    [0.3727, '37%'],
    [0.051, '5.1%'],
    [0.05, '5%'],
    [0.0004, '0.04%'],
    [0, '0%'],
  ])('percent in a sentence: %s → %s', (p, text) => expect(formatPercent(p, 'text')).toBe(text));

  it('numbers and counts', () => {
    expect(formatNumber(1500)).toBe('1,500');
    expect(formatNumber(0.123456)).toBe('0.1235');
    expect(formatNumber(Infinity)).toBe('—');
    expect(formatCount(12.46)).toBe('about 12.5');
    expect(formatCount(1234.4)).toBe('about 1,234');
  });

  it('plurals follow Intl.PluralRules and one table of irregular nouns', () => {
    expect(plural(1, 'study')).toBe('1 study');
    expect(plural(2, 'study')).toBe('2 studies');
    expect(plural(0, 'finding')).toBe('0 findings');
    expect(plural(3, 'person')).toBe('3 people');
    expect(nounFor(2, 'GP practice')).toBe('GP practices');
    expect(nounFor(1, 'is', 'are')).toBe('is');
    expect(nounFor(4, 'is', 'are')).toBe('are');
    expect(pluralWord('Mouse')).toBe('Mice');
    expect(pluralWord('box')).toBe('boxes');
  });

  it('dates in UTC, saying so', () => {
    const late = '2026-12-03T23:30:00Z';
    expect(formatDate(late)).toBe('3 Dec 2026');
    expect(formatDateTime(late)).toBe('3 Dec 2026, 23:30 UTC');
  });
});
