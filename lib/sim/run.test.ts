import { describe, expect, it } from 'vitest';
import { naiveTypeIError } from '@/lib/stats/design-effect';
import { simulationSpecSchema, type SimulationSpec, type SimulationSpecInput } from './spec';
import operating from './fixtures/operating.json';
import { aggregate, createWorkspace, mergeBlocks, runReplicates, type ReplicateBlock } from './run';
import { summarise } from './summarise';
import { expectWithinMcse } from './test-helpers';

/**
 * Reproducibility across chunkings, and operating characteristics against theory within 3 MC
 * SE: exact t-test power from R (`fixtures/operating.json`, written by
 * `fixtures/generate_operating.R`), the naive false-positive rate under clustering from
 * lib/stats/design-effect.ts, and the nominal 5% / 95% of correctly specified analyses.
 */

/** Generous: these tests take 1–3 s on an idle 2-core machine, several times that under load. */
const SLOW = 60_000;

const spec = (input: Partial<SimulationSpecInput> & Pick<SimulationSpecInput, 'design' | 'truth'>): SimulationSpec =>
  simulationSpecSchema.parse({ scenarios: [{ violation: 'none' }], analyses: ['ols'], replicates: 100, seed: 11, ...input });

function runAll(s: SimulationSpec, scenarioIndex: number, cuts: number[], order: 'forward' | 'reverse'): ReplicateBlock[] {
  const ranges = cuts.slice(0, -1).map((from, i) => [from, cuts[i + 1]!] as const);
  if (order === 'reverse') ranges.reverse();
  const workspace = createWorkspace(s, scenarioIndex);
  return ranges.map(([from, to]) => runReplicates(s, scenarioIndex, from, to, workspace));
}

describe('reproducibility', () => {
  const s = spec({
    design: { arms: 2, clustersPerArm: 4, clusterSize: 6, clusterSizeCv: 0.4 },
    truth: { effect: 0.4, sd: 1, icc: 0.2 },
    scenarios: [{ violation: 'none' }, { violation: 'heavy-tailed' }, { violation: 'outliers', name: 'rare large outliers', fraction: 0.02, scale: 10 }],
    analyses: ['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed'],
    replicates: 60,
  });

  it('gives bit-identical per-replicate fits and results for any chunking and order of chunks', () => {
    const reference = s.scenarios.map((_, i) => runReplicates(s, i, 0, 60));
    const chunkings: [number[], 'forward' | 'reverse'][] = [
      [[0, 7, 30, 31, 60], 'reverse'],
      [Array.from({ length: 61 }, (_, r) => r), 'forward'],
      [[0, 45, 60], 'reverse'],
    ];
    for (const [cuts, order] of chunkings) {
      const blocks = s.scenarios.flatMap((_, i) => runAll(s, i, cuts, order));
      s.scenarios.forEach((_, i) => {
        const merged = mergeBlocks(blocks.filter((b) => b.scenario === reference[i]!.scenario));
        expect(merged, `scenario ${i}, cuts ${cuts.length - 1} chunks ${order}`).toEqual(reference[i]);
      });
      expect(aggregate(s, blocks)).toEqual(aggregate(s, reference));
    }
    // Different data in each scenario, and not all fits equal.
    expect(reference[0]!.estimate).not.toEqual(reference[1]!.estimate);
    expect(new Set(reference[0]!.estimate).size).toBeGreaterThan(100);
  }, SLOW);

  it('changes with the seed', () => {
    const other = { ...s, seed: 12 };
    expect(runReplicates(other, 0, 0, 5).estimate).not.toEqual(runReplicates(s, 0, 0, 5).estimate);
  });

  it('refuses overlapping or missing replicates, and ranges outside the specification', () => {
    const a = runReplicates(s, 0, 0, 10);
    const b = runReplicates(s, 0, 5, 20);
    expect(() => mergeBlocks([a, b])).toThrow(/blocks must be contiguous: one ends at replicate 10, the next starts at 5/);
    expect(() => aggregate(s, [a])).toThrow(/scenario "none" has replicates 0–10, not 0–60/);
    expect(() => aggregate(s, [runReplicates(s, 0, 0, 60)])).toThrow(/no replicates of scenario "heavy-tailed"/);
    expect(() => runReplicates(s, 0, 50, 61)).toThrow(/0 ≤ from ≤ to ≤ 60, got from 50, to 61/);
    expect(() => runReplicates(s, 3, 0, 1)).toThrow(/scenarioIndex must be between 0 and 2, got 3/);
  });
});

describe('operating characteristics against theory (within 3 MC SE)', () => {
  it('ols ignoring clustering (10 classes × 20 pupils per arm, ICC 0.1, DE 2.9): false-positive rate 2·(1 − Φ(1.96/√DE)) ≈ 0.25; cluster-means and mixed hold 5% and 95%; cluster-means has R’s exact power', () => {
    const c = operating.clusterMeans;
    // 2,000 replicates: MC SE 0.0097 for a rate of 0.25, 0.0049 for 0.05 or 0.95, 0.0091 for power 0.79.
    const s = spec({
      design: { arms: 2, clustersPerArm: c.clustersPerArm, clusterSize: c.clusterSize },
      truth: { effect: c.effect, sd: c.sd, icc: c.icc },
      analyses: ['ols', 'cluster-means', 'mixed'],
      replicates: 2000,
      seed: 2019,
    });
    const results = aggregate(s, [runReplicates(s, 0, 0, s.replicates)]).none!;
    const expectedNaive = naiveTypeIError({ designEffect: operating.naive.designEffect });
    expect(Math.abs(expectedNaive - operating.naive.typeIError)).toBeLessThan(1e-12);
    expectWithinMcse('ols type I error under clustering', results.ols!.typeIError.value, expectedNaive, Math.sqrt((expectedNaive * (1 - expectedNaive)) / s.replicates));
    const cm = results['cluster-means']!;
    expectWithinMcse('cluster-means type I error', cm.typeIError.value, 0.05, Math.sqrt((0.05 * 0.95) / s.replicates));
    expectWithinMcse('cluster-means coverage', cm.coverage.value, 0.95, Math.sqrt((0.05 * 0.95) / s.replicates));
    expectWithinMcse('cluster-means power', cm.power.value, c.power, Math.sqrt((c.power * (1 - c.power)) / s.replicates));
    expectWithinMcse('cluster-means bias', cm.bias.value, 0, cm.bias.mcse);
    expectWithinMcse('cluster-means SE ratio', cm.seRatio.value, 1, cm.seRatio.mcse);
    expect(cm.nonConverged.value).toBe(0);
    // The REML mixed model with Satterthwaite df is exact here up to the fits where the cluster
    // variance is estimated as 0 (then it leans towards ols): within 3 MC SE of the nominal rates.
    const mixed = results.mixed!;
    expectWithinMcse('mixed type I error', mixed.typeIError.value, 0.05, Math.sqrt((0.05 * 0.95) / s.replicates));
    expectWithinMcse('mixed coverage', mixed.coverage.value, 0.95, Math.sqrt((0.05 * 0.95) / s.replicates));
    expect(mixed.nonConverged.value).toBeLessThan(20);
    // ols's model SE understates the spread by about √DE.
    expectWithinMcse('ols SE ratio ≈ 1/√DE', results.ols!.seRatio.value, 1 / Math.sqrt(2.9), results.ols!.seRatio.mcse);

    const sentences = summarise(s, { none: results });
    expect(sentences).toContain(`When the assumptions hold, analysed with least squares, the false-positive rate is ${Math.round(100 * results.ols!.typeIError.value)}%, not 5%.`);
    expect(sentences.filter((x) => !x.includes('analysed with least squares,'))).toEqual([]);
  }, SLOW);

  it('ols on independent units: 5% false positives, 95% coverage and R’s exact power (2,000 replicates, MC SE 0.0049 and 0.010)', () => {
    const o = operating.olsIndependent;
    const s = spec({ design: { arms: 2, unitsPerArm: o.unitsPerArm }, truth: { effect: o.effect, sd: o.sd }, replicates: 2000, seed: 1985 });
    const ols = aggregate(s, [runReplicates(s, 0, 0, s.replicates)]).none!.ols!;
    const nominal = Math.sqrt((0.05 * 0.95) / s.replicates);
    expectWithinMcse('ols type I error', ols.typeIError.value, 0.05, nominal);
    expectWithinMcse('ols coverage', ols.coverage.value, 0.95, nominal);
    expectWithinMcse('ols power', ols.power.value, o.power, Math.sqrt((o.power * (1 - o.power)) / s.replicates));
    expectWithinMcse('ols empirical SE = √(2σ²/n)', ols.empiricalSe.value, Math.sqrt(2 / o.unitsPerArm), ols.empiricalSe.mcse);
  }, SLOW);

  it('binary outcomes, independent units (200 per arm, baseline 0.3): ols and logistic glm hold about 5% false positives (1,000 replicates, MC SE 0.0069)', () => {
    const s = spec({ design: { arms: 2, unitsPerArm: 200 }, truth: { effect: Math.log(2), family: 'binary', baseline: 0.3 }, analyses: ['ols', 'glm'], replicates: 1000, seed: 1958 });
    const results = aggregate(s, [runReplicates(s, 0, 0, s.replicates)]).none!;
    const nominal = Math.sqrt((0.05 * 0.95) / s.replicates);
    expectWithinMcse('ols (linear probability) type I error', results.ols!.typeIError.value, 0.05, nominal);
    expectWithinMcse('glm (logistic, Wald) type I error', results.glm!.typeIError.value, 0.05, nominal);
    // The true log odds ratio is log 2; the logistic estimate is consistent for it.
    expectWithinMcse('glm bias on the log-odds scale', results.glm!.bias.value, 0, 3 * results.glm!.bias.mcse, 1);
    expect(results.glm!.nonConverged.value).toBe(0);
  }, SLOW);
});
