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
