import { describe, expect, it } from 'vitest';
import fixture from './fixtures/glmm.json';
import { gaussHermite } from './gauss-hermite';
import { fitGlmm, fitGlmmFull, fitGlmmProblem, type GlmmFit, type GlmmProblem } from './glmm';
import { buildPatterns, GlmmCriterion } from './glmm-criterion';
import { expectNoMismatches, mismatch, type Mismatch } from '@/lib/stats/test-helpers';
import type { Dataset, FixedEffects } from './types';

/**
 * Reference values: `fixtures/glmm.json`, written by `fixtures/generate_glmm.R` with Debian's R
 * and lme4 1.1-31 (versions in the file). For each data set and number of quadrature points:
 *
 * - `expected`: the optimum of lme4's deviance formula evaluated directly in R (modes to 1e-15,
 *   checked against lme4's own deviance function), found by Newton steps on Richardson-
 *   extrapolated differences; SEs from 2·H⁻¹, H the Hessian in (θ, β) — glmer's definition.
 *   Tolerances: β 1e-9 of max(|β̂|, SE), SEs 1e-6, σ 1e-9, deviance 1e-10 (relative).
 *   Achieved (19 fits): β within 2e-10, SEs within 8e-8, σ within 3e-8, deviance within 1e-14;
 *   a variance on the boundary comes out below 1e-10 (compared absolutely, to 1e-8).
 * - `lme4Devfun`: the same optimum of lme4's own deviance function (glmerControl(tolPwrss =
 *   1e-14)). Its inner IRLS leaves the modes accurate to about √tolPwrss, which moves the Laplace
 *   deviance by up to 7e-7 (binary-pairs): β within 1e-5, SEs within 2e-4, as the issue asks.
 *   Achieved: β 1.5e-6, SEs 1.7e-4 (Laplace, binary-pairs), 1.4e-7 with quadrature.
 * - `lme4Tight`: glmer's own fit at tolPwrss = 1e-14 and BOBYQA rhoend = 1e-10: β and σ within
 *   1e-5 (achieved 1.5e-6 and 1.2e-5 of max(σ, 0.01)); its SEs come from a finite-difference
 *   Hessian of that deviance (step 1e-4), within 1e-5 except on binary-pairs with the Laplace
 *   approximation, where the noise of the deviance breaks it (SE off by a factor 4.7).
 * - `lme4Default`: glmer with its defaults, as users see it: β within 5e-4 of max(|β̂|, SE) and
 *   SEs within 1.5e-2 of ours (achieved 4.1e-4 and 1.3e-2, both cbpp with the Laplace
 *   approximation: glmer's default inner tolerance leaves its Laplace deviance 6e-4 off).
 */

interface Estimates {
  beta: number[];
  se: number[];
  sigma: number;
  deviance?: number;
  singular?: boolean;
}

interface FixtureFit {
  nAGQ: number;
  expected: Required<Estimates>;
  lme4Devfun: Estimates;
  lme4Default: Estimates;
  lme4Tight: Estimates;
}

interface FixtureSet {
  name: string;
  source: string;
  family: 'binomial' | 'poisson';
  n: number;
  columns: string[];
  model: FixedEffects;
  data: {
    y: number[];
    trials?: number[];
    treat: number[];
    covariates?: Record<string, number[]>;
    groups: { name: string; id: number[]; count: number }[];
  };
  fits: FixtureFit[];
}

const SETS = fixture.glmm as unknown as FixtureSet[];

function set(name: string): FixtureSet {
  const found = SETS.find((s) => s.name === name);
  if (!found) throw new Error(`no fixture data set "${name}"`);
  return found;
}

function problemOf(s: FixtureSet): GlmmProblem {
  const n = s.n;
  const p = s.columns.length;
  const x = new Float64Array(n * p);
  x.fill(1, 0, n);
  x.set(s.data.treat, n);
  s.model.covariates.forEach((c, j) => x.set(s.data.covariates![c]!, (j + 2) * n));
  const g = s.data.groups[0]!;
  return {
    family: s.family,
    n,
    p,
    x,
    y: Float64Array.from(s.data.y),
    ...(s.data.trials ? { trials: Float64Array.from(s.data.trials) } : {}),
    group: { name: g.name, id: Int32Array.from(g.id), count: g.count },
    names: s.columns,
  };
}

/** The data set of a fixture with 0/1 or count rows (binomial rows with trials expanded into 0/1 rows). */
function datasetOf(s: FixtureSet): Dataset {
  const rows: { y: number; treat: number; covariates: number[]; group: number }[] = [];
  s.data.y.forEach((y, i) => {
    const covariates = s.model.covariates.map((c) => s.data.covariates![c]![i]!);
    const base = { treat: s.data.treat[i]!, covariates, group: s.data.groups[0]!.id[i]! };
    const trials = s.data.trials?.[i];
    if (trials === undefined) rows.push({ ...base, y });
    else for (let k = 0; k < trials; k++) rows.push({ ...base, y: k < y ? 1 : 0 });
  });
  return {
    n: rows.length,
    y: Float64Array.from(rows, (r) => r.y),
    treat: Float64Array.from(rows, (r) => r.treat),
    covariates: Object.fromEntries(s.model.covariates.map((c, j) => [c, Float64Array.from(rows, (r) => r.covariates[j]!)])),
    groups: [{ name: s.data.groups[0]!.name, id: Int32Array.from(rows, (r) => r.group), count: s.data.groups[0]!.count }],
  };
}

function check(input: string, got: number, expected: number, tolerance: number): Mismatch | null {
  return mismatch(input, got, expected, { absolute: tolerance });
}

/** Mismatches of β (relative to max(|β̂|, SE)), SEs and σ against one set of reference estimates. */
function compare(label: string, s: FixtureSet, fit: GlmmFit, ref: Estimates, tol: { beta: number; se: number; sigma: number }, options: { se?: boolean } = {}): (Mismatch | null)[] {
  const scaleSe = s.fits[0]!.expected.se;
  return [
    ...ref.beta.map((b, k) => check(`${label} β[${s.columns[k]}]`, fit.beta[k]!, b, tol.beta * Math.max(Math.abs(b), scaleSe[k]!))),
    ...(options.se === false ? [] : ref.se.map((se, k) => check(`${label} SE[${s.columns[k]}]`, fit.se[k]!, se, tol.se * se))),
    // A variance on the boundary: |θ̂| below 1e-8 is 0 for every purpose (lme4 calls 1e-4 singular).
    check(`${label} σ`, fit.sigma, ref.sigma, ref.sigma === 0 ? 1e-8 : tol.sigma * Math.max(ref.sigma, 0.01)),
  ];
}

const CASES = SETS.flatMap((s) => s.fits.map((f) => [`${s.name}, nAGQ ${f.nAGQ}`, s, f] as const));

describe.each(CASES)('GLMM fit of %s against lme4', (label, s, f) => {
  const fit = fitGlmmProblem(problemOf(s), { quadraturePoints: f.nAGQ });

  it('converges; singular exactly when the reference is on the boundary', () => {
    expect(fit.converged, `${label}: converged`).toBe(true);
    expect(fit.singular, `${label}: singular`).toBe(f.expected.singular);
  });

  it('β to 1e-9, SEs to 1e-6, σ to 1e-9 and the deviance to 1e-10 of the reference optimum (lme4’s formula, evaluated directly)', () => {
    expectNoMismatches([
      ...compare(label, s, fit, f.expected, { beta: 1e-9, se: 1e-6, sigma: 1e-9 }),
      check(`${label} deviance`, fit.deviance, f.expected.deviance, 1e-10 * f.expected.deviance),
    ]);
  });

  it('β to 1e-5 and SEs to 2e-4 of the optimum of lme4’s own deviance function', () => {
    expectNoMismatches(compare(`${label} (lme4 devfun)`, s, fit, f.lme4Devfun, { beta: 1e-5, se: 2e-4, sigma: 1e-5 }));
  });

  it('β and σ to 1e-5 of glmer’s own tight fit; its SEs to 1e-5 where its finite-difference Hessian is usable', () => {
    const brokenHessian = s.name === 'binary-pairs' && f.nAGQ === 1;
    expectNoMismatches(compare(`${label} (glmer tight)`, s, fit, f.lme4Tight, { beta: 1e-5, se: 1e-5, sigma: 2e-5 }, { se: !brokenHessian }));
  });

  it('β within 5e-4 and SEs within 1.5e-2 of glmer with its default settings', () => {
    expectNoMismatches(compare(`${label} (glmer default)`, s, fit, f.lme4Default, { beta: 5e-4, se: 1.5e-2, sigma: 5e-4 }));
  });
});

describe('cbpp: the example of lme4’s glmer help page', () => {
  const s = set('cbpp');

  it('glmer’s default fit in the fixture prints the documented summary (−1.3983, −0.9919, −1.1282, −1.5797; SEs 0.2312, 0.3032, 0.3228, 0.4220; herd variance 0.4123)', () => {
    const d = s.fits.find((f) => f.nAGQ === 1)!.lme4Default;
    expect(d.beta.map((b) => b.toFixed(4))).toEqual(['-1.3983', '-0.9919', '-1.1282', '-1.5797']);
    expect(d.se.map((b) => b.toFixed(4))).toEqual(['0.2312', '0.3032', '0.3228', '0.4220']);
    expect((d.sigma ** 2).toFixed(4)).toBe('0.4123');
  });

  it('our Laplace fit is within 7e-4 of those figures in β (0.2% of an SE) and 1.3% in the SEs — glmer’s default tolerances, not ours (see the fixture header)', () => {
    const fit = fitGlmmProblem(problemOf(s));
    const printed = [-1.3983, -0.9919, -1.1282, -1.5797];
    const printedSe = [0.2312, 0.3032, 0.3228, 0.422];
    expectNoMismatches([
      ...printed.map((b, k) => check(`β[${k}]`, fit.beta[k]!, b, 7e-4)),
      ...printedSe.map((se, k) => check(`SE[${k}]`, fit.se[k]!, se, 0.015 * se)),
      check('herd variance', fit.sigma ** 2, 0.4123, 0.002),
    ]);
  });

  it('the same estimates from the data set expanded into 0/1 rows (the analysis path), the deviance higher by 2 Σ ln C(m, y)', () => {
    const aggregated = fitGlmmProblem(problemOf(s));
    const full = fitGlmmFull(datasetOf(s), s.model);
    let logChoose = 0;
    s.data.y.forEach((y, i) => {
      const m = s.data.trials![i]!;
      for (let k = 1; k <= y; k++) logChoose += Math.log((m - y + k) / k);
    });
    expectNoMismatches([
      ...Array.from(aggregated.beta, (b, k) => check(`β[${k}]`, full.beta[k]!, b, 1e-9 * Math.max(Math.abs(b), aggregated.se[k]!))),
      ...Array.from(aggregated.se, (se, k) => check(`SE[${k}]`, full.se[k]!, se, 1e-7 * se)),
      check('deviance − 2 Σ ln C(m, y)', full.deviance - 2 * logChoose, aggregated.deviance, 1e-10 * aggregated.deviance),
    ]);
    expect(full.target).toBe(1);
    const estimate = fitGlmm(datasetOf(s), s.model);
    expect(estimate).toEqual({ estimate: full.beta[1], se: full.se[1], df: Infinity, converged: true });
  });
});

describe('the deviance and its gradient', () => {
  it.each([
    ['binary-crossover', 1],
    ['binary-crossover', 9],
    ['count-overdispersed', 5],
    ['cbpp', 25],
  ] as const)('the exact gradient of %s (nAGQ %s) agrees with central differences of the deviance to 1e-6', (name, q) => {
    const s = set(name);
    const problem = problemOf(s);
    const patterns = buildPatterns(problem.family, problem.n, problem.p, problem.x, problem.y, problem.group.id, problem.group.count, problem.trials);
    const criterion = new GlmmCriterion(patterns, gaussHermite(q));
    // A point away from the optimum, θ negative to exercise the sign rule.
    const phi = Float64Array.from([...s.fits[0]!.expected.beta.map((b, k) => b + 0.1 * (k + 1)), -0.7]);
    const gradient = new Float64Array(phi.length);
    criterion.evaluate(phi, gradient);
    const mismatches = Array.from(phi, (_, c) => {
      const h = 1e-5;
      const up = Float64Array.from(phi);
      const down = Float64Array.from(phi);
      up[c]! += h;
      down[c]! -= h;
      const numeric = (criterion.evaluate(up) - criterion.evaluate(down)) / (2 * h);
      return check(`∂/∂φ[${c}]`, gradient[c]!, numeric, 1e-6 * Math.max(1, Math.abs(numeric)));
    });
    expectNoMismatches(mismatches);
  });

  it('is even in θ', () => {
    const problem = problemOf(set('count-cluster'));
    const patterns = buildPatterns(problem.family, problem.n, problem.p, problem.x, problem.y, problem.group.id, problem.group.count);
    const criterion = new GlmmCriterion(patterns, gaussHermite(3));
    expect(criterion.evaluate(Float64Array.of(1, -0.4, 0.5))).toBeCloseTo(criterion.evaluate(Float64Array.of(1, -0.4, -0.5)), 10);
  });

  it('merges the rows of a cluster-randomised design into one pattern per cluster', () => {
    const problem = problemOf(set('binary-cluster'));
    const patterns = buildPatterns(problem.family, problem.n, problem.p, problem.x, problem.y, problem.group.id, problem.group.count);
    expect(patterns.count).toBe(16);
    expect(patterns.groups).toBe(16);
  });
});

describe('Gauss–Hermite rules against lme4’s GHrule', () => {
  it.each(fixture.gaussHermite.map((r) => [r.points, r] as const))('%s points: nodes to 1e-13 (absolute), weights to 1e-12 (relative)', (_q, r) => {
    const rule = gaussHermite(r.points);
    expectNoMismatches([
      ...r.nodes.map((z, k) => check(`node ${k}`, rule.nodes[k]!, z, 1e-13)),
      ...r.weights.map((w, k) => check(`weight ${k}`, rule.weights[k]!, w, 1e-12 * w)),
    ]);
  });

  it('integrates z⁴ exactly with 3 points (E z⁴ = 3) and refuses 0 points', () => {
    const { nodes, weights } = gaussHermite(3);
    expect(nodes.reduce((s, z, k) => s + weights[k]! * z ** 4, 0)).toBeCloseTo(3, 13);
    expect(() => gaussHermite(0)).toThrow(RangeError);
  });
});

describe('non-converged fits and bad input', () => {
  it('complete separation (no events in one arm) is not converged', () => {
    const s = set('binary-cluster');
    const data = datasetOf(s);
    const y = Float64Array.from(data.y, (v, i) => (data.treat[i] === 0 ? 0 : v));
    expect(fitGlmm({ ...data, y }, s.model).converged).toBe(false);
  });

  it('is deterministic: the same data give bit-identical results', () => {
    const s = set('count-overdispersed');
    expect(fitGlmm(datasetOf(s), s.model, { quadraturePoints: 3 })).toEqual(fitGlmm(datasetOf(s), s.model, { quadraturePoints: 3 }));
  });

  it.each([
    ['no grouping level', (d: Dataset) => ({ ...d, groups: [] }), /needs a grouping level/],
    ['a negative outcome', (d: Dataset) => ({ ...d, y: Float64Array.from(d.y, (v, i) => (i === 3 ? -1 : v)) }), /0\/1 or a non-negative integer/],
    ['an id out of range', (d: Dataset) => ({ ...d, groups: [{ ...d.groups[0]!, id: Int32Array.from(d.groups[0]!.id, (g) => g + 1) }] }), /outside 0…15/],
  ])('%s throws a RangeError', (_case, change, message) => {
    const s = set('binary-cluster');
    expect(() => fitGlmm(change(datasetOf(s)), s.model)).toThrow(message);
  });

  it('a count outcome with the binomial family, and 30 quadrature points, are refused', () => {
    const s = set('count-cluster');
    expect(() => fitGlmm(datasetOf(s), s.model, { family: 'binomial' })).toThrow(/does not suit the binomial family/);
    expect(() => fitGlmm(datasetOf(s), s.model, { quadraturePoints: 30 })).toThrow(/from 1 to 25/);
  });
});
