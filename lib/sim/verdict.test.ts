/**
 * The stress-test verdicts at the edges of the Monte Carlo error: a false-positive rate (or a
 * miss rate of the interval) is broken only when its interval (± 1.96 MC SE) lies wholly above α
 * AND it exceeds 1.5α (Bradley's liberal bound); undecided when its interval reaches α but also
 * past 1.5α; power never counts for an analysis whose rate is off or undecided. The arithmetic of
 * each boundary case is written beside it (α = 5%, so 1.5α = 7.5%).
 */
import { describe, expect, it } from 'vitest';
import { bestAnalysis, errorRateVerdict, mcInterval, powerVerdict, replicatesToSettle, verdictOf, type Verdict } from './verdict';

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
    // 0.09 ± 1.96 × 0.025 = 0.041 to 0.139: reaches α (0.05) and past 1.5α (0.075).
    ['far above alpha but a noisy estimate whose interval holds alpha', 0.09, 0.025, 'undecided'],
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
    // The same rate from 100 replicates: MC SE 0.0271, interval 0.027 to 0.133 — reaches α and past 1.5α.
    expect(errorRateVerdict({ value: 0.08, mcse: null }, alpha, 100)).toBe('undecided');
  });

  it('is unknown without a value', () => {
    expect(errorRateVerdict({ value: null, mcse: null }, alpha, R)).toBe('unknown');
    expect(errorRateVerdict({ value: Number.NaN, mcse: Number.NaN }, alpha, R)).toBe('unknown');
  });
});

describe('errorRateVerdict: too few replicates to tell (interval reaches α and past 1.5α = 0.075)', () => {
  it.each([
    // name, verdict, rate, MC SE — interval = rate ± 1.96 × SE
    ['5.5% ± 1.0%: 0.0354 to 0.0746, within 1.5α', 'holds', 0.055, 0.01],
    ['5.6% ± 1.0%: 0.0364 to 0.0756, past 1.5α', 'undecided', 0.056, 0.01],
    ['top exactly 1.5α − 1e-9: 0.0554 − 1e-9 ± 0.0196', 'holds', 0.075 - 1.96 * 0.01 - eps, 0.01],
    ['top exactly 1.5α + 1e-9: 0.0554 + 1e-9 ± 0.0196', 'undecided', 0.075 - 1.96 * 0.01 + eps, 0.01],
    ['the issue\'s 6% ± 4.7%: −0.032 to 0.152', 'undecided', 0.06, 0.047],
    ['5% from 100 replicates: SE √(0.05 × 0.95 / 100) = 0.0218, 0.0073 to 0.0927', 'undecided', 0.05, Math.sqrt((0.05 * 0.95) / 100)],
    ['5% from 300 replicates: SE 0.0126, 0.0253 to 0.0747', 'holds', 0.05, Math.sqrt((0.05 * 0.95) / 300)],
    ['1% from 100 replicates (conservative): SE 0.00995, top 0.0295', 'holds', 0.01, Math.sqrt((0.01 * 0.99) / 100)],
    ['7% ± 0.9%: 0.0524 to 0.0876 clears α, so known to be above: inflated, not undecided', 'inflated', 0.07, 0.009],
  ] as const)('%s → %s', (_name, want, value, mcse) => {
    expect(errorRateVerdict({ value, mcse }, alpha, R)).toBe(want);
  });
});

describe('replicatesToSettle: R · (1.96 SE / gap)², gap = max(1.5α − rate, rate − α), rounded up to two digits', () => {
  it.each([
    // name, settled at, rate, MC SE, replicates
    // gap = max(0.015, 0.010) = 0.015; 100 × (0.09212 / 0.015)² = 100 × 37.716 = 3,771.6 → 3,772 → 3,800.
    ['6% ± 4.7% from 100', 3800, 0.06, 0.047, 100],
    // gap = 0.025; SE 0.021794; 100 × (0.042717 / 0.025)² = 100 × 2.9196 = 291.96 → 292 → 300.
    ['5% from 100', 300, 0.05, Math.sqrt((0.05 * 0.95) / 100), 100],
    // gap = max(0.035, −0.010) = 0.035; 1,000 × (0.0392 / 0.035)² = 1,000 × 1.2544 = 1,254.4 → 1,255 → 1,300.
    ['4% ± 2.0% from 1,000 (few usable fits)', 1300, 0.04, 0.02, 1000],
    // Miss rate of 90.0% ± 3.0% coverage from 100: gap = max(−0.025, 0.05) = 0.05; 100 × (0.0588 / 0.05)² = 138.3 → 139 → 140.
    ['miss rate 10% ± 3.0% from 100', 140, 0.1, 0.03, 100],
    ['holds: nothing to settle', null, 0.05, 0.007, 1000],
    ['broken: nothing to settle', null, 0.25, 0.014, 1000],
  ] as const)('%s → %s', (_name, want, value, mcse, replicates) => {
    expect(replicatesToSettle({ value, mcse }, alpha, replicates)).toBe(want);
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
    expect(verdictOf(m(0.049, 0.951, 0.85), opts)).toEqual({ cell: 'holds', falsePositive: 'holds', coverage: 'holds', power: 'meets', powerCounts: true, settleAt: null });
  });

  it('coverage 90.0% ± 3.0% from 100 replicates (the sleep demo, Huber regression, carry-over) is too few to tell, not "holds"', () => {
    // Miss rate 0.10 ± 1.96 × 0.03 = 0.041 to 0.159: reaches α = 0.05 and past 1.5α = 0.075
    // (coverage 84.1% to 95.9% against 95% and the bound 1 − 1.5 × 5% = 92.5%); settles at about 140.
    const v = verdictOf(
      { typeIError: { value: 0.04, mcse: 0.0196 }, coverage: { value: 0.9, mcse: 0.03 }, power: { value: 0.9, mcse: 0.03 } },
      { ...opts, replicates: 100 },
    );
    // False positives 0.04 ± 0.0384 = 0.0016 to 0.0784: undecided too, settling at 100 × (0.0384 / 0.035)² = 120.4 → 121 → 130.
    expect(v).toMatchObject({ cell: 'undecided', falsePositive: 'undecided', coverage: 'undecided', powerCounts: false, settleAt: 140 });
  });

  it('coverage just inside and just outside the bound 1 − 1.5α = 92.5%', () => {
    // 94.5% ± 0.87%: miss 0.055, 0.038 to 0.072 → holds; 94.0% ± 0.87%: miss 0.06, 0.043 to 0.077 → undecided.
    expect(verdictOf({ coverage: { value: 0.945, mcse: 0.0087 } }, opts).coverage).toBe('holds');
    expect(verdictOf({ coverage: { value: 0.94, mcse: 0.0087 } }, opts).coverage).toBe('undecided');
  });

  it('an undecided false-positive rate outranks low power, and its power does not count', () => {
    const v = verdictOf({ typeIError: { value: 0.06, mcse: 0.047 }, power: { value: 0.5, mcse: 0.05 } }, { ...opts, replicates: 100 });
    expect(v).toMatchObject({ cell: 'undecided', power: 'below', powerCounts: false, settleAt: 3800 });
  });

  it('a broken coverage outranks an undecided false-positive rate', () => {
    const v = verdictOf({ typeIError: { value: 0.06, mcse: 0.047 }, coverage: { value: 0.75, mcse: 0.014 } }, { ...opts, replicates: 100 });
    expect(v).toMatchObject({ cell: 'broken', falsePositive: 'undecided', coverage: 'broken', settleAt: null });
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

  it('broken coverage fails the cell even when false positives hold, and its power is not to its credit (a biased estimate)', () => {
    const v = verdictOf(m(0.05, 0.88, 0.9), opts);
    expect(v).toMatchObject({ cell: 'broken', falsePositive: 'holds', coverage: 'broken', powerCounts: false });
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
  const v = (cell: Verdict['cell'], powerCounts = true): Verdict => ({ cell, falsePositive: 'holds', coverage: 'holds', power: 'meets', powerCounts, settleAt: null });
  const table: Record<string, { verdict: Verdict; power: number | null }[]> = {
    ols: [{ verdict: v('broken', false), power: 0.99 }],
    robust: [{ verdict: v('underpowered'), power: 0.6 }],
    mixed: [{ verdict: v('underpowered'), power: 0.7 }],
    means: [{ verdict: v('caution', false), power: 0.95 }],
    unsure: [{ verdict: v('undecided', false), power: 0.99 }],
  };
  it('prefers no failure, then no caution, then the higher lowest power; never a broken analysis for its power', () => {
    expect(bestAnalysis(['ols', 'robust', 'mixed', 'means'], (a) => table[a]!)).toBe('mixed');
    expect(bestAnalysis(['ols', 'means'], (a) => table[a]!)).toBe('means');
    expect(bestAnalysis([], (a) => table[a]!)).toBeNull();
    // Undecided may be broken: after a known small excess, before a known failure, whatever its power.
    expect(bestAnalysis(['unsure', 'means'], (a) => table[a]!)).toBe('means');
    expect(bestAnalysis(['ols', 'unsure'], (a) => table[a]!)).toBe('unsure');
    expect(bestAnalysis(['unsure', 'robust'], (a) => table[a]!)).toBe('robust');
  });
});
