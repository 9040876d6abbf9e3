/**
 * Inputs of the analytic calculations (POST /api/v1/calculations, the calculator pages and the
 * Plan tab). One schema per kind, joined by `kind`; each kind names the quantities it can solve
 * for (`SOLVABLE`). The caller leaves exactly one of them out — or names it in `solveFor` — and
 * the calculation returns it. Sizes are the numbers that are analysed; `dropout` and
 * `clusterDropout` inflate them to the numbers to recruit.
 *
 * Bounds keep every calculation finite and fast; the messages say what to fix.
 */
import { z } from 'zod';
import { DIGGLE_2002, FRISON_POCOCK_1992, HAYES_BENNETT_1999, narrative, RAUDENBUSH_1997 } from '@/lib/citations';
import { rawText } from '@/lib/text-schema';

/** A finite number; the refused ones are worded by lib/field-messages.ts, which names the field. */
const num = () => z.number();
const positive = (max = 1e9) => num().gt(0).max(max);
const whole = (min: number, max: number) =>
  z
    .number()
    .int()
    .min(min)
    .max(max);
const openUnit = () => num().gt(0).lt(1);
/** A ratio of rates, risks or odds: between 1/1,000,000 and 1,000,000. */
const ratioOf = () => num().min(1e-6).max(1e6);

/** Shared by every kind: significance level, target power, attrition and several outcomes. */
const common = {
  alpha: num().gt(0).max(0.5).default(0.05),
  power: num().gt(0).max(0.9999).optional(),
  /** Share of units expected to be lost before the analysis, 0 ≤ d < 1. */
  dropout: num().min(0).max(0.9).default(0),
  /** Number of primary outcomes tested, each at the adjusted alpha. */
  outcomes: whole(1, 100).default(1),
  multiplicity: z.enum(['none', 'bonferroni', 'holm']).default('none'),
  solveFor: rawText('solveFor').max(40).optional(),
};

const sides = z.union([z.literal(1), z.literal(2)]).default(2);

export const twoGroupMeansSchema = z
  .object({
    kind: z.literal('two-group-means'),
    delta: positive().optional(),
    sd: positive(),
    nPerGroup: whole(2, 10_000_000).optional(),
    ratio: num().min(0.01).max(100).default(1),
    sides,
    ...common,
  })
  .meta({ id: 'TwoGroupMeans', description: 'Difference between two independent means (t test).' });

export const regressionSchema = z
  .object({
    kind: z.literal('regression'),
    f2: positive(1e4).optional(),
    slope: positive().optional(),
    sdX: positive().optional(),
    residualSd: positive().optional(),
    testedPredictors: whole(1, 1000).default(1),
    predictors: whole(1, 1000).optional(),
    n: whole(3, 10_000_000).optional(),
    ...common,
  })
  .meta({ id: 'Regression', description: 'F test of testedPredictors of predictors in a linear regression.' });

export const clusterMeansSchema = z
  .object({
    kind: z.literal('cluster-means'),
    delta: positive().optional(),
    sd: positive(),
    icc: num().min(0).max(1),
    clusterSize: whole(1, 1_000_000).optional(),
    cv: num().min(0).max(3).default(0),
    clustersPerArm: whole(2, 1_000_000).optional(),
    /** Share of whole clusters expected to drop out. */
    clusterDropout: num().min(0).max(0.9).default(0),
    sides,
    ...common,
  })
  .meta({ id: 'ClusterMeans', description: 'Two arms randomised by cluster, compared on cluster means.' });

export const repeatedMeasuresSchema = z
  .object({
    kind: z.literal('repeated-measures'),
    delta: positive().optional(),
    sd: positive(),
    rho: num().min(0).lt(1),
    baselines: whole(0, 50).default(1),
    followUps: whole(1, 50).default(1),
    analysis: z.enum(['post', 'change', 'ancova']).default('ancova'),
    nPerGroup: whole(2, 10_000_000).optional(),
    sides,
    ...common,
  })
  .meta({ id: 'RepeatedMeasures', description: `Two groups, mean of baselines and of follow-ups (${FRISON_POCOCK_1992.short}).` });

export const longitudinalSlopesSchema = z
  .object({
    kind: z.literal('longitudinal-slopes'),
    slopeDifference: positive().optional(),
    sd: positive(),
    rho: num().min(0).lt(1),
    times: z.array(num()).min(2).max(200),
    nPerGroup: whole(2, 10_000_000).optional(),
    sides,
    ...common,
  })
  .meta({ id: 'LongitudinalSlopes', description: `Difference in rates of change between two groups (${DIGGLE_2002.short}).` });

/**
 * The effect on a yes-or-no outcome: the proportion p2 itself, or its difference from p1
 * (p2 − p1), its ratio to p1 (p2/p1) or the odds ratio — at most one of them
 * (lib/stats/calculations/proportion-effect.ts turns any of them into p2).
 */
const proportionEffect = {
  p2: openUnit().optional(),
  difference: num().gt(-1).lt(1).optional(),
  riskRatio: ratioOf().optional(),
  oddsRatio: ratioOf().optional(),
};

export const twoProportionsSchema = z
  .object({
    kind: z.literal('two-proportions'),
    p1: openUnit(),
    ...proportionEffect,
    nPerGroup: whole(2, 10_000_000).optional(),
    sides,
    continuityCorrection: z.boolean().default(false),
    /** When solving for p2: whether it lies above p1 (the default) or below. */
    direction: z.enum(['higher', 'lower']).optional(),
    icc: num().min(0).max(1).optional(),
    clusterSize: whole(1, 1_000_000).optional(),
    cv: num().min(0).max(3).default(0),
    ...common,
  })
  .meta({ id: 'TwoProportions', description: 'Two independent proportions (normal approximation), optionally clustered.' });

export const clusterProportionsSchema = z
  .object({
    kind: z.literal('cluster-proportions'),
    p1: openUnit(),
    ...proportionEffect,
    icc: num().min(0).max(1),
    clusterSize: whole(1, 1_000_000).optional(),
    cv: num().min(0).max(3).default(0),
    clustersPerArm: whole(2, 1_000_000).optional(),
    clusterDropout: num().min(0).max(0.9).default(0),
    direction: z.enum(['higher', 'lower']).optional(),
    sides,
    ...common,
  })
  .meta({ id: 'ClusterProportions', description: 'Two arms randomised by cluster, compared on a yes-or-no outcome (design effect with the ICC on the proportion scale).' });

/** Rate ratio, the solved direction and the shared inputs of both rate kinds. */
const rateInputs = {
  /** Events per unit of exposure (person-year, person-month …) in the comparison arm. */
  baselineRate: positive(1e6),
  /** Rate in the treated arm divided by baselineRate. */
  rateRatio: ratioOf().optional(),
  /** Follow-up time of each participant, in the time unit of the rate. */
  exposure: positive(1e6).default(1),
  /** Negative binomial dispersion κ between participants: variance = mean + κ·mean²; 0 for Poisson counts. */
  dispersion: num().min(0).max(100).default(0),
  /** When solving for rateRatio: a reduction (the default) or an increase. */
  direction: z.enum(['lower', 'higher']).optional(),
  sides,
};

export const twoRatesSchema = z
  .object({
    kind: z.literal('two-rates'),
    ...rateInputs,
    nPerGroup: whole(2, 10_000_000).optional(),
    ratio: num().min(0.01).max(100).default(1),
    ...common,
  })
  .meta({ id: 'TwoRates', description: 'Two event rates (counts per unit of exposure), participants randomised one by one: Wald test on the log rate ratio, Poisson or negative binomial.' });

export const clusterRatesSchema = z
  .object({
    kind: z.literal('cluster-rates'),
    ...rateInputs,
    /** Coefficient of variation of the true rates between clusters of one arm (Hayes & Bennett's k). */
    betweenClusterCv: num().min(0).max(5),
    clusterSize: whole(1, 1_000_000).optional(),
    clustersPerArm: whole(2, 1_000_000).optional(),
    clusterDropout: num().min(0).max(0.9).default(0),
    ...common,
  })
  .meta({ id: 'ClusterRates', description: `Two event rates, whole clusters randomised: clusters per arm by ${narrative(HAYES_BENNETT_1999)}.` });

export const designEffectSchema = z
  .object({
    kind: z.literal('design-effect'),
    icc: num().min(0).max(1),
    clusterSize: num().min(1).max(1_000_000),
    cv: num().min(0).max(3).default(0),
    totalObservations: whole(1, 1_000_000_000).optional(),
    alpha: common.alpha,
  })
  .meta({ id: 'DesignEffect', description: 'Design effect, effective sample size and the false-positive rate of an analysis that ignores clustering.' });

export const optimalAllocationSchema = z
  .object({
    kind: z.literal('optimal-allocation'),
    icc: num().gt(0).lt(1),
    costPerCluster: positive(),
    costPerUnit: positive(),
    budget: positive(1e12).optional(),
    delta: positive().optional(),
    sd: positive().optional(),
    alpha: common.alpha,
    power: common.power,
    sides,
    /** Optional here (absent means 1 and 'none'): the significance level for several outcomes. */
    outcomes: common.outcomes.unwrap().optional(),
    multiplicity: common.multiplicity.unwrap().optional(),
  })
  .meta({ id: 'OptimalAllocation', description: `Cluster size that minimises cost per unit of information (${RAUDENBUSH_1997.short}), with clusters for a budget or the budget for a target.` });

export const calculationSchema = z
  .discriminatedUnion(
    'kind',
    [
      twoGroupMeansSchema,
      regressionSchema,
      clusterMeansSchema,
      repeatedMeasuresSchema,
      longitudinalSlopesSchema,
      twoProportionsSchema,
      clusterProportionsSchema,
      twoRatesSchema,
      clusterRatesSchema,
      designEffectSchema,
      optimalAllocationSchema,
    ],
    { error: 'Choose the kind of calculation from the options offered.' },
  )
  .meta({ id: 'CalculationRequest' });

export type CalculationRequest = z.infer<typeof calculationSchema>;
export type CalculationKind = CalculationRequest['kind'];
export const CALCULATION_KINDS = calculationSchema.options.map((o) => o.shape.kind.value) as CalculationKind[];

/** The values a kind's request takes for the inputs left out: its schema's defaults, by name. */
export function requestDefaults(kind: CalculationKind): Record<string, unknown> {
  const option = calculationSchema.options.find((o) => o.shape.kind.value === kind);
  const shape = (option?.shape ?? {}) as Record<string, z.ZodType>;
  return Object.fromEntries(Object.entries(shape).flatMap(([name, field]) => (field instanceof z.ZodDefault ? [[name, field.def.defaultValue]] : [])));
}

/**
 * The quantities each kind can solve for: the caller leaves exactly one out (or names it in
 * `solveFor`). The effect of regression is f2 — or slope when sdX and residualSd are given; the
 * effect of the proportion kinds is p2, which may also be given as difference, riskRatio or oddsRatio.
 * design-effect solves nothing; optimal-allocation solves what its inputs imply.
 */
export const SOLVABLE: Record<CalculationKind, readonly string[]> = {
  'two-group-means': ['power', 'nPerGroup', 'delta'],
  regression: ['power', 'n', 'f2'],
  'cluster-means': ['power', 'clustersPerArm', 'clusterSize', 'delta'],
  'repeated-measures': ['power', 'nPerGroup', 'delta'],
  'longitudinal-slopes': ['power', 'nPerGroup', 'slopeDifference'],
  'two-proportions': ['power', 'nPerGroup', 'p2'],
  'cluster-proportions': ['power', 'clustersPerArm', 'clusterSize', 'p2'],
  'two-rates': ['power', 'nPerGroup', 'rateRatio'],
  'cluster-rates': ['power', 'clustersPerArm', 'clusterSize', 'rateRatio'],
  'design-effect': [],
  'optimal-allocation': [],
};
