import { describe, expect, it } from 'vitest';
import { formatCount, formatDate, formatDateTime, formatDecimal, formatNumber, formatPercent, MINUS, nounFor, plural, pluralWord } from './format';

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

  it.each([
    ['a number', () => formatNumber(-0.35667), '\u22120.3567'],
    ['a whole number', () => formatNumber(-1500), '\u22121,500'],
    ['a tiny number and its exponent', () => formatNumber(-0.0000123), '\u22121.23e\u22125'],
    ['a count', () => formatCount(-2.25), 'about \u22122.3'],
    ['a percentage in a table', () => formatPercent(-0.031), '\u22123.1%'],
    ['a percentage in a sentence', () => formatPercent(-0.25, 'text'), '\u221225%'],
    ['a decimal', () => formatDecimal(-0.25, 2), '\u22120.25'],
  ] as const)('negative numbers read with the minus sign U+2212, never a hyphen: %s', (_what, format, text) => {
    const out = format();
    expect(out).toBe(text);
    expect(out).not.toContain('-');
    expect(out).toContain(MINUS);
  });

  it('decimals: at most the digits asked for, trailing zeros dropped, thousands separated', () => {
    expect(formatDecimal(4.8)).toBe('4.8');
    expect(formatDecimal(0.15, 2)).toBe('0.15');
    expect(formatDecimal(0.5, 2)).toBe('0.5');
    expect(formatDecimal(1234.56)).toBe('1,234.6');
    expect(formatDecimal(Number.NaN)).toBe('—');
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
