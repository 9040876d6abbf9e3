/**
 * What the calculator pages say about each kind: a title, when to use it, its fields with labels
 * and help, and the words for the quantities it can solve for. The API's names stay the field
 * names; the words here are what people read.
 */
import { COHEN_1988, DIGGLE_2002, DONNER_KLAR_2000, ELDRIDGE_2006, FLEISS_2003, FRISON_POCOCK_1992, HAYES_BENNETT_1999, KISH_1965, narrative, RAUDENBUSH_1997, ZHU_LAKKIS_2014 } from '@/lib/citations';
import type { CalculationKind } from '@/lib/stats/calculations/request';

export interface FieldSpec {
  name: string;
  label: string;
  help: string;
  input: 'number' | 'whole' | 'select' | 'times' | 'checkbox';
  options?: readonly (readonly [string, string])[];
  /** Shown only in these modes (kinds with a mode switch: regression, optimal-allocation, the proportions). */
  modes?: readonly string[];
  /** Shown only while this quantity is solved for (the direction of a solved effect). */
  onlyWhenSolving?: string;
  /** Hidden while this quantity is solved for (another form of the same effect: slope for f2, a risk ratio for p2). */
  hiddenWhenSolving?: string;
  /** The heading the field is listed under; fields without one come first, under no heading. */
  group?: string;
}

export interface ModeSpec {
  legend: string;
  options: readonly (readonly [string, string])[];
  /** The choice is moot, and hidden, while this quantity is solved for. */
  hiddenWhenSolving?: string;
}

export interface KindInfo {
  kind: CalculationKind;
  title: string;
  /** One sentence: when this calculation is the right one. */
  when: string;
  fields: readonly FieldSpec[];
  /** A choice that decides which inputs are used, for kinds that solve what their inputs imply. */
  mode?: ModeSpec;
}

const SIDES = [
  ['2', 'Two-sided'],
  ['1', 'One-sided'],
] as const;

const f = {
  delta: (help = 'The smallest difference in means worth detecting, in the outcome’s units.'): FieldSpec => ({ name: 'delta', label: 'Difference in means', help, input: 'number' }),
  sd: (help = 'Standard deviation of the outcome within a group, in the outcome’s units.'): FieldSpec => ({ name: 'sd', label: 'Standard deviation', help, input: 'number' }),
  nPerGroup: (help = 'Units analysed in each group.'): FieldSpec => ({ name: 'nPerGroup', label: 'Sample size per group', help, input: 'whole' }),
  sides: { name: 'sides', label: 'Test', help: 'Two-sided unless a difference in the other direction would truly not matter.', input: 'select', options: SIDES } satisfies FieldSpec,
  icc: (help = 'Intracluster correlation: the share of the outcome’s variance that lies between clusters.'): FieldSpec => ({ name: 'icc', label: 'Intracluster correlation (ICC)', help, input: 'number' }),
  cv: { name: 'cv', label: 'Variation in cluster size (CV)', help: `Coefficient of variation of cluster sizes: 0 when every cluster is the same size (${ELDRIDGE_2006.short}).`, input: 'number' } satisfies FieldSpec,
  rho: { name: 'rho', label: 'Correlation between occasions', help: 'Correlation of two measurements of the same unit (compound symmetry).', input: 'number' } satisfies FieldSpec,
};

const TEST_GROUP = 'Significance and power';
const ADJUSTMENTS_GROUP = 'Attrition and several outcomes';

/** Significance, power, attrition and several outcomes: the same on every kind that has them. */
const ERROR_RATES: FieldSpec[] = [
  { name: 'alpha', label: 'Significance level (alpha)', help: 'The false-positive rate (type I error) of each test, e.g. 0.05.', input: 'number', group: TEST_GROUP },
  { name: 'power', label: 'Power', help: 'The chance of detecting the effect if it is real, as a fraction: 0.8 means 80%.', input: 'number', group: TEST_GROUP },
];
const ADJUSTMENTS: FieldSpec[] = [
  {
    name: 'dropout',
    label: 'Expected attrition',
    help: 'Share of units lost before the analysis, as a fraction (0.1 = 10%). Sizes to recruit are inflated by 1 / (1 − attrition).',
    input: 'number',
    group: ADJUSTMENTS_GROUP,
  },
  { name: 'outcomes', label: 'Primary outcomes', help: 'Number of primary outcomes, each tested at the adjusted alpha.', input: 'whole', group: ADJUSTMENTS_GROUP },
  {
    name: 'multiplicity',
    label: 'Adjustment for several outcomes',
    help: 'Bonferroni tests each outcome at alpha / K; Holm’s step-down procedure is planned here at its strictest step, also alpha / K.',
    input: 'select',
    options: [
      ['none', 'None'],
      ['bonferroni', 'Bonferroni'],
      ['holm', 'Holm'],
    ],
    group: ADJUSTMENTS_GROUP,
  },
];
/** The sides of the test, listed with alpha and power. */
const SIDES_FIELD: FieldSpec = { ...f.sides, group: TEST_GROUP };

/** The four ways to give the effect on a yes-or-no outcome, and the fields behind them. */
const PROPORTION_MODE: ModeSpec = {
  legend: 'Describe the effect as',
  options: [
    ['p2', 'The proportion expected with the intervention'],
    ['difference', 'A difference in proportions'],
    ['riskRatio', 'A risk ratio'],
    ['oddsRatio', 'An odds ratio'],
  ],
  hiddenWhenSolving: 'p2',
};

function proportionFields(group: string): FieldSpec[] {
  const effect = { input: 'number', group, hiddenWhenSolving: 'p2' } as const;
  return [
    { name: 'p1', label: 'Proportion in the comparison group', help: 'Expected share with the outcome without the intervention, as a fraction (0.55 = 55%).', input: 'number', group },
    { name: 'p2', label: 'Proportion with the intervention', help: 'Expected share with the outcome under the intervention, as a fraction.', modes: ['p2'], ...effect },
    { name: 'difference', label: 'Difference in proportions', help: 'Proportion with the intervention minus the comparison one, as a fraction: 0.1 is ten percentage points more.', modes: ['difference'], ...effect },
    { name: 'riskRatio', label: 'Risk ratio', help: 'Proportion with the intervention divided by the comparison one: 1.25 is a quarter more, 0.8 a fifth less.', modes: ['riskRatio'], ...effect },
    { name: 'oddsRatio', label: 'Odds ratio', help: 'Odds of the outcome with the intervention divided by the odds without it.', modes: ['oddsRatio'], ...effect },
    {
      name: 'direction',
      label: 'Look for a proportion',
      help: 'Whether the smallest detectable effect is an increase or a decrease from the comparison proportion.',
      input: 'select',
      options: [
        ['higher', 'Above the comparison one'],
        ['lower', 'Below the comparison one'],
      ],
      onlyWhenSolving: 'p2',
      group,
    },
  ];
}

function rateFields(group: string): FieldSpec[] {
  return [
    {
      name: 'baselineRate',
      label: 'Baseline rate (events per unit of follow-up time)',
      help: 'Events expected per participant per unit of time without the intervention, e.g. 1.5 awakenings a night or 0.3 infections a person-year.',
      input: 'number',
      group,
    },
    { name: 'rateRatio', label: 'Rate ratio', help: 'Rate with the intervention divided by the baseline rate: 0.8 is a 20% reduction, 1.5 a 50% increase.', input: 'number', group },
    {
      name: 'direction',
      label: 'Look for',
      help: 'Whether the smallest detectable effect is a reduction or an increase in the rate.',
      input: 'select',
      options: [
        ['lower', 'A reduction (rate ratio below 1)'],
        ['higher', 'An increase (rate ratio above 1)'],
      ],
      onlyWhenSolving: 'rateRatio',
      group,
    },
  ];
}

const FOLLOW_UP: FieldSpec = {
  name: 'exposure',
  label: 'Follow-up time per participant',
  help: 'How long each participant is followed, in the time unit of the rate: 8 for eight nights with a rate per night.',
  input: 'number',
};

export const KINDS: readonly KindInfo[] = [
  {
    kind: 'two-group-means',
    title: 'Two group means',
    when: 'Two independent groups compared on a continuous outcome, each unit measured once and randomised on its own — no clusters, no repeated measures.',
    fields: [f.delta(), f.sd(), f.nPerGroup(), { name: 'ratio', label: 'Units in the second group for each one in the first', help: '1 for equal groups; 2 puts two units in the second group for each one in the first (a third and two thirds of all units).', input: 'number' }, SIDES_FIELD, ...ERROR_RATES, ...ADJUSTMENTS],
  },
  {
    kind: 'regression',
    title: 'Linear regression',
    when: 'Testing one or more predictors in a linear regression of independent units, e.g. a dose or a covariate’s slope after adjusting for others.',
    mode: {
      legend: 'Describe the effect as',
      options: [
        ['f2', 'Cohen’s f²'],
        ['slope', 'A slope with the spread of the predictor and the residual spread'],
      ],
    },
    fields: [
      { name: 'f2', label: 'Effect size f²', help: `Cohen’s f² = R² explained by the tested predictors / (1 − R²); 0.02 small, 0.15 medium, 0.35 large (${COHEN_1988.short}).`, input: 'number', modes: ['f2'] },
      { name: 'slope', label: 'Slope', help: 'Change in the outcome per unit of the tested predictor.', input: 'number', modes: ['slope'], hiddenWhenSolving: 'f2' },
      { name: 'sdX', label: 'Standard deviation of the predictor', help: 'Spread of the tested predictor in the sample.', input: 'number', modes: ['slope'] },
      { name: 'residualSd', label: 'Residual standard deviation', help: 'Spread of the outcome around the fitted line.', input: 'number', modes: ['slope'] },
      { name: 'testedPredictors', label: 'Predictors tested', help: 'How many coefficients the F test tests together (numerator degrees of freedom).', input: 'whole' },
      { name: 'predictors', label: 'Predictors in the model', help: 'All predictors, the tested ones included; the error degrees of freedom are n − predictors − 1.', input: 'whole' },
      { name: 'n', label: 'Sample size', help: 'Units in the regression.', input: 'whole' },
      ...ERROR_RATES,
      ...ADJUSTMENTS,
    ],
  },
  {
    kind: 'cluster-means',
    title: 'Cluster-randomised means',
    when: 'Whole clusters — classrooms, trays, clinics — are randomised to two arms and the outcome is measured on units within them.',
    fields: [
      f.delta(),
      f.sd('Total standard deviation of the outcome among units (within and between clusters).'),
      f.icc(),
      { name: 'clusterSize', label: 'Units per cluster', help: 'Average number of units analysed in each cluster.', input: 'whole' },
      f.cv,
      { name: 'clustersPerArm', label: 'Clusters per arm', help: 'Clusters randomised to each arm.', input: 'whole' },
      { name: 'clusterDropout', label: 'Clusters expected to drop out', help: 'Share of whole clusters lost, as a fraction.', input: 'number' },
      SIDES_FIELD,
      ...ERROR_RATES,
      ...ADJUSTMENTS,
    ],
  },
  {
    kind: 'repeated-measures',
    title: 'Baseline and follow-up measures',
    when: `Two groups measured before and after, possibly several times each; the answer is for ANCOVA, shown beside the follow-up only and the change from baseline (${FRISON_POCOCK_1992.short}).`,
    fields: [
      f.delta(),
      f.sd('Standard deviation of a single measurement.'),
      f.rho,
      { name: 'baselines', label: 'Baseline measurements', help: 'Measurements before assignment, averaged; 0 for none.', input: 'whole' },
      { name: 'followUps', label: 'Follow-up measurements', help: 'Measurements after assignment, averaged.', input: 'whole' },
      f.nPerGroup(),
      SIDES_FIELD,
      ...ERROR_RATES,
      ...ADJUSTMENTS,
    ],
  },
  {
    kind: 'longitudinal-slopes',
    title: 'Rates of change',
    when: `Each unit is measured on several occasions and the question is whether the outcome changes faster in one group than the other (${DIGGLE_2002.short}).`,
    fields: [
      { name: 'slopeDifference', label: 'Difference in slopes', help: 'Difference between the groups in change per unit of time, in outcome units.', input: 'number' },
      f.sd('Standard deviation of a single measurement.'),
      f.rho,
      { name: 'times', label: 'Times of measurement', help: 'When each unit is measured, separated by commas, e.g. 0, 1, 2, 3.', input: 'times' },
      f.nPerGroup(),
      SIDES_FIELD,
      ...ERROR_RATES,
      ...ADJUSTMENTS,
    ],
  },
  {
    kind: 'two-proportions',
    title: 'Two proportions',
    when: `A yes-or-no outcome compared between two groups; give an ICC and cluster size when units share clusters (${FLEISS_2003.short}).`,
    mode: PROPORTION_MODE,
    fields: [
      ...proportionFields('Proportions and the effect'),
      { ...f.nPerGroup(), group: 'Sample size' },
      { name: 'continuityCorrection', label: 'Continuity correction', help: `Adds the correction of ${narrative(FLEISS_2003)}; more conservative.`, input: 'checkbox', group: TEST_GROUP },
      { ...f.icc('Leave empty when units are independent.'), group: 'Clusters (optional)' },
      { name: 'clusterSize', label: 'Units per cluster', help: 'Leave empty when units are independent.', input: 'whole', group: 'Clusters (optional)' },
      { ...f.cv, group: 'Clusters (optional)' },
      SIDES_FIELD,
      ...ERROR_RATES,
      ...ADJUSTMENTS,
    ],
  },
  {
    kind: 'cluster-proportions',
    title: 'Cluster-randomised proportions',
    when: `Whole clusters — classrooms, clinics, villages — are randomised to two arms and a yes-or-no outcome is recorded for each member (${DONNER_KLAR_2000.short}).`,
    mode: PROPORTION_MODE,
    fields: [
      ...proportionFields('Proportions and the effect'),
      {
        ...f.icc('Share of the variation in the yes-or-no outcome that lies between clusters, on the proportion scale.'),
        group: 'Clusters',
      },
      { name: 'clusterSize', label: 'Members per cluster', help: 'Average number of members analysed in each cluster.', input: 'whole', group: 'Clusters' },
      { ...f.cv, group: 'Clusters' },
      { name: 'clustersPerArm', label: 'Clusters per arm', help: 'Clusters randomised to each arm.', input: 'whole', group: 'Clusters' },
      { name: 'clusterDropout', label: 'Clusters expected to drop out', help: 'Share of whole clusters lost, as a fraction.', input: 'number', group: 'Clusters' },
      SIDES_FIELD,
      ...ERROR_RATES,
      ...ADJUSTMENTS,
    ],
  },
  {
    kind: 'two-rates',
    title: 'Two event rates',
    when: `Counts of events — infections, falls, awakenings — compared between two groups of participants randomised one by one, each followed for a time (${ZHU_LAKKIS_2014.short}).`,
    fields: [
      ...rateFields('Rates and the effect'),
      { ...FOLLOW_UP, group: 'Follow-up and variation between participants' },
      {
        name: 'dispersion',
        label: 'Overdispersion between participants',
        help:
          'How much more participants differ than chance alone makes them: 0 for plain (Poisson) counts. The variance of a count is its mean + dispersion × mean²; ' +
          'the dispersion is 1 / k for a negative binomial k, and the square of the coefficient of variation of participants’ own rates.',
        input: 'number',
        group: 'Follow-up and variation between participants',
      },
      { ...f.nPerGroup('Participants analysed in the first group.'), group: 'Sample size' },
      { name: 'ratio', label: 'Units in the second group for each one in the first', help: '1 for equal groups; 2 puts two units in the second group for each one in the first (a third and two thirds of all units).', input: 'number', group: 'Sample size' },
      SIDES_FIELD,
      ...ERROR_RATES,
      ...ADJUSTMENTS,
    ],
  },
  {
    kind: 'cluster-rates',
    title: 'Cluster-randomised event rates',
    when: `Whole clusters — villages, wards, classrooms — are randomised to two arms and events are counted over the follow-up of their members (${HAYES_BENNETT_1999.short}).`,
    fields: [
      ...rateFields('Rates and the effect'),
      { name: 'clusterSize', label: 'Participants per cluster', help: 'Average number of participants followed in each cluster.', input: 'whole', group: 'Clusters and follow-up' },
      { ...FOLLOW_UP, group: 'Clusters and follow-up' },
      {
        name: 'betweenClusterCv',
        label: 'Between-cluster coefficient of variation of the rate',
        help: 'How much the clusters’ true rates differ within an arm: the standard deviation of the cluster rates divided by their mean. Take it from earlier studies of similar clusters.',
        input: 'number',
        group: 'Clusters and follow-up',
      },
      {
        name: 'dispersion',
        label: 'Overdispersion between participants in a cluster',
        help: 'Leave at 0 when participants in one cluster differ only by chance (the published formula’s assumption); otherwise the negative binomial dispersion, as for two event rates.',
        input: 'number',
        group: 'Clusters and follow-up',
      },
      { name: 'clustersPerArm', label: 'Clusters per arm', help: 'Clusters randomised to each arm.', input: 'whole', group: 'Clusters and follow-up' },
      { name: 'clusterDropout', label: 'Clusters expected to drop out', help: 'Share of whole clusters lost, as a fraction.', input: 'number', group: 'Clusters and follow-up' },
      SIDES_FIELD,
      ...ERROR_RATES,
      ...ADJUSTMENTS,
    ],
  },
  {
    kind: 'design-effect',
    title: 'Design effect',
    when: `To see what clustering costs: how many independent units a clustered sample is worth, and how often a test that ignores the clusters gives a false positive (${KISH_1965.short}).`,
    fields: [
      f.icc(),
      { name: 'clusterSize', label: 'Units per cluster', help: 'Average number of units in a cluster.', input: 'number' },
      f.cv,
      { name: 'totalObservations', label: 'Total units', help: 'Optional: all units in the study, for the effective sample size.', input: 'whole' },
      { name: 'alpha', label: 'Significance level (alpha)', help: 'The nominal false-positive rate of the test that ignores clustering.', input: 'number' },
    ],
  },
  {
    kind: 'optimal-allocation',
    title: 'Cluster size under a budget',
    when: `Deciding how many units to take per cluster when recruiting a cluster costs more than measuring one more unit (${RAUDENBUSH_1997.short}).`,
    mode: {
      legend: 'Work out',
      options: [
        ['budget', 'Clusters a budget buys'],
        ['target', 'The budget a target needs'],
      ],
    },
    fields: [
      f.icc('Intracluster correlation, above 0 and below 1.'),
      { name: 'costPerCluster', label: 'Cost per cluster', help: 'Cost of recruiting one more cluster, in any currency.', input: 'number' },
      { name: 'costPerUnit', label: 'Cost per unit', help: 'Cost of measuring one more unit in a cluster, in the same currency.', input: 'number' },
      { name: 'budget', label: 'Budget', help: 'Money available for both arms. Optional: the ICC and the two costs alone give the best cluster size.', input: 'number', modes: ['budget'] },
      f.delta('The smallest difference in means worth detecting. Optional with a budget: it gives the power the budget buys.'),
      f.sd('Total standard deviation of the outcome among units. Optional with a budget.'),
      { name: 'alpha', label: 'Significance level (alpha)', help: 'The false-positive rate of the test, e.g. 0.05.', input: 'number' },
      { name: 'power', label: 'Power', help: 'The target: the chance of detecting the effect if it is real, as a fraction (0.8 = 80%).', input: 'number', modes: ['target'] },
      SIDES_FIELD,
    ],
  },
];

export function kindInfo(kind: string): KindInfo | undefined {
  return KINDS.find((k) => k.kind === kind);
}

/** The fields a form shows while `solveFor` is unknown in `mode`: the calculator pages and the Plan tab. */
export function fieldsShown(info: KindInfo, solveFor: string | null, mode: string | null): FieldSpec[] {
  const mooted = info.mode?.hiddenWhenSolving !== undefined && info.mode.hiddenWhenSolving === solveFor;
  return info.fields.filter(
    (field) =>
      field.name !== solveFor &&
      !(field.modes && mode && !mooted && !field.modes.includes(mode)) &&
      !(field.onlyWhenSolving && field.onlyWhenSolving !== solveFor) &&
      !(field.hiddenWhenSolving && field.hiddenWhenSolving === solveFor),
  );
}

/** Whether the kind's mode choice matters while `solveFor` is unknown. */
export function modeShown(info: KindInfo, solveFor: string | null): boolean {
  return info.mode !== undefined && info.mode.hiddenWhenSolving !== solveFor;
}

export interface FieldGroup {
  /** The heading, or null for the leading fields without one. */
  legend: string | null;
  fields: FieldSpec[];
}

/** Fields bucketed by their group, in the order each group first appears. */
export function groupFields(fields: readonly FieldSpec[]): FieldGroup[] {
  const groups: FieldGroup[] = [];
  for (const field of fields) {
    const legend = field.group ?? null;
    const existing = groups.find((g) => g.legend === legend);
    if (existing) existing.fields.push(field);
    else groups.push({ legend, fields: [field] });
  }
  return groups.sort((a, b) => (a.legend === null ? -1 : b.legend === null ? 1 : 0));
}

/** The words for the quantities a kind can solve for, in our own wording. */
export const SOLVE_LABELS: Record<string, string> = {
  power: 'power',
  nPerGroup: 'sample size',
  n: 'sample size',
  clustersPerArm: 'clusters per arm',
  clusterSize: 'cluster size',
  delta: 'smallest detectable effect',
  slopeDifference: 'smallest detectable effect',
  f2: 'smallest detectable effect',
  p2: 'smallest detectable effect',
  rateRatio: 'smallest detectable rate ratio',
};
