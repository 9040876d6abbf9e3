import { describe, expect, it } from 'vitest';
import fixture from './fixtures/mixed.json';
import { fitLinearMixedModel, fitMixed, fitMixedFull, mixedProblem, type MixedFit, type MixedProblem } from './mixed';
import { betweenWithinDf } from './mixed-model';
import { fitProfiledReml } from './mixed-reml';
import { expectNoMismatches, mismatch, type Mismatch } from '@/lib/stats/test-helpers';
import type { Dataset, FixedEffects, Grouping } from './types';

/**
 * Reference values: `fixtures/mixed.json`, written by `fixtures/generate_mixed.R` with Debian's
 * R, lme4 (REML fits: the better of two tightly converged optimisers), lmerTest (Satterthwaite
 * df) and nlme (between–within df); versions in the file's header.
 *
 * Tolerances, relative to the value:
 * - β̂ and SEs: 1e-6 (the figure), against max(|β̂|, SE) so a coefficient near 0 is
 *   judged on the scale of its uncertainty;
 * - variance components: 1e-6; an intercept–slope covariance relative to √(σ²_int·σ²_slope)
 *   (the scale of a correlation: the covariance is the flattest direction of the criterion and
 *   near 0 for some data); a component the reference puts at the boundary (below 1e-12 of σ²)
 *   is compared absolutely, at 1e-10·σ². (The reference is the better of two tight lme4 fits;
 *   with one optimiser alone, lme4 stopped up to 1.5e-6 short in the flattest direction, with
 *   a REML criterion above ours.)
 * - REML criterion: 1e-9 (it is flat at the optimum, so small errors in θ barely move it);
 * - Satterthwaite df: 1e-5. lmerTest differentiates numerically (numDeriv's Richardson
 *   scheme); its own error shows where the exact df is known: 5.00000015 for the balanced
 *   Dyestuff (exactly J − 1 = 5), 17.0000052 for sleepstudy's time (exactly 17): up to 3e-7;
 *   and on repeated-slope its df moves by up to 1.4e-4 with other numDeriv step settings.
 *   Ours (analytic for one level; Richardson-extrapolated differences otherwise, stable to
 *   about 1e-7 across step sizes) are within 7e-7 of lmerTest's on all 26 sets.
 * - between–within df: exact (integers).
 */

interface FixtureGroup {
  name: string;
  id: number[];
  count: number;
}

interface FixtureSet {
  name: string;
  n: number;
  columns: string[];
  model: FixedEffects | null;
  data: {
    y: number[];
    treat?: number[];
    time?: number[];
    covariates?: Record<string, number[]>;
    groups: FixtureGroup[];
  };
  expected: {
    beta: number[];
    se: number[];
    dfSatterthwaite: number[];
    dfBetweenWithin: number[];
    sigma: number;
    varianceComponents: { group: string; var1: string | null; var2: string | null; vcov: number }[];
    remlCriterion: number;
    singular: boolean;
  };
}

const SETS = fixture.datasets as unknown as FixtureSet[];

function set(name: string): FixtureSet {
  const found = SETS.find((s) => s.name === name);
  if (!found) throw new Error(`no fixture data set "${name}"`);
  return found;
}

function groupings(s: FixtureSet): Grouping[] {
  return s.data.groups.map((g) => ({ name: g.name, id: Int32Array.from(g.id), count: g.count }));
}

function dataset(s: FixtureSet): Dataset {
  const covariates = s.data.covariates
    ? Object.fromEntries(Object.entries(s.data.covariates).map(([k, v]) => [k, Float64Array.from(v)]))
    : undefined;
  return {
    n: s.n,
    y: Float64Array.from(s.data.y),
    treat: Float64Array.from(s.data.treat ?? []),
    ...(s.data.time ? { time: Float64Array.from(s.data.time) } : {}),
    ...(covariates ? { covariates } : {}),
    groups: groupings(s),
  };
}

/** The fixture's model as `FixedEffects` (null for Dyestuff and sleepstudy, built by hand). */
function fixedOf(s: FixtureSet): FixedEffects | null {
  return s.model ?? null;
}

/** The `FixedEffects` of a named fixture set that has a treatment column. */
function fixedFor(name: string): FixedEffects {
  const fixed = fixedOf(set(name));
  if (!fixed) throw new Error(`fixture "${name}" has no model`);
  return fixed;
}

/** Dyestuff (intercept only) and sleepstudy (intercept + time, random slope): built by hand. */
function problemWithoutTreatment(s: FixtureSet): MixedProblem {
  const n = s.n;
  const p = s.columns.length;
  const x = new Float64Array(n * p);
  x.fill(1, 0, n);
  if (p > 1) x.set(s.data.time!, n);
  return {
    n,
    p,
    x,
    y: Float64Array.from(s.data.y),
    names: s.columns,
    levels: groupings(s),
    ...(s.columns.includes('time') ? { slope: Float64Array.from(s.data.time!) } : {}),
  };
}

function fitFixture(s: FixtureSet): MixedFit {
  const fixed = fixedOf(s);
  return fixed ? fitMixedFull(dataset(s), fixed) : fitLinearMixedModel(problemWithoutTreatment(s));
}

/** A mismatch when |got − expected| exceeds `tolerance` (an absolute figure, computed by the caller). */
function check(input: string, got: number, expected: number, tolerance: number): Mismatch | null {
  return mismatch(input, got, expected, { absolute: tolerance });
}

/** lme4's names of inner nested levels → the fixture's grouping names. */
const LME4_INNER_NAMES: Record<string, string> = { 'plant:tray': 'plant', 'clinic:patient': 'patient' };

/** lme4's VarCorr rows → our (level, term). */
function componentKey(group: string, var1: string | null, var2: string | null): string {
  const level = LME4_INNER_NAMES[group] ?? group;
  if (group === 'Residual') return 'Residual/residual';
  if (var2 !== null) return `${level}/covariance`;
  return `${level}/${var1}`;
}

const RELATIVE = 1e-6;
const DF_RELATIVE = 1e-5;

describe.each(SETS.map((s) => [s.name, s] as const))('REML fit of %s against lme4 / lmerTest / nlme', (name, s) => {
  const fit = fitFixture(s);
  const e = s.expected;

  it('converges', () => {
    expect(fit.converged, `${name}: converged`).toBe(true);
    expect(fit.singular, `${name}: singular`).toBe(e.singular);
  });

  it(`fixed effects and SEs to ${RELATIVE} relative (of max(|β̂|, SE))`, () => {
    expectNoMismatches(
      e.beta.flatMap((b, k) => {
        const scale = Math.max(Math.abs(b), e.se[k]!);
        return [
          check(`${name} β[${s.columns[k]}]`, fit.beta[k]!, b, RELATIVE * scale),
          check(`${name} SE[${s.columns[k]}]`, fit.se[k]!, e.se[k]!, RELATIVE * e.se[k]!),
        ];
      }),
    );
  });

  it(`variance components and σ to ${RELATIVE} relative; REML criterion to 1e-9`, () => {
    const got = new Map(fit.components.map((c) => [`${c.level}/${c.term}`, c.value]));
    const sigma2 = e.sigma * e.sigma;
    // A covariance is judged on the scale √(σ²_intercept·σ²_slope) of its level (as a
    // correlation would be), a variance relative to itself.
    const componentScale = (vc: (typeof e.varianceComponents)[number]): number => {
      if (vc.var2 === null) return Math.abs(vc.vcov);
      const variance = (term: string) => e.varianceComponents.find((c) => c.group === vc.group && c.var1 === term && c.var2 === null)!.vcov;
      return Math.sqrt(variance(vc.var1!) * variance(vc.var2));
    };
    expectNoMismatches([
      check(`${name} σ`, fit.sigma, e.sigma, RELATIVE * e.sigma),
      check(`${name} REML criterion`, fit.remlCriterion, e.remlCriterion, 1e-9 * Math.abs(e.remlCriterion)),
      ...e.varianceComponents.map((vc) => {
        const key = componentKey(vc.group, vc.var1, vc.var2);
        const value = got.get(key);
        const atBoundary = Math.abs(vc.vcov) < 1e-12 * sigma2;
        return check(`${name} ${key}`, value ?? NaN, vc.vcov, atBoundary ? 1e-10 * sigma2 : RELATIVE * componentScale(vc));
      }),
    ]);
    expect(fit.components.length, `${name}: number of components`).toBe(e.varianceComponents.length);
    expect(fit.remlLogLik).toBe(-fit.remlCriterion / 2);
  });

  it(`Satterthwaite df to ${DF_RELATIVE} relative (lmerTest)`, () => {
    expectNoMismatches(
      e.dfSatterthwaite.map((df, k) => check(`${name} df[${s.columns[k]}]`, fit.dfSatterthwaite[k]!, df, DF_RELATIVE * df)),
    );
  });

  it('between–within df exactly (nlme)', () => {
    expect(Array.from(fit.dfBetweenWithin), `${name}: between–within df`).toEqual(e.dfBetweenWithin);
  });
});

describe('published fits (Bates, Mächler, Bolker & Walker 2015, J Stat Softw 67(1))', () => {
  // Printed values of the paper's sleepstudy REML fit, quoted from memory; lme4's fixture values
  // agree with them to the printed digits, which is what this checks.
  it('sleepstudy: REML criterion 1743.6, σ 25.59, β (251.405, 10.467), SE (6.825, 1.546)', () => {
    const fit = fitFixture(set('sleepstudy'));
    expect(fit.remlCriterion.toFixed(1)).toBe('1743.6');
    expect(fit.sigma.toFixed(2)).toBe('25.59');
    expect(Array.from(fit.beta, (b) => b.toFixed(3))).toEqual(['251.405', '10.467']);
    expect(Array.from(fit.se, (b) => b.toFixed(3))).toEqual(['6.825', '1.546']);
  });

  // Dyestuff: lme4's REML fit, variance components 1764.0 (Batch) and 2451.3 (residual), mean
  // 1527.5 with SE 19.38 — quoted from memory of lme4's documentation.
  it('Dyestuff: Batch variance 1764.0, residual 2451.3, mean 1527.5 (SE 19.38)', () => {
    const fit = fitFixture(set('dyestuff'));
    expect(fit.components.map((c) => c.value.toFixed(1))).toEqual(['1764.0', '2451.3']);
    expect(fit.beta[0]!.toFixed(1)).toBe('1527.5');
    expect(fit.se[0]!.toFixed(2)).toBe('19.38');
  });
});

describe('fitMixed (the stress-test analysis)', () => {
  it('returns the target coefficient, its SE and the chosen df', () => {
    const s = set('cluster-unequal');
    const data = dataset(s);
    const fixed = fixedFor('cluster-unequal');
    const sat = fitMixed(data, fixed);
    const bw = fitMixed(data, fixed, { df: 'between-within' });
    expectNoMismatches([
      check('estimate', sat.estimate, s.expected.beta[1]!, RELATIVE * s.expected.se[1]!),
      check('se', sat.se, s.expected.se[1]!, RELATIVE * s.expected.se[1]!),
      check('Satterthwaite df', sat.df, s.expected.dfSatterthwaite[1]!, DF_RELATIVE * s.expected.dfSatterthwaite[1]!),
    ]);
    expect(sat.converged).toBe(true);
    expect(bw).toEqual({ ...sat, df: 10 });
  });

  it('fits treat:time with a random slope by default, and without one when asked', () => {
    const s = set('repeated-slope');
    const data = dataset(s);
    const fixed = fixedFor('repeated-slope');
    const slope = fitMixed(data, fixed);
    expectNoMismatches([
      check('treat:time estimate', slope.estimate, s.expected.beta[3]!, RELATIVE * s.expected.se[3]!),
      check('treat:time SE', slope.se, s.expected.se[3]!, RELATIVE * s.expected.se[3]!),
    ]);
    const interceptOnly = fitMixed(data, fixed, { randomSlope: false });
    // Without the random slope the slope difference looks far more precise (the classic error).
    expect(interceptOnly.se).toBeLessThan(slope.se);
    expect(interceptOnly.converged).toBe(true);
  });

  it('the one-level fast path and the general block algorithm agree', () => {
    for (const name of ['cluster-unequal', 'cluster-covariate', 'singular']) {
      const s = set(name);
      const { problem } = mixedProblem(dataset(s), fixedFor(name));
      const fast = fitLinearMixedModel(problem);
      const general = fitProfiledReml(problem);
      const scale = Math.max(Math.abs(fast.beta[1]!), fast.se[1]!);
      expectNoMismatches([
        check(`${name} β`, general.beta[1]!, fast.beta[1]!, 1e-7 * scale),
        check(`${name} SE`, general.se[1]!, fast.se[1]!, 1e-7 * fast.se[1]!),
        check(`${name} σ`, general.sigma, fast.sigma, 1e-7 * fast.sigma),
        check(`${name} df`, general.dfSatterthwaite[1]!, fast.dfSatterthwaite[1]!, 1e-5 * fast.dfSatterthwaite[1]!),
      ]);
    }
  });

  it('a singular fit (between-cluster variance 0) is converged, with df n − p as lmerTest', () => {
    const s = set('singular');
    const fit = fitMixedFull(dataset(s), fixedFor('singular'));
    expect(fit.converged).toBe(true);
    expect(fit.singular).toBe(true);
    expect(fit.theta[0]).toBe(0);
    expect(fit.dfSatterthwaite[1]).toBeCloseTo(s.n - 2, 6);
  });

  it('reports a non-estimable fixed part (treatment constant) as not converged', () => {
    const s = set('cluster-unequal');
    const data = { ...dataset(s), treat: new Float64Array(s.n).fill(1) };
    const r = fitMixed(data, fixedFor('cluster-unequal'));
    expect(r.converged).toBe(false);
  });

  it('is deterministic: the same data give bit-identical results', () => {
    const s = set('nested-three-level');
    const a = fitMixed(dataset(s), fixedFor('nested-three-level'));
    const b = fitMixed(dataset(s), fixedFor('nested-three-level'));
    expect(b).toEqual(a);
  });
});

describe('bad input', () => {
  const s = set('cluster-unequal');
  const fixed = fixedFor('cluster-unequal');

  it.each([
    ['no grouping level', { groups: [] }, /needs at least one grouping level/],
    [
      'groups not contiguous',
      { groups: [{ name: 'cluster', id: Int32Array.from(s.data.groups[0]!.id, (g, i) => (i === 0 ? 5 : g)), count: 12 }] },
      /rows of group \d+ are not contiguous/,
    ],
    ['an id out of range', { groups: [{ name: 'cluster', id: Int32Array.from(s.data.groups[0]!.id, (g) => g + 1), count: 12 }] }, /outside 0…11/],
  ])('%s throws a RangeError', (_case, change, message) => {
    const data = { ...dataset(s), ...change } as Dataset;
    expect(() => fitMixed(data, fixed)).toThrow(RangeError);
    expect(() => fitMixed(data, fixed)).toThrow(message);
  });

  it('a random slope without a time column throws', () => {
    expect(() => fitMixed(dataset(s), fixed, { randomSlope: true })).toThrow(/needs the time column/);
  });

  it('inner groups that cross outer groups are refused (not nested)', () => {
    const g = set('nested-three-level');
    const data = dataset(g);
    const plant = Int32Array.from(data.groups[1]!.id);
    // Give the first row of tray 2 the plant of the last row of tray 1.
    const first = data.groups[0]!.id.indexOf(1);
    plant[first] = plant[first - 1]!;
    const bad = { ...data, groups: [data.groups[0]!, { ...data.groups[1]!, id: plant }] };
    expect(() => fitMixed(bad, fixedFor('nested-three-level'))).toThrow(/not nested/);
  });
});

describe('grouping levels', () => {
  it('leaves out a level whose groups hold one row each (it is the residual)', () => {
    const s = set('cluster-unequal');
    const data = dataset(s);
    const pupil = { name: 'pupil', id: Int32Array.from({ length: s.n }, (_, i) => i), count: s.n };
    const withPupils = { ...data, groups: [...data.groups, pupil] };
    expect(fitMixed(withPupils, fixedFor('cluster-unequal'))).toEqual(fitMixed(data, fixedFor('cluster-unequal')));
  });
});

describe('betweenWithinDf', () => {
  it('gives J − 2 to a cluster-level treatment and n − J − 1 to a within-cluster covariate', () => {
    const { problem } = mixedProblem(dataset(set('cluster-covariate')), fixedFor('cluster-covariate'));
    expect(Array.from(betweenWithinDf(problem))).toEqual([problem.n - 12 - 1, 10, problem.n - 12 - 1]);
  });
});
