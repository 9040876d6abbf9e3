/**
 * Designs of the four invented demo studies (PRODUCT.md, "Demo scenario"). All numbers and
 * sources here are invented for the demo; none describes a real study. Each design is built to
 * trigger different checks: a unit-of-analysis error (classroom), pseudoreplication in a shared
 * environment (greenhouse), repeated measures in a cross-over (sleep timing), and a count outcome
 * in a cluster-randomised trial planned as a Poisson regression on residents (falls).
 */
import type { DesignInput } from '@/lib/design/schema';

const invented = (citation: string, certainty: 'low' | 'medium' | 'high' = 'medium') =>
  ({ kind: 'published', citation: `${citation} (invented for the demo)`, certainty }) as const;

export const CLASSROOM_DESIGN: DesignInput = {
  outcome: {
    name: 'Reading score',
    unit: 'points',
    type: 'continuous',
    shape: 'symmetric',
    primaryOutcomes: 1,
    secondaryOutcomes: ['Reading enjoyment questionnaire'],
    explanatoryVariables: [
      { id: 'programme', name: 'Reading-support programme', role: 'treatment', kind: 'categorical' },
      { id: 'baseline-score', name: 'Baseline reading score', role: 'covariate', kind: 'continuous' },
    ],
  },
  structure: {
    levels: [
      { id: 'classroom', name: 'Classroom', kind: 'grouping', groupingType: 'classroom', count: 20, countCv: 0.2, sharedEnvironment: true },
      { id: 'pupil', name: 'Pupil', kind: 'independent', count: 25, countCv: 0.25 },
    ],
  },
  assignment: {
    kind: 'randomised',
    variableName: 'Reading-support programme',
    levelId: 'classroom',
    arms: [
      { name: 'Programme', allocation: 1 },
      { name: 'Usual teaching', allocation: 1 },
    ],
    blocking: { kind: 'stratified', factor: 'School', inAnalysis: false },
  },
  occasions: {
    timeUnit: 'weeks',
    list: [
      { label: 'Start of year', time: 0, baseline: true, attrition: 0 },
      { label: 'End of year', time: 36, baseline: false, attrition: 0.08 },
    ],
    correlationStructure: 'exchangeable',
  },
  assumptions: {
    outcomeSd: { value: 10, source: invented('Harrow Vale reading survey 2024') },
    iccs: [{ levelId: 'classroom', value: 0.15, source: invented('Regional reading-test report, classroom ICCs', 'medium') }],
    occasionCorrelation: { value: 0.6, source: { kind: 'expert', certainty: 'low' } },
    effect: { value: 3, source: { kind: 'expert', citation: 'Smallest difference teachers consider worth a programme', certainty: 'medium' } },
  },
  analysis: { method: 't-test', unitOfAnalysisLevelId: 'pupil' },
};

export const GREENHOUSE_DESIGN: DesignInput = {
  outcome: {
    name: 'Leaf chlorophyll content',
    unit: 'µg/cm²',
    type: 'continuous',
    shape: 'right-skewed',
    positiveOnly: true,
    explanatoryVariables: [{ id: 'substrate', name: 'Substrate', role: 'treatment', kind: 'categorical' }],
    unequalVarianceExpected: true,
  },
  structure: {
    levels: [
      { id: 'tray', name: 'Tray', kind: 'grouping', groupingType: 'tray', count: 12, sharedEnvironment: true, spatialOrSerial: true },
      { id: 'plant', name: 'Plant', kind: 'independent', count: 6 },
      { id: 'leaf', name: 'Leaf', kind: 'replicate', count: 4 },
    ],
  },
  assignment: {
    kind: 'randomised',
    variableName: 'Substrate',
    levelId: 'tray',
    arms: [
      { name: 'Peat-free substrate', allocation: 1 },
      { name: 'Standard substrate', allocation: 1 },
    ],
  },
  occasions: { timeUnit: 'weeks', list: [{ label: 'Harvest', time: 6, baseline: false, attrition: 0.05 }] },
  assumptions: {
    outcomeSd: { value: 4.5, source: { kind: 'pilot', citation: 'Bench pilot, spring batch', certainty: 'medium' } },
    iccs: [
      { levelId: 'tray', value: 0.2, source: { kind: 'expert', certainty: 'low' } },
      { levelId: 'plant', value: 0.4, source: { kind: 'pilot', certainty: 'medium' } },
    ],
    effect: { value: 2, source: { kind: 'expert', certainty: 'medium' } },
  },
  analysis: { method: 'linear-regression', unitOfAnalysisLevelId: 'leaf' },
};

export const SLEEP_DESIGN: DesignInput = {
  outcome: {
    name: 'Reaction time',
    unit: 'ms',
    type: 'continuous',
    shape: 'right-skewed',
    positiveOnly: true,
    outliersExpected: true,
    explanatoryVariables: [{ id: 'schedule', name: 'Sleep-timing schedule', role: 'treatment', kind: 'categorical' }],
  },
  structure: {
    levels: [
      { id: 'volunteer', name: 'Volunteer', kind: 'independent', count: 24 },
      { id: 'night', name: 'Night', kind: 'repeated', count: 8, spatialOrSerial: true },
    ],
  },
  assignment: {
    kind: 'randomised',
    variableName: 'Sleep-timing schedule',
    levelId: 'night',
    arms: [
      { name: 'Early schedule', allocation: 1 },
      { name: 'Late schedule', allocation: 1 },
    ],
    crossover: { enabled: true, periods: 2, washout: 'None planned between the two blocks of four nights', carryoverPossible: true },
  },
  occasions: {
    timeUnit: 'days',
    list: [1, 2, 3, 4, 5, 6, 7, 8].map((d) => ({ label: `Night ${d}`, time: d, baseline: false, attrition: d > 4 ? 0.1 : 0 })),
    correlationStructure: 'ar1',
  },
  assumptions: {
    outcomeSd: { value: 45, source: invented('Sleep-lab reaction-time norms') },
    iccs: [{ levelId: 'volunteer', value: 0.5, source: invented('Sleep-lab reaction-time norms', 'medium') }],
    occasionCorrelation: { value: 0.5, source: { kind: 'expert', certainty: 'low' } },
    effect: { value: 20, source: { kind: 'expert', certainty: 'medium' } },
  },
  analysis: { method: 't-test', unitOfAnalysisLevelId: 'night' },
};

/**
 * Falls in care homes: whole care homes are randomised, falls are counted per resident over a
 * year. The count numbers are those the Assumptions step asks for (rates per resident-year, so
 * the follow-up time is in years). The ICC of a resident's fall count between homes agrees with
 * the between-home CV and the overdispersion: k²μ² / (k²μ² + μ + κμ²) with μ = 1.8 falls, k = 0.3,
 * κ = 0.8 is 0.06.
 */
export const FALLS_DESIGN: DesignInput = {
  outcome: {
    name: 'Falls',
    unit: 'falls per resident',
    type: 'count',
    shape: 'right-skewed',
    primaryOutcomes: 1,
    secondaryOutcomes: ['Falls with injury', 'Hospital admissions after a fall'],
    explanatoryVariables: [
      { id: 'programme', name: 'Falls-prevention programme', role: 'treatment', kind: 'categorical' },
      { id: 'mobility', name: 'Mobility score at the start', role: 'covariate', kind: 'continuous' },
    ],
  },
  structure: {
    levels: [
      { id: 'care-home', name: 'Care home', kind: 'grouping', groupingType: 'site', count: 40, sharedEnvironment: true },
      { id: 'resident', name: 'Resident', kind: 'independent', count: 30, countCv: 0.35 },
    ],
  },
  assignment: {
    kind: 'randomised',
    variableName: 'Falls-prevention programme',
    levelId: 'care-home',
    arms: [
      { name: 'Falls-prevention programme', allocation: 1 },
      { name: 'Usual care', allocation: 1 },
    ],
  },
  occasions: {
    timeUnit: 'months',
    list: [{ label: 'End of follow-up', time: 12, baseline: false, attrition: 0.25 }],
  },
  assumptions: {
    baselineRate: { value: 1.8, source: invented('Harrow Vale care-home falls audit 2023, falls per resident-year') },
    rateRatio: { value: 0.7, source: { kind: 'expert', citation: 'Smallest reduction the care-home managers consider worth the staff time', certainty: 'medium' } },
    followUpTime: { value: 1, source: { kind: 'expert', citation: 'The protocol follows each resident for one year', certainty: 'high' } },
    dispersion: { value: 0.8, source: { kind: 'pilot', citation: 'Falls of residents in six pilot care homes, 2024 (negative binomial fit)', certainty: 'low' } },
    betweenClusterCv: { value: 0.3, source: invented('County care-home falls register, rates per home', 'low') },
    iccs: [{ levelId: 'care-home', value: 0.06, source: invented('County care-home falls register, rates per home', 'low') }],
  },
  analysis: { method: 'glm', glmFamily: 'poisson', unitOfAnalysisLevelId: 'resident' },
};
