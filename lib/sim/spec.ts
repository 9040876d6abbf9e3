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
import { fieldMessage } from '@/lib/field-messages';
import { rawText } from '@/lib/text-schema';
import { formatCount, formatNumber } from '@/lib/format';

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
export const formatBound = (x: number) => formatNumber(x, 6);

/** A finite number; the refused ones are worded by lib/field-messages.ts, which names the field. */
const num = () => z.number();
/** A number in `range`, with its default. */
const ranged = (range: Range & { why?: string }) => {
  const why = range.why ? { error: (issue: z.core.$ZodRawIssue) => `${fieldMessage(issue).replace(/\.$/, '')}, ${range.why}.` } : undefined;
  const low = range.minOpen ? num().gt(range.min, why) : num().min(range.min, why);
  return low.max(range.max).default(range.default);
};
const whole = (min: number, max: number) =>
  z
    .number()
    .int()
    .min(min)
    .max(max);
const between = (min: number, max: number) =>
  num().min(min).max(max);

const unitsPerArm = z.union([whole(2, MAX_ROWS), z.tuple([whole(2, MAX_ROWS), whole(2, MAX_ROWS)])], {
  error: 'Enter the units per arm as a whole number, or as two whole numbers (arm 1, arm 2).',
});

export const simulationDesignSchema = z
  .object({
    arms: z.literal(2),
    /** Clusters (classes, trays, practices) per arm; each has `clusterSize` units on average. */
    clustersPerArm: whole(2, 10_000).optional(),
    clusterSize: whole(1, 10_000).optional(),
    /** Coefficient of variation of the cluster sizes (SD / mean); 0 for equal sizes. */
    clusterSizeCv: between(0, 3).default(0),
    /** Independent units per arm when there are no clusters: one number, or [arm 1, arm 2]. */
    unitsPerArm: unitsPerArm.optional(),
    /** Occasions at which each unit is measured (repeated measures). */
    occasions: whole(2, MAX_OCCASIONS).optional(),
    /** Times of the occasions, increasing; 0, 1, 2, … by default. */
    times: z.array(num()).optional(),
    /** The effect of interest: the difference between arms, or (with occasions) the difference in slopes over time. */
    target: z.enum(['treat', 'treat:time']).default('treat'),
    /**
     * Blocks (schools, sites, trays) that each hold both arms: the treatment is assigned within
     * every block, to its clusters (then clustersPerArm counts the clusters of one arm in one
     * block) or to its units (unitsPerArm per arm in one block).
     */
    blocks: whole(2, 10_000).optional(),
    /**
     * Each unit receives both arms in turn, one per period, in the order of its sequence (a
     * cross-over, or a within-subject design with several occasions): unitsPerArm counts the
     * units of each of the two sequences. The periods are the occasions (leave occasions out).
     */
    crossover: z
      .object({
        periods: whole(2, MAX_PERIODS),
        /**
         * The two sequences, as letters A (arm 1) and B (arm 2), one per period, e.g.
         * ["AB", "BA"] or ["ABBA", "BAAB"]. Default: ABBA… repeated to the number of periods and
         * its mirror image (AB/BA, ABB/BAA, ABBA/BAAB, …).
         */
        sequences: z
          .tuple([rawText('The first sequence'), rawText('The second sequence')], {
            error: 'Enter two sequences of the arms, such as AB and BA.',
          })
          .optional(),
      })
      .optional(),
  })
  .superRefine((d, ctx) => {
    const clustered = d.clustersPerArm !== undefined;
    if (clustered && d.unitsPerArm !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['unitsPerArm'], message: 'Give either the clusters per arm with the cluster size, or the units per arm, not both.' });
    }
    if (!clustered && d.unitsPerArm === undefined) {
      ctx.addIssue({ code: 'custom', path: ['unitsPerArm'], message: 'Enter the units per arm, or the clusters per arm with the cluster size.' });
    }
    if (clustered && d.clusterSize === undefined) {
      ctx.addIssue({ code: 'custom', path: ['clusterSize'], message: 'Enter the cluster size as well as the clusters per arm.' });
    }
    if (!clustered && d.clusterSize !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['clustersPerArm'], message: 'Enter the clusters per arm as well as the cluster size.' });
    }
    if (!clustered && d.clusterSizeCv > 0) {
      ctx.addIssue({ code: 'custom', path: ['clusterSizeCv'], message: 'The variation in cluster size needs clusters: enter the clusters per arm and the cluster size.' });
    }
    if (d.times !== undefined) {
      if (d.occasions === undefined || d.times.length !== d.occasions) {
        ctx.addIssue({ code: 'custom', path: ['times'], message: 'Enter one time per occasion, as many times as occasions.' });
      } else if (d.times.some((t, i) => i > 0 && !(t > d.times![i - 1]!))) {
        ctx.addIssue({ code: 'custom', path: ['times'], message: 'Enter the times in increasing order, one per occasion.' });
      }
    }
    if (d.target === 'treat:time' && d.occasions === undefined) {
      ctx.addIssue({ code: 'custom', path: ['target'], message: 'A difference in slopes needs occasions: enter the number of occasions.' });
    }
    if (d.crossover) {
      const { periods, sequences } = d.crossover;
      if (clustered || d.unitsPerArm === undefined) {
        ctx.addIssue({ code: 'custom', path: ['crossover'], message: 'A cross-over needs the units per sequence; clusters that cross over are not simulated yet.' });
      }
      if (d.blocks !== undefined) ctx.addIssue({ code: 'custom', path: ['blocks'], message: 'Blocks and a cross-over cannot be combined yet: leave the blocks out.' });
      if (d.occasions !== undefined || d.times !== undefined) {
        ctx.addIssue({ code: 'custom', path: ['occasions'], message: 'In a cross-over the periods are the occasions: leave the occasions and times out.' });
      }
      if (d.target !== 'treat') ctx.addIssue({ code: 'custom', path: ['target'], message: 'A cross-over estimates the difference between the arms, not a difference in slopes.' });
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
      ctx.addIssue({ code: 'custom', path: ['target'], message: 'A design with blocks estimates the difference between the arms, not a difference in slopes.' });
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
  effect: between(-1e6, 1e6),
  /** Total SD of the outcome (gaussian family). */
  sd: num().gt(0).max(1e6).optional(),
  /** Share of the variance between clusters. */
  icc: num().min(0).lt(1).default(0),
  /** Correlation of two occasions of one unit beyond its cluster (the unit's share of the remaining variance). */
  occasionCorrelation: num().min(0).lt(1).default(0),
  /** SD of the units' random slopes over time. */
  randomSlopeSd: between(SLOPE_SD.min, SLOPE_SD.max).default(SLOPE_SD.default),
  /**
   * SD of the clusters' random slopes over time (clusters with occasions): each cluster's units
   * share a trend beyond their own, so a difference in slopes between arms of clusters is judged
   * against the spread of the clusters' trends.
   */
  clusterSlopeSd: between(0, 1e6).default(0),
  family: z.enum(['gaussian', 'binary', 'count']).default('gaussian'),
  /**
   * The first arm's level: gaussian, its mean (default 0; set it well above sd for a positive
   * outcome that log-ols can analyse); binary, its probability (default 0.3); count, its mean
   * count (default 5) — for binary and count at zero random effects.
   */
  baseline: between(-1e6, 1e6).optional(),
  /** Count: the negative-binomial shape k (variance μ + μ²/k); leave out for Poisson counts. */
  overdispersion: num().gt(0).max(1e6).optional(),
  /**
   * The scale of `icc`. `latent` (default): the share of the link-scale variance between clusters,
   * with the family's level-one variance (π²/3 for binary). `proportion` (binary only): the
   * correlation of two outcomes in one cluster, Var(P_c)/(p̄(1 − p̄)) in the first arm (Donner &
   * Klar 2000) — the ICC of a design with clusters of individuals and no other random effect.
   */
  iccScale: z.enum(['latent', 'proportion']).default('latent'),
  /**
   * Count: the coefficient of variation of the clusters' true mean counts (SD/mean between
   * clusters; Hayes & Bennett 1999's k), instead of icc.
   */
  clusterCv: num().gt(0).max(5).optional(),
  /** Count with clusterCv: the clusters' rate multipliers are log-normal (default) or gamma with mean 1 (negative binomial cluster totals). */
  clusterDistribution: z.enum(['log-normal', 'gamma']).default('log-normal'),
  /**
   * Binary and count: false (default) — `baseline` and `effect` describe a cluster and unit with
   * zero random effects (for binary, the conditional odds ratio a GLMM estimates); true — they are
   * population averages: the first arm's proportion or mean count over all clusters, and the
   * marginal odds ratio (the rate ratio is the same either way). Binary without random slopes.
   */
  marginal: z.boolean().default(false),
  /** Share of the variance between blocks (link scale for binary and count), with design.blocks. */
  blockIcc: num().min(0).lt(1).default(0),
  /**
   * Cross-over: the mean of periods 2, 3, … minus period 1's, one number per later period (on the
   * outcome's scale for gaussian, the link scale for binary and count). Default 0.
   */
  periodEffects: z.array(between(-1e6, 1e6)).optional(),
});

const scenarioName = rawText('The scenario name')
  .trim()
  .min(1)
  .max(60)
  .optional();

const scenario = <V extends string, S extends z.ZodRawShape>(violation: V, shape: S) =>
  z.object({ violation: z.literal(violation), name: scenarioName, ...shape });

export const scenarioSchema = z.discriminatedUnion(
  'violation',
  [
    scenario('none', {}),
    scenario('skewed', {
      sigmaLog: ranged(SCENARIO_RANGES.skewed.sigmaLog),
    }),
    scenario('heavy-tailed', {
      df: ranged(SCENARIO_RANGES['heavy-tailed'].df),
    }),
    scenario('outliers', {
      fraction: ranged(SCENARIO_RANGES.outliers.fraction),
      scale: ranged(SCENARIO_RANGES.outliers.scale),
    }),
    scenario('unequal-variance', {
      model: z.enum(['arm', 'covariate', 'mean']).default('arm'),
      sdRatio: ranged(SCENARIO_RANGES['unequal-variance'].sdRatio),
    }),
    scenario('nonlinear', {
      shape: z.enum(['quadratic', 'logarithmic', 'threshold']).default('quadratic'),
      /** The predictor whose relation is curved; time by default when there are occasions, else a covariate. */
      on: z.enum(['time', 'covariate']).optional(),
      /** Rise of the curve over the predictor's range, in SDs of the outcome. */
      strength: ranged(SCENARIO_RANGES.nonlinear.strength),
    }),
    scenario('serial', {
      ar: ranged(SCENARIO_RANGES.serial.ar),
    }),
    scenario('carry-over', {
      /**
       * In a cross-over, arm 2's treatment in the previous period adds to the outcome: `fraction`
       * of the run's effect (default 0.5, so none when there is no effect), or, when given, a fixed
       * `size` (outcome scale for gaussian, link scale otherwise) in both runs.
       */
      fraction: ranged(SCENARIO_RANGES['carry-over'].fraction),
      size: between(-1e6, 1e6).optional(),
    }),
  ],
);

export const simulationSpecSchema = z
  .object({
    design: simulationDesignSchema,
    truth: simulationTruthSchema,
    scenarios: z
      .array(scenarioSchema)
      .min(1)
      .max(MAX_SCENARIOS),
    analyses: z
      .array(z.enum(ANALYSIS_NAMES))
      .min(1)
      .max(ANALYSIS_NAMES.length),
    replicates: whole(REPLICATES.min, REPLICATES.max).default(REPLICATES.default),
    seed: whole(SEED.min, SEED.max).default(SEED.default),
    alpha: ranged(ALPHA),
  })
  .superRefine((spec, ctx) => {
    const { design, truth } = spec;
    const clustered = design.clustersPerArm !== undefined;
    const hasOccasions = design.occasions !== undefined;
    const gaussian = truth.family === 'gaussian';
    if (gaussian && truth.sd === undefined) ctx.addIssue({ code: 'custom', path: ['truth', 'sd'], message: 'Enter the standard deviation of the outcome.' });
    if (truth.family === 'binary' && truth.baseline !== undefined && !(truth.baseline > 0 && truth.baseline < 1)) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'baseline'], message: 'For a yes/no outcome, enter the baseline as a proportion between 0 and 1.' });
    }
    if (truth.family === 'count' && truth.baseline !== undefined && !(truth.baseline > 0)) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'baseline'], message: 'For a count outcome, enter the baseline as a mean count above 0.' });
    }
    if (!gaussian && design.target !== 'treat') {
      ctx.addIssue({ code: 'custom', path: ['design', 'target'], message: 'For yes/no and count outcomes the stress test estimates the difference between the arms, not a difference in slopes.' });
    }
    if (truth.overdispersion !== undefined && truth.family !== 'count') {
      ctx.addIssue({ code: 'custom', path: ['truth', 'overdispersion'], message: 'Leave the overdispersion out: it applies to count outcomes only.' });
    }
    if (truth.icc > 0 && !clustered) ctx.addIssue({ code: 'custom', path: ['truth', 'icc'], message: 'An intracluster correlation needs clusters: enter the clusters per arm and the cluster size, or set the ICC to 0.' });
    if (truth.occasionCorrelation > 0 && !hasOccasions && design.crossover === undefined) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'occasionCorrelation'], message: 'A correlation between occasions needs occasions: enter the number of occasions, or set it to 0.' });
    }
    if (truth.randomSlopeSd > 0 && !hasOccasions) ctx.addIssue({ code: 'custom', path: ['truth', 'randomSlopeSd'], message: 'A spread of the slopes between units needs occasions: enter the number of occasions, or set it to 0.' });
    if (truth.clusterSlopeSd > 0 && !(clustered && hasOccasions)) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'clusterSlopeSd'], message: 'A spread of the slopes between clusters needs clusters measured at occasions: enter the clusters per arm, the cluster size and the occasions, or set it to 0.' });
    }
    const crossover = design.crossover;
    const withinUnits = crossover !== undefined;
    if (withinUnits && truth.randomSlopeSd > 0) ctx.addIssue({ code: 'custom', path: ['truth', 'randomSlopeSd'], message: 'A cross-over has periods, not occasions: set the spread of the slopes between units to 0.' });
    if (truth.periodEffects !== undefined && (!crossover || truth.periodEffects.length !== crossover.periods - 1)) {
      ctx.addIssue({
        code: 'custom',
        path: ['truth', 'periodEffects'],
        message: crossover ? `Enter one period effect per period after the first (${crossover.periods - 1}).` : 'Leave the period effects out: they apply to a cross-over only.',
      });
    }
    if (truth.blockIcc > 0 && design.blocks === undefined) ctx.addIssue({ code: 'custom', path: ['truth', 'blockIcc'], message: 'The intracluster correlation of the blocks needs blocks: enter the blocks, or set it to 0.' });
    if (truth.blockIcc + truth.icc >= 1) ctx.addIssue({ code: 'custom', path: ['truth', 'blockIcc'], message: 'The two intracluster correlations (clusters and blocks) together must stay below 1.' });
    const binaryBaseline = truth.family === 'binary' && truth.baseline !== undefined && truth.baseline > 0 && truth.baseline < 1 ? truth.baseline : 0.3;
    if (truth.iccScale === 'proportion') {
      if (truth.family !== 'binary') ctx.addIssue({ code: 'custom', path: ['truth', 'iccScale'], message: 'An ICC on the proportion scale applies to yes/no outcomes only.' });
      else if (truth.blockIcc > 0 || truth.occasionCorrelation > 0 || truth.randomSlopeSd > 0 || truth.clusterSlopeSd > 0) {
        ctx.addIssue({ code: 'custom', path: ['truth', 'iccScale'], message: 'An ICC on the proportion scale takes one level of clusters and no other random effect: set the ICC of the blocks, the correlation between occasions and the spreads of the slopes to 0.' });
      } else {
        try {
          sigmaForIcc(truth.icc, truth.marginal ? { marginal: binaryBaseline } : { eta: Math.log(binaryBaseline / (1 - binaryBaseline)) });
        } catch (e) {
          ctx.addIssue({ code: 'custom', path: ['truth', 'icc'], message: `${(e as Error).message.replace(/^an ICC/, 'An ICC')}.` });
        }
      }
    }
    if (truth.marginal && truth.family === 'binary' && Math.abs(Math.log(binaryBaseline / (1 - binaryBaseline)) + truth.effect) > 30) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'effect'], message: 'With a population-average effect the second arm’s proportion must stay between 0 and 1: enter a smaller log odds ratio (logit of the baseline plus the effect within ±30).' });
    }
    if (truth.clusterCv !== undefined) {
      if (truth.family !== 'count') ctx.addIssue({ code: 'custom', path: ['truth', 'clusterCv'], message: 'The variation between clusters (CV) applies to count outcomes only.' });
      if (!clustered) ctx.addIssue({ code: 'custom', path: ['truth', 'clusterCv'], message: 'The variation between clusters (CV) needs clusters: enter the clusters per arm and the cluster size.' });
      if (truth.icc > 0) ctx.addIssue({ code: 'custom', path: ['truth', 'clusterCv'], message: 'Describe the clusters by either the ICC or the variation between clusters (CV), not both.' });
    }
    if (truth.marginal && gaussian) ctx.addIssue({ code: 'custom', path: ['truth', 'marginal'], message: 'A population-average effect applies to yes/no and count outcomes only.' });
    if (truth.marginal && truth.family === 'binary' && (truth.randomSlopeSd > 0 || truth.clusterSlopeSd > 0)) {
      ctx.addIssue({ code: 'custom', path: ['truth', 'marginal'], message: 'A population-average effect on a yes/no outcome takes no random slopes: set the spreads of the slopes to 0.' });
    }

    const names = new Set<string>();
    spec.scenarios.forEach((s, i) => {
      const name = s.name ?? s.violation;
      if (names.has(name)) {
        ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'name'], message: `Two scenarios are called "${name}": give each a different name.` });
      }
      names.add(name);
      if (!gaussian && s.violation !== 'none' && s.violation !== 'carry-over') {
        ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'violation'], message: 'This scenario applies to measured outcomes; for yes/no and count outcomes choose assumptions that hold or carry-over.' });
      }
      if (s.violation === 'carry-over' && !design.crossover) ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'violation'], message: 'Carry-over needs a cross-over design.' });
      if (s.violation === 'serial' && design.crossover) ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'violation'], message: 'Serial correlation is not simulated in a cross-over yet.' });
      if (s.violation === 'serial' && !hasOccasions) ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'violation'], message: 'Serial correlation needs occasions.' });
      if (s.violation === 'nonlinear' && s.on === 'time' && !hasOccasions) {
        ctx.addIssue({ code: 'custom', path: ['scenarios', i, 'on'], message: 'A curved relation with time needs occasions; choose a curve in a covariate instead.' });
      }
    });
    if (new Set(spec.analyses).size !== spec.analyses.length) ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'Name each analysis once.' });
    if (spec.analyses.includes('glm') && gaussian) {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'Logistic or Poisson regression needs a yes/no or count outcome.' });
    }
    if (spec.analyses.includes('glmm') && gaussian) {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'The logistic or Poisson mixed model needs a yes/no or count outcome; for a measured outcome choose the linear mixed model.' });
    }
    if (spec.analyses.includes('glmm') && !clustered && !hasOccasions && !design.crossover && design.blocks === undefined) {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'The logistic or Poisson mixed model needs clusters, occasions, blocks or a cross-over to give a random intercept.' });
    }
    if (spec.analyses.includes('glm-nb') && truth.family !== 'count') {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'Negative-binomial regression needs a count outcome.' });
    }
    if (spec.analyses.includes('period-difference') && design.crossover?.periods !== 2) {
      ctx.addIssue({ code: 'custom', path: ['analyses'], message: 'The t test on the period differences needs a two-period cross-over.' });
    }

    const rows = rowsPerDataset(design);
    if (rows !== undefined && rows > MAX_ROWS) {
      ctx.addIssue({ code: 'custom', path: ['design'], message: `The design has ${formatCount(rows)} rows per data set; at most ${formatCount(MAX_ROWS)} are simulated. Use fewer units, clusters or occasions.` });
    } else if (rows !== undefined && rows * spec.replicates * spec.scenarios.length > MAX_GENERATED_OBSERVATIONS) {
      ctx.addIssue({
        code: 'custom',
        path: ['replicates'],
        message: `Replicates × scenarios × rows of data come to ${formatCount(rows * spec.replicates * spec.scenarios.length)}, more than the ${formatCount(MAX_GENERATED_OBSERVATIONS)} simulated at most: use fewer replicates or scenarios.`,
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
