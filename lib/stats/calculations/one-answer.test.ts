/**
 * One answer per question (issue 11): the number Unitwise leads with is the exact one, and two
 * routes to the same question give the same number. Every expected value comes from R 4.2.2
 * (stats: power.t.test with strict = TRUE, power.prop.test, pt/qt with noncentrality), written
 * by fixtures/generate_one_answer.R into fixtures/one-answer.json; the source is named beside
 * each check.
 */
import { describe, expect, it } from 'vitest';
import fixture from './fixtures/one-answer.json';
import { calculationSchema } from './request';
import { calculate } from './index';

const run = (request: Record<string, unknown>) => calculate(calculationSchema.parse(request));

describe('one answer per question', () => {
  it(`repeated measures leads with the exact t answer (${fixture.repeatedMeasures.nPerGroup}); the normal formula (${fixture.repeatedMeasures.nPerGroupNormal}) is only beside it`, () => {
    // R: smallest n with the noncentral-t power (pt, df = 2n − 3) ≥ 0.9 → 42; Frison & Pocock's normal formula → 41.
    const out = run(fixture.repeatedMeasures.request);
    expect(out.result.nPerGroup).toBe(fixture.repeatedMeasures.nPerGroup);
    expect(out.result.nPerGroupNormal).toBe(fixture.repeatedMeasures.nPerGroupNormal);
    expect(out.result.power as number).toBeGreaterThanOrEqual(0.9);
    // The note may name the normal formula's number, never a size above the headline.
    for (const w of out.warnings) expect(w).not.toMatch(new RegExp(`${fixture.repeatedMeasures.nPerGroup + 1} per group`));
  });

  it('with one baseline and one follow-up, "follow-up only" and the two-group calculation agree with power.t.test', () => {
    const { delta, sd, power, nPerGroup } = fixture.postOneFollowUp; // R: ceiling(power.t.test(delta = 0.5, sd = 1, power = 0.8, strict = TRUE)$n) = 64
    const post = run({ kind: 'repeated-measures', analysis: 'post', baselines: 1, followUps: 1, rho: 0.5, delta, sd, power });
    const twoGroup = run({ kind: 'two-group-means', delta, sd, power });
    expect(post.result.nPerGroup).toBe(nPerGroup);
    expect(twoGroup.result.nPerGroup).toBe(nPerGroup);
    expect(post.result.power).toBeCloseTo(twoGroup.result.power as number, 12);
  });

  it('under Bonferroni each outcome is planned at the adjusted level', () => {
    const { delta, sd, power, alpha, outcomes, alphaAdjusted, nPerGroup } = fixture.bonferroni; // R: power.t.test(..., sig.level = 0.025, strict = TRUE) → 213
    const out = run({ kind: 'two-group-means', delta, sd, power, alpha, outcomes, multiplicity: 'bonferroni' });
    expect(out.result.alphaAdjusted).toBe(alphaAdjusted);
    expect(out.result.nPerGroup).toBe(nPerGroup);
  });

  it('the optimal cluster size needs only the ICC and the two costs (Raudenbush 1997)', () => {
    const { icc, costPerCluster, costPerUnit, clusterSize, clusterSizeInteger } = fixture.optimalClusterSize; // R: sqrt(1200/40 × 0.85/0.15) = 13.04 → 13
    const out = run({ kind: 'optimal-allocation', icc, costPerCluster, costPerUnit });
    expect(out.result.clusterSize).toBeCloseTo(clusterSize, 12);
    expect(out.result.clusterSizeInteger).toBe(clusterSizeInteger);
    expect(out.result.clustersPerArm).toBeUndefined();
    // With a target the clusters follow, at the same cluster size.
    const withTarget = run({ kind: 'optimal-allocation', icc, costPerCluster, costPerUnit, delta: 0.3, sd: 1, power: 0.8 });
    expect(withTarget.result.clusterSizeInteger).toBe(clusterSizeInteger);
    expect(withTarget.result.clustersPerArm as number).toBeGreaterThan(1);
  });

  it('two proportions with independent units agree with power.prop.test', () => {
    const { p1, p2, power, nPerGroup } = fixture.twoProportions; // R: ceiling(power.prop.test(p1 = 0.55, p2 = 0.7, power = 0.8)$n) = 163
    expect(run({ kind: 'two-proportions', p1, p2, power }).result.nPerGroup).toBe(nPerGroup);
  });
});
