/**
 * The Checks tab shows a finding's numbers and sentences in a researcher's words: no code keys
 * ("naive type i error", "size cv") and no Markdown backticks around the models it quotes.
 */
import { describe, expect, it } from 'vitest';
import { NUMBER_LABELS, numberText, proseParts } from '@/components/design/finding-numbers';
import { runChecks } from '@/lib/rules/registry';
import * as fixtures from '@/lib/rules/__fixtures__/designs';
import type { Design } from '@/lib/design/schema';

const designs = Object.values(fixtures).filter((d): d is Design => typeof d === 'object' && d !== null && 'structure' in d);

describe('the numbers of a finding', () => {
  it('every number a rule reports on the fixture designs has a label in words', () => {
    const keys = new Set(designs.flatMap((d) => runChecks(d).findings.flatMap((f) => Object.keys(f.numbers ?? {}))));
    expect(keys.size).toBeGreaterThan(40);
    expect([...keys].filter((k) => !(k in NUMBER_LABELS))).toEqual([]);
  });

  it('reads the false-positive rate of the classroom demo in words, as a percentage', () => {
    expect(numberText('naiveTypeIError', 0.3727)).toBe('false-positive rate of the planned test: 37.3%');
    expect(numberText('sizeCv', 0.25)).toBe('CV of cluster sizes: 0.25');
    expect(numberText('measurementsUsedByMixedModel', 0.95)).toBe('measurements a mixed model uses: 95.0%');
  });
});

describe('a finding’s sentences', () => {
  it('set the model they quote between backticks as code, without the backticks', () => {
    const parts = proseParts('Analyse within volunteers, `log(y) ~ arm + (1 | volunteer)`, counting the 24 volunteers.');
    expect(parts).toEqual([
      { text: 'Analyse within volunteers, ', code: false },
      { text: 'log(y) ~ arm + (1 | volunteer)', code: true },
      { text: ', counting the 24 volunteers.', code: false },
    ]);
    expect(parts.map((p) => p.text).join('')).not.toContain('`');
  });
});
