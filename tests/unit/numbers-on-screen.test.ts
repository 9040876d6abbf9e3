/**
 * The sentences beside the numbers say the same as the numbers (issue 11 point 9): the level a
 * test is planned at under Bonferroni, and one optimum on the budget card.
 */
import { describe, expect, it } from 'vitest';
import { meaning } from '@/components/calculations/meaning';
import { costSummary } from '@/components/plan/cost-summary';
import { costCurve, costCurveSizes } from '@/lib/plan/sensitivity';
import { calculate } from '@/lib/stats/calculations';
import { calculationSchema, clusterMeansSchema } from '@/lib/stats/calculations/request';
import { clustersGrid } from '@/lib/stats/calculations/sensitivity';

const run = (request: Record<string, unknown>) => calculate(calculationSchema.parse(request));

describe('the sentence names the level each outcome is tested at', () => {
  it('Bonferroni over 2 outcomes: alpha 0.025 for each, not alpha 0.05', () => {
    const out = run({ kind: 'two-group-means', delta: 3, sd: 10, power: 0.8, outcomes: 2, multiplicity: 'bonferroni' });
    const sentence = meaning(out);
    expect(sentence).toContain('alpha 0.025 for each outcome (0.05 shared by 2 outcomes, Bonferroni)');
    expect(sentence).not.toMatch(/test at alpha 0\.05\b/);
  });

  it('one outcome: the nominal level', () => {
    expect(meaning(run({ kind: 'two-group-means', delta: 3, sd: 10, power: 0.8 }))).toContain('two-sided test at alpha 0.05 has');
  });
});

describe('the budget card names one optimum', () => {
  it.each([
    [0.05, 1200, 40],
    [0.02, 5000, 30],
    [0.15, 1200, 40],
  ])('ICC %s, cluster %s, unit %s: the sentence names only the calculation’s best size', (icc, costPerCluster, costPerUnit) => {
    const output = run({ kind: 'optimal-allocation', icc, costPerCluster, costPerUnit, delta: 0.3, sd: 1, power: 0.8 });
    const best = output.result.clusterSizeInteger as number;
    const sizes = costCurveSizes(best);
    const grid = clusterMeansSchema.parse({ kind: 'cluster-means', delta: 0.3, sd: 1, icc, clusterSize: best, power: 0.8 });
    const points = costCurve(clustersGrid(grid, [icc], sizes), costPerCluster, costPerUnit);
    const sentence = costSummary(points, best, 'pupils per classroom');
    expect(sentence).toContain(`The best cluster size is ${best} pupils per classroom`);
    expect(sentence).toContain(`takes ${output.result.clustersPerArm} per arm`);
    expect(sentence).not.toMatch(/about \d+/);
  });
});

describe('a clear answer at the limits', () => {
  it('a difference of 1e9 with SD 1: "already met with 2 per group"', () => {
    const sentence = meaning(run({ kind: 'two-group-means', delta: 1e9, sd: 1, power: 0.8 }));
    expect(sentence).toMatch(/^The target power of 80.0% is already met with 2 per group, the smallest allowed/);
  });

  it('a difference of 1e-9: not reached even with the largest size allowed', () => {
    expect(meaning(run({ kind: 'two-group-means', delta: 1e-9, sd: 1, power: 0.8 }))).toMatch(/not reached even with 10,000,000 per group, the largest allowed/);
  });
});

describe('words beside a calculation’s answer', () => {
  it('one year of follow-up is “1 unit of time”, not “1 units of time”', () => {
    const out = run({ kind: 'cluster-rates', baselineRate: 1.8, rateRatio: 0.7, exposure: 1, clusterSize: 22, betweenClusterCv: 0.3, power: 0.8 });
    expect(meaning(out)).toContain('each followed for 1 unit of time');
    expect(meaning(run({ kind: 'cluster-rates', baselineRate: 1.8, rateRatio: 0.7, exposure: 2, clusterSize: 22, betweenClusterCv: 0.3, power: 0.8 }))).toContain('each followed for 2 units of time');
  });

  it('the note on unequal cluster sizes names no input by its internal id', () => {
    for (const kind of ['cluster-means', 'design-effect'] as const) {
      const request = kind === 'cluster-means' ? { kind, delta: 3, sd: 10, icc: 0.15, clusterSize: 23, cv: 0.25, power: 0.8 } : { kind, icc: 0.15, clusterSize: 25, cv: 0.25 };
      const out = run(request);
      expect(out.warnings.join(' ')).toContain('the cluster size entered is the mean size');
      expect(out.warnings.join(' ')).not.toMatch(/clusterSize/);
    }
  });
});
