/**
 * The stress-test verdicts at the edges of the Monte Carlo error: a false-positive rate (or a
 * miss rate of the interval) is broken only when its interval (± 1.96 MC SE) lies wholly above α
 * AND it exceeds α by more than half of α; power never counts for an analysis whose rate is off.
 */
import { describe, expect, it } from 'vitest';
import { bestAnalysis, errorRateVerdict, mcInterval, powerVerdict, verdictOf, type Verdict } from './verdict';

const alpha = 0.05;
const R = 1000;
const eps = 1e-9;

describe('errorRateVerdict at the Monte Carlo boundary', () => {
  it.each([
    // name, rate, MC SE, verdict
    ['at alpha', 0.05, 0.007, 'holds'],
    ['below alpha (conservative)', 0.01, 0.003, 'holds'],
    ['interval touches alpha exactly (closed interval)', 0.05 + 1.96 * 0.004, 0.004, 'holds'],
    ['interval just clears alpha, small excess', 0.05 + 1.96 * 0.004 + eps, 0.004, 'inflated'],
    ['far above alpha but a noisy estimate whose interval holds alpha', 0.09, 0.025, 'holds'],
    ['interval clears alpha, exactly 1.5 α (not more)', 0.075, 0.005, 'inflated'],
    ['interval clears alpha, just above 1.5 α', 0.075 + eps, 0.005, 'broken'],
    ['5.6% from a huge run: beyond the MC error but within the margin', 0.056, 0.0007, 'inflated'],
    ['25% (ignoring clustering)', 0.25, 0.014, 'broken'],
  ] as const)('%s: %f ± %f → %s', (_name, value, mcse, want) => {
    expect(errorRateVerdict({ value, mcse }, alpha, R)).toBe(want);
  });

  it('uses √(p(1 − p)/R) when the MC SE is missing', () => {
    // p = 0.08 with R = 1000: MC SE 0.00858, interval from 0.0632 — above α, beyond 1.5α.
    expect(mcInterval({ value: 0.08, mcse: null }, R)![0]).toBeCloseTo(0.08 - 1.96 * Math.sqrt(0.08 * 0.92 / 1000), 12);
    expect(errorRateVerdict({ value: 0.08, mcse: null }, alpha, R)).toBe('broken');
    // The same rate from 100 replicates: interval from 0.027, holds.
    expect(errorRateVerdict({ value: 0.08, mcse: null }, alpha, 100)).toBe('holds');
  });

  it('is unknown without a value', () => {
    expect(errorRateVerdict({ value: null, mcse: null }, alpha, R)).toBe('unknown');
    expect(errorRateVerdict({ value: Number.NaN, mcse: Number.NaN }, alpha, R)).toBe('unknown');
  });
});

describe('powerVerdict', () => {
  it.each([
    [0.8, 0.01, 'meets'],
    [0.78, 0.0103, 'meets'], // interval reaches past 0.80
    [0.8 - 1.96 * 0.01 - eps, 0.01, 'below'],
    [0.5, 0.016, 'below'],
  ] as const)('%f ± %f against 80% → %s', (value, mcse, want) => {
    expect(powerVerdict({ value, mcse }, 0.8, R)).toBe(want);
  });
});

describe('verdictOf', () => {
  const opts = { alpha, targetPower: 0.8, replicates: R };
  const m = (typeIError: number, coverage: number, power: number) => ({
    typeIError: { value: typeIError, mcse: Math.sqrt((typeIError * (1 - typeIError)) / R) },
    coverage: { value: coverage, mcse: Math.sqrt((coverage * (1 - coverage)) / R) },
    power: { value: power, mcse: Math.sqrt((power * (1 - power)) / R) },
  });

  it('holds when all three hold', () => {
    expect(verdictOf(m(0.049, 0.951, 0.85), opts)).toEqual({ cell: 'holds', falsePositive: 'holds', coverage: 'holds', power: 'meets', powerCounts: true });
  });

  it('a broken false-positive rate fails the cell and its high power does not count', () => {
    const v = verdictOf(m(0.25, 0.75, 0.97), opts);
    expect(v.cell).toBe('broken');
    expect(v.falsePositive).toBe('broken');
    expect(v.power).toBe('meets');
    expect(v.powerCounts).toBe(false);
  });

  it('an inflated rate is a caution, and its power does not count either', () => {
    const v = verdictOf(m(0.07, 0.94, 0.9), opts);
    expect(v).toMatchObject({ cell: 'caution', falsePositive: 'inflated', powerCounts: false });
  });

  it('broken coverage fails the cell even when false positives hold', () => {
    const v = verdictOf(m(0.05, 0.88, 0.9), opts);
    expect(v).toMatchObject({ cell: 'broken', falsePositive: 'holds', coverage: 'broken', powerCounts: true });
  });

  it('low power with valid error rates is "underpowered", not a failure', () => {
    expect(verdictOf(m(0.05, 0.95, 0.6), opts).cell).toBe('underpowered');
  });

  it('coverage that cannot be estimated (no single true effect) does not decide', () => {
    const v = verdictOf({ ...m(0.05, 0.95, 0.9), coverage: { value: null, mcse: null } }, opts);
    expect(v).toMatchObject({ cell: 'holds', coverage: 'unknown' });
  });

  it('no figures at all: no result', () => {
    expect(verdictOf({}, opts).cell).toBe('no-result');
  });
});

describe('bestAnalysis', () => {
  const v = (cell: Verdict['cell'], powerCounts = true): Verdict => ({ cell, falsePositive: 'holds', coverage: 'holds', power: 'meets', powerCounts });
  const table: Record<string, { verdict: Verdict; power: number | null }[]> = {
    ols: [{ verdict: v('broken', false), power: 0.99 }],
    robust: [{ verdict: v('underpowered'), power: 0.6 }],
    mixed: [{ verdict: v('underpowered'), power: 0.7 }],
    means: [{ verdict: v('caution', false), power: 0.95 }],
  };
  it('prefers no failure, then no caution, then the higher lowest power; never a broken analysis for its power', () => {
    expect(bestAnalysis(['ols', 'robust', 'mixed', 'means'], (a) => table[a]!)).toBe('mixed');
    expect(bestAnalysis(['ols', 'means'], (a) => table[a]!)).toBe('means');
    expect(bestAnalysis([], (a) => table[a]!)).toBeNull();
  });
});
