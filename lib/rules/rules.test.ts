/**
 * Every rule against designs that must trigger it and designs that must not (the demo designs
 * and small variants of them), and the demo designs' findings as a whole.
 */
import { describe, expect, it } from 'vitest';
import type { Design } from '@/lib/design/schema';
import {
  classroom,
  classroomMixed,
  absencesPoisson,
  classroomNoPlan,
  empty,
  falls,
  greenhouse,
  longitudinal,
  miceInCages,
  narrowDose,
  outcomeOnly,
  parallelNights,
  perVisitTests,
  pupilsInClassrooms,
  simple,
  sleep,
  twins,
  variant,
} from './__fixtures__/designs';
import { RULES, runChecks } from './registry';
import type { Severity } from './types';

type Case = [label: string, design: Design, expect?: { key?: string; severity?: Severity }];

interface RuleCases {
  fires: Case[];
  silent: Case[];
}

const CASES: Record<string, RuleCases> = {
  'unit-of-analysis': {
    fires: [
      ['classroom demo (t-test per pupil)', classroom, { key: 'classroom', severity: 'blocker' }],
      ['greenhouse demo (regression per leaf)', greenhouse, { key: 'tray', severity: 'blocker' }],
      ['volunteers assigned, t-test on nights', parallelNights, { key: 'volunteer', severity: 'blocker' }],
      ['classroom, no unit of analysis named', variant(classroom, (d) => { delete d.analysis.unitOfAnalysisLevelId; }), { severity: 'blocker' }],
      ['classroom, ICC missing', variant(classroom, (d) => { d.assumptions.iccs = []; }), { severity: 'blocker' }],
      ['classroom, mixed model without the classroom intercept', variant(classroom, (d) => { d.analysis.method = 'mixed-model'; }), { severity: 'blocker' }],
      ['greenhouse, plant means (still below the tray)', variant(greenhouse, (d) => { d.analysis.unitOfAnalysisLevelId = 'plant'; }), { key: 'tray' }],
    ],
    silent: [
      ['classroom with mixed model + (1 | classroom)', classroomMixed],
      ['classroom, t-test on classroom means', variant(classroom, (d) => { d.analysis.unitOfAnalysisLevelId = 'classroom'; })],
      ['classroom, cluster-means analysis', variant(classroom, (d) => { d.analysis.method = 'cluster-means'; delete d.analysis.unitOfAnalysisLevelId; })],
      ['classroom, GEE', variant(classroom, (d) => { d.analysis.method = 'gee'; })],
      ['classroom, regression with CR2', variant(classroom, (d) => { d.analysis.method = 'linear-regression'; d.analysis.standardErrors = 'cr2'; })],
      ['classroom, no analysis plan yet', classroomNoPlan],
      ['sleep cross-over (treatment within volunteer)', sleep],
      ['pupils randomised individually', pupilsInClassrooms],
      ['individually randomised trial', simple],
    ],
  },
  'analysis-mismatch': {
    fires: [
      ['sleep demo: t-test on nights of a cross-over', sleep, { key: 'repeated-volunteer', severity: 'blocker' }],
      ['binary outcome with a gaussian GLM', variant(simple, (d) => { d.outcome.type = 'binary'; d.analysis.method = 'glm'; d.analysis.glmFamily = 'gaussian'; }), { key: 'family', severity: 'blocker' }],
      ['continuous outcome with a Poisson GLMM', variant(classroomMixed, (d) => { d.analysis.method = 'glmm'; d.analysis.glmFamily = 'poisson'; }), { key: 'family', severity: 'blocker' }],
      ['greenhouse, tray intercept only', variant(greenhouse, (d) => { d.analysis.method = 'mixed-model'; d.analysis.randomIntercepts = ['tray']; }), { key: 'level-plant', severity: 'warning' }],
      ['clustered, no assignment level yet', variant(classroom, (d) => { delete d.assignment.levelId; }), { key: 'unassigned-classroom', severity: 'warning' }],
      ['t-test with three arms', variant(simple, (d) => { d.assignment.arms.push({ name: 'Exercise', allocation: 1 }); }), { key: 'two-groups', severity: 'warning' }],
      ['unit of analysis above the experimental unit', variant(pupilsInClassrooms, (d) => { d.analysis.unitOfAnalysisLevelId = 'classroom'; }), { key: 'above-unit', severity: 'warning' }],
    ],
    silent: [
      ['classroom demo (left to unit-of-analysis)', classroom],
      ['classroom mixed', classroomMixed],
      ['sleep with a mixed model on volunteer', variant(sleep, (d) => { d.analysis.method = 'mixed-model'; d.analysis.randomIntercepts = ['volunteer']; })],
      ['binary outcome with a binomial GLM', variant(simple, (d) => { d.outcome.type = 'binary'; d.analysis.method = 'glm'; d.analysis.glmFamily = 'binomial'; })],
      ['classroom, no analysis plan yet', classroomNoPlan],
      ['individually randomised trial', simple],
    ],
  },
  'repeated-measures': {
    fires: [
      ['sleep demo: 8 nights per volunteer', sleep, { key: 'night', severity: 'warning' }],
      ['5 visits with no repeated level in the structure', longitudinal, { key: 'occasions', severity: 'warning' }],
      ['sleep, volunteer accounted for: advice', variant(sleep, (d) => { d.analysis.method = 'mixed-model'; d.analysis.randomIntercepts = ['volunteer']; }), { severity: 'advice' }],
    ],
    silent: [
      ['classroom (baseline + one follow-up)', classroom],
      ['greenhouse (one harvest)', greenhouse],
      ['individually randomised trial', simple],
    ],
  },
  'nested-clusters': {
    fires: [
      ['classroom demo', classroom, { key: 'classroom', severity: 'warning' }],
      ['greenhouse demo', greenhouse, { key: 'tray', severity: 'warning' }],
      ['pupils randomised inside classrooms', pupilsInClassrooms, { key: 'classroom' }],
      ['classroom mixed: reminder only', classroomMixed, { key: 'classroom', severity: 'advice' }],
    ],
    silent: [
      ['sleep (no grouping level)', sleep],
      ['individually randomised trial', simple],
      ['one pupil per classroom', variant(classroom, (d) => { d.structure.levels[1]!.count = 1; })],
      ['twin pairs (left to pairs-and-blocks)', twins],
    ],
  },
  pseudoreplication: {
    fires: [
      ['greenhouse demo: 4 leaves per plant counted as n', greenhouse, { key: 'leaf', severity: 'warning' }],
      ['greenhouse, plant intercept: reminder only', variant(greenhouse, (d) => { d.analysis.method = 'mixed-model'; d.analysis.randomIntercepts = ['tray', 'plant']; d.analysis.unitOfAnalysisLevelId = 'tray'; }), { severity: 'advice' }],
    ],
    silent: [
      ['classroom demo', classroom],
      ['sleep demo', sleep],
      ['greenhouse with one leaf per plant', variant(greenhouse, (d) => { d.structure.levels[2]!.count = 1; })],
    ],
  },
  'shared-environment': {
    fires: [
      ['greenhouse demo: substrate per tray', greenhouse, { key: 'tray', severity: 'warning' }],
      ['classroom demo: programme per classroom', classroom, { key: 'classroom', severity: 'warning' }],
      ['mice assigned individually in shared cages', miceInCages, { key: 'cage', severity: 'advice' }],
    ],
    silent: [
      ['sleep demo', sleep],
      ['individually randomised trial', simple],
      ['classroom not marked shared and of type school', variant(classroom, (d) => { d.structure.levels[0]!.sharedEnvironment = false; d.structure.levels[0]!.groupingType = 'school'; })],
    ],
  },
  'few-units': {
    fires: [
      ['greenhouse demo: 6 trays per arm', greenhouse, { key: 'per-arm', severity: 'warning' }],
      ['8 classrooms in all', variant(classroom, (d) => { d.structure.levels[0]!.count = 8; }), { key: 'variance' }],
      ['GEE on 20 classrooms', variant(classroom, (d) => { d.analysis.method = 'gee'; }), { key: 'robust-se', severity: 'warning' }],
      ['CR2 without Satterthwaite df', variant(classroom, (d) => { d.analysis.method = 'linear-regression'; d.analysis.standardErrors = 'cr2'; }), { key: 'robust-se', severity: 'advice' }],
      ['mixed model on 20 classrooms with residual df', classroomMixed, { key: 'df', severity: 'warning' }],
    ],
    silent: [
      ['individually randomised trial (30 per arm)', simple],
      ['classroom demo (10 per arm, t-test)', classroom],
      ['classroom mixed with Kenward–Roger df', variant(classroomMixed, (d) => { d.analysis.dfMethod = 'kenward-roger'; })],
      ['60 classrooms, mixed model, residual df', variant(classroomMixed, (d) => { d.structure.levels[0]!.count = 60; })],
    ],
  },
  crossover: {
    fires: [
      ['sleep demo: no washout, carry-over possible', sleep, { key: 'carry-over', severity: 'warning' }],
      ['sleep with a washout: the carry-over finding stays, as advice', variant(sleep, (d) => { d.assignment.crossover.washout = 'Two weeks of usual sleep between blocks'; d.assignment.crossover.carryoverPossible = false; }), { key: 'carry-over', severity: 'advice' }],
      ['sleep with a washout: period advice', variant(sleep, (d) => { d.assignment.crossover.washout = 'Two weeks of usual sleep between blocks'; d.assignment.crossover.carryoverPossible = false; }), { key: 'period', severity: 'advice' }],
    ],
    silent: [
      ['classroom demo', classroom],
      ['parallel-group sleep study', parallelNights],
    ],
  },
  'per-occasion': {
    fires: [['a test at each of 3 visits', perVisitTests, { key: 'per-occasion', severity: 'warning' }]],
    silent: [
      ['5 visits in one regression', longitudinal],
      ['sleep demo', sleep],
      ['one occasion tested once', variant(simple, (d) => { d.analysis.method = 'per-occasion-tests'; })],
    ],
  },
  'many-occasions': {
    fires: [
      ['sleep demo: 8 nights', sleep, { key: 'covariance', severity: 'advice' }],
      ['5 unequally spaced visits, trajectory of interest', longitudinal, { key: 'time-trend', severity: 'advice' }],
      ['3 unequally spaced visits', variant(simple, (d) => { d.occasions.list = [0, 1, 6].map((t) => ({ label: `T${t}`, time: t, baseline: false, attrition: 0 })); }), { key: 'covariance' }],
    ],
    silent: [
      ['classroom demo (2 occasions)', classroom],
      ['greenhouse demo (1 occasion)', greenhouse],
      ['3 equally spaced visits', variant(simple, (d) => { d.occasions.list = [0, 1, 2].map((t) => ({ label: `T${t}`, time: t, baseline: false, attrition: 0 })); })],
      ['sleep with AR(1) planned', variant(sleep, (d) => { d.analysis.covarianceStructure = 'ar1'; })],
    ],
  },
  'outcome-family': {
    fires: [
      ['binary outcome, t-test', variant(simple, (d) => { d.outcome.type = 'binary'; }), { key: 'binary', severity: 'warning' }],
      ['count outcome in classrooms', variant(classroom, (d) => { d.outcome.type = 'count'; }), { key: 'count' }],
      ['overdispersed counts, Poisson mixed model', absencesPoisson, { key: 'overdispersion', severity: 'warning' }],
      ['overdispersed counts, Poisson GLM without rates given', variant(absencesPoisson, (d) => { d.analysis.method = 'glm'; delete d.assumptions.baselineRate; }), { key: 'overdispersion' }],
      ['proportion, no plan yet', variant(outcomeOnly, (d) => { d.outcome.type = 'proportion'; }), { key: 'proportion', severity: 'advice' }],
    ],
    silent: [
      ['continuous outcome', simple],
      ['binary outcome with a GLM', variant(simple, (d) => { d.outcome.type = 'binary'; d.analysis.method = 'glm'; d.analysis.glmFamily = 'binomial'; })],
      ['binary outcome with GEE', variant(simple, (d) => { d.outcome.type = 'binary'; d.analysis.method = 'gee'; })],
      ['overdispersed counts, negative binomial mixed model', variant(absencesPoisson, (d) => { d.analysis.glmFamily = 'negative-binomial'; })],
      ['overdispersed counts, Poisson with CR2 standard errors', variant(absencesPoisson, (d) => { d.analysis.standardErrors = 'cr2'; })],
      ['overdispersed counts, Poisson GEE', variant(absencesPoisson, (d) => { d.analysis.method = 'gee'; })],
      ['Poisson counts (no overdispersion expected)', variant(absencesPoisson, (d) => { d.assumptions.dispersion!.value = 0; })],
    ],
  },
  'skewed-outcome': {
    fires: [
      ['greenhouse demo', greenhouse, { key: 'skew', severity: 'warning' }],
      ['sleep demo', sleep, { key: 'skew', severity: 'warning' }],
    ],
    silent: [
      ['classroom demo (symmetric)', classroom],
      ['sleep on the log scale', variant(sleep, (d) => { d.analysis.transformation = 'log'; })],
      ['greenhouse with a gamma family', variant(greenhouse, (d) => { d.analysis.method = 'glmm'; d.analysis.glmFamily = 'gamma'; })],
    ],
  },
  'unequal-variance': {
    fires: [['greenhouse demo', greenhouse, { key: 'variance', severity: 'warning' }]],
    silent: [
      ['classroom demo', classroom],
      ['greenhouse with CR2', variant(greenhouse, (d) => { d.analysis.standardErrors = 'cr2'; })],
      ['greenhouse with a variance model', variant(greenhouse, (d) => { d.analysis.modelVariance = true; })],
    ],
  },
  'unequal-cluster-sizes': {
    fires: [
      ['classroom demo (CV 0.25)', classroom, { key: 'classroom', severity: 'advice' }],
      ['classroom with CV 0.8: warning', variant(classroom, (d) => { d.structure.levels[1]!.countCv = 0.8; }), { key: 'classroom', severity: 'warning' }],
    ],
    silent: [
      ['greenhouse demo (equal trays)', greenhouse],
      ['sleep demo', sleep],
      ['classroom with equal sizes', variant(classroom, (d) => { d.structure.levels[1]!.countCv = 0; })],
    ],
  },
  'uncertain-icc': {
    fires: [
      ['greenhouse demo: tray ICC an expert guess', greenhouse, { key: 'tray', severity: 'advice' }],
      ['classroom with no ICC', variant(classroom, (d) => { d.assumptions.iccs = []; }), { key: 'classroom', severity: 'warning' }],
    ],
    silent: [
      ['classroom demo (published ICC)', classroom],
      ['sleep demo (published ICC)', sleep],
      ['individually randomised trial', simple],
    ],
  },
  multiplicity: {
    fires: [['3 primary outcomes, no adjustment', variant(simple, (d) => { d.outcome.primaryOutcomes = 3; }), { key: 'primary-outcomes', severity: 'warning' }]],
    silent: [
      ['one primary outcome', simple],
      ['3 primary outcomes with Holm', variant(simple, (d) => { d.outcome.primaryOutcomes = 3; d.analysis.multiplicity = 'holm'; })],
    ],
  },
  'baseline-adjustment': {
    fires: [
      ['classroom demo: baseline not used', classroom, { key: 'baseline', severity: 'warning' }],
      ['classroom, no plan yet', classroomNoPlan, { severity: 'advice' }],
    ],
    silent: [
      ['classroom adjusting for baseline', variant(classroom, (d) => { d.analysis.adjustsForBaseline = true; })],
      ['classroom ANCOVA', variant(classroom, (d) => { d.analysis.method = 'ancova'; })],
      ['greenhouse demo (no baseline)', greenhouse],
      ['sleep demo (no baseline)', sleep],
    ],
  },
  'pairs-and-blocks': {
    fires: [
      ['classroom demo: stratified by school, not in the analysis', classroom, { key: 'blocking', severity: 'advice' }],
      ['matched pairs, not in the analysis', variant(simple, (d) => { d.assignment.blocking = { kind: 'matched', factor: 'Age and sex', inAnalysis: false }; }), { key: 'blocking', severity: 'warning' }],
      ['twin pairs ignored', twins, { key: 'pair', severity: 'warning' }],
    ],
    silent: [
      ['classroom with school in the analysis', variant(classroom, (d) => { d.assignment.blocking.inAnalysis = true; })],
      ['twins with a pair intercept', variant(twins, (d) => { d.analysis.method = 'mixed-model'; d.analysis.randomIntercepts = ['pair']; })],
      ['individually randomised trial', simple],
    ],
  },
  'spatial-serial': {
    fires: [
      ['sleep demo: consecutive nights', sleep, { key: 'night', severity: 'warning' }],
      ['greenhouse demo: trays on benches', greenhouse, { key: 'tray', severity: 'advice' }],
    ],
    silent: [
      ['classroom demo', classroom],
      ['sleep with AR(1) planned', variant(sleep, (d) => { d.analysis.covarianceStructure = 'ar1'; d.structure.levels[0]!.spatialOrSerial = false; })],
    ],
  },
  attrition: {
    fires: [
      ['classroom demo: 8% by the end of the year', classroom, { key: 'attrition', severity: 'warning' }],
      ['sleep demo: 10% from night 5', sleep, { severity: 'warning' }],
      ['sleep with a mixed model under MAR: advice', variant(sleep, (d) => { d.analysis.missingData = 'mixed-model-mar'; }), { severity: 'advice' }],
      ['counts of absences: 8% lose follow-up time', absencesPoisson, { severity: 'warning' }],
    ],
    silent: [
      ['no attrition', simple],
      ['classroom without losses', variant(classroom, (d) => { d.occasions.list.forEach((o) => { o.attrition = 0; }); })],
    ],
  },
  outliers: {
    fires: [
      ['sleep demo: outliers plausible, no plan', sleep, { key: 'outliers', severity: 'warning' }],
      ['classroom demo: no plan', classroom, { key: 'outliers', severity: 'advice' }],
    ],
    silent: [
      ['sleep with an outlier plan', variant(sleep, (d) => { d.analysis.outlierPlan = 'Values above 2000 ms checked against the log; robust regression as sensitivity analysis.'; })],
      ['outliers ruled out', simple],
      ['no analysis plan yet', classroomNoPlan],
    ],
  },
  'narrow-range': {
    fires: [['dose observed over 10–20, wanted 0–40', narrowDose, { key: 'dose', severity: 'warning' }]],
    silent: [
      ['target inside the observed range', variant(narrowDose, (d) => { const v = d.outcome.explanatoryVariables[0]!; v.targetMin = 12; v.targetMax = 18; })],
      ['no target range given', variant(narrowDose, (d) => { const v = d.outcome.explanatoryVariables[0]!; delete v.targetMin; delete v.targetMax; })],
      ['classroom demo', classroom],
    ],
  },
};

describe('registry', () => {
  it('every rule has a case table, and every table a rule', () => {
    expect(Object.keys(CASES).sort()).toEqual(RULES.map((r) => r.id).sort());
  });
  it('rule ids are unique kebab-case', () => {
    const ids = RULES.map((r) => r.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(/^[a-z]+(-[a-z0-9]+)*$/);
  });
});

describe.each(RULES.map((r) => [r.id, r] as const))('%s', (id, rule) => {
  const cases = CASES[id]!;
  it.each(cases.fires)('fires: %s', (_label, design, want) => {
    const found = rule.check(design);
    expect(found.length).toBeGreaterThan(0);
    const match = found.find((f) => (want?.key === undefined || f.key === want.key) && (want?.severity === undefined || f.severity === want.severity));
    expect(match, `wanted ${JSON.stringify(want)}, got ${JSON.stringify(found.map((f) => [f.key, f.severity]))}`).toBeDefined();
    for (const f of found) {
      expect(f.ruleId).toBe(id);
      expect(['blocker', 'warning', 'advice']).toContain(f.severity);
    }
  });
  it.each(cases.silent)('silent: %s', (_label, design) => {
    expect(rule.check(design)).toEqual([]);
  });
  it('is silent on an empty design and on one with only the outcome filled in', () => {
    expect(rule.check(empty)).toEqual([]);
    expect(rule.check(outcomeOnly)).toEqual([]);
  });
  it('never raises anything more severe than its own severity', () => {
    const rank = { blocker: 0, warning: 1, advice: 2 };
    for (const [, d] of cases.fires) for (const f of rule.check(d)) expect(rank[f.severity]).toBeGreaterThanOrEqual(rank[rule.severity]);
  });
});

describe('count outcomes read as counts', () => {
  it('a Poisson model of overdispersed counts: the variance factor 1 + κμ from the rate and follow-up', () => {
    const f = runChecks(absencesPoisson).findings.find((x) => x.key === 'overdispersion')!;
    expect(f.found).toContain('overdispersion of 0.5 between pupils');
    // μ = 0.5 days a month × 6 months = 3; 1 + 0.5 × 3 = 2.5; √2.5 = 1.58.
    expect(f.why).toContain('1 + 0.5 × 3 = 2.5 times the mean');
    expect(f.why).toContain('by up to a factor of 1.58');
    expect(f.why).toContain('A random intercept for classroom does not cover this');
    expect(f.numbers).toEqual({ dispersion: 0.5, meanCount: 3, varianceFactor: 2.5 });
  });
  it('a clustered count: cluster-level analysis of event rates, a GLMM with its family, the follow-up time as offset', () => {
    const d = variant(absencesPoisson, (x) => { x.analysis = { ...x.analysis, method: 'glm', randomIntercepts: [], unitOfAnalysisLevelId: 'pupil' }; });
    const unit = runChecks(d).findings.find((x) => x.ruleId === 'unit-of-analysis')!;
    expect(unit.todo).toContain('a model with a random intercept for classroom, here a negative binomial GLMM');
    expect(unit.todo).toContain('a t-test on the 20 classroom event rates');
    expect(unit.model).toBe('days_absent ~ programme + baseline_score + school + offset(log(follow_up_time)) + (1 | classroom)');
    expect(runChecks(d).findings.find((x) => x.ruleId === 'shared-environment')!.todo).toContain('analyse classroom event rates');
  });
  it('attrition of a count: what is lost is follow-up time', () => {
    const f = runChecks(absencesPoisson).findings.find((x) => x.ruleId === 'attrition')!;
    expect(f.why).toContain('What is lost is follow-up time');
    expect(f.todo).toContain('Record each pupil’s follow-up time until it leaves');
  });
});

describe('demo designs', () => {
  const ruleIds = (d: Design) => new Set(runChecks(d).findings.map((f) => f.ruleId));
  const signature = (d: Design) => runChecks(d).findings.map((f) => `${f.ruleId}:${f.key}:${f.severity}`).sort().join('|');

  it('classroom raises the unit-of-analysis blocker with its false-positive rate', () => {
    const f = runChecks(classroom).findings.find((x) => x.ruleId === 'unit-of-analysis')!;
    expect(f.severity).toBe('blocker');
    expect(f.key).toBe('classroom');
    expect(f.found).toContain('20 classrooms');
    expect(f.found).toContain('500 pupils');
    expect(f.why).toMatch(/false-positive rate of about 37%/);
    expect(f.numbers!.designEffect).toBeGreaterThan(4);
  });
  it('classroom with only the method changed to a mixed model on classroom has no blocker', () => {
    const blockers = runChecks(classroomMixed).findings.filter((x) => x.severity === 'blocker');
    expect(blockers).toEqual([]);
  });
  it('greenhouse raises pseudoreplication and shared environment', () => {
    const ids = ruleIds(greenhouse);
    for (const id of ['pseudoreplication', 'shared-environment', 'unit-of-analysis']) expect(ids).toContain(id);
  });
  it('sleep raises repeated measures, cross-over and serial correlation', () => {
    const ids = ruleIds(sleep);
    for (const id of ['repeated-measures', 'crossover', 'spatial-serial', 'analysis-mismatch']) expect(ids).toContain(id);
    expect(runChecks(sleep).findings.find((f) => f.ruleId === 'spatial-serial')!.key).toBe('night');
  });
  it('falls raises the clustering of residents in care homes and the Poisson model of overdispersed counts', () => {
    const findings = runChecks(falls).findings;
    const unit = findings.find((f) => f.ruleId === 'unit-of-analysis')!;
    expect([unit.key, unit.severity]).toEqual(['care-home', 'blocker']);
    expect(unit.found).toContain('40 care homes (20 per arm)');
    expect(unit.todo).toContain('a model with a random intercept for care home, here a negative binomial GLMM');
    expect(unit.todo).toContain('care home event rates');
    const over = findings.find((f) => f.key === 'overdispersion')!;
    expect(over.severity).toBe('warning');
    // μ = 1.8 falls a resident-year × 1 year; 1 + 0.8 × 1.8 = 2.44.
    expect(over.why).toContain('1 + 0.8 × 1.8 = 2.44 times the mean');
    expect(findings.find((f) => f.ruleId === 'attrition')!.why).toContain('What is lost is follow-up time');
    expect(runChecks(falls).recommendation.model).toBe('falls ~ programme + mobility + offset(log(follow_up_time)) + (1 | care_home)');
  });
  it('the four demo designs trigger different findings', () => {
    const sets = [classroom, greenhouse, sleep, falls].map(signature);
    expect(new Set(sets).size).toBe(4);
    const c = ruleIds(classroom);
    const g = ruleIds(greenhouse);
    const s = ruleIds(sleep);
    const f = ruleIds(falls);
    expect(c.has('pseudoreplication') || c.has('crossover') || c.has('outcome-family')).toBe(false);
    expect(g.has('crossover') || g.has('repeated-measures') || g.has('outcome-family')).toBe(false);
    expect(s.has('pseudoreplication') || s.has('unit-of-analysis') || s.has('outcome-family')).toBe(false);
    expect(f.has('pseudoreplication') || f.has('crossover') || f.has('repeated-measures') || f.has('skewed-outcome')).toBe(false);
  });
  it('findings are sorted blocker → warning → advice', () => {
    const rank = { blocker: 0, warning: 1, advice: 2 };
    for (const d of [classroom, greenhouse, sleep, falls, empty]) {
      const r = runChecks(d).findings.map((f) => rank[f.severity]);
      expect(r).toEqual([...r].sort((a, b) => a - b));
    }
  });
  it('keys are unique within a rule', () => {
    for (const d of [classroom, greenhouse, sleep, falls]) {
      const keys = runChecks(d).findings.map((f) => `${f.ruleId}:${f.key}`);
      expect(new Set(keys).size).toBe(keys.length);
    }
  });
  it('an empty design gives no crash and no finding', () => {
    const r = runChecks(empty, { onRuleError: (id, e) => { throw new Error(`${id}: ${String(e)}`); } });
    expect(r.findings).toEqual([]);
    expect(r.recommendation.model).toBe('y ~ arm');
  });
});
