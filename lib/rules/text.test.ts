/** The helpers that put a design's names and numbers into sentences and model formulas. */
import { describe, expect, it } from 'vitest';
import type { Level } from '@/lib/design/schema';
import { count, dec, identifier, list, noun, num, numbers, pct, pluralWord } from './text';

const level = (name: string): Level => ({ id: 'x', name, kind: 'grouping', count: 1, countIsTotal: false, countCv: 0, sharedEnvironment: false, spatialOrSerial: false });

describe('text helpers', () => {
  it.each([
    ['classroom', 'classrooms'],
    ['leaf', 'leaves'],
    ['mouse', 'mice'],
    ['batch', 'batches'],
    ['family', 'families'],
    ['day', 'days'],
    ['species', 'species'],
  ])('plural of %s is %s', (w, p) => expect(pluralWord(w)).toBe(p));
  it('nouns keep acronyms and pluralise the last word', () => {
    expect(noun(level('Twin pair'), true)).toBe('twin pairs');
    expect(noun(level('GP practice'), true)).toBe('GP practices');
    expect(count(1, level('Tray'))).toBe('1 tray');
    expect(count(20, level('Classroom'))).toBe('20 classrooms');
  });
  it('numbers read naturally', () => {
    expect(num(1500)).toBe('1,500');
    expect(num(12.46)).toBe('about 12.5');
    expect(dec(4.834375)).toBe('4.8');
    expect(pct(0.3727)).toBe('37%');
    expect(pct(0.051)).toBe('5.1%');
    expect(list(['a', 'b', 'c'])).toBe('a, b and c');
  });
  it.each([
    ['Reading score', 'reading_score'],
    ['baseline-score', 'baseline_score'],
    ['Ölgehalt 2', 'olgehalt_2'],
    ['2nd dose', 'x_2nd_dose'],
    ['', 'y'],
  ])('identifier(%j) = %s', (s, id) => expect(identifier(s, 'y')).toBe(id));
  it('numbers() drops undefined and turns −0 into 0', () => {
    expect(numbers({ a: 1, b: undefined, c: -0 })).toEqual({ a: 1, c: 0 });
    expect(Object.is(numbers({ c: -0 }).c, 0)).toBe(true);
  });
});
