/**
 * Designs of each shape the wizard accepts, for tests of the design's readers (facts, checks,
 * Plan, stress-test specification) and of runs from a design through the API. Small where the
 * shape allows, so that a run of a few hundred replicates stays quick. All numbers are invented.
 */
import type { DesignInput } from './schema';

export type LevelInput = NonNullable<NonNullable<DesignInput['structure']>['levels']>[number];

export const ARMS_2 = [
  { name: 'Intervention', allocation: 1 },
  { name: 'Control', allocation: 1 },
];
export const SRC = { kind: 'expert', certainty: 'low' } as const;

/** A design with the given levels, assignment and assumptions; continuous outcome unless given. */
export function shape(levels: LevelInput[], assignedTo: string, extra: Partial<DesignInput> = {}): DesignInput {
  return {
    outcome: { name: 'Score', type: 'continuous', shape: 'symmetric' },
    structure: { levels },
    assignment: { kind: 'randomised', levelId: assignedTo, arms: ARMS_2 },
    assumptions: { outcomeSd: { value: 10, source: SRC }, effect: { value: 4, source: SRC }, iccs: [] },
    ...extra,
  };
}

const countNumbers = { baselineRate: { value: 0.5, source: SRC }, rateRatio: { value: 0.75, source: SRC }, followUpTime: { value: 2, source: SRC }, dispersion: { value: 0.5, source: SRC } };
const binaryNumbers = { controlProportion: { value: 0.3, source: SRC }, proportionEffect: { measure: 'difference' as const, value: -0.1, source: SRC } };

export const SHAPES = {
  'two-level cluster trial': shape(
    [
      { id: 'practice', name: 'Practice', kind: 'grouping', count: 16, countCv: 0.3 },
      { id: 'patient', name: 'Patient', kind: 'independent', count: 30, countCv: 0.4 },
    ],
    'practice',
    { assumptions: { outcomeSd: { value: 8, source: SRC }, effect: { value: 2, source: SRC }, iccs: [{ levelId: 'practice', value: 0.05, source: SRC }] } },
  ),
  'three levels, treatment at the top': shape(
    [
      { id: 'school', name: 'School', kind: 'grouping', count: 12 },
      { id: 'classroom', name: 'Classroom', kind: 'grouping', count: 3, countCv: 0.2 },
      { id: 'pupil', name: 'Pupil', kind: 'independent', count: 20, countCv: 0.25 },
    ],
    'school',
    {
      assumptions: {
        outcomeSd: { value: 10, source: SRC },
        effect: { value: 3, source: SRC },
        iccs: [
          { levelId: 'school', value: 0.05, source: SRC },
          { levelId: 'classroom', value: 0.1, source: SRC },
        ],
      },
    },
  ),
  'three levels, treatment at the middle': shape(
    [
      { id: 'school', name: 'School', kind: 'grouping', count: 6 },
      { id: 'classroom', name: 'Classroom', kind: 'grouping', count: 4 },
      { id: 'pupil', name: 'Pupil', kind: 'independent', count: 25 },
    ],
    'classroom',
    {
      assignment: { kind: 'randomised', levelId: 'classroom', arms: ARMS_2, blocking: { kind: 'stratified', factor: 'School', inAnalysis: true } },
      assumptions: {
        outcomeSd: { value: 10, source: SRC },
        effect: { value: 3, source: SRC },
        iccs: [
          { levelId: 'school', value: 0.05, source: SRC },
          { levelId: 'classroom', value: 0.12, source: SRC },
        ],
      },
    },
  ),
  'AB/BA cross-over': shape(
    [
      { id: 'patient', name: 'Patient', kind: 'independent', count: 30 },
      { id: 'period', name: 'Period', kind: 'repeated', count: 2 },
    ],
    'period',
    {
      assignment: { kind: 'randomised', levelId: 'period', arms: ARMS_2, crossover: { enabled: true, periods: 2, carryoverPossible: false } },
      occasions: { list: [{ label: 'Period 1', time: 1 }, { label: 'Period 2', time: 2 }] },
      assumptions: { outcomeSd: { value: 12, source: SRC }, effect: { value: 5, source: SRC }, iccs: [{ levelId: 'patient', value: 0.6, source: SRC }] },
    },
  ),
  'three-period cross-over': shape(
    [
      { id: 'patient', name: 'Patient', kind: 'independent', count: 18 },
      { id: 'period', name: 'Period', kind: 'repeated', count: 3 },
    ],
    'patient',
    {
      assignment: { kind: 'randomised', levelId: 'patient', arms: ARMS_2, crossover: { enabled: true, periods: 3, carryoverPossible: true } },
      occasions: { list: [1, 2, 3].map((t) => ({ label: `Period ${t}`, time: t })) },
      assumptions: { outcomeSd: { value: 12, source: SRC }, effect: { value: 5, source: SRC }, occasionCorrelation: { value: 0.5, source: SRC }, iccs: [] },
    },
  ),
  'within-subject comparison over 8 occasions': shape(
    [
      { id: 'volunteer', name: 'Volunteer', kind: 'independent', count: 20 },
      { id: 'session', name: 'Session', kind: 'repeated', count: 8 },
    ],
    'session',
    {
      occasions: { list: [1, 2, 3, 4, 5, 6, 7, 8].map((t) => ({ label: `Session ${t}`, time: t })) },
      assumptions: { outcomeSd: { value: 30, source: SRC }, effect: { value: 10, source: SRC }, iccs: [{ levelId: 'volunteer', value: 0.5, source: SRC }] },
    },
  ),
  'individually randomised, baseline and follow-up': shape([{ id: 'patient', name: 'Patient', kind: 'independent', count: 120 }], 'patient', {
    occasions: { list: [{ label: 'Baseline', time: 0, baseline: true }, { label: 'Week 12', time: 12, attrition: 0.1 }] },
    assumptions: { outcomeSd: { value: 10, source: SRC }, effect: { value: 3, source: SRC }, occasionCorrelation: { value: 0.6, source: SRC }, iccs: [] },
    analysis: { method: 'ancova', unitOfAnalysisLevelId: 'patient', adjustsForBaseline: true },
  }),
  'longitudinal, trajectory of interest with random slopes planned': shape(
    [
      { id: 'patient', name: 'Patient', kind: 'independent', count: 40 },
      { id: 'visit', name: 'Visit', kind: 'repeated', count: 4, spatialOrSerial: true },
    ],
    'patient',
    {
      occasions: { list: [0, 2, 4, 8].map((t) => ({ label: `Week ${t}`, time: t })), trajectoryOfInterest: true },
      assumptions: { outcomeSd: { value: 10, source: SRC }, effect: { value: 4, source: SRC }, occasionCorrelation: { value: 0.6, source: SRC }, iccs: [] },
      analysis: { method: 'mixed-model', randomIntercepts: ['patient'], randomSlopeForTime: true, unitOfAnalysisLevelId: 'patient' },
    },
  ),
  'count outcome, clustered': shape(
    [
      { id: 'village', name: 'Village', kind: 'grouping', count: 16 },
      { id: 'household', name: 'Household', kind: 'independent', count: 10, countCv: 0.3 },
    ],
    'village',
    {
      outcome: { name: 'Malaria episodes', type: 'count', shape: 'right-skewed' },
      assumptions: { ...countNumbers, betweenClusterCv: { value: 0.3, source: SRC }, iccs: [{ levelId: 'village', value: 0.04, source: SRC }] },
    },
  ),
  'count outcome, individually randomised': shape([{ id: 'patient', name: 'Patient', kind: 'independent', count: 60 }], 'patient', {
    outcome: { name: 'Asthma attacks', type: 'count' },
    assumptions: { ...countNumbers, iccs: [] },
  }),
  'binary outcome, clustered': shape(
    [
      { id: 'clinic', name: 'Clinic', kind: 'grouping', count: 16 },
      { id: 'patient', name: 'Patient', kind: 'independent', count: 12 },
    ],
    'clinic',
    {
      outcome: { name: 'Smoking cessation', type: 'binary' },
      assumptions: { ...binaryNumbers, iccs: [{ levelId: 'clinic', value: 0.05, source: SRC }] },
    },
  ),
  'binary outcome, individually randomised': shape([{ id: 'patient', name: 'Patient', kind: 'independent', count: 200 }], 'patient', {
    outcome: { name: 'Smoking cessation', type: 'binary' },
    assumptions: { controlProportion: { value: 0.2, source: SRC }, proportionEffect: { measure: 'oddsRatio', value: 2, source: SRC }, iccs: [] },
  }),
} satisfies Record<string, DesignInput>;

export type ShapeName = keyof typeof SHAPES;
