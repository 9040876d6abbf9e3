import { describe, expect, it } from 'vitest';
import fixture from './fixtures/models.json';
import { analyse, type AnalysisOptions } from './index';
import type { AnalysisName, Dataset, FixedEffects } from './types';

/**
 * Reference values: `fixtures/models.json`, written by `fixtures/generate_models.R` with Debian's
 * R and its sandwich, clubSandwich and MASS packages (versions in the file's header): lm,
 * vcovHC(type = "HC3"), coef_test(vcov = "CR2", test = "Satterthwaite"), rlm + summary /
 * sandwich, glm, on three invented data sets and three of R's datasets package.
 */

/** The figure: estimates, SEs and df to 1e-6 relative. */
const RELATIVE = 1e-6;

interface FixtureDataset {
  name: string;
  n: number;
  treat: number[];
  time?: number[];
  covariates: Record<string, number[]>;
  outcomes: Record<string, number[]>;
  groups: { name: string; id: number[] }[];
}

interface FixtureCase {
  dataset: string;
  outcome: string;
  analysis: string;
  fixed: FixedEffects;
  options: Record<string, unknown>;
  estimate: number;
  se: number;
  df: number | null;
  reference: string;
}

function datasetOf(name: string, outcome: string): Dataset {
  const d = (fixture.datasets as unknown as FixtureDataset[]).find((s) => s.name === name)!;
  return {
    n: d.n,
    y: Float64Array.from(d.outcomes[outcome]!),
    treat: Float64Array.from(d.treat),
    ...(d.time ? { time: Float64Array.from(d.time) } : {}),
    covariates: Object.fromEntries(Object.entries(d.covariates).map(([k, v]) => [k, Float64Array.from(v)])),
    groups: d.groups.map((g) => ({
      name: g.name,
      id: Int32Array.from(g.id),
      count: Math.max(...g.id) + 1,
    })),
  };
}

/** Passes when |got − expected| ≤ relative·|expected|; the message says by how much it missed. */
function expectRelativelyClose(input: string, got: number, expected: number, relative: number): void {
  const difference = Math.abs(got - expected);
  const tolerance = relative * Math.abs(expected);
  expect(
    difference <= tolerance,
    `${input}: expected ${expected}, got ${got}, difference ${difference.toExponential(3)}, ` +
      `tolerance ${tolerance.toExponential(3)} (relative ${relative})`,
  ).toBe(true);
}

function describeCase(c: FixtureCase): string {
  const terms = ['treat', ...c.fixed.covariates];
  if (c.fixed.includeTime || c.fixed.target === 'treat:time') terms.push('time');
  if (c.fixed.target === 'treat:time') terms.push('treat:time');
  const opts = Object.keys(c.options).length ? ` ${JSON.stringify(c.options)}` : '';
  return `${c.analysis} on ${c.dataset} (${c.outcome} ~ ${terms.join(' + ')}, effect ${c.fixed.target})${opts}`;
}

const cases = (fixture.cases as unknown as FixtureCase[]).map((c) => [describeCase(c), c] as const);

describe('estimators against R (lm, sandwich, clubSandwich, MASS::rlm, glm)', () => {
  it.each(cases)('%s', (label, c) => {
    const data = datasetOf(c.dataset, c.outcome);
    const got = analyse(c.analysis as AnalysisName, data, c.fixed, c.options as AnalysisOptions);
    expect(got.converged, `${label}: did not converge`).toBe(true);
    expectRelativelyClose(`${label}: estimate`, got.estimate, c.estimate, RELATIVE);
    expectRelativelyClose(`${label}: SE`, got.se, c.se, RELATIVE);
    if (c.df === null) expect(got.df).toBe(Infinity);
    else expectRelativelyClose(`${label}: df`, got.df, c.df, RELATIVE);
  });

  it('covers every analysis but mixed, with and without the closed-form path', () => {
    const names = new Set(cases.map(([, c]) => c.analysis));
    expect([...names].sort()).toEqual(['cluster-means', 'cluster-robust', 'glm', 'huber', 'log-ols', 'ols', 'ols-hc3']);
  });
});
