/**
 * The recommended analysis: model notation, family, df method, unit of analysis, and that
 * adopting it (its `analysisPatch`) clears every blocker.
 */
import { describe, expect, it } from 'vitest';
import { analysisSchema, type Design } from '@/lib/design/schema';
import { absencesPoisson, classroom, empty, greenhouse, longitudinal, miceInCages, simple, sleep, twins, variant } from './__fixtures__/designs';
import { runChecks } from './registry';

const rec = (d: Design) => runChecks(d).recommendation;

/** The design with the recommendation's analysis fields adopted. */
function adopt(d: Design): Design {
  return variant(d, (x) => {
    x.analysis = analysisSchema.parse({ ...x.analysis, ...rec(d).analysisPatch });
  });
}

describe('recommendation for the demo designs', () => {
  it('classroom: linear mixed model with classroom intercept, ANCOVA and strata, Kenward–Roger df, classroom as n', () => {
    const r = rec(classroom);
    expect(r.method).toBe('mixed-model');
    expect(r.model).toBe('reading_score ~ programme + baseline_score + school + (1 | classroom)');
    expect(r.dfMethod).toBe('kenward-roger');
    expect(r.unitOfAnalysis).toEqual({ levelId: 'classroom', name: 'Classroom', total: 20, perArm: 10 });
    expect(r.adjustments.some((a) => a.startsWith('ANCOVA'))).toBe(true);
    expect(r.explanation).toContain('20 classrooms (10 per arm)');
    expect(r.explanation).toMatch(/qualified statistician/);
  });
  it('greenhouse: log scale, nested trays and plants, tray as n, variance per arm', () => {
    const r = rec(greenhouse);
    expect(r.model).toBe('log(leaf_chlorophyll_content) ~ substrate + (1 | tray/plant)');
    expect(r.randomIntercepts).toEqual(['tray', 'plant']);
    expect(r.unitOfAnalysis).toEqual({ levelId: 'tray', name: 'Tray', total: 12, perArm: 6 });
    expect(r.analysisPatch.modelVariance).toBe(true);
    expect(r.analysisPatch.transformation).toBe('log');
  });
  it('sleep: log scale, period, volunteer intercept, AR(1), volunteer as n (no per-arm count in a cross-over)', () => {
    const r = rec(sleep);
    expect(r.model).toBe('log(reaction_time) ~ schedule + period + (1 | volunteer)');
    expect(r.unitOfAnalysis).toEqual({ levelId: 'volunteer', name: 'Volunteer', total: 24 });
    expect(r.analysisPatch.covarianceStructure).toBe('ar1');
    expect(r.dfMethod).toBe('kenward-roger');
  });
});

describe('model notation', () => {
  it('trajectory of interest with 3 occasions: arm × time with a random slope, as "y ~ arm * time + (1 + time | volunteer)"', () => {
    const d = variant(sleep, (x) => {
      x.outcome.name = 'y';
      x.outcome.shape = 'symmetric';
      x.outcome.explanatoryVariables = [];
      x.assignment.variableName = 'arm';
      x.assignment.levelId = 'volunteer';
      x.assignment.crossover.enabled = false;
      x.structure.levels[1]!.count = 3;
      x.occasions.list = [0, 1, 2].map((t) => ({ label: `T${t}`, time: t, baseline: false, attrition: 0 }));
      x.occasions.trajectoryOfInterest = true;
      x.occasions.correlationStructure = 'unknown';
      x.structure.levels[1]!.spatialOrSerial = false;
    });
    expect(rec(d).model).toBe('y ~ arm * time + (1 + time | volunteer)');
    expect(rec(d).analysisPatch.randomSlopeForTime).toBe(true);
  });
  it('5 visits, trajectory of interest: spline in time, random slope on the patient', () => {
    const r = rec(longitudinal);
    expect(r.model).toBe('lung_function ~ arm * ns(time, df = 3) + lung_function_baseline + (1 + time | patient)');
    expect(r.adjustments.some((a) => a.includes('spline'))).toBe(true);
  });
  it('binary outcome, independent units: GLM, binomial family, logit link', () => {
    const r = rec(variant(simple, (d) => { d.outcome.type = 'binary'; }));
    expect([r.method, r.family, r.link]).toEqual(['glm', 'binomial', 'logit']);
  });
  it('count outcome in classrooms: GLMM, Poisson, log link, between-within df, follow-up time as offset', () => {
    const r = rec(variant(classroom, (d) => { d.outcome.type = 'count'; }));
    expect([r.method, r.family, r.link, r.dfMethod]).toEqual(['glmm', 'poisson', 'log', 'between-within']);
    expect(r.model).toBe('reading_score ~ programme + baseline_score + school + offset(log(follow_up_time)) + (1 | classroom)');
    expect(r.adjustments.some((a) => a.includes('follow-up time as an offset'))).toBe(true);
  });
  it('overdispersed counts: the negative binomial family, and adopting it clears the overdispersion warning', () => {
    const r = rec(absencesPoisson);
    expect([r.method, r.family]).toEqual(['glmm', 'negative-binomial']);
    expect(r.adjustments.some((a) => a.startsWith('Negative binomial family, as the Assumptions step expects overdispersion (0.5)'))).toBe(true);
    expect(runChecks(adopt(absencesPoisson)).findings.some((f) => f.key === 'overdispersion')).toBe(false);
  });
  it('independent units with unequal variance: linear regression with HC3', () => {
    const r = rec(variant(simple, (d) => { d.outcome.unequalVarianceExpected = true; }));
    expect([r.method, r.standardErrors]).toEqual(['linear-regression', 'hc3']);
  });
  it('twin pairs and caged mice: a random intercept for the pair or cage', () => {
    expect(rec(twins).model).toBe('anxiety_score ~ arm + (1 | twin_pair)');
    expect(rec(miceInCages).model).toBe('body_weight ~ arm + (1 | cage)');
  });
  it('several primary outcomes: Holm', () => {
    const r = rec(variant(simple, (d) => { d.outcome.primaryOutcomes = 3; }));
    expect(r.analysisPatch.multiplicity).toBe('holm');
    expect(r.adjustments.some((a) => a.includes('Holm'))).toBe(true);
  });
  it('an empty design gets a placeholder that says so', () => {
    const r = rec(empty);
    expect(r.model).toBe('y ~ arm');
    expect(r.unitOfAnalysis).toBeUndefined();
    expect(r.explanation).toMatch(/not described yet/);
  });
});

describe('adopting the recommendation', () => {
  it.each([
    ['classroom', classroom],
    ['greenhouse', greenhouse],
    ['sleep', sleep],
    ['count outcome with a gaussian GLMM', variant(classroom, (d) => { d.outcome.type = 'count'; d.analysis.method = 'glmm'; d.analysis.glmFamily = 'gaussian'; })],
  ])('%s: no blocker left, and the patch is a valid analysis plan', (_label, d) => {
    expect(runChecks(d).findings.some((f) => f.severity === 'blocker')).toBe(true);
    const after = adopt(d);
    expect(runChecks(after).findings.filter((f) => f.severity === 'blocker')).toEqual([]);
  });
  it('is JSON (stored with the revision)', () => {
    for (const d of [classroom, greenhouse, sleep, empty]) {
      const r = rec(d);
      expect(JSON.parse(JSON.stringify(r))).toEqual(r);
    }
  });
});
