/**
 * The design model: one zod schema family shared by the wizard's forms, the API and the stored
 * revisions. A design is saved while it is being written, so every part may be incomplete:
 * fields are optional where a half-filled wizard needs them to be, and `lib/design/progress.ts`
 * says which steps are complete. lib/design/facts.ts is the one reader that interprets it (counts,
 * units, ICCs, occasions, the outcome); the checks, the Plan and the stress test ask it.
 *
 * Bounds keep hostile input harmless (at most 8 levels, counts up to 1,000,000, texts limited);
 * the error messages say what to fix.
 */
import { z } from 'zod';
import { rawText, text } from '@/lib/text-schema';

const name = (label: string, max = 120) => text(label, 1, max);
const note = (label: string, max = 2000) => text(label, 0, max);

const probability = (label: string) =>
  z.number({ error: `${label} must be a number.` }).min(0, `${label} is at least 0.`).max(1, `${label} is at most 1.`);

export const idSchema = rawText('An id').regex(/^[a-z0-9-]{1,40}$/, 'An id is 1–40 lower-case letters, digits or dashes.');

// ---------------------------------------------------------------- outcome

export const OUTCOME_TYPES = ['continuous', 'binary', 'count', 'proportion', 'bounded-score', 'time-to-event'] as const;
export const OUTCOME_SHAPES = ['symmetric', 'right-skewed', 'heavy-tailed', 'floor-or-ceiling'] as const;

export const explanatoryVariableSchema = z.object({
  id: idSchema,
  name: name('Variable name'),
  role: z.enum(['treatment', 'exposure', 'covariate']),
  kind: z.enum(['categorical', 'continuous']),
  /** Range the variable will take in the study (continuous variables). */
  observedMin: z.number().finite().optional(),
  observedMax: z.number().finite().optional(),
  /** Range over which the team wants to draw conclusions. */
  targetMin: z.number().finite().optional(),
  targetMax: z.number().finite().optional(),
});

export const outcomeSchema = z
  .object({
    name: name('Outcome name').optional(),
    unit: note('Unit', 60).optional(),
    type: z.enum(OUTCOME_TYPES).optional(),
    shape: z.enum(OUTCOME_SHAPES).optional(),
    /** Is the outcome positive only (times, concentrations, weights)? */
    positiveOnly: z.boolean().optional(),
    /** Number of primary outcomes tested for the main claim (1 for a single primary outcome). */
    primaryOutcomes: z.number().int().min(1, 'At least one primary outcome.').max(50, 'At most 50 primary outcomes.').default(1),
    secondaryOutcomes: z.array(name('Secondary outcome')).max(30, 'At most 30 secondary outcomes.').default([]),
    explanatoryVariables: z.array(explanatoryVariableSchema).max(30, 'At most 30 explanatory variables.').default([]),
    /** Is variance expected to differ between arms or grow with a covariate or the mean? */
    unequalVarianceExpected: z.boolean().optional(),
    /** Are outliers or data-entry extremes plausible? */
    outliersExpected: z.boolean().optional(),
  })
  .superRefine((o, ctx) => {
    o.explanatoryVariables.forEach((v, i) => {
      if (v.observedMin !== undefined && v.observedMax !== undefined && v.observedMin > v.observedMax) {
        ctx.addIssue({ code: 'custom', path: ['explanatoryVariables', i, 'observedMax'], message: 'The upper end is below the lower end.' });
      }
      if (v.targetMin !== undefined && v.targetMax !== undefined && v.targetMin > v.targetMax) {
        ctx.addIssue({ code: 'custom', path: ['explanatoryVariables', i, 'targetMax'], message: 'The upper end is below the lower end.' });
      }
    });
  });

// ---------------------------------------------------------------- structure

/**
 * Kinds of level: independent units (volunteers, pupils); a grouping of units (classroom, tray,
 * litter, cage, site, family); repeated measurements of one unit over time (nights, visits);
 * technical replicates or sub-samples of one sample (leaves of a plant, wells of a sample).
 */
export const LEVEL_KINDS = ['independent', 'grouping', 'repeated', 'replicate'] as const;
export const GROUPING_TYPES = ['cluster', 'school', 'classroom', 'site', 'family', 'litter', 'cage', 'tank', 'tray', 'pot', 'plot', 'pair', 'other'] as const;

export const levelSchema = z.object({
  id: idSchema,
  name: name('Level name', 60),
  kind: z.enum(LEVEL_KINDS),
  groupingType: z.enum(GROUPING_TYPES).optional(),
  /**
   * Planned number. The top level's count is the number in the whole study, over all arms (split
   * between the arms by their allocation; `countIsTotal` changes nothing there). A lower level's
   * count is the number per unit of the level above, or the number in the whole study when
   * `countIsTotal` (then the number per parent is that total divided by the parent level's total).
   * lib/design/facts.ts reads it; nothing else does.
   */
  count: z.number({ error: 'Count must be a number.' }).int('Count must be a whole number.').min(1, 'Count is at least 1.').max(1_000_000, 'Count is at most 1,000,000.'),
  /** The count of a lower level is the number in the whole study rather than per parent. */
  countIsTotal: z.boolean().default(false),
  /** Coefficient of variation of the count between parents (0 when all parents have the same number). */
  countCv: z.number().min(0, 'CV is at least 0.').max(3, 'A CV above 3 is not plausible.').default(0),
  /** Units of this level share an environment (cage, tank, tray, pot, classroom). */
  sharedEnvironment: z.boolean().default(false),
  /** Units of this level are close in space or time (field plots, consecutive days). */
  spatialOrSerial: z.boolean().default(false),
});

export const crossedFactorSchema = z.object({
  id: idSchema,
  name: name('Crossed factor name', 60),
  count: z.number().int().min(1).max(100_000),
  /** The level whose units are all measured by every level of this factor (raters × subjects). */
  crossedWithLevelId: idSchema,
});

export const MAX_LEVELS = 8;

export const structureSchema = z.object({
  levels: z
    .array(levelSchema)
    .max(MAX_LEVELS, `At most ${MAX_LEVELS} levels: group the rest, or describe them in a note.`)
    .default([]),
  crossedFactors: z.array(crossedFactorSchema).max(5, 'At most 5 crossed factors.').default([]),
});

// ---------------------------------------------------------------- assignment

export const armSchema = z.object({
  name: name('Arm name', 60),
  allocation: z.number().positive('Allocation is a positive share.').max(100, 'Use shares like 1 and 2, not percentages above 100.'),
});

export const assignmentSchema = z.object({
  kind: z.enum(['randomised', 'observed', 'continuous']).optional(),
  variableName: note('Variable name', 120).optional(),
  /** The level at which the treatment or exposure varies: its units are the experimental units. */
  levelId: idSchema.optional(),
  arms: z.array(armSchema).max(10, 'At most 10 arms.').default([]),
  blocking: z
    .object({
      kind: z.enum(['none', 'blocked', 'stratified', 'matched', 'paired']).default('none'),
      factor: note('Blocking factor', 120).optional(),
      inAnalysis: z.boolean().default(false),
    })
    .default({ kind: 'none', inAnalysis: false }),
  crossover: z
    .object({
      enabled: z.boolean().default(false),
      periods: z.number().int().min(2).max(10).default(2),
      washout: note('Washout', 200).optional(),
      carryoverPossible: z.boolean().optional(),
    })
    .default({ enabled: false, periods: 2 }),
});

// ---------------------------------------------------------------- occasions

export const occasionSchema = z.object({
  label: name('Occasion label', 60),
  /** Time since the start, in `timeUnit`. */
  time: z.number().finite().min(-1e6).max(1e6),
  baseline: z.boolean().default(false),
  /** Expected cumulative share of units lost by this occasion. */
  attrition: probability('Attrition').default(0),
});

export const occasionsSchema = z.object({
  timeUnit: note('Time unit', 30).default('weeks'),
  list: z.array(occasionSchema).max(200, 'At most 200 occasions.').default([]),
  trajectoryOfInterest: z.boolean().default(false),
  correlationStructure: z.enum(['exchangeable', 'ar1', 'unknown']).default('unknown'),
});

// ---------------------------------------------------------------- assumptions

export const SOURCE_KINDS = ['published', 'pilot', 'expert', 'none'] as const;
/** How the effect on a yes-or-no outcome is stated: the second proportion itself, or against the first. */
export const PROPORTION_EFFECT_MEASURES = ['p2', 'difference', 'riskRatio', 'oddsRatio'] as const;
export const CERTAINTY = ['low', 'medium', 'high'] as const;

export const sourceSchema = z.object({
  kind: z.enum(SOURCE_KINDS).default('none'),
  citation: note('Citation', 500).optional(),
  certainty: z.enum(CERTAINTY).default('low'),
});

const sourced = <T extends z.ZodType>(value: T) => z.object({ value, source: sourceSchema.default({ kind: 'none', certainty: 'low' }) });

export const assumptionsSchema = z.object({
  outcomeSd: sourced(z.number().positive('The SD must be above 0.').max(1e12)).optional(),
  /** ICC of each grouping level (and of the unit for repeated measures), keyed by level id. */
  iccs: z
    .array(sourced(probability('ICC')).extend({ levelId: idSchema }))
    .max(MAX_LEVELS)
    .default([]),
  occasionCorrelation: sourced(z.number().min(-1).max(1)).optional(),
  /** The smallest difference worth detecting, in the outcome's units. */
  effect: sourced(z.number().positive('The effect must be above 0; give its size, not its sign.').max(1e12)).optional(),
  // Yes-or-no outcomes.
  /** The share with the outcome expected without the intervention, 0 < p < 1. */
  controlProportion: sourced(z.number().gt(0, 'The proportion must be above 0.').lt(1, 'The proportion must be below 1.')).optional(),
  /** The effect worth detecting: the proportion expected with the intervention, or its difference, risk ratio or odds ratio against controlProportion. */
  proportionEffect: z
    .object({
      measure: z.enum(PROPORTION_EFFECT_MEASURES),
      value: z.number().finite('The effect must be a number.').gt(-1, 'The effect must be above −1.').max(1e6, 'The effect can be at most 1,000,000.'),
      source: sourceSchema.default({ kind: 'none', certainty: 'low' }),
    })
    .superRefine((e, ctx) => {
      const problem =
        e.measure === 'p2' && !(e.value > 0 && e.value < 1)
          ? 'The proportion must be between 0 and 1.'
          : e.measure === 'difference' && !(e.value < 1)
            ? 'The difference must be between −1 and 1.'
            : (e.measure === 'riskRatio' || e.measure === 'oddsRatio') && !(e.value > 0)
              ? 'The ratio must be above 0.'
              : null;
      if (problem) ctx.addIssue({ code: 'custom', path: ['value'], message: problem });
    })
    .optional(),
  // Counts of events.
  /** Events per unit of follow-up time expected without the intervention. */
  baselineRate: sourced(z.number().positive('The rate must be above 0.').max(1e6)).optional(),
  /** The rate ratio worth detecting (rate with the intervention / baseline rate): 0.8 is a 20% reduction. */
  rateRatio: sourced(z.number().positive('The rate ratio must be above 0.').max(1e6).refine((x) => x !== 1, 'A rate ratio of 1 is no effect.')).optional(),
  /** Follow-up time of each unit, in the time unit of the rate. */
  followUpTime: sourced(z.number().positive('The follow-up time must be above 0.').max(1e6)).optional(),
  /** Negative binomial dispersion between units (variance = mean + dispersion × mean²); 0 for plain Poisson counts. */
  dispersion: sourced(z.number().min(0, 'The dispersion is at least 0.').max(100, 'The dispersion can be at most 100.')).optional(),
  /** Coefficient of variation of the true rates between clusters (Hayes & Bennett's k), for cluster-randomised counts. */
  betweenClusterCv: sourced(z.number().min(0, 'The coefficient of variation is at least 0.').max(5, 'The coefficient of variation can be at most 5.')).optional(),
  alpha: z.number().gt(0).lt(0.5).default(0.05),
  power: z.number().gt(0.5).lt(1).default(0.8),
});

// ---------------------------------------------------------------- analysis plan

export const ANALYSIS_METHODS = [
  't-test',
  'linear-regression',
  'ancova',
  'mixed-model',
  'gee',
  'cluster-means',
  'glm',
  'glmm',
  'robust-regression',
  'paired-t-test',
  'per-occasion-tests',
  'other',
] as const;

export const analysisSchema = z.object({
  method: z.enum(ANALYSIS_METHODS).optional(),
  /** For mixed models: levels with a random intercept. */
  randomIntercepts: z.array(idSchema).max(MAX_LEVELS).default([]),
  /**
   * Levels entered as fixed effects (a term with one coefficient per unit), e.g. the few sites,
   * donors or litters that cannot support a variance estimate. Absent: none.
   */
  fixedEffectLevels: z.array(idSchema).max(MAX_LEVELS).optional(),
  /** How the model carries the blocking (stratification, matching) factor: as a fixed or a random term. Absent: not in the model. */
  blockEffect: z.enum(['fixed', 'random']).optional(),
  randomSlopeForTime: z.boolean().default(false),
  /** The level whose units the analysis counts as n. */
  unitOfAnalysisLevelId: idSchema.optional(),
  adjustsForBaseline: z.boolean().default(false),
  glmFamily: z.enum(['gaussian', 'binomial', 'poisson', 'negative-binomial', 'gamma', 'beta']).optional(),
  standardErrors: z.enum(['model', 'hc3', 'cluster-robust', 'cr2']).default('model'),
  dfMethod: z.enum(['residual', 'satterthwaite', 'kenward-roger', 'between-within']).default('residual'),
  transformation: z.enum(['none', 'log', 'other']).default('none'),
  timeModel: z.enum(['not-applicable', 'categorical', 'linear', 'polynomial', 'spline']).default('not-applicable'),
  covarianceStructure: z.enum(['not-applicable', 'independence', 'exchangeable', 'ar1', 'unstructured']).default('not-applicable'),
  missingData: z.enum(['not-planned', 'complete-case', 'mixed-model-mar', 'multiple-imputation']).default('not-planned'),
  multiplicity: z.enum(['none', 'bonferroni', 'holm', 'hierarchical']).default('none'),
  outlierPlan: note('Outlier plan', 1000).optional(),
  modelVariance: z.boolean().default(false),
  notes: note('Notes', 4000).optional(),
});

// ---------------------------------------------------------------- the design

export const DESIGN_SCHEMA_VERSION = 1;

export const designSchema = z
  .object({
    schemaVersion: z.literal(DESIGN_SCHEMA_VERSION).default(DESIGN_SCHEMA_VERSION),
    outcome: outcomeSchema.default({ primaryOutcomes: 1, secondaryOutcomes: [], explanatoryVariables: [] }),
    structure: structureSchema.default({ levels: [], crossedFactors: [] }),
    assignment: assignmentSchema.default({ arms: [], blocking: { kind: 'none', inAnalysis: false }, crossover: { enabled: false, periods: 2 } }),
    occasions: occasionsSchema.default({ timeUnit: 'weeks', list: [], trajectoryOfInterest: false, correlationStructure: 'unknown' }),
    assumptions: assumptionsSchema.default({ iccs: [], alpha: 0.05, power: 0.8 }),
    analysis: analysisSchema.default({
      randomIntercepts: [],
      randomSlopeForTime: false,
      adjustsForBaseline: false,
      standardErrors: 'model',
      dfMethod: 'residual',
      transformation: 'none',
      timeModel: 'not-applicable',
      covarianceStructure: 'not-applicable',
      missingData: 'not-planned',
      multiplicity: 'none',
      modelVariance: false,
    }),
  })
  .superRefine((d, ctx) => {
    const ids = new Set<string>();
    d.structure.levels.forEach((l, i) => {
      if (ids.has(l.id)) ctx.addIssue({ code: 'custom', path: ['structure', 'levels', i, 'id'], message: 'Two levels share this id.' });
      ids.add(l.id);
    });
    const refs: [string | undefined, (string | number)[]][] = [
      [d.assignment.levelId, ['assignment', 'levelId']],
      [d.analysis.unitOfAnalysisLevelId, ['analysis', 'unitOfAnalysisLevelId']],
      ...d.analysis.randomIntercepts.map((id, i) => [id, ['analysis', 'randomIntercepts', i]] as [string, (string | number)[]]),
      ...(d.analysis.fixedEffectLevels ?? []).map((id, i) => [id, ['analysis', 'fixedEffectLevels', i]] as [string, (string | number)[]]),
      ...d.assumptions.iccs.map((c, i) => [c.levelId, ['assumptions', 'iccs', i, 'levelId']] as [string, (string | number)[]]),
      ...d.structure.crossedFactors.map((c, i) => [c.crossedWithLevelId, ['structure', 'crossedFactors', i, 'crossedWithLevelId']] as [string, (string | number)[]]),
    ];
    for (const [id, path] of refs) {
      if (id !== undefined && !ids.has(id)) ctx.addIssue({ code: 'custom', path, message: 'This refers to a level that is not in the structure.' });
    }
    if (d.assignment.kind !== 'continuous' && d.assignment.arms.length === 1) {
      ctx.addIssue({ code: 'custom', path: ['assignment', 'arms'], message: 'A comparison needs at least two arms.' });
    }
  });

export type Design = z.infer<typeof designSchema>;
export type DesignInput = z.input<typeof designSchema>;
export type Level = z.infer<typeof levelSchema>;
export type Outcome = z.infer<typeof outcomeSchema>;
export type Assignment = z.infer<typeof assignmentSchema>;
export type Occasions = z.infer<typeof occasionsSchema>;
export type Assumptions = z.infer<typeof assumptionsSchema>;
export type Analysis = z.infer<typeof analysisSchema>;
export type Source = z.infer<typeof sourceSchema>;

/** The wizard's steps, in order, each editing one part of the design. */
export const DESIGN_STEPS = [
  { slug: 'outcome', label: 'Outcome', part: 'outcome' },
  { slug: 'structure', label: 'Structure', part: 'structure' },
  { slug: 'assignment', label: 'Assignment', part: 'assignment' },
  { slug: 'occasions', label: 'Occasions', part: 'occasions' },
  { slug: 'assumptions', label: 'Assumptions', part: 'assumptions' },
  { slug: 'analysis', label: 'Analysis plan', part: 'analysis' },
] as const;
export type DesignPart = (typeof DESIGN_STEPS)[number]['part'];

export const PART_SCHEMAS = {
  outcome: outcomeSchema,
  structure: structureSchema,
  assignment: assignmentSchema,
  occasions: occasionsSchema,
  assumptions: assumptionsSchema,
  analysis: analysisSchema,
} as const;

/** An empty design with every default filled in. */
export function emptyDesign(): Design {
  return designSchema.parse({});
}
