import { describe, expect, it } from 'vitest';
import fixture from './fixtures/glmm.json';
import { digamma, fitGlmNb, fitGlmNbFull, trigamma } from './glm-nb';
import { fitGlm } from './glm';
import { expectNoMismatches, mismatch } from '@/lib/stats/test-helpers';
import type { Dataset, FixedEffects } from './types';

/**
 * Reference values: `fixtures/glmm.json` (`negativeBinomial`, `special`), written by
 * `fixtures/generate_glmm.R` with Debian's R and MASS 7.3-58 (versions in the file): glm.nb
 * iterated to epsilon = 1e-13, its SEs also computed exactly at the estimates. Tolerances: β̂
 * 1e-9 of max(|β̂|, SE), SEs 1e-9, θ̂ 1e-9, twice the log-likelihood 1e-12 (relative);
 * achieved 1.1e-12, 1.2e-11, 3.2e-11 and 3.5e-15. digamma and trigamma against R's to 1e-13 (the JSON holds 15 digits).
 */

interface NbSet {
  name: string;
  n: number;
  columns: string[];
  model: FixedEffects;
  data: { y: number[]; treat: number[]; covariates?: Record<string, number[]> };
  expected: { beta: number[]; se: number[]; seSummary: number[]; theta: number; seTheta: number; twoLogLik: number };
}

const SETS = fixture.negativeBinomial as unknown as NbSet[];

function datasetOf(s: NbSet): Dataset {
  return {
    n: s.n,
    y: Float64Array.from(s.data.y),
    treat: Float64Array.from(s.data.treat),
    covariates: Object.fromEntries(Object.entries(s.data.covariates ?? {}).map(([k, v]) => [k, Float64Array.from(v)])),
    groups: [],
  };
}

describe.each(SETS.flatMap((s) => [[s.name, s, false], [`${s.name} (general path)`, s, true]] as const))('glm.nb fit of %s against MASS', (label, s, general) => {
  const fit = fitGlmNbFull(datasetOf(s), s.model, { general });
  const e = s.expected;

  it('β̂ and SEs to 1e-9, θ̂ to 1e-9, 2 log L to 1e-12', () => {
    expect(fit.converged).toBe(true);
    expectNoMismatches([
      ...e.beta.map((b, k) => mismatch(`${label} β[${s.columns[k]}]`, fit.beta[k]!, b, { absolute: 1e-9 * Math.max(Math.abs(b), e.se[k]!) })),
      ...e.se.map((se, k) => mismatch(`${label} SE[${s.columns[k]}]`, fit.se[k]!, se, { relative: 1e-9 })),
      mismatch(`${label} θ`, fit.theta, e.theta, { relative: 1e-9 }),
      mismatch(`${label} 2 log L`, fit.twoLogLik, e.twoLogLik, { relative: 1e-12 }),
    ]);
  });
});

describe('the analysis', () => {
  const quine = SETS.find((s) => s.name === 'quine')!;

  it('returns the log rate ratio of treat, its SE and a z test', () => {
    const full = fitGlmNbFull(datasetOf(quine), quine.model);
    expect(fitGlmNb(datasetOf(quine), quine.model)).toEqual({ estimate: full.beta[1], se: full.se[1], df: Infinity, converged: true });
  });

  it('without overdispersion (equidispersed counts) θ̂ is Infinity and the fit is Poisson regression', () => {
    // Counts 0, 1, 2 in equal numbers per arm: variance 2/3 below the mean 1.
    const y = Float64Array.from({ length: 60 }, (_, i) => (i % 3) + (i >= 30 && i % 3 === 2 ? 1 : 0));
    const data: Dataset = { n: 60, y, treat: Float64Array.from({ length: 60 }, (_, i) => (i >= 30 ? 1 : 0)), groups: [] };
    const fixed: FixedEffects = { covariates: [], includeTime: false, target: 'treat' };
    for (const general of [false, true]) {
      const nb = fitGlmNbFull(data, fixed, { general });
      expect(nb.theta).toBe(Infinity);
      expect(nb.converged).toBe(true);
      const poisson = fitGlm(data, fixed, { family: 'poisson' });
      expect(Math.abs(nb.beta[1]! - poisson.estimate)).toBeLessThan(1e-10);
      expect(Math.abs(nb.se[1]! - poisson.se)).toBeLessThan(1e-10);
    }
  });

  it('an arm without any event is not converged; a non-count outcome throws', () => {
    const s = datasetOf(quine);
    const y = Float64Array.from(s.y, (v, i) => (s.treat[i] === 1 ? 0 : v));
    expect(fitGlmNb({ ...s, y }, quine.model).converged).toBe(false);
    expect(fitGlmNb({ ...s, y }, { covariates: [], includeTime: false, target: 'treat' }).converged).toBe(false);
    expect(() => fitGlmNb({ ...s, y: Float64Array.from(s.y, (v) => v + 0.5) }, quine.model)).toThrow(/count outcome/);
  });
});

describe('digamma and trigamma against R', () => {
  it.each(fixture.special.x.map((x, k) => [x, fixture.special.digamma[k]!, fixture.special.trigamma[k]!] as const))('at %s: to 1e-13 (relative; the fixture holds 15 digits)', (x, d, t) => {
    expectNoMismatches([mismatch(`digamma(${x})`, digamma(x), d, { relative: 1e-13, absolute: 1e-15 }), mismatch(`trigamma(${x})`, trigamma(x), t, { relative: 1e-13 })]);
  });
});
