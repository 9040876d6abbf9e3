/**
 * Designs the rule tests share: the four demo designs (db/demo/designs.ts) and small variants
 * of them, each made to have, or not to have, one problem. All invented.
 */
import { CLASSROOM_DESIGN, FALLS_DESIGN, GREENHOUSE_DESIGN, SLEEP_DESIGN } from '@/db/demo/designs';
import { designSchema, type Design, type DesignInput } from '@/lib/design/schema';

export const parse = (d: DesignInput): Design => designSchema.parse(d);

/** A parsed copy of `base` changed by `edit` (which may mutate the copy), re-validated. */
export function variant(base: Design, edit: (d: Design) => void): Design {
  const copy = structuredClone(base);
  edit(copy);
  return parse(copy as DesignInput);
}

export const classroom = parse(CLASSROOM_DESIGN);
export const greenhouse = parse(GREENHOUSE_DESIGN);
export const sleep = parse(SLEEP_DESIGN);
export const falls = parse(FALLS_DESIGN);
export const empty = parse({});
export const outcomeOnly = parse({ outcome: { name: 'Blood pressure', type: 'continuous', shape: 'symmetric' } });

/** The UI test's change: only the method and the random intercept. */
export const classroomMixed = variant(classroom, (d) => {
  d.analysis.method = 'mixed-model';
  d.analysis.randomIntercepts = ['classroom'];
});

/** An individually randomised trial of 60 people, one outcome measurement, t-test. */
export const simple = parse({
  outcome: { name: 'Blood pressure', unit: 'mmHg', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: { levels: [{ id: 'person', name: 'Person', kind: 'independent', count: 60 }] },
  assignment: { kind: 'randomised', levelId: 'person', arms: [{ name: 'Drug', allocation: 1 }, { name: 'Placebo', allocation: 1 }] },
  occasions: { list: [{ label: 'Week 12', time: 12 }] },
  analysis: { method: 't-test', unitOfAnalysisLevelId: 'person' },
});

/**
 * Days absent per pupil, classrooms randomised, planned as a Poisson mixed model with a random
 * intercept for classroom, with counts expected to be overdispersed (0.5 at 3 days per pupil).
 */
export const absencesPoisson = variant(classroom, (d) => {
  d.outcome.name = 'Days absent';
  d.outcome.type = 'count';
  d.occasions.list = [{ label: 'End of year', time: 36, baseline: false, attrition: 0.08 }];
  const source = { kind: 'expert', certainty: 'medium' } as const;
  Object.assign(d.assumptions, { baselineRate: { value: 0.5, source }, rateRatio: { value: 0.75, source }, followUpTime: { value: 6, source }, dispersion: { value: 0.5, source }, betweenClusterCv: { value: 0.25, source } });
  d.analysis = { ...d.analysis, method: 'glmm', glmFamily: 'poisson', randomIntercepts: ['classroom'], unitOfAnalysisLevelId: 'classroom' };
});

/** Volunteers randomised between schedules (parallel groups), 8 nights each, t-test on nights. */
export const parallelNights = variant(sleep, (d) => {
  d.assignment.levelId = 'volunteer';
  d.assignment.crossover = { enabled: false, periods: 2 };
});

/** Pupils randomised individually inside classrooms. */
export const pupilsInClassrooms = variant(classroom, (d) => {
  d.assignment.levelId = 'pupil';
});

/** A cohort measured at 5 unequally spaced visits; the trajectory is of interest. */
export const longitudinal = parse({
  outcome: { name: 'Lung function', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: { levels: [{ id: 'patient', name: 'Patient', kind: 'independent', count: 80 }] },
  assignment: { kind: 'randomised', levelId: 'patient', arms: [{ name: 'Exercise', allocation: 1 }, { name: 'Usual care', allocation: 1 }] },
  occasions: {
    timeUnit: 'months',
    trajectoryOfInterest: true,
    list: [0, 1, 3, 6, 12].map((t, i) => ({ label: `Month ${t}`, time: t, baseline: i === 0 })),
  },
  analysis: { method: 'linear-regression', unitOfAnalysisLevelId: 'patient', adjustsForBaseline: true, outlierPlan: 'Range checks; robust regression as sensitivity.' },
});

/** Twin pairs, one twin per arm. */
export const twins = parse({
  outcome: { name: 'Anxiety score', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: {
    levels: [
      { id: 'pair', name: 'Twin pair', kind: 'grouping', groupingType: 'pair', count: 40 },
      { id: 'twin', name: 'Twin', kind: 'independent', count: 2 },
    ],
  },
  assignment: { kind: 'randomised', levelId: 'twin', arms: [{ name: 'App', allocation: 1 }, { name: 'Waiting list', allocation: 1 }] },
  analysis: { method: 't-test', unitOfAnalysisLevelId: 'twin' },
});

/** Mice assigned individually, housed four to a cage. */
export const miceInCages = parse({
  outcome: { name: 'Body weight', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: {
    levels: [
      { id: 'cage', name: 'Cage', kind: 'grouping', groupingType: 'cage', count: 10, sharedEnvironment: true },
      { id: 'mouse', name: 'Mouse', kind: 'independent', count: 4 },
    ],
  },
  assignment: { kind: 'randomised', levelId: 'mouse', arms: [{ name: 'Diet A', allocation: 1 }, { name: 'Diet B', allocation: 1 }] },
  assumptions: { iccs: [{ levelId: 'cage', value: 0.1, source: { kind: 'published', certainty: 'high' } }] },
  analysis: { method: 'mixed-model', randomIntercepts: ['cage'], unitOfAnalysisLevelId: 'mouse', dfMethod: 'kenward-roger' },
});

/** A dose–response study: dose observed over 10–20 mg, conclusions wanted for 0–40 mg. */
export const narrowDose = variant(simple, (d) => {
  d.assignment.kind = 'continuous';
  d.assignment.arms = [];
  d.outcome.explanatoryVariables = [{ id: 'dose', name: 'Dose', role: 'exposure', kind: 'continuous', observedMin: 10, observedMax: 20, targetMin: 0, targetMax: 40 }];
  d.analysis.method = 'linear-regression';
});

/** The classroom study with a structure and assignment but no analysis plan yet. */
export const classroomNoPlan = variant(classroom, (d) => {
  d.analysis = empty.analysis;
});

// ---- Designs for the rule classes of issue 11 (few units at a random level, the ICC's
// direction, an analysis per occasion, cross-over, blocking in the model, names). Invented.

const TWO_ARMS = [{ name: 'Active', allocation: 1 }, { name: 'Control', allocation: 1 }];
const GUESS = { kind: 'expert', certainty: 'low' } as const;

/** Patients randomised individually within 4 sites (stratified by site); a mixed model with a random intercept for site. */
export const fewSites = parse({
  outcome: { name: 'Systolic blood pressure', unit: 'mmHg', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: {
    levels: [
      { id: 'site', name: 'Site', kind: 'grouping', groupingType: 'site', count: 4 },
      { id: 'patient', name: 'Patient', kind: 'independent', count: 30 },
    ],
  },
  assignment: { kind: 'randomised', levelId: 'patient', arms: TWO_ARMS, blocking: { kind: 'stratified', factor: 'Site' } },
  occasions: { list: [{ label: 'Week 12', time: 12 }] },
  assumptions: { iccs: [{ levelId: 'site', value: 0.05, source: GUESS }] },
  analysis: { method: 'mixed-model', randomIntercepts: ['site'], unitOfAnalysisLevelId: 'patient', dfMethod: 'kenward-roger', outlierPlan: 'Range checks.' },
});

/** Pups randomised individually within 5 litters; a yes-or-no outcome analysed by logistic regression that ignores the litters. */
export const fewLitters = parse({
  outcome: { name: 'Tumour present', type: 'binary' },
  structure: {
    levels: [
      { id: 'litter', name: 'Litter', kind: 'grouping', groupingType: 'litter', count: 5 },
      { id: 'pup', name: 'Pup', kind: 'independent', count: 6 },
    ],
  },
  assignment: { kind: 'randomised', levelId: 'pup', arms: TWO_ARMS },
  occasions: { list: [{ label: 'Week 20', time: 20 }] },
  analysis: { method: 'glm', glmFamily: 'binomial', unitOfAnalysisLevelId: 'pup' },
});

/** Culture wells from 3 donors, wells assigned to the arms within each donor, a t-test on the wells. */
export const fewDonors = parse({
  outcome: { name: 'Cytokine release', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: {
    levels: [
      { id: 'donor', name: 'Donor', kind: 'grouping', groupingType: 'other', count: 3 },
      { id: 'well', name: 'Well', kind: 'independent', count: 8 },
    ],
  },
  assignment: { kind: 'randomised', levelId: 'well', arms: TWO_ARMS },
  occasions: { list: [{ label: 'Day 2', time: 2 }] },
  analysis: { method: 't-test', unitOfAnalysisLevelId: 'well' },
});

/** fewSites with 3 raters who each score every patient (a crossed factor with few levels). */
export const fewRaters = variant(fewSites, (d) => {
  d.structure.crossedFactors = [{ id: 'rater', name: 'Rater', count: 3, crossedWithLevelId: 'patient' }];
});

/** Patients randomised individually in 8 wards of 200 each; no ICC for wards. */
export const wardsAbove = parse({
  outcome: { name: 'Length of stay', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: {
    levels: [
      { id: 'ward', name: 'Ward', kind: 'grouping', groupingType: 'site', count: 8, countCv: 0.3 },
      { id: 'patient', name: 'Patient', kind: 'independent', count: 200 },
    ],
  },
  assignment: { kind: 'randomised', levelId: 'patient', arms: TWO_ARMS },
  occasions: { list: [{ label: 'Discharge', time: 1 }] },
  analysis: { method: 'mixed-model', randomIntercepts: ['ward'], unitOfAnalysisLevelId: 'patient', outlierPlan: 'Range checks.' },
});

/** A two-period cross-over of 20 volunteers, 4 sessions each, with a described washout; the within-volunteer correlation guessed. */
export const washedOutCrossover = parse({
  outcome: { name: 'Pain score', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: {
    levels: [
      { id: 'volunteer', name: 'Volunteer', kind: 'independent', count: 20 },
      { id: 'session', name: 'Session', kind: 'repeated', count: 4 },
    ],
  },
  assignment: { kind: 'randomised', levelId: 'volunteer', arms: TWO_ARMS, crossover: { enabled: true, periods: 2, washout: 'Two weeks', carryoverPossible: false } },
  assumptions: { iccs: [{ levelId: 'volunteer', value: 0.6, source: GUESS }] },
  analysis: { method: 'mixed-model', randomIntercepts: ['volunteer'], unitOfAnalysisLevelId: 'volunteer', dfMethod: 'kenward-roger', outlierPlan: 'Range checks.' },
});

/** 60 patients randomised, measured at baseline and 3 visits, the arms tested separately at each visit. */
export const perVisitTests = parse({
  outcome: { name: 'Grip strength', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: { levels: [{ id: 'patient', name: 'Patient', kind: 'independent', count: 60 }] },
  assignment: { kind: 'randomised', levelId: 'patient', arms: TWO_ARMS },
  occasions: { timeUnit: 'weeks', list: [0, 4, 8, 12].map((t, i) => ({ label: `Week ${t}`, time: t, baseline: i === 0 })) },
  analysis: { method: 'per-occasion-tests', unitOfAnalysisLevelId: 'patient', adjustsForBaseline: true, outlierPlan: 'Range checks.' },
});

/** Twin pairs analysed by a paired t-test. */
export const twinsPaired = variant(twins, (d) => {
  d.analysis.method = 'paired-t-test';
});

/** Patients in matched pairs (by age), analysed by a paired t-test. */
export const matchedPaired = variant(simple, (d) => {
  d.assignment.blocking = { kind: 'matched', factor: 'Age', inAnalysis: false };
  d.analysis.method = 'paired-t-test';
});

/** The classroom demo with the recommended analysis adopted (the analysis step only). */
export const classroomAdopted = variant(classroom, (d) => {
  Object.assign(d.analysis, { method: 'mixed-model', randomIntercepts: ['classroom'], adjustsForBaseline: true, blockEffect: 'fixed', dfMethod: 'kenward-roger' });
});

/** Plots in blocks that are a level of the structure; a mixed model with a random intercept for the block. */
export const blocksAsLevel = parse({
  outcome: { name: 'Yield', type: 'continuous', shape: 'symmetric', outliersExpected: false },
  structure: {
    levels: [
      { id: 'block', name: 'Block', kind: 'grouping', groupingType: 'plot', count: 8 },
      { id: 'plot', name: 'Plot', kind: 'independent', count: 4 },
    ],
  },
  assignment: { kind: 'randomised', levelId: 'plot', arms: TWO_ARMS, blocking: { kind: 'blocked', factor: 'Block' } },
  occasions: { list: [{ label: 'Harvest', time: 1 }] },
  analysis: { method: 'mixed-model', randomIntercepts: ['block'], unitOfAnalysisLevelId: 'plot', outlierPlan: 'Range checks.' },
});

/** Variables the user added in the wizard (ids made up as var-1, var-2). */
export const wizardNames = variant(simple, (d) => {
  d.outcome.explanatoryVariables = [
    { id: 'var-1', name: 'Fertiliser', role: 'treatment', kind: 'categorical' },
    { id: 'var-2', name: 'Soil moisture', role: 'covariate', kind: 'continuous' },
  ];
});

/** Days absent per pupil, classrooms randomised, plain Poisson counts, planned as a t-test per pupil. */
export const absencesTTest = variant(absencesPoisson, (d) => {
  d.assumptions.dispersion = { value: 0, source: { kind: 'expert', certainty: 'medium' } };
  d.analysis = { ...d.analysis, method: 't-test', glmFamily: undefined, randomIntercepts: [], unitOfAnalysisLevelId: 'pupil' };
});

/** A two-period cross-over whose periods are given only as occasions of its one level. */
export const occasionsCrossover = parse({
  outcome: { name: 'Tinnitus loudness', type: 'continuous', shape: 'symmetric' },
  structure: { levels: [{ id: 'participant', name: 'Participant', kind: 'independent', count: 34 }] },
  assignment: {
    kind: 'randomised',
    variableName: 'Sound therapy',
    levelId: 'participant',
    arms: [
      { name: 'Active', allocation: 1 },
      { name: 'Sham', allocation: 1 },
    ],
    crossover: { enabled: true, periods: 2, washout: 'Four weeks' },
  },
  occasions: { list: [{ label: 'End of period 1', time: 4 }, { label: 'End of period 2', time: 12 }] },
  assumptions: { outcomeSd: { value: 4, source: { kind: 'expert', certainty: 'low' } }, effect: { value: 2, source: { kind: 'expert', certainty: 'low' } }, occasionCorrelation: { value: 0.5, source: { kind: 'expert', certainty: 'low' } } },
  analysis: { method: 't-test', unitOfAnalysisLevelId: 'participant' },
});
