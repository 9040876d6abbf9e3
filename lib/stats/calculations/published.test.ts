import { describe, expect, it } from 'vitest';
import { calculationSchema } from './request';
import { calculate } from './index';
import { costPerInformation, optimalClusterSize, optimalWholeClusterSize } from './optimal-allocation';
import { frisonPocockFactor } from './repeated-measures';
import { continuityCorrected, continuityUncorrected } from './two-proportions';
import { expectRelativelyClose } from './testing';

/**
 * Published tables and worked examples, and hand-checked cases of the published formulas.
 * Where the page or table is not verified here it says "from memory".
 */
function run(input: Record<string, unknown>) {
  return calculate(calculationSchema.parse(input));
}

describe('two-group means', () => {
  it('Cohen 1988, Table 2.4.1: d = 0.5, two-sided α = .05, power .80 → 64 per group', () => {
    const out = run({ kind: 'two-group-means', delta: 0.5, sd: 1, power: 0.8 });
    expect(out.result.nPerGroup).toBe(64);
    expect(out.result.power as number).toBeGreaterThanOrEqual(0.8);
  });

  it('Cohen 1988, Table 2.4.1 (from memory): d = 0.8 → 26 per group', () => {
    // For d = 0.2 the table (from memory) lists 393, where the exact t gives 394 (R: 393.41):
    // Cohen's table rests on an approximation to the noncentral t, so only the larger effects are compared.
    expect(run({ kind: 'two-group-means', delta: 0.8, sd: 1, power: 0.8 }).result.nPerGroup).toBe(26);
  });
});

describe('repeated measures: Frison & Pocock 1992 variance factors', () => {
  it.each([0, 0.3, 0.5, 0.7, 0.95])('one baseline, one follow-up, ρ = %s: post 1, change 2(1 − ρ), ANCOVA 1 − ρ²', (rho) => {
    expect(frisonPocockFactor('post', 1, 1, rho)).toBe(1);
    expectRelativelyClose(`change ρ ${rho}`, frisonPocockFactor('change', 1, 1, rho), 2 * (1 - rho), 1e-15);
    expectRelativelyClose(`ancova ρ ${rho}`, frisonPocockFactor('ancova', 1, 1, rho), 1 - rho * rho, 1e-15);
  });

  it('three baselines and three follow-ups at ρ = 0.7 (hand-checked): post 0.8, change 0.4, ANCOVA 0.8 − 1.47/2.4', () => {
    expectRelativelyClose('post', frisonPocockFactor('post', 3, 3, 0.7), (1 + 2 * 0.7) / 3, 1e-15);
    expectRelativelyClose('post by hand', frisonPocockFactor('post', 3, 3, 0.7), 0.8, 1e-15);
    expectRelativelyClose('change by hand', frisonPocockFactor('change', 3, 3, 0.7), 0.8 + 0.8 - 1.4, 1e-14);
    expectRelativelyClose('ancova by hand', frisonPocockFactor('ancova', 3, 3, 0.7), 0.8 - (3 * 0.49) / 2.4, 1e-15);
  });

  it('ANCOVA is never less precise than post or change (Frison & Pocock 1992; Vickers & Altman 2001)', () => {
    for (const p of [1, 2, 4]) for (const r of [1, 3, 8]) for (const rho of [0, 0.2, 0.5, 0.8, 0.99]) {
      const ancova = frisonPocockFactor('ancova', p, r, rho);
      expect(ancova).toBeLessThanOrEqual(frisonPocockFactor('post', p, r, rho) + 1e-15);
      expect(ancova).toBeLessThanOrEqual(frisonPocockFactor('change', p, r, rho) + 1e-15);
    }
  });

  it('n by the published normal formula: δ = 0.5σ, ANCOVA with ρ = 0.5 → ⌈2·(1.959964 + 0.841621)²·0.75/0.25⌉ = 48', () => {
    // 2·7.848879·0.75/0.25 = 47.09 → 48 (hand-checked).
    const out = run({ kind: 'repeated-measures', delta: 0.5, sd: 1, rho: 0.5, power: 0.8, analysis: 'ancova' });
    expect(out.result.nPerGroupNormal).toBe(48);
  });
});

describe('longitudinal slopes: Diggle et al. 2002 §2.4 (hand-checked)', () => {
  it('times 0..4, ρ = 0.5, σ = 1, δ = 0.1 per unit of time: n = ⌈2·7.848879·0.5/(10·0.01)⌉ = 79', () => {
    // Σ(t − t̄)² = 10; n = 2·(z.975 + z.80)²·σ²(1 − ρ)/(Σ·δ²) = 78.49 → 79.
    const out = run({ kind: 'longitudinal-slopes', slopeDifference: 0.1, sd: 1, rho: 0.5, times: [0, 1, 2, 3, 4], power: 0.8 });
    expect(out.result.sumOfSquaredTimeDeviations).toBe(10);
    expect(out.result.nPerGroupNormal).toBe(79);
  });
});

describe('cluster means (hand-checked with Donner & Klar 2000’s inflation by the design effect)', () => {
  it('m = 20, ICC = 0.05 → DE = 1.95; clusters needed are close to the individually randomised n × DE / m', () => {
    const out = run({ kind: 'cluster-means', delta: 0.3, sd: 1, icc: 0.05, clusterSize: 20, power: 0.8 });
    expectRelativelyClose('designEffect', out.result.designEffect as number, 1.95, 1e-15);
    // Normal approximation: 2·7.848879·1.95/(0.09·20) = 17.01 clusters per arm; the t test with
    // 2k − 2 df needs more (R: power 0.7996 at k = 18, 0.8216 at k = 19).
    expect(out.result.clustersPerArm).toBe(19);
  });
});

describe('two proportions: Fleiss, Levin & Paik 2003', () => {
  it('R’s documented example power.prop.test(p1 = .50, p2 = .75, power = .90) → n = 76.7, so 77 per group', () => {
    expect(run({ kind: 'two-proportions', p1: 0.5, p2: 0.75, power: 0.9 }).result.nPerGroup).toBe(77);
  });

  it('the continuity correction and its inverse agree (hand-checked: n = 76.65, |Δ| = 0.25 → 84.46)', () => {
    const corrected = continuityCorrected(76.65, 0.25);
    expectRelativelyClose('corrected', corrected, (76.65 / 4) * (1 + Math.sqrt(1 + 4 / (76.65 * 0.25))) ** 2, 1e-15);
    // 19.1625·(1 + √(1 + 4/19.1625))² = 19.1625·(1 + 1.099427)² = 84.4606.
    expectRelativelyClose('corrected by hand', corrected, 84.4606, 1e-5);
    expectRelativelyClose('inverse', continuityUncorrected(corrected, 0.25), 76.65, 1e-13);
  });
});

describe('optimal allocation: Raudenbush 1997', () => {
  it('c_cluster = 300, c_unit = 10, ICC = 0.05: m* = √(30·19) = √570 ≈ 23.87; 24 costs less per unit of information than 23', () => {
    expectRelativelyClose('m*', optimalClusterSize(0.05, 300, 10), Math.sqrt(570), 1e-15);
    // (300 + 230)(0.05 + 0.95/23) = 48.3913…; (300 + 240)(0.05 + 0.95/24) = 48.375.
    expectRelativelyClose('cost at 23', costPerInformation(23, 0.05, 300, 10), 530 * (0.05 + 0.95 / 23), 1e-15);
    expectRelativelyClose('cost at 24', costPerInformation(24, 0.05, 300, 10), 48.375, 1e-14);
    expect(optimalWholeClusterSize(0.05, 300, 10)).toBe(24);
  });

  it('equal costs and ICC 0.5 give m* = 1', () => {
    expect(optimalClusterSize(0.5, 50, 50)).toBe(1);
    expect(optimalWholeClusterSize(0.5, 50, 50)).toBe(1);
  });
});
