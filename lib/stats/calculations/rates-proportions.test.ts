import { describe, expect, it } from 'vitest';
import fixture from './fixtures/rates-proportions.json';
import { exactMismatch, expectNoMismatches, relativeMismatch, run, type Mismatch } from './testing';

/**
 * The count and binary kinds against `fixtures/rates-proportions.json`, written by
 * `fixtures/generate_rates_proportions.R` with Debian's R (stats, MASS, lme4; versions in the
 * file). Three sources, named beside each check:
 * - "formula in R": the published formula computed independently in R (a hand calculation of the
 *   published formula, not a library's implementation of it);
 * - "power.prop.test": R's own two-proportion calculation (Fleiss's normal approximation);
 * - "simulation": seeded R simulations of the data and the analysis, with Monte Carlo SE.
 * Tolerances: 1e-6 relative on power, exact on whole sizes, 1e-6 relative on solved effects.
 */
const POWER_TOLERANCE = 1e-6;
const EFFECT_TOLERANCE = 1e-6;

const num = (value: unknown) => value as number;
const label = (row: object) => JSON.stringify(row);
/** A mismatch for a feasibility that differs (expected and got print as 0 and 1). */
const feasibilityMismatch = (row: object, got: string, expected: string): Mismatch | null =>
  got === expected ? null : { input: `feasibility ${expected} ${label(row)} got ${got}`, expected: 0, got: 1, difference: 1, tolerance: 0 };

/** Drops the fixture's bookkeeping fields so the rest is a request. */
function request(row: Record<string, unknown>, drop: readonly string[]): Record<string, unknown> {
  return Object.fromEntries(Object.entries(row).filter(([key]) => !drop.includes(key)));
}

describe(`count and binary kinds against ${fixture.r} (MASS ${fixture.mass}, lme4 ${fixture.lme4})`, () => {
  it(`two rates: power of ${fixture.twoRates.power.length} designs (formula in R: Wald test on log RR, Poisson and negative binomial variance)`, () => {
    expectNoMismatches(
      fixture.twoRates.power.flatMap((row) => {
        const out = run({ kind: 'two-rates', ...request(row, ['power', 'nGroup2']) });
        return [
          relativeMismatch(`power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE),
          exactMismatch(`nGroup2 ${label(row)}`, num(out.result.nGroup2), row.nGroup2),
        ];
      }),
    );
  });

  it(`two rates: participants per group for ${fixture.twoRates.nPerGroup.length} targets (formula in R)`, () => {
    expectNoMismatches(
      fixture.twoRates.nPerGroup.flatMap((row) => {
        const out = run({ kind: 'two-rates', ...request(row, ['targetPower', 'nPerGroup', 'power', 'nFractional']), power: row.targetPower });
        return [
          exactMismatch(`nPerGroup ${label(row)}`, num(out.result.nPerGroup), row.nPerGroup),
          relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE),
        ];
      }),
    );
  });

  it(`two rates: smallest detectable rate ratio for ${fixture.twoRates.rateRatio.length} designs, both directions and the most powerful reduction (formula in R)`, () => {
    expectNoMismatches(
      fixture.twoRates.rateRatio.flatMap((row) => {
        const out = run({ kind: 'two-rates', ...request(row, ['targetPower', 'feasibility', 'rateRatio', 'peakPower']), power: row.targetPower });
        return [
          feasibilityMismatch(row, out.feasibility, row.feasibility),
          relativeMismatch(`rateRatio ${label(row)}`, num(out.result.rateRatio), row.rateRatio, EFFECT_TOLERANCE),
          'peakPower' in row ? relativeMismatch(`power at the peak ${label(row)}`, num(out.result.power), row.peakPower as number, POWER_TOLERANCE) : null,
        ];
      }),
    );
  });

  it(`cluster rates: power of ${fixture.clusterRates.power.length} designs (formula in R: Hayes & Bennett 1999)`, () => {
    expectNoMismatches(
      fixture.clusterRates.power.map((row) => {
        const out = run({ kind: 'cluster-rates', ...request(row, ['power']) });
        return relativeMismatch(`power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE);
      }),
    );
  });

  it(`cluster rates: clusters per arm for ${fixture.clusterRates.clustersPerArm.length} targets = Hayes & Bennett's c rounded up (formula in R)`, () => {
    expectNoMismatches(
      fixture.clusterRates.clustersPerArm.flatMap((row) => {
        const out = run({ kind: 'cluster-rates', ...request(row, ['targetPower', 'clustersFractional', 'clustersPerArm', 'power']), power: row.targetPower });
        return [
          exactMismatch(`clustersPerArm ${label(row)}`, num(out.result.clustersPerArm), row.clustersPerArm),
          relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE),
        ];
      }),
    );
  });

  it(`cluster rates: cluster size (${fixture.clusterRates.clusterSize.length}, with the plateau) and rate ratio (${fixture.clusterRates.rateRatio.length}) (formula in R)`, () => {
    const mismatches: (Mismatch | null)[] = [];
    for (const row of fixture.clusterRates.clusterSize as Record<string, unknown>[]) {
      const out = run({ kind: 'cluster-rates', ...request(row, ['targetPower', 'plateauPower', 'feasibility', 'clusterSize', 'power']), power: row.targetPower });
      mismatches.push(feasibilityMismatch(row, out.feasibility, row.feasibility as string));
      mismatches.push(relativeMismatch(`plateauPower ${label(row)}`, num(out.result.plateauPower), num(row.plateauPower), POWER_TOLERANCE));
      if (row.feasibility === 'ok') {
        mismatches.push(exactMismatch(`clusterSize ${label(row)}`, num(out.result.clusterSize), num(row.clusterSize)));
        mismatches.push(relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), num(row.power), POWER_TOLERANCE));
      }
    }
    for (const row of fixture.clusterRates.rateRatio) {
      const out = run({ kind: 'cluster-rates', ...request(row, ['targetPower', 'feasibility', 'rateRatio']), power: row.targetPower });
      mismatches.push(feasibilityMismatch(row, out.feasibility, row.feasibility));
      mismatches.push(relativeMismatch(`rateRatio ${label(row)}`, num(out.result.rateRatio), row.rateRatio, EFFECT_TOLERANCE));
    }
    expectNoMismatches(mismatches);
  });

  it(`cluster proportions: power of ${fixture.clusterProportions.power.length} designs (power.prop.test at k·m/DE per arm; the t test on cluster proportions by pt with ncp)`, () => {
    expectNoMismatches(
      fixture.clusterProportions.power.flatMap((row) => {
        const out = run({ kind: 'cluster-proportions', ...request(row, ['power', 'powerT', 'designEffect']) });
        return [
          relativeMismatch(`designEffect ${label(row)}`, num(out.result.designEffect), row.designEffect, 1e-13),
          relativeMismatch(`power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE),
          relativeMismatch(`powerT ${label(row)}`, num(out.result.powerT), row.powerT, POWER_TOLERANCE),
        ];
      }),
    );
  });

  it(`cluster proportions: clusters per arm (${fixture.clusterProportions.clustersPerArm.length}, also by t), cluster size (${fixture.clusterProportions.clusterSize.length}) and p2 (${fixture.clusterProportions.p2.length}) (power.prop.test)`, () => {
    const mismatches: (Mismatch | null)[] = [];
    for (const row of fixture.clusterProportions.clustersPerArm) {
      const out = run({ kind: 'cluster-proportions', ...request(row, ['targetPower', 'nIndividual', 'clustersPerArm', 'power', 'clustersPerArmByT']), power: row.targetPower });
      mismatches.push(exactMismatch(`clustersPerArm ${label(row)}`, num(out.result.clustersPerArm), row.clustersPerArm));
      mismatches.push(exactMismatch(`clustersPerArmByT ${label(row)}`, num(out.result.clustersPerArmByT), row.clustersPerArmByT));
      mismatches.push(relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), row.power, POWER_TOLERANCE));
    }
    for (const row of fixture.clusterProportions.clusterSize as Record<string, unknown>[]) {
      const out = run({ kind: 'cluster-proportions', ...request(row, ['targetPower', 'plateauPower', 'feasibility', 'clusterSize', 'power']), power: row.targetPower });
      mismatches.push(feasibilityMismatch(row, out.feasibility, row.feasibility as string));
      mismatches.push(relativeMismatch(`plateauPower ${label(row)}`, num(out.result.plateauPower), num(row.plateauPower), POWER_TOLERANCE));
      if (row.feasibility === 'ok') {
        mismatches.push(exactMismatch(`clusterSize ${label(row)}`, num(out.result.clusterSize), num(row.clusterSize)));
        mismatches.push(relativeMismatch(`achieved power ${label(row)}`, num(out.result.power), num(row.power), POWER_TOLERANCE));
      }
    }
    for (const row of fixture.clusterProportions.p2) {
      const out = run({ kind: 'cluster-proportions', ...request(row, ['targetPower', 'p2']), power: row.targetPower });
      mismatches.push(relativeMismatch(`p2 ${label(row)}`, num(out.result.p2), row.p2, EFFECT_TOLERANCE));
    }
    expectNoMismatches(mismatches);
  });

  it(`two proportions with the effect as a risk ratio, odds ratio or difference: ${fixture.twoProportionsEffects.length} designs (power.prop.test)`, () => {
    expectNoMismatches(
      (fixture.twoProportionsEffects as Record<string, unknown>[]).flatMap((row) => {
        const out = run({ kind: 'two-proportions', ...request(row, ['targetPower', 'p2', 'nPerGroup', 'measure']), power: row.targetPower });
        return [
          relativeMismatch(`p2 ${label(row)}`, num(out.result.p2), num(row.p2), 1e-14),
          relativeMismatch(`${row.measure} back ${label(row)}`, num(out.result[row.measure as string]), num(row[row.measure as string]), 1e-12),
          exactMismatch(`nPerGroup ${label(row)}`, num(out.result.nPerGroup), num(row.nPerGroup)),
        ];
      }),
    );
  });
});

/**
 * How close the formulas are to the power of a real analysis of simulated data (R, seeded; the
 * rows name the analysis). Tolerance: 3 Monte Carlo SE plus the approximation error allowed for
 * the formula, stated per kind. Each row's difference is printed on failure with its inputs.
 */
describe('simulation cross-checks (seeded R simulations, Monte Carlo SE)', () => {
  function simulationMismatch(row: { simulatedPower: number; monteCarloSe: number }, formula: number, allowed: { below: number; above: number }, what: string): Mismatch | null {
    const difference = row.simulatedPower - formula;
    const ok = difference >= -(3 * row.monteCarloSe + allowed.below) && difference <= 3 * row.monteCarloSe + allowed.above;
    return ok ? null : { input: `${what} ${label(row)}`, expected: row.simulatedPower, got: formula, difference, tolerance: 3 * row.monteCarloSe + Math.max(allowed.below, allowed.above) };
  }

  it(`two rates: ${fixture.twoRates.simulation.length} designs, glm (Poisson) or glm.nb Wald test — formula within 3 MCSE + 0.01`, () => {
    expectNoMismatches(
      fixture.twoRates.simulation.flatMap((row) => {
        const out = run({ kind: 'two-rates', ...request(row, ['seed', 'formulaPower', 'analysis', 'replicates', 'simulatedPower', 'monteCarloSe', 'failedFits']) });
        return [
          relativeMismatch(`formula power ${label(row)}`, num(out.result.power), row.formulaPower, POWER_TOLERANCE),
          simulationMismatch(row, num(out.result.power), { below: 0.01, above: 0.01 }, 'simulated vs formula'),
          row.failedFits === 0 ? null : { input: `failed fits ${label(row)}`, expected: 0, got: row.failedFits, difference: row.failedFits, tolerance: 0 },
        ];
      }),
    );
  });

  it(`cluster rates: ${fixture.clusterRates.simulation.length} designs, t test on cluster rates — Hayes & Bennett within 3 MCSE below and up to 0.02 conservative`, () => {
    expectNoMismatches(
      fixture.clusterRates.simulation.flatMap((row) => {
        const out = run({ kind: 'cluster-rates', ...request(row, ['seed', 'formulaPower', 'analysis', 'replicates', 'simulatedPower', 'monteCarloSe']) });
        return [
          relativeMismatch(`formula power ${label(row)}`, num(out.result.power), row.formulaPower, POWER_TOLERANCE),
          simulationMismatch(row, num(out.result.power), { below: 0, above: 0.02 }, 'simulated vs formula'),
        ];
      }),
    );
  });

  it(`cluster proportions: ${fixture.clusterProportions.simulation.length} designs — the t test on cluster proportions within 3 MCSE + 0.01 of powerT; the normal approximation above it`, () => {
    const mismatches: (Mismatch | null)[] = [];
    for (const row of fixture.clusterProportions.simulation) {
      const out = run({ kind: 'cluster-proportions', ...request(row, ['seed', 'formulaPower', 'formulaPowerT', 'analysis', 'replicates', 'simulatedPower', 'monteCarloSe', 'failedFits']) });
      mismatches.push(relativeMismatch(`formula power ${label(row)}`, num(out.result.power), row.formulaPower, POWER_TOLERANCE));
      mismatches.push(relativeMismatch(`formula powerT ${label(row)}`, num(out.result.powerT), row.formulaPowerT, POWER_TOLERANCE));
      expect(num(out.result.power), label(row)).toBeGreaterThan(num(out.result.powerT));
      if (row.analysis.startsWith('t test')) {
        mismatches.push(simulationMismatch(row, num(out.result.powerT), { below: 0.01, above: 0.01 }, 'simulated t test vs powerT'));
      } else {
        // The logistic mixed model's Wald test is at least as powerful as the t test (with few
        // clusters its false-positive rate is also above alpha, which this row does not measure).
        mismatches.push(simulationMismatch(row, num(out.result.powerT), { below: 0, above: 1 }, 'simulated mixed model vs powerT'));
      }
    }
    expectNoMismatches(mismatches);
  });
});
