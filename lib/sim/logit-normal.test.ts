import { describe, expect, it } from 'vitest';
import fixture from './fixtures/estimands.json';
import { interceptForMarginal, logitNormalMoments, proportionIcc, sigmaForIcc } from './logit-normal';
import { expectRelativelyClose } from './test-helpers';

/**
 * Against R (`fixtures/estimands.json`, written by `fixtures/generate_estimands.R`):
 * integrate() with rel.tol 1e-13 for E[P] and E[P²], uniroot() with tol 1e-14 on those for the
 * intercept of a marginal probability and the σ of a proportion-scale ICC. Tolerances relative:
 * moments 1e-11, intercepts 1e-10, σ 1e-8 (uniroot's tolerance on σ is 1e-13 absolute, but its
 * inner integrals carry 1e-13 relative error, which the ICC's slope in σ magnifies).
 */

describe('logitNormalMoments', () => {
  it.each(fixture.logitNormalMoments.map((r) => [r.eta, r.sigma, r] as const))('η %s, σ %s: E[P] and E[P²] to 1e-11 (R integrate)', (eta, sigma, r) => {
    const m = logitNormalMoments(eta, sigma);
    expectRelativelyClose(`E[P](${eta}, ${sigma})`, m.mean, r.mean, 1e-11);
    expectRelativelyClose(`E[P²](${eta}, ${sigma})`, m.second, r.second, 1e-11);
  });

  it('σ = 0: P is expit(η), ICC 0', () => {
    expect(logitNormalMoments(0.3, 0)).toEqual({ mean: 1 / (1 + Math.exp(-0.3)), second: (1 / (1 + Math.exp(-0.3))) ** 2 });
    expect(proportionIcc(0.3, 0)).toBe(0);
  });
});

describe('interceptForMarginal', () => {
  it.each(fixture.interceptForMarginal.map((r) => [r.probability, r.sigma, r.eta] as const))('p̄ %s, σ %s → η %s (R uniroot) to 1e-10', (p, sigma, eta) => {
    expectRelativelyClose(`interceptForMarginal(${p}, ${sigma})`, interceptForMarginal(p, sigma), eta, 1e-10);
  });

  it('refuses a probability of 0 or 1', () => {
    expect(() => interceptForMarginal(1, 0.5)).toThrow(RangeError);
  });
});

describe('sigmaForIcc', () => {
  it.each(fixture.sigmaForIcc.map((r) => [r.baseline, r.icc, r] as const))('baseline %s, ICC %s: σ at a fixed η and at a fixed marginal p̄ (R uniroot) to 1e-8', (p, icc, r) => {
    expectRelativelyClose('σ at η = logit(baseline)', sigmaForIcc(icc, { eta: Math.log(p / (1 - p)) }), r.sigmaAtEta, 1e-8);
    expectRelativelyClose('σ at p̄ = baseline', sigmaForIcc(icc, { marginal: p }), r.sigmaAtMarginal, 1e-8);
  });

  it('ICC 0 gives σ 0; an ICC of 1 is refused', () => {
    expect(sigmaForIcc(0, { eta: 0 })).toBe(0);
    expect(() => sigmaForIcc(1, { eta: 0 })).toThrow(RangeError);
  });
});
