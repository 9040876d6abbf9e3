import { describe, it } from 'vitest';
import { calculationSchema } from './request';
import fixture from './fixtures/calculations.json';
import { calculate } from './index';
import { exactMismatch, expectNoMismatches, relativeMismatch, type Mismatch } from './testing';

/**
 * Every kind against R: `fixtures/calculations.json`, written by
 * `fixtures/generate_calculations.R` with Debian's R (stats: power.t.test(strict = TRUE),
 * power.prop.test, pt/qt/pf/qf/pnorm/qnorm) and pwr (pwr.t2n.test, pwr.f2.test); the versions
 * are in the file. Tolerances: 1e-6 relative on power, exact on whole sizes, 1e-6 relative on
 * solved effects (R's uniroot runs at tol 1e-15 there; ours at 1e-10 relative).
 */
const POWER_TOLERANCE = 1e-6;
const EFFECT_TOLERANCE = 1e-6;

function run(input: Record<string, unknown>) {
  return calculate(calculationSchema.parse(input));
}

const num = (value: unknown) => value as number;
const label = (row: object) => JSON.stringify(row);

describe(`reference values from ${fixture.r}, pwr ${fixture.pwr}`, () => {
  it(`two-group means: power of ${fixture.twoGroupMeans.power.length} designs (pwr.t2n.test, power.t.test strict)`, () => {
    expectNoMismatches(
      fixture.twoGroupMeans.power.flatMap((row) => {
        const { power: expected, n2, ...input } = row;
        const out = run({ kind: 'two-group-means', ...input });
        return [
          relativeMismatch(`power ${label(row)}`, num(out.result.power), expected, POWER_TOLERANCE),
          exactMismatch(`n2 ${label(row)}`, num(out.result.nGroup2), n2),
        ];
      }),
    );
  });

  it(`two-group means: nPerGroup for ${fixture.twoGroupMeans.nPerGroup.length} targets`, () => {
    expectNoMismatches(
      fixture.twoGroupMeans.nPerGroup.flatMap((row) => {
        const out = run({ kind: 'two-group-means', delta: row.delta, sd: row.sd, alpha: row.alpha, sides: row.sides, ratio: row.ratio, power: row.targetPower });
        return [
          exactMismatch(`nPerGroup ${label(row)}`, num(out.result.nPerGroup), row.nPerGroup),
          relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE),
        ];
      }),
    );
  });

  it(`two-group means: delta for ${fixture.twoGroupMeans.delta.length} designs`, () => {
    expectNoMismatches(
      fixture.twoGroupMeans.delta.map((row) => {
        const out = run({ kind: 'two-group-means', nPerGroup: row.nPerGroup, sd: row.sd, alpha: row.alpha, sides: row.sides, power: row.targetPower });
        return relativeMismatch(`delta ${label(row)}`, num(out.result.delta), row.delta, EFFECT_TOLERANCE);
      }),
    );
  });

  it(`regression: power of ${fixture.regression.power.length} designs (pwr.f2.test where u = k, pf otherwise)`, () => {
    expectNoMismatches(
      fixture.regression.power.map((row) => {
        const out = run({ kind: 'regression', n: row.n, predictors: row.predictors, testedPredictors: row.testedPredictors, f2: row.f2, alpha: row.alpha });
        return relativeMismatch(`power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE);
      }),
    );
  });

  it(`regression: n for ${fixture.regression.n.length} targets and f2 for ${fixture.regression.f2.length} designs`, () => {
    expectNoMismatches([
      ...fixture.regression.n.flatMap((row) => {
        const out = run({ kind: 'regression', predictors: row.predictors, testedPredictors: row.testedPredictors, f2: row.f2, alpha: row.alpha, power: row.targetPower });
        return [
          exactMismatch(`n ${label(row)}`, num(out.result.n), row.n),
          relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE),
        ];
      }),
      ...fixture.regression.f2.map((row) => {
        const out = run({ kind: 'regression', n: row.n, predictors: row.predictors, testedPredictors: row.testedPredictors, alpha: row.alpha, power: row.targetPower });
        return relativeMismatch(`f2 ${label(row)}`, num(out.result.f2), row.f2, EFFECT_TOLERANCE);
      }),
    ]);
  });

  it(`cluster means: power of ${fixture.clusterMeans.power.length} designs (pt with ncp)`, () => {
    expectNoMismatches(
      fixture.clusterMeans.power.map((row) => {
        const { power, ...input } = row;
        return relativeMismatch(`power ${label(row)}`, num(run({ kind: 'cluster-means', ...input }).result.power), power, POWER_TOLERANCE);
      }),
    );
  });

  it(`cluster means: clusters per arm (${fixture.clusterMeans.clustersPerArm.length}), cluster size (${fixture.clusterMeans.clusterSize.length}) and delta (${fixture.clusterMeans.delta.length})`, () => {
    const mismatches: (Mismatch | null)[] = [];
    for (const row of fixture.clusterMeans.clustersPerArm) {
      const { targetPower, clustersPerArm, power, ...input } = row;
      const out = run({ kind: 'cluster-means', ...input, power: targetPower });
      mismatches.push(exactMismatch(`clustersPerArm ${label(row)}`, num(out.result.clustersPerArm), clustersPerArm));
      mismatches.push(relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), power, POWER_TOLERANCE));
    }
    for (const row of fixture.clusterMeans.clusterSize) {
      const { targetPower, clusterSize, plateauPower, ...input } = row as typeof row & { power?: number };
      const { power: achieved, ...rest } = input as typeof input & { power?: number };
      const out = run({ kind: 'cluster-means', ...rest, power: targetPower });
      mismatches.push(relativeMismatch(`plateauPower ${label(row)}`, num(out.result.plateauPower), plateauPower, POWER_TOLERANCE));
      if (clusterSize === null) {
        mismatches.push(out.feasibility === 'unreachable' ? null : { input: `feasibility ${label(row)}`, expected: 0, got: 1, difference: 1, tolerance: 0 });
      } else {
        mismatches.push(exactMismatch(`clusterSize ${label(row)}`, num(out.result.clusterSize), clusterSize));
        mismatches.push(relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), achieved!, POWER_TOLERANCE));
      }
    }
    for (const row of fixture.clusterMeans.delta) {
      const { targetPower, delta, ...input } = row;
      const out = run({ kind: 'cluster-means', ...input, power: targetPower });
      mismatches.push(relativeMismatch(`delta ${label(row)}`, num(out.result.delta), delta, EFFECT_TOLERANCE));
    }
    expectNoMismatches(mismatches);
  });

  // The answer is the t test's (R: pt with ncp, uniroot); the published normal formula rides beside it.
  it(`repeated measures: ${fixture.repeatedMeasures.length} designs, exact t power, n and delta; the normal approximation beside them`, () => {
    expectNoMismatches(
      fixture.repeatedMeasures.flatMap((row) => {
        const input = { kind: 'repeated-measures', analysis: row.analysis, baselines: row.baselines, followUps: row.followUps, rho: row.rho, sd: row.sd, alpha: row.alpha };
        const byPower = run({ ...input, delta: row.delta, nPerGroup: row.nPerGroup });
        const byN = run({ ...input, delta: row.delta, power: row.targetPower });
        const byDelta = run({ ...input, nPerGroup: row.nPerGroup, power: row.targetPower });
        return [
          relativeMismatch(`varianceFactor ${label(row)}`, num(byPower.result.varianceFactor), row.factor, 1e-12),
          relativeMismatch(`power ${label(row)}`, num(byPower.result.power), row.powerT, POWER_TOLERANCE),
          relativeMismatch(`powerNormal ${label(row)}`, num(byPower.result.powerNormal), row.power, POWER_TOLERANCE),
          exactMismatch(`nPerGroup ${label(row)}`, num(byN.result.nPerGroup), row.nPerGroupNeededT),
          exactMismatch(`nPerGroupNormal ${label(row)}`, num(byN.result.nPerGroupNormal), row.nPerGroupNeeded),
          relativeMismatch(`delta ${label(row)}`, num(byDelta.result.delta), row.deltaT, EFFECT_TOLERANCE),
        ];
      }),
    );
  });

  it(`longitudinal slopes: ${fixture.longitudinalSlopes.length} designs`, () => {
    expectNoMismatches(
      fixture.longitudinalSlopes.flatMap((row) => {
        const input = { kind: 'longitudinal-slopes', times: row.times, rho: row.rho, sd: row.sd, alpha: row.alpha, slopeDifference: row.slopeDifference };
        const byPower = run({ ...input, nPerGroup: row.nPerGroup });
        const byN = run({ ...input, power: row.targetPower });
        const byEffect = run({ ...input, slopeDifference: undefined, nPerGroup: row.nPerGroup, power: row.targetPower });
        return [
          relativeMismatch(`power ${label(row)}`, num(byPower.result.power), row.powerT, POWER_TOLERANCE),
          relativeMismatch(`powerNormal ${label(row)}`, num(byPower.result.powerNormal), row.power, POWER_TOLERANCE),
          exactMismatch(`nPerGroup ${label(row)}`, num(byN.result.nPerGroup), row.nPerGroupNeededT),
          exactMismatch(`nPerGroupNormal ${label(row)}`, num(byN.result.nPerGroupNormal), row.nPerGroupNeeded),
          relativeMismatch(`slopeDifference ${label(row)}`, num(byEffect.result.slopeDifference), row.slopeDifferenceT, EFFECT_TOLERANCE),
        ];
      }),
    );
  });

  it(`two proportions: power (${fixture.twoProportions.power.length}), n (${fixture.twoProportions.nPerGroup.length}) and p2 (${fixture.twoProportions.p2.length}) against power.prop.test`, () => {
    expectNoMismatches([
      ...fixture.twoProportions.power.map((row) => {
        const { power, ...input } = row;
        return relativeMismatch(`power ${label(row)}`, num(run({ kind: 'two-proportions', ...input }).result.power), power, POWER_TOLERANCE);
      }),
      ...fixture.twoProportions.nPerGroup.map((row) => {
        const out = run({ kind: 'two-proportions', p1: row.p1, p2: row.p2, alpha: row.alpha, sides: row.sides, power: row.targetPower, continuityCorrection: row.continuityCorrection });
        return exactMismatch(`nPerGroup ${label(row)}`, num(out.result.nPerGroup), row.nPerGroup);
      }),
      ...fixture.twoProportions.p2.map((row) => {
        const out = run({ kind: 'two-proportions', p1: row.p1, nPerGroup: row.nPerGroup, alpha: row.alpha, sides: row.sides, power: row.targetPower });
        return relativeMismatch(`p2 ${label(row)}`, num(out.result.p2), row.p2, EFFECT_TOLERANCE);
      }),
    ]);
  });

  it(`design effect: ${fixture.designEffect.length} designs`, () => {
    expectNoMismatches(
      fixture.designEffect.flatMap((row) => {
        const out = run({ kind: 'design-effect', clusterSize: row.clusterSize, icc: row.icc, cv: row.cv, alpha: row.alpha, totalObservations: row.totalObservations });
        return [
          relativeMismatch(`designEffect ${label(row)}`, num(out.result.designEffect), row.designEffect, 1e-13),
          relativeMismatch(`effectiveSampleSize ${label(row)}`, num(out.result.effectiveSampleSize), row.effectiveSampleSize, 1e-13),
          relativeMismatch(`naiveTypeIError ${label(row)}`, num(out.result.naiveTypeIError), row.naiveTypeIError, 1e-12),
        ];
      }),
    );
  });

  it(`optimal allocation: ${fixture.optimalAllocation.length} cost settings`, () => {
    expectNoMismatches(
      fixture.optimalAllocation.flatMap((row) => {
        const out = run({
          kind: 'optimal-allocation',
          icc: row.icc,
          costPerCluster: row.costPerCluster,
          costPerUnit: row.costPerUnit,
          budget: row.budget,
          delta: row.delta,
          sd: row.sd,
          alpha: row.alpha,
        });
        return [
          relativeMismatch(`clusterSize ${label(row)}`, num(out.result.clusterSize), row.clusterSize, 1e-14),
          exactMismatch(`clusterSizeInteger ${label(row)}`, num(out.result.clusterSizeInteger), row.clusterSizeInteger),
          exactMismatch(`clustersPerArm ${label(row)}`, num(out.result.clustersPerArm), row.clustersPerArm),
          row.power === null ? null : relativeMismatch(`power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE),
        ];
      }),
    );
  });
});
