/**
 * The classes of miss of issue 11, one table each, on designs of our own (lib/rules/__fixtures__)
 * besides the demos: the finding, its severity, its numbers and the recommended model.
 *
 * Figures checked by hand (no library needed): the df of a variance between k units is k − 1;
 * the within-unit variance factor is 1 − ρ (Var(y₁ − y₂) = 2σ²(1 − ρ)); the family-wise error of
 * K independent tests at α is 1 − (1 − α)^K, for K = 3 at 0.05: 1 − 0.857375 = 0.142625.
 */
import { describe, expect, it } from 'vitest';
import { analysisSchema, designSchema, type Design } from '@/lib/design/schema';
import {
  absencesTTest,
  blocksAsLevel,
  classroom,
  classroomAdopted,
  falls,
  fewDonors,
  fewLitters,
  fewRaters,
  fewSites,
  greenhouse,
  matchedPaired,
  occasionsCrossover,
  parse,
  perVisitTests,
  sleep,
  twins,
  twinsPaired,
  variant,
  wardsAbove,
  washedOutCrossover,
  wizardNames,
} from './__fixtures__/designs';
import { designFacts } from '@/lib/design/facts';
import { runChecks } from './registry';
import type { Finding, Severity } from './types';

const find = (d: Design, ruleId: string, key: string): Finding | undefined => runChecks(d).findings.find((f) => f.ruleId === ruleId && f.key === key);
const adopt = (d: Design): Design => designSchema.parse({ ...d, analysis: analysisSchema.parse({ ...d.analysis, ...runChecks(d).recommendation.analysisPatch }) });
const close = (got: number | undefined, want: number) => expect(got, `got ${got}, want ${want}`).toBeCloseTo(want, 9);

const fourVolunteers = variant(washedOutCrossover, (d) => {
  d.structure.levels[0]!.count = 4;
});

describe('1. few units at a level that would carry a random effect', () => {
  it.each<[string, Design, string, Severity, number, string, Design['analysis']['method']]>([
    ['4 sites, planned with a random intercept', fewSites, 'level-site', 'warning', 4, 'systolic_blood_pressure ~ arm + site', 'linear-regression'],
    ['5 litters, a logistic regression that ignores them', fewLitters, 'level-litter', 'advice', 5, 'tumour_present ~ arm + litter', 'glm'],
    ['3 donors, a t-test on the wells', fewDonors, 'level-donor', 'advice', 3, 'cytokine_release ~ arm + donor', 'linear-regression'],
    ['3 raters crossed with patients', fewRaters, 'crossed-rater', 'advice', 3, 'systolic_blood_pressure ~ arm + site + rater', 'linear-regression'],
    ['a cross-over of 4 volunteers with a random intercept', fourVolunteers, 'level-volunteer', 'warning', 4, 'pain_score ~ arm + period + volunteer', 'linear-regression'],
  ])('%s: says so, with the df of the variance, and the model has a fixed effect', (_label, design, key, severity, units, model, method) => {
    const { findings, recommendation } = runChecks(design);
    const f = findings.find((x) => x.ruleId === 'few-units' && x.key === key);
    expect(f, JSON.stringify(findings.map((x) => `${x.ruleId}/${x.key}`))).toBeDefined();
    expect(f!.severity).toBe(severity);
    expect(f!.numbers).toEqual({ units, varianceDf: units - 1, threshold: 6 });
    expect(f!.why).toContain(`${units - 1} degrees of freedom at most`);
    expect(f!.why).toMatch(/common practice \(Gomes 2022/);
    expect(f!.citations.map((c) => c.short)).toContain('Gomes 2022');
    expect(f!.model).toBe(model);
    expect(recommendation.model).toBe(model);
    expect(recommendation.method).toBe(method);
    const level = key.replace(/^level-/, '');
    expect(recommendation.randomIntercepts).not.toContain(level);
    if (key.startsWith('level-')) expect(recommendation.analysisPatch.fixedEffectLevels).toContain(level);
  });

  it.each<[string, Design]>([
    ['8 wards', wardsAbove],
    ['20 classrooms (the level of assignment)', classroom],
    ['12 trays (the level of assignment)', greenhouse],
    ['24 volunteers in a cross-over', sleep],
  ])('%s: no such finding, and the random intercept stays', (_label, design) => {
    const { findings, recommendation } = runChecks(design);
    expect(findings.filter((x) => x.ruleId === 'few-units' && /^(level|crossed)-/.test(x.key))).toEqual([]);
    expect(recommendation.analysisPatch.fixedEffectLevels).toEqual([]);
  });

  it('adopting the recommendation follows its advice: the warning drops to a reminder', () => {
    const adopted = adopt(fewSites);
    expect(adopted.analysis.fixedEffectLevels).toEqual(['site']);
    expect(adopted.analysis.randomIntercepts).toEqual([]);
    expect(find(adopted, 'few-units', 'level-site')!.severity).toBe('advice');
    expect(find(adopted, 'nested-clusters', 'site')!.todo).toBe('The plan accounts for this. Keep it.');
  });

  it('the nested-clusters finding on a planned random intercept for 4 sites asks for the fixed effect, not "keep it"', () => {
    expect(find(fewSites, 'nested-clusters', 'site')!.todo).toContain('give site a fixed effect instead');
  });
});

describe('2. the ICC’s direction', () => {
  const designEffectKeys = (f: Finding) => Object.keys(f.numbers ?? {}).filter((k) => /^designEffect/.test(k));

  it.each<[string, Design, string, number, number, number]>([
    ['a cross-over with a guessed correlation of 0.6', washedOutCrossover, 'volunteer', 0.3, 0.8, 0.7 / 0.2],
    ['the sleep demo with its ICC as an expert guess', variant(sleep, (d) => { d.assumptions.iccs[0]!.source = { kind: 'expert', certainty: 'low' }; }), 'volunteer', 0.25, 0.75, 0.75 / 0.25],
  ])('%s: compared within, a higher correlation helps; no design effect', (_label, design, level, lo, hi, ratio) => {
    const f = find(design, 'uncertain-icc', level)!;
    expect(f.severity).toBe('advice');
    close(f.numbers!.iccLow, lo);
    close(f.numbers!.iccHigh, hi);
    close(f.numbers!.varianceFactorLow, 1 - lo);
    close(f.numbers!.varianceFactorHigh, 1 - hi);
    close(f.numbers!.sampleSizeRatio, ratio);
    expect(designEffectKeys(f)).toEqual([]);
    expect(f.why).toContain('A correlation guessed too high leaves the study underpowered');
    expect(f.why).not.toMatch(/guessed too low leaves/);
    for (const g of runChecks(design).findings.filter((x) => x.levelIds?.includes(level) && x.ruleId !== 'pseudoreplication')) expect(designEffectKeys(g), `${g.ruleId}/${g.key}`).toEqual([]);
  });

  it.each<[string, Design, string]>([
    ['8 wards of 200 patients randomised individually (no ICC)', wardsAbove, 'ward'],
    ['4 sites (ICC 0.05, a guess)', fewSites, 'site'],
    ['5 litters', fewLitters, 'litter'],
  ])('%s: above the level of assignment, no design effect is quoted and no ICC warning is raised', (_label, design, level) => {
    const { findings } = runChecks(design);
    expect(findings.filter((x) => x.ruleId === 'uncertain-icc' || x.ruleId === 'unequal-cluster-sizes')).toEqual([]);
    const nested = findings.find((x) => x.ruleId === 'nested-clusters' && x.key === level)!;
    expect(designEffectKeys(nested)).toEqual([]);
    expect(nested.why).toMatch(/no design effect applies to the comparison/i);
  });

  it('the ICC of sites above the unit of assignment: its share of variance a site term removes (1 − 0.05)', () => {
    close(find(fewSites, 'nested-clusters', 'site')!.numbers!.residualVarianceFactor, 0.95);
  });

  it('compared between clusters, the design effect over the range stays (falls demo: 1.98, 2.96, 4.92 at ICC 0.03, 0.06, 0.12)', () => {
    const f = find(falls, 'uncertain-icc', 'care-home')!;
    close(f.numbers!.designEffectLow, 1.98025);
    close(f.numbers!.designEffectHigh, 4.921);
    expect(f.why).toContain('one guessed too low leaves the study underpowered');
  });
});

describe('3. an analysis per occasion, and a paired comparison', () => {
  it('both are methods of the analysis plan', () => {
    expect(analysisSchema.parse({ method: 'per-occasion-tests' }).method).toBe('per-occasion-tests');
    expect(analysisSchema.parse({ method: 'paired-t-test' }).method).toBe('paired-t-test');
  });

  it('tests at 3 visits: multiplicity and the ignored correlation, and one model with arm × occasion', () => {
    const { findings, recommendation } = runChecks(perVisitTests);
    const f = findings.find((x) => x.ruleId === 'per-occasion')!;
    expect(f.severity).toBe('warning');
    close(f.numbers!.tests, 3);
    close(f.numbers!.familyWiseError, 0.142625);
    expect(f.why).toContain('1 − (1 − 0.05)^3 = 14%');
    expect(f.why).toContain('ignore that the occasions are measurements of the same patients');
    expect(f.todo).toContain('one contrast fixed in the protocol');
    const model = 'grip_strength ~ arm * occasion + grip_strength_baseline + (1 | patient)';
    expect(f.model).toBe(model);
    expect(recommendation.model).toBe(model);
    expect(recommendation.adjustments.some((a) => a.startsWith('One model for all 3 follow-up occasions'))).toBe(true);
    expect(findings.some((x) => x.ruleId === 'repeated-measures' && x.severity === 'warning')).toBe(true);
  });

  it.each<[string, Design, Design, string]>([
    ['twin pairs', twins, twinsPaired, 'pairs-and-blocks/pair'],
    ['matched pairs by age', variant(matchedPaired, (d) => { d.analysis.method = 't-test'; }), matchedPaired, 'pairs-and-blocks/blocking'],
    ['nights of each volunteer under both schedules', sleep, variant(sleep, (d) => { d.analysis.method = 'paired-t-test'; }), 'analysis-mismatch/repeated-volunteer'],
  ])('%s: a t-test is flagged, a paired t-test is not', (_label, unpaired, paired, id) => {
    const ids = (d: Design) => runChecks(d).findings.map((f) => `${f.ruleId}/${f.key}`);
    expect(ids(unpaired)).toContain(id);
    expect(ids(paired)).not.toContain(id);
  });

  it.each<[string, Design, boolean]>([
    ['before and after in a parallel-group trial', variant(perVisitTests, (d) => { d.analysis.method = 'paired-t-test'; }), true],
    ['one measurement per patient, nothing paired', variant(wizardNames, (d) => { d.analysis.method = 'paired-t-test'; }), true],
    ['twin pairs, one twin per arm', twinsPaired, false],
    ['matched pairs', matchedPaired, false],
    ['both schedules within each volunteer', variant(sleep, (d) => { d.analysis.method = 'paired-t-test'; }), false],
  ])('a paired t-test that does not compare the arms is flagged: %s', (_label, design, flagged) => {
    const f = find(design, 'analysis-mismatch', 'paired-between');
    expect(f !== undefined).toBe(flagged);
    if (f) expect(f.severity).toBe('warning');
  });
});

describe('4. every cross-over gets the cross-over finding', () => {
  const threePeriods = variant(washedOutCrossover, (d) => {
    d.assignment.crossover.periods = 3;
    d.assignment.arms.push({ name: 'Third', allocation: 1 });
  });
  it.each<[string, Design, Severity, string, boolean]>([
    ['sleep demo: no washout, carry-over possible', sleep, 'warning', 'Cross-over without a washout', true],
    ['a washout of two weeks, carry-over not expected', washedOutCrossover, 'advice', 'Is the washout long enough?', true],
    ['a washout, carry-over marked possible', variant(washedOutCrossover, (d) => { d.assignment.crossover.carryoverPossible = true; }), 'warning', 'Carry-over possible between periods', true],
    ['three periods with a washout', threePeriods, 'advice', 'Is the washout long enough?', false],
  ])('%s', (_label, design, severity, title, twoPeriods) => {
    const f = find(design, 'crossover', 'carry-over')!;
    expect([f.severity, f.title]).toEqual([severity, title]);
    expect(f.why).toContain('Senn 2002');
    expect(f.why).toContain('A preliminary test for carry-over has little power');
    expect(f.why.includes('carry-over cannot be tested away')).toBe(twoPeriods);
    expect(f.todo).toContain('Do not rely on a test for carry-over');
    if (design.assignment.crossover.washout && !/^none/i.test(design.assignment.crossover.washout)) expect(f.todo).toContain(`("${design.assignment.crossover.washout}")`);
    expect(find(design, 'crossover', 'period')).toBeDefined();
  });
});

describe('5. blocking that the model carries counts as blocking in the analysis', () => {
  it.each<[string, Design]>([
    ['a fixed school term in the planned model', classroomAdopted],
    ['the classroom demo with the recommendation adopted', adopt(classroom)],
    ['a random intercept for the block level', blocksAsLevel],
    ['a random intercept for the sites it was stratified by', fewSites],
    ['the fixed site effect the recommendation puts in', adopt(fewSites)],
    ['no analysis planned yet (the recommended model has the term)', variant(classroom, (d) => { d.analysis = analysisSchema.parse({}); })],
  ])('%s: silent', (_label, design) => {
    expect(find(design, 'pairs-and-blocks', 'blocking')).toBeUndefined();
  });

  it('a t-test that leaves the strata out still gets it (classroom demo)', () => {
    const f = find(classroom, 'pairs-and-blocks', 'blocking')!;
    expect(f.severity).toBe('advice');
    expect(f.model).toContain('+ school +');
  });
});

describe('6. the user’s names, and blocker and recommendation naming the same model', () => {
  it('variables added in the wizard (ids var-1, var-2) appear by their names', () => {
    const { recommendation } = runChecks(wizardNames);
    expect(recommendation.model).toBe('blood_pressure ~ fertiliser + soil_moisture');
  });

  it.each<[string, Design, string, string, string]>([
    ['a count per pupil, classrooms randomised', absencesTTest, 'unit-of-analysis', 'classroom', 'a model with a random intercept for classroom, here a Poisson GLMM'],
    ['the falls demo', falls, 'unit-of-analysis', 'care-home', 'a model with a random intercept for care home, here a negative binomial GLMM'],
    ['the sleep demo', sleep, 'analysis-mismatch', 'repeated-volunteer', 'a model with a random intercept for volunteer, here a linear mixed model'],
    ['5 litters, a yes-or-no outcome', variant(fewLitters, (d) => { d.analysis.method = 't-test'; }), 'outcome-family', 'binary', 'a model with a fixed effect for litter, here a logistic (binomial) regression'],
  ])('%s', (_label, design, ruleId, key, words) => {
    const { findings, recommendation } = runChecks(design);
    const f = findings.find((x) => x.ruleId === ruleId && x.key === key)!;
    expect(f.todo).toContain(words);
    expect(f.model ?? recommendation.model).toBe(recommendation.model);
    const kind = words.replace(/^.*, here /, '');
    if (/GLMM|mixed/.test(kind)) expect(['glmm', 'mixed-model']).toContain(recommendation.method);
    if (kind.includes('Poisson')) expect(recommendation.family).toBe('poisson');
    if (kind.includes('negative binomial')) expect(recommendation.family).toBe('negative-binomial');
  });
});

/*
 * Classes found by trying designs from fields the demos do not cover (issue 11, an outside
 * methods consultant's pass). The designs below are made up for these tests.
 */
const SRC = { kind: 'expert', certainty: 'low' } as const;
const twoArms = [
  { name: 'Active', allocation: 1 },
  { name: 'Sham', allocation: 1 },
];

/** Days of one calf assigned to the arms: a cross-over in effect, not described as one. */
const calves = parse({
  outcome: { name: 'Milk intake', type: 'continuous', shape: 'symmetric' },
  structure: {
    levels: [
      { id: 'calf', name: 'Calf', kind: 'independent', count: 14 },
      { id: 'feeding-day', name: 'Feeding day', kind: 'repeated', count: 6 },
    ],
  },
  assignment: { kind: 'randomised', variableName: 'Teat type', levelId: 'feeding-day', arms: twoArms },
  occasions: { timeUnit: 'days', list: [1, 2, 3, 4, 5, 6].map((t) => ({ label: `Day ${t}`, time: t })) },
  assumptions: { outcomeSd: { value: 1.2, source: SRC }, effect: { value: 0.5, source: SRC }, iccs: [{ levelId: 'calf', value: 0.55, source: SRC }] },
  analysis: { method: 'mixed-model', randomIntercepts: ['calf'], unitOfAnalysisLevelId: 'calf', dfMethod: 'kenward-roger' },
});

describe('4b. a cross-over that the structure does not show as one still is one', () => {
  it('periods given only as occasions: the participant receives both arms and counts as n once', () => {
    const f = designFacts(occasionsCrossover);
    expect([f.withinUnit, f.changesOverTime, f.eu?.level.id]).toEqual([true, true, 'participant']);
    const { findings, recommendation } = runChecks(occasionsCrossover);
    // Not two parallel groups of 17: no per-arm count, no design effect between participants.
    expect(findings.find((x) => x.ruleId === 'few-units' && x.key === 'per-arm')).toBeUndefined();
    const rm = findings.find((x) => x.ruleId === 'repeated-measures')!;
    expect(rm.numbers).toEqual({ units: 34, measurementsPerUnit: 2, measurements: 68, correlation: 0.5, varianceFactorWithin: 0.5 });
    expect(find(occasionsCrossover, 'crossover', 'carry-over')!.why).toContain('carry-over cannot be tested away');
    expect(recommendation.model).toBe('tinnitus_loudness ~ sound_therapy + period + (1 | participant)');
    expect(recommendation.unitOfAnalysis).toEqual({ levelId: 'participant', name: 'Participant', total: 34 });
  });

  it.each<[string, Design, number, string, Severity, string]>([
    ['days of a calf assigned to teat types', calves, 6, 'feeding days', 'warning', 'milk_intake ~ teat_type + occasion + (1 | calf)'],
    ['the same with a washout between days described', variant(calves, (d) => void (d.assignment.crossover.washout = 'A day of the usual teat')), 6, 'feeding days', 'advice', 'milk_intake ~ teat_type + occasion + (1 | calf)'],
  ])('%s: the cross-over findings, in the design’s words', (_label, design, periods, word, severity, model) => {
    const { findings, recommendation } = runChecks(design);
    const carry = findings.find((x) => x.ruleId === 'crossover' && x.key === 'carry-over')!;
    expect(carry.severity).toBe(severity);
    expect(carry.title).toBe(`The arms change between ${word}: carry-over?`);
    expect(carry.numbers).toEqual({ periods });
    expect(carry.why).toContain('Senn 2002');
    const period = findings.find((x) => x.ruleId === 'crossover' && x.key === 'period')!;
    expect(period.found).toContain('a cross-over in effect');
    expect(period.todo).toContain('include the feeding day (`occasion` in the model) as a fixed effect, with calf as a random intercept');
    expect(period.model).toBe(model);
    expect(recommendation.model).toBe(model);
  });

  it('a cross-over described with no periods in the structure or the occasions still gets both findings', () => {
    const bare = variant(occasionsCrossover, (d) => void (d.occasions.list = []));
    expect(designFacts(bare).withinUnit).toBe(false);
    const keys = runChecks(bare).findings.filter((x) => x.ruleId === 'crossover').map((x) => x.key);
    expect(keys).toEqual(['carry-over', 'period']);
  });

  it('a unit measured on replicates (not over time) that receives both arms gets no cross-over finding', () => {
    const halves = variant(calves, (d) => {
      d.structure.levels[1] = { ...d.structure.levels[1]!, kind: 'replicate', name: 'Udder quarter', count: 4 };
      d.occasions.list = [];
    });
    expect(runChecks(halves).findings.filter((x) => x.ruleId === 'crossover')).toEqual([]);
  });

  it('the period finding names the unit’s term as the model carries it (a fixed effect for 4 units)', () => {
    const few = variant(calves, (d) => void (d.structure.levels[0]!.count = 4));
    const period = find(few, 'crossover', 'period')!;
    expect(period.model).toBe('milk_intake ~ teat_type + occasion + calf');
    expect(period.todo).toContain('with calf as a fixed effect');
  });
});

describe('2b. the correlation between occasions serves as the ICC of the unit measured over time', () => {
  /** Households visited each quarter, an exposure compared between households. */
  const households = parse({
    outcome: { name: 'Water use', type: 'continuous', shape: 'symmetric' },
    structure: {
      levels: [
        { id: 'household', name: 'Household', kind: 'independent', count: 120 },
        { id: 'quarter', name: 'Quarter', kind: 'repeated', count: 4 },
      ],
    },
    assignment: { kind: 'randomised', variableName: 'Smart meter', levelId: 'household', arms: twoArms },
    occasions: { list: [1, 2, 3, 4].map((t) => ({ label: `Quarter ${t}`, time: t })) },
    assumptions: { outcomeSd: { value: 30, source: SRC }, effect: { value: 8, source: SRC }, occasionCorrelation: { value: 0.45, source: SRC }, iccs: [] },
  });
  it.each<[string, Design, number, number]>([
    ['two levels: the correlation itself', households, 0.45, 0],
    [
      'under villages with ICC 0.1: the correlation less the village share',
      variant(households, (d) => {
        d.structure.levels.unshift({ id: 'village', name: 'Village', kind: 'grouping', count: 12, countIsTotal: false, countCv: 0, sharedEnvironment: false, spatialOrSerial: false });
        d.structure.levels[1]!.count = 10;
        d.assumptions.iccs = [{ levelId: 'village', value: 0.1, source: { kind: 'published', certainty: 'high' } }];
      }),
      0.35,
      0.1,
    ],
  ])('%s: an uncertain value, not a missing one', (_label, design, share, above) => {
    const f = find(design, 'uncertain-icc', 'household')!;
    expect(f.severity).toBe('advice');
    expect(f.title).toBe('The ICC for households is uncertain');
    expect(f.found).toContain('taken from the correlation between occasions of one household');
    expect(f.numbers!.icc).toBeCloseTo(share, 12);
    expect(f.numbers!.iccLow).toBeCloseTo(share / 2, 12);
    // 4 quarters per household: DE = 1 + 3ρ at the value given (Kish 1965), ρ taken within the
    // level above (clusteringEffect leaves out the shares above the level it is about).
    expect(f.numbers!.designEffect).toBeCloseTo(1 + (3 * share) / (1 - above), 12);
  });
  it('with neither, it is missing (warning), as before', () => {
    const none = variant(households, (d) => void delete d.assumptions.occasionCorrelation);
    expect(find(none, 'uncertain-icc', 'household')!.severity).toBe('warning');
  });
});

describe('1b. the degrees of freedom between units leave out the blocks the model enters as fixed effects', () => {
  /** Strips of an orchard row assigned to pruning regimes, trees measured in each strip. */
  const orchard = (rows: number) =>
    parse({
      outcome: { name: 'Fruit set', type: 'continuous', shape: 'symmetric' },
      structure: {
        levels: [
          { id: 'row', name: 'Row', kind: 'grouping', groupingType: 'plot', count: rows },
          { id: 'strip', name: 'Strip', kind: 'grouping', groupingType: 'plot', count: 2 },
          { id: 'tree', name: 'Tree', kind: 'independent', count: 4 },
        ],
      },
      assignment: { kind: 'randomised', variableName: 'Pruning', levelId: 'strip', arms: twoArms, blocking: { kind: 'blocked', factor: 'Row', inAnalysis: true } },
      assumptions: { outcomeSd: { value: 5, source: SRC }, effect: { value: 3, source: SRC }, iccs: [{ levelId: 'row', value: 0.2, source: SRC }, { levelId: 'strip', value: 0.1, source: SRC }] },
    });
  // One strip of each arm per row: an RCBD on strip means, error df (rows − 1)(arms − 1); R 4.2.2
  // aov(y ~ arm + row + Error(strip)) on 4 rows gives 3 in the strip stratum.
  it.each<[string, Design, string, number]>([
    ['5 rows: 10 strips, 5 per arm', orchard(5), 'per-arm', 4],
    ['3 rows: 6 strips, too few for their variance', orchard(3), 'variance', 2],
  ])('%s', (_label, design, key, df) => {
    const { findings, recommendation } = runChecks(design);
    const f = findings.find((x) => x.ruleId === 'few-units' && x.key === key)!;
    expect(f.numbers!.betweenUnitDf).toBe(df);
    expect(recommendation.model).toBe('fruit_set ~ pruning + row + (1 | row:strip)');
    if (key === 'variance') {
      expect(f.why).toContain(`leaving about ${df} degrees of freedom once the arms and rows are fitted`);
      expect(f.todo).toContain(`a linear model of the 6 means on the arms and rows with ${df} df`);
    }
  });
});

describe('2c. periods that hold several members (a cluster cross-over) are clusters of people, not repeats of one unit', () => {
  /** Schools switch between two timetables from term to term; pupils are measured in each term. */
  const schools = parse({
    outcome: { name: 'Attention score', type: 'continuous', shape: 'symmetric' },
    structure: {
      levels: [
        { id: 'school', name: 'School', kind: 'grouping', groupingType: 'school', count: 12 },
        { id: 'term', name: 'Term', kind: 'repeated', count: 4 },
        { id: 'pupil', name: 'Pupil', kind: 'independent', count: 20 },
      ],
    },
    assignment: { kind: 'randomised', variableName: 'Timetable', levelId: 'term', arms: twoArms },
    occasions: { list: [1, 2, 3, 4].map((t) => ({ label: `Term ${t}`, time: t })) },
    assumptions: { outcomeSd: { value: 15, source: SRC }, effect: { value: 4, source: SRC }, iccs: [{ levelId: 'school', value: 0.08, source: { kind: 'published', certainty: 'high' } }] },
  });
  it('the ICC range for the school-term is that of clusters of pupils (0.01–0.2)', () => {
    const f = find(schools, 'uncertain-icc', 'term')!;
    expect(f.severity).toBe('warning');
    expect([f.numbers!.iccLow, f.numbers!.iccHigh]).toEqual([0.01, 0.2]);
  });
  it('the repeated measurements are counted in terms, with the pupils of each', () => {
    const f = runChecks(schools).findings.find((x) => x.ruleId === 'repeated-measures')!;
    expect(f.found).toBe('Each school is measured in 4 terms, 20 pupils in each: 960 measurements of attention score from 12 schools.');
  });
  it('nights of one volunteer keep the range of repeated measurements (0.2–0.8)', () => {
    const f = find(variant(calves, (d) => void (d.assumptions.iccs = [])), 'uncertain-icc', 'calf')!;
    expect([f.numbers!.iccLow, f.numbers!.iccHigh]).toEqual([0.2, 0.8]);
  });
});
