/**
 * The compact specification of a stress test (POST /api/v1/simulations): the design, the truth,
 * the scenarios (one violated assumption each, with its parameters), the analyses to compare,
 * and the number of replicates, seed and alpha.
 *
 * Bounds keep a job finite: at most 100,000 replicates, 50,000 rows per data set, 20 scenarios,
 * and replicates × scenarios × rows ≤ 500 million generated observations per hypothesis. The
 * scenarios' number parameters have the ranges and defaults of `SCENARIO_RANGES` (unequal variance
 * by arm and a quadratic curve by default). Messages say what to fix.
 *
 * This is the engine's contract: the request envelope of POST /api/v1/simulations
 * (lib/validation/simulation-run.ts) wraps it, and the Stress test tab's form takes its bounds and
 * defaults from the ranges exported here.
 *
 * Design shapes: independent units (`unitsPerArm`) or clusters (`clustersPerArm`,
 * `clusterSize`), optionally measured at `occasions` (repeated measures, or sub-samples such as
 * pupils in classes when the units are classes: two levels of clustering with the treatment at
 * the top); `blocks` that each hold both arms (the treatment assigned within schools, sites or
 * trays, to clusters or units); and `crossover`, where each unit receives both arms in turn
 * over periods (AB/BA, multi-period, or a within-subject design with several occasions).
 */
import { z } from 'zod';
import { ANALYSIS_NAMES } from '@/lib/models/types';
import { clusterSizes } from './cluster-sizes';
import { sigmaForIcc } from './logit-normal';
import { rawText } from '@/lib/text-schema';

export const MAX_REPLICATES = 100_000;
export const MAX_ROWS = 50_000;
export const MAX_SCENARIOS = 20;
/** The most periods of a cross-over and occasions of a unit that are simulated. */
export const MAX_PERIODS = 20;
export const MAX_OCCASIONS = 100;
export const MAX_GENERATED_OBSERVATIONS = 500_000_000;

/**
 * The range of a number in the specification: from `min` (itself allowed unless `minOpen`) to
 * `max` (allowed), and the value taken when it is left out. The schema below is built from these
 * ranges, and so is the Stress test tab's form (components/stress-test/run-form-schema.ts), so the
 * two cannot disagree.
 */
export interface Range {
  min: number;
  minOpen?: boolean;
  max: number;
  default: number;
}

export const REPLICATES = { min: 10, max: MAX_REPLICATES, default: 1000 } as const satisfies Range;
export const SEED = { min: 0, max: Number.MAX_SAFE_INTEGER, default: 1 } as const satisfies Range;
export const ALPHA = { min: 0, minOpen: true, max: 0.5, default: 0.05 } as const satisfies Range;
/** SD of the units' random slopes over time. */
export const SLOPE_SD = { min: 0, max: 1e6, default: 0 } as const satisfies Range;

/** The number parameters of each scenario; `why` completes the message for a value at or below an open `min`. */
export const SCENARIO_RANGES = {
  skewed: {
    /** σ of the log-normal before standardising. */
    sigmaLog: { min: 0, minOpen: true, max: 2, default: 0.8 },
  },
  'heavy-tailed': { df: { min: 2, minOpen: true, max: 1000, default: 3, why: 'so that the errors have a finite SD' } },
  outliers: {
    fraction: { min: 0, minOpen: true, max: 0.5, default: 0.05 },
    scale: { min: 1, minOpen: true, max: 100, default: 5 },
  },
  'unequal-variance': { sdRatio: { min: 0.05, max: 20, default: 2 } },
  nonlinear: { strength: { min: -10, max: 10, default: 1 } },
  serial: { ar: { min: -0.99, max: 0.99, default: 0.5 } },
  'carry-over': { fraction: { min: -10, max: 10, default: 0.5 } },
} as const satisfies Record<string, Record<string, Range & { why?: string }>>;

/** A bound as written in a message: "1,000", "−0.99". */
export const formatBound = (x: number) => x.toLocaleString('en-GB', { maximumFractionDigits: 6 }).replace('-', '−');

const num = (label: string) => z.number({ error: `${label} must be a number.` }).finite(`${label} must be finite.`);
/** A number in `range`, with its default. */
const ranged = (label: string, range: Range & { why?: string }) => {
  const why = range.why ? `, ${range.why}` : '';
  const low = range.minOpen ? num(label).gt(range.min, `${label} must be above ${formatBound(range.min)}${why}.`) : num(label).min(range.min, `${label} is at least ${formatBound(range.min)}.`);
  return low.max(range.max, `${label} can be at most ${formatBound(range.max)}.`).default(range.default);
};
const whole = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label} must be a number.` })
    .int(`${label} must be a whole number.`)
    .min(min, `${label} is at least ${min}.`)
    .max(max, `${label} can be at most ${max.toLocaleString('en-GB')}.`);
const between = (label: string, min: number, max: number) =>
  num(label).min(min, `${label} is at least ${min}.`).max(max, `${label} can be at most ${max}.`);

const unitsPerArm = z.union([whole('unitsPerArm', 2, MAX_ROWS), z.tuple([whole('unitsPerArm[0]', 2, MAX_ROWS), whole('unitsPerArm[1]', 2, MAX_ROWS)])], {
  error: 'unitsPerArm is a whole number, or a pair [arm 1, arm 2] of whole numbers.',
});

export const simulationDesignSchema = z
  .object({
    arms: z.literal(2, { error: 'arms must be 2: the stress test compares two arms.' }),
    /** Clusters (classes, trays, practices) per arm; each has `clusterSize` units on average. */
    clustersPerArm: whole('clustersPerArm', 2, 10_000).optional(),
    clusterSize: whole('clusterSize', 1, 10_000).optional(),
    /** Coefficient of variation of the cluster sizes (SD / mean); 0 for equal sizes. */
    clusterSizeCv: between('clusterSizeCv', 0, 3).default(0),
    /** Independent units per arm when there are no clusters: one number, or [arm 1, arm 2]. */
    unitsPerArm: unitsPerArm.optional(),
    /** Occasions at which each unit is measured (repeated measures). */
    occasions: whole('occasions', 2, MAX_OCCASIONS).optional(),
    /** Times of the occasions, increasing; 0, 1, 2, … by default. */
    times: z.array(num('times[]'), { error: 'times is a list of numbers.' }).optional(),
    /** The effect of interest: the difference between arms, or (with occasions) the difference in slopes over time. */
    target: z.enum(['treat', 'treat:time'], { error: 'target is treat or treat:time.' }).default('treat'),
    /**
     * Blocks (schools, sites, trays) that each hold both arms: the treatment is assigned within
     * every block, to its clusters (then clustersPerArm counts the clusters of one arm in one
     * block) or to its units (unitsPerArm per arm in one block).
     */
    blocks: whole('blocks', 2, 10_000).optional(),
    /**
     * Each unit receives both arms in turn, one per period, in the order of its sequence (a
     * cross-over, or a within-subject design with several occasions): unitsPerArm counts the
     * units of each of the two sequences. The periods are the occasions (leave occasions out).
     */
    crossover: z
      .object({
        periods: whole('crossover.periods', 2, MAX_PERIODS),
        /**
         * The two sequences, as letters A (arm 1) and B (arm 2), one per period, e.g.
         * ["AB", "BA"] or ["ABBA", "BAAB"]. Default: ABBA… repeated to the number of periods and
         * its mirror image (AB/BA, ABB/BAA, ABBA/BAAB, …).
         */
        sequences: z
          .tuple([rawText('crossover.sequences[0]'), rawText('crossover.sequences[1]')], {
            error: 'crossover.sequences is a pair of sequences such as ["AB", "BA"].',
          })
          .optional(),
      })
      .optional(),
  })
  .superRefine((d, ctx) => {
    const clustered = d.clustersPerArm !== undefined;
    if (clustered && d.unitsPerArm !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['unitsPerArm'], message: 'Give either clustersPerArm with clusterSize, or unitsPerArm, not both.' });
    }
    if (!clustered && d.unitsPerArm === undefined) {
      ctx.addIssue({ code: 'custom', path: ['unitsPerArm'], message: 'Give unitsPerArm, or clustersPerArm with clusterSize.' });
    }
    if (clustered && d.clusterSize === undefined) {
      ctx.addIssue({ code: 'custom', path: ['clusterSize'], message: 'clusterSize is needed with clustersPerArm.' });
    }
    if (!clustered && d.clusterSize !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['clustersPerArm'], message: 'clustersPerArm is needed with clusterSize.' });
    }
    if (!clustered && d.clusterSizeCv > 0) {
      ctx.addIssue({ code: 'custom', path: ['clusterSizeCv'], message: 'clusterSizeCv needs clusters: give clustersPerArm and clusterSize.' });
    }
    if (d.times !== undefined) {
      if (d.occasions === undefined || d.times.length !== d.occasions) {
        ctx.addIssue({ code: 'custom', path: ['times'], message: 'times needs one value per occasion: give occasions and as many times.' });
      } else if (d.times.some((t, i) => i > 0 && !(t > d.times![i - 1]!))) {
        ctx.addIssue({ code: 'custom', path: ['times'], message: 'times must increase from one occasion to the next.' });
      }
    }
    if (d.target === 'treat:time' && d.occasions === undefined) {
      ctx.addIssue({ code: 'custom', path: ['target'], message: 'A difference in slopes (treat:time) needs occasions.' });
    }
    if (d.crossover) {
      const { periods, sequences } = d.crossover;
      if (clustered || d.unitsPerArm === undefined) {
        ctx.addIssue({ code: 'custom', path: ['crossover'], message: 'A cross-over needs unitsPerArm (units per sequence); clusters that cross over are not simulated yet.' });
      }
      if (d.blocks !== undefined) ctx.addIssue({ code: 'custom', path: ['blocks'], message: 'blocks and a cross-over cannot be combined yet: leave blocks out.' });
      if (d.occasions !== undefined || d.times !== undefined) {
        ctx.addIssue({ code: 'custom', path: ['occasions'], message: 'In a cross-over the periods are the occasions: leave occasions and times out.' });
      }
      if (d.target !== 'treat') ctx.addIssue({ code: 'custom', path: ['target'], message: 'A cross-over takes target treat (the difference between the arms).' });
      if (sequences) {
        sequences.forEach((q, i) => {
          if (q.length !== periods || !/^[AB]+$/.test(q)) {
            ctx.addIssue({ code: 'custom', path: ['crossover', 'sequences', i], message: `Each sequence is ${periods} letters A or B, one per period (e.g. ${defaultSequences(periods)[i]}).` });
          }
        });
        const [s0, s1] = sequences;
        if (s0 === s1 || !(s0 + s1).includes('A') || !(s0 + s1).includes('B')) {
          ctx.addIssue({ code: 'custom', path: ['crossover', 'sequences'], message: 'Give two different sequences that together use both arms (A and B).' });
        }
      }
    }
    if (d.blocks !== undefined && d.target !== 'treat') {
      ctx.addIssue({ code: 'custom', path: ['target'], message: 'A design with blocks takes target treat (the difference between the arms).' });
    }
    if (clustered && d.clusterSize !== undefined && d.clusterSizeCv > 0) {
      try {
        clusterSizes(d.clustersPerArm!, d.clusterSize, d.clusterSizeCv);
      } catch (e) {
        ctx.addIssue({ code: 'custom', path: ['clusterSizeCv'], message: `${(e as Error).message}.` });
      }
    }
  });

export const simulationTruthSchema = z.object({
  /** Difference between the arms (or in slopes); on the log-odds scale for binary, the log rate ratio for counts. */
  effect: between('effect', -1e6, 1e6),
  /** Total SD of the outcome (gaussian family). */
  sd: num('sd').gt(0, 'sd must be above 0.').max(1e6, 'sd can be at most 1,000,000.').optional(),
  /** Share of the variance between clusters. */
  icc: num('icc').min(0, 'icc is at least 0.').lt(1, 'icc must be below 1.').default(0),
  /** Correlation of two occasions of one unit beyond its cluster (the unit's share of the remaining variance). */
  occasionCorrelation: num('occasionCorrelation').min(0, 'occasionCorrelation is at least 0.').lt(1, 'occasionCorrelation must be below 1.').default(0),
  /** SD of the units' random slopes over time. */
  randomSlopeSd: between('randomSlopeSd', SLOPE_SD.min, SLOPE_SD.max).default(SLOPE_SD.default),
  /**
   * SD of the clusters' random slopes over time (clusters with occasions): each cluster's units
   * share a trend beyond their own, so a difference in slopes between arms of clusters is judged
   * against the spread of the clusters' trends.
   */
  clusterSlopeSd: between('clusterSlopeSd', 0, 1e6).default(0),
  family: z.enum(['gaussian', 'binary', 'count'], { error: 'family is gaussian, binary or count.' }).default('gaussian'),
  /**
   * The first arm's level: gaussian, its mean (default 0; set it well above sd for a positive
   * outcome that log-ols can analyse); binary, its probability (default 0.3); count, its mean
   * count (default 5) — for binary and count at zero random effects.
   */
  baseline: between('baseline', -1e6, 1e6).optional(),
  /** Count: the negative-binomial shape k (variance μ + μ²/k); leave out for Poisson counts. */
  overdispersion: num('overdispersion').gt(0, 'overdispersion must be above 0.').max(1e6, 'overdispersion can be at most 1,000,000.').optional(),
  /**
   * The scale of `icc`. `latent` (default): the share of the link-scale variance between clusters,
   * with the family's level-one variance (π²/3 for binary). `proportion` (binary only): the
   * correlation of two outcomes in one cluster, Var(P_c)/(p̄(1 − p̄)) in the first arm (Donner &
   * Klar 2000) — the ICC of a design with clusters of individuals and no other random effect.
   */
  iccScale: z.enum(['latent', 'proportion'], { error: 'iccScale is latent or proportion.' }).default('latent'),
  /**
   * Count: the coefficient of variation of the clusters' true mean counts (SD/mean between
   * clusters; Hayes & Bennett 1999's k), instead of icc.
   */
  clusterCv: num('clusterCv').gt(0, 'clusterCv must be above 0.').max(5, 'clusterCv can be at most 5.').optional(),
  /** Count with clusterCv: the clusters' rate multipliers are log-normal (default) or gamma with mean 1 (negative binomial cluster totals). */
  clusterDistribution: z.enum(['log-normal', 'gamma'], { error: 'clusterDistribution is log-normal or gamma.' }).default('log-normal'),
  /**
   * Binary and count: false (default) — `baseline` and `effect` describe a cluster and unit with
   * zero random effects (for binary, the conditional odds ratio a GLMM estimates); true — they are
   * population averages: the first arm's proportion or mean count over all clusters, and the
   * marginal odds ratio (the rate ratio is the same either way). Binary without random slopes.
   */
  marginal: z.boolean({ error: 'marginal is true or false.' }).default(false),
  /** Share of the variance between blocks (link scale for binary and count), with design.blocks. */
  blockIcc: num('blockIcc').min(0, 'blockIcc is at least 0.').lt(1, 'blockIcc must be below 1.').default(0),
  /**
   * Cross-over: the mean of periods 2, 3, … minus period 1's, one number per later period (on the
   * outcome's scale for gaussian, the link scale for binary and count). Default 0.
   */
  periodEffects: z.array(between('periodEffects[]', -1e6, 1e6), { error: 'periodEffects is a list of numbers.' }).optional(),
});

const scenarioName = rawText('name')
  .trim()
  .min(1, 'name is required when given.')
  .max(60, 'name can be at most 60 characters.')
  .optional();

const scenario = <V extends string, S extends z.ZodRawShape>(violation: V, shape: S) =>
  z.object({ violation: z.literal(violation), name: scenarioName, ...shape });

export const scenarioSchema = z.discriminatedUnion(
  'violation',
  [
    scenario('none', {}),
    scenario('skewed', {
      sigmaLog: ranged('sigmaLog', SCENARIO_RANGES.skewed.sigmaLog),
    }),
    scenario('heavy-tailed', {
      df: ranged('df', SCENARIO_RANGES['heavy-tailed'].df),
    }),
    scenario('outliers', {
      fraction: ranged('fraction', SCENARIO_RANGES.outliers.fraction),
      scale: ranged('scale', SCENARIO_RANGES.outliers.scale),
    }),
    scenario('unequal-variance', {
      model: z.enum(['arm', 'covariate', 'mean'], { error: 'model is arm, covariate or mean.' }).default('arm'),
      sdRatio: ranged('sdRatio', SCENARIO_RANGES['unequal-variance'].sdRatio),
    }),
    scenario('nonlinear', {
      shape: z.enum(['quadratic', 'logarithmic', 'threshold'], { error: 'shape is quadratic, logarithmic or threshold.' }).default('quadratic'),
      /** The predictor whose relation is curved; time by default when there are occasions, else a covariate. */
      on: z.enum(['time', 'covariate'], { error: 'on is time or covariate.' }).optional(),
      /** Rise of the curve over the predictor's range, in SDs of the outcome. */
      strength: ranged('strength', SCENARIO_RANGES.nonlinear.strength),
    }),
    scenario('serial', {
      ar: ranged('ar', SCENARIO_RANGES.serial.ar),
    }),
    scenario('carry-over', {
      /**
       * In a cross-over, arm 2's treatment in the previous period adds to the outcome: `fraction`
       * of the run's effect (default 0.5, so none when there is no effect), or, when given, a fixed
       * `size` (outcome scale for gaussian, link scale otherwise) in both runs.
       */
      fraction: ranged('fraction', SCENARIO_RANGES['carry-over'].fraction),
      size: between('size', -1e6, 1e6).optional(),
    }),
  ],
  { error: 'violation is one of none, skewed, heavy-tailed, outliers, unequal-variance, nonlinear, serial, carry-over.' },
);

export const simulationSpecSchema = z
  .object({
    design: simulationDesignSchema,
    truth: simulationTruthSchema,
    scenarios: z
      .array(scenarioSchema, { error: 'scenarios is a list.' })
      .min(1, 'Give at least one scenario (e.g. {"violation": "none"}).')
      .max(MAX_SCENARIOS, `Give at most ${MAX_SCENARIOS} scenarios.`),
    analyses: z
      .array(z.enum(ANALYSIS_NAMES, { error: `Each analysis is one of ${ANALYSIS_NAMES.join(', ')}.` }), { error: 'analyses is a list.' })
      .min(1, 'Give at least one analysis.')
      .max(ANALYSIS_NAMES.length, `Give at most ${ANALYSIS_NAMES.length} analyses.`),
    replicates: whole('replicates', REPLICATES.min, REPLICATES.max).default(REPLICATES.default),
    seed: whole('seed', SEED.min, SEED.max).default(SEED.default),
    alpha: ranged('alpha', ALPHA),
  })
  .superRefine((spec, ctx) => {
    const { design, truth } = spec;
    const clustered = design.clustersPerArm !== undefined;
    const hasOccasions = design.occasions !== undefined;
    const gaussian = truth.family === 'gaussian';
    if (gaussian && truth.sd === undefined) ctx.addIssue({ code: 'custom', path: ['truth', 'sd'], message: 'sd is needed for a gaussian outcome.' });
    if (truth.family === 'binary' && truth.baseline !== undefined && !(truth.baseline > 0 && truth.baseline < 1)) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'baseline'], message: 'For a binary outcome, baseline is a probability between 0 and 1.' });
    }
    if (truth.family === 'count' && truth.baseline !== undefined && !(truth.baseline > 0)) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'baseline'], message: 'For a count outcome, baseline is a mean count above 0.' });
    }
    if (!gaussian && design.target !== 'treat') {
      ctx.addIssue({ code: 'custom', path: ['design', 'target'], message: 'Binary and count outcomes take target treat (a difference between arms).' });
    }
    if (truth.overdispersion !== undefined && truth.family !== 'count') {
      ctx.addIssue({ code: 'custom', path: ['truth', 'overdispersion'], message: 'overdispersion applies to count outcomes only.' });
    }
    if (truth.icc > 0 && !clustered) ctx.addIssue({ code: 'custom', path: ['truth', 'icc'], message: 'icc needs clusters: give clustersPerArm and clusterSize, or set icc to 0.' });
    if (truth.occasionCorrelation > 0 && !hasOccasions && design.crossover === undefined) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'occasionCorrelation'], message: 'occasionCorrelation needs occasions.' });
    }
    if (truth.randomSlopeSd > 0 && !hasOccasions) ctx.addIssue({ code: 'custom', path: ['truth', 'randomSlopeSd'], message: 'randomSlopeSd needs occasions.' });
    if (truth.clusterSlopeSd > 0 && !(clustered && hasOccasions)) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'clusterSlopeSd'], message: 'clusterSlopeSd needs clusters measured at occasions (clustersPerArm, clusterSize and occasions).' });
    }
    const crossover = design.crossover;
    const withinUnits = crossover !== undefined;
    if (withinUnits && truth.randomSlopeSd > 0) ctx.addIssue({ code: 'custom', path: ['truth', 'randomSlopeSd'], message: 'randomSlopeSd needs occasions; a cross-over has periods.' });
    if (truth.periodEffects !== undefined && (!crossover || truth.periodEffects.length !== crossover.periods - 1)) {
      ctx.addIssue({
        code: 'custom',
        path: ['truth', 'periodEffects'],
        message: crossover ? `periodEffects needs one number per period after the first (${crossover.periods - 1}).` : 'periodEffects needs a cross-over.',
      });
    }
    if (truth.blockIcc > 0 && design.blocks === undefined) ctx.addIssue({ code: 'custom', path: ['truth', 'blockIcc'], message: 'blockIcc needs blocks, or set it to 0.' });
    if (truth.blockIcc + truth.icc >= 1) ctx.addIssue({ code: 'custom', path: ['truth', 'blockIcc'], message: 'icc and blockIcc together must stay below 1.' });
    const binaryBaseline = truth.family === 'binary' && truth.baseline !== undefined && truth.baseline > 0 && truth.baseline < 1 ? truth.baseline : 0.3;
    if (truth.iccScale === 'proportion') {
      if (truth.family !== 'binary') ctx.addIssue({ code: 'custom', path: ['truth', 'iccScale'], message: 'iccScale proportion applies to binary outcomes.' });
      else if (truth.blockIcc > 0 || truth.occasionCorrelation > 0 || truth.randomSlopeSd > 0 || truth.clusterSlopeSd > 0) {
        ctx.addIssue({ code: 'custom', path: ['truth', 'iccScale'], message: 'iccScale proportion takes one level of clusters and no other random effect (blockIcc, occasionCorrelation, randomSlopeSd and clusterSlopeSd 0).' });
      } else {
        try {
          sigmaForIcc(truth.icc, truth.marginal ? { marginal: binaryBaseline } : { eta: Math.log(binaryBaseline / (1 - binaryBaseline)) });
        } catch (e) {
          ctx.addIssue({ code: 'custom', path: ['truth', 'icc'], message: `${(e as Error).message.replace(/^an ICC/, 'An ICC')}.` });
        }
      }
    }
    if (truth.marginal && truth.family === 'binary' && Math.abs(Math.log(binaryBaseline / (1 - binaryBaseline)) + truth.effect) > 30) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'effect'], message: 'With a marginal truth the second arm’s proportion must stay between 0 and 1: give a log odds ratio that keeps logit(baseline) + effect within ±30.' });
    }
    if (truth.clusterCv !== undefined) {
      if (truth.family !== 'count') ctx.addIssue({ code: 'custom', path: ['truth', 'clusterCv'], message: 'clusterCv applies to count outcomes.' });
      if (!clustered) ctx.addIssue({ code: 'custom', path: ['truth', 'clusterCv'], message: 'clusterCv needs clusters: give clustersPerArm and clusterSize.' });
      if (truth.icc > 0) ctx.addIssue({ code: 'custom', path: ['truth', 'clusterCv'], message: 'Give either icc or clusterCv for the clusters, not both.' });
    }
    if (truth.marginal && gaussian) ctx.addIssue({ code: 'custom', path: ['truth', 'marginal'], message: 'marginal applies to binary and count outcomes.' });
    if (truth.marginal && truth.family === 'binary' && (truth.randomSlopeSd > 0 || truth.clusterSlopeSd > 0)) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'marginal'], message: 'A marginal binary truth takes no random slopes (randomSlopeSd and clusterSlopeSd 0).' });
    }

    const names = new Set<string>();
    spec.scenarios.forEach((s, i) => {
      const name = s.name ?? s.violation;
      if (names.has(name)) {
        ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'name'], message: `Two scenarios are called "${name}": give each a different name.` });
      }
      names.add(name);
      if (!gaussian && s.violation !== 'none' && s.violation !== 'carry-over') {
        ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'violation'], message: `${s.violation} applies to gaussian outcomes; binary and count outcomes take violation none or carry-over.` });
      }
      if (s.violation === 'carry-over' && !design.crossover) ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'violation'], message: 'carry-over needs a cross-over design.' });
      if (s.violation === 'serial' && design.crossover) ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'violation'], message: 'serial correlation is not simulated in a cross-over yet.' });
      if (s.violation === 'serial' && !hasOccasions) ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'violation'], message: 'serial correlation needs occasions.' });
      if (s.violation === 'nonlinear' && s.on === 'time' && !hasOccasions) {
        ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'on'], message: 'A curved relation with time needs occasions; use on: covariate.' });
      }
    });
    if (new Set(spec.analyses).size !== spec.analyses.length) ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'Name each analysis once.' });
    if (spec.analyses.includes('glm') && gaussian) {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'glm needs a binary or count outcome (family).' });
    }
    if (spec.analyses.includes('glmm') && gaussian) {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'glmm needs a binary or count outcome (family); use mixed for a gaussian one.' });
    }
    if (spec.analyses.includes('glmm') && !clustered && !hasOccasions && !design.crossover && design.blocks === undefined) {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'glmm needs clusters, occasions, blocks or a cross-over to give a random intercept.' });
    }
    if (spec.analyses.includes('glm-nb') && truth.family !== 'count') {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'glm-nb needs a count outcome (family count).' });
    }
    if (spec.analyses.includes('period-difference') && design.crossover?.periods !== 2) {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'period-difference needs a two-period cross-over (crossover with periods 2).' });
    }

    const rows = rowsPerDataset(design);
    if (rows !== undefined && rows > MAX_ROWS) {
      ctx.addIssue({ code: 'custom', path: ['design'], message: `The design has ${rows.toLocaleString('en-GB')} rows per data set; at most ${MAX_ROWS.toLocaleString('en-GB')} are simulated. Use fewer units, clusters or occasions.` });
    } else if (rows !== undefined && rows * spec.replicates * spec.scenarios.length > MAX_GENERATED_OBSERVATIONS) {
      ctx.addIssue({
        code: 'custom',
        path: ['replicates'],
        message: `replicates × scenarios × rows (${(rows * spec.replicates * spec.scenarios.length).toLocaleString('en-GB')}) can be at most ${MAX_GENERATED_OBSERVATIONS.toLocaleString('en-GB')}: use fewer replicates or scenarios.`,
      });
    }
  })
  .meta({ id: 'SimulationSpec', description: 'A stress test: design, truth, scenarios, analyses, replicates, seed and alpha.' });

export type SimulationSpecInput = z.input<typeof simulationSpecSchema>;
export type SimulationSpec = z.output<typeof simulationSpecSchema>;
export type SimulationDesign = SimulationSpec['design'];
export type SimulationTruth = SimulationSpec['truth'];
export type Scenario = SimulationSpec['scenarios'][number];
export type Violation = Scenario['violation'];

/** The scenario's key in results: its name, by default its violation. */
export function scenarioKey(scenario: Scenario): string {
  return scenario.name ?? scenario.violation;
}

/** Rows of one data set, or undefined when the design is incomplete (the refinements report that). */
export function rowsPerDataset(design: SimulationDesign): number | undefined {
  const occasions = design.crossover?.periods ?? design.occasions ?? 1;
  const blocks = design.blocks ?? 1;
  if (design.clustersPerArm !== undefined && design.clusterSize !== undefined) {
    try {
      const sizes = clusterSizes(design.clustersPerArm, design.clusterSize, design.clusterSizeCv);
      return 2 * sizes.reduce((s, m) => s + m, 0) * occasions * blocks;
    } catch {
      return undefined;
    }
  }
  if (design.unitsPerArm === undefined) return undefined;
  const [n1, n2] = typeof design.unitsPerArm === 'number' ? [design.unitsPerArm, design.unitsPerArm] : design.unitsPerArm;
  return (n1 + n2) * occasions * blocks;
}

/**
 * The default cross-over sequences for `periods` periods: ABBA… repeated to that length and its
 * mirror image (AB/BA, ABB/BAA, ABBA/BAAB — the designs Jones & Kenward recommend for two
 * treatments in two to four periods, Design and Analysis of Cross-Over Trials, 3rd ed., ch. 3–4,
 * from memory).
 */
export function defaultSequences(periods: number): [string, string] {
  const first = Array.from({ length: periods }, (_, t) => ('ABBA'[t % 4] as string)).join('');
  const second = first.replace(/A/g, 'x').replace(/B/g, 'A').replace(/x/g, 'B');
  return [first, second];
}
