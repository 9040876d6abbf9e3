/**
 * The model a design calls for, in standard (lme4-style) notation: the outcome and treatment
 * names as snake_case identifiers, fixed effects for the treatment, baseline, strata and period,
 * a random intercept for every level that groups observations (nested levels as `a/b`), a random
 * slope for time at the measured unit when the trajectory is of interest, crossed factors as
 * crossed random intercepts. Rules quote it in their advice; `recommendation.ts` builds on it.
 *
 * Choices (standard practice; the references are in the recommendation): binary and proportion
 * outcomes → binomial family with logit link, counts → Poisson with log link (negative binomial
 * when the Assumptions step gives an overdispersion above 0) and the log of each unit's follow-up
 * time as an offset, so that the effect is a rate ratio and units followed for less time weigh
 * less; positive right-skewed continuous outcomes → log scale; Kenward–Roger df
 * below about 40 experimental units, Satterthwaite above, between-within df for a GLMM.
 */
import type { Analysis, Design } from '@/lib/design/schema';
import { designFacts, type DesignFacts, type LevelInfo } from '@/lib/design/facts';
import { FEW_CLUSTERS, FEW_LEVELS, fixedEffectLevels } from './clustering';
import { identifier } from './text';

export interface ModelPlan {
  method: NonNullable<Analysis['method']>;
  family?: NonNullable<Analysis['glmFamily']>;
  link?: 'identity' | 'logit' | 'log';
  logScale: boolean;
  response: string;
  treatment: string;
  fixed: string[];
  /** Levels with a random intercept, top first. */
  randomLevels: LevelInfo[];
  /** Levels with too few units for a variance, entered as fixed effects (`fixedEffectLevels`), top first. */
  fixedLevels: LevelInfo[];
  /** Crossed factors with too few levels for a variance, entered as fixed effects (their model names). */
  fixedCrossed: string[];
  slopeLevel?: LevelInfo;
  timeModel: Analysis['timeModel'];
  covarianceStructure: Analysis['covarianceStructure'];
  dfMethod: Analysis['dfMethod'];
  baselineTerm?: string;
  blockTerm?: string;
  /** How the model carries the blocking factor (a term of its own, or a level of the structure). */
  blockEffect?: 'fixed' | 'random';
  /** The plan tests each occasion separately; the model replaces them with one time × treatment model. */
  perOccasion: boolean;
  formula: string;
}

const cache = new WeakMap<Design, ModelPlan>();

/** The offset of a count model: events per unit of follow-up time. */
export const COUNT_OFFSET = 'offset(log(follow_up_time))';

export function modelPlan(design: Design): ModelPlan {
  const hit = cache.get(design);
  if (hit) return hit;
  const plan = buildPlan(designFacts(design));
  cache.set(design, plan);
  return plan;
}

/** Is the outcome positive, continuous and right-skewed (a candidate for the log scale)? */
export function isSkewedPositive(design: Design): boolean {
  const o = design.outcome;
  return (o.type === 'continuous' || o.type === undefined) && o.shape === 'right-skewed' && o.positiveOnly === true;
}

export function familyFor(design: Design): { family: NonNullable<Analysis['glmFamily']>; link: 'logit' | 'log' } | undefined {
  switch (design.outcome.type) {
    case 'binary':
    case 'proportion':
      return { family: 'binomial', link: 'logit' };
    case 'count':
      return { family: (design.assumptions.dispersion?.value ?? 0) > 0 ? 'negative-binomial' : 'poisson', link: 'log' };
    default:
      return undefined;
  }
}

type Variable = Design['outcome']['explanatoryVariables'][number];

/** The ids the wizard makes up for a variable the user adds ('var-1', 'var-2-2'): not a name anyone chose. */
const GENERATED_ID = /^var(-\d+)+$/;

/**
 * A variable as a model term: its id where someone chose it ('baseline-score' → baseline_score),
 * the user's name for it where the wizard made the id up ('var-1' named "Soil moisture" →
 * soil_moisture), the made-up id only when the name gives no identifier.
 */
export function variableTerm(v: Variable, fallback: string): string {
  return GENERATED_ID.test(v.id) ? identifier(v.name, identifier(v.id, fallback)) : identifier(v.id, fallback);
}

/** The treatment (or exposure) as a model term. */
export function treatmentTerm(design: Design): string {
  const vars = design.outcome.explanatoryVariables;
  const v = vars.find((x) => x.role === 'treatment') ?? vars.find((x) => x.role === 'exposure');
  if (v) return variableTerm(v, 'arm');
  return identifier(design.assignment.variableName, 'arm');
}

function baselineTerm(design: Design, response: string): string | undefined {
  const vars = design.outcome.explanatoryVariables;
  const named = vars.find((x) => x.role === 'covariate' && /baseline|pre-?test/i.test(`${x.id} ${x.name}`));
  return named ? variableTerm(named, `${response}_baseline`) : `${response}_baseline`;
}

/** The levels that must get a random intercept: those that group observations, plus the measured unit when occasions repeat it implicitly. */
export function randomLevels(f: DesignFacts): LevelInfo[] {
  return f.levels.filter((l) => l.groupsObservations || (f.implicitRepeats && l === f.bottom));
}

/** The model name of a level: 'Care home' → 'care_home'. */
export function levelTerm(l: LevelInfo): string {
  return identifier(l.level.name, 'unit');
}

/**
 * The random terms: one nested chain for the random levels (`a/b`, with a random slope where asked),
 * under the fixed levels above them (`site:classroom`, as a classroom is only identified within
 * its site), and a crossed intercept for each crossed factor.
 */
function randomPart(levels: LevelInfo[], fixedAbove: LevelInfo[], slope: LevelInfo | undefined, crossed: string[]): string[] {
  const ids = levels.map(levelTerm);
  const prefix = fixedAbove.filter((l) => levels[0] !== undefined && l.index < levels[0].index).map(levelTerm);
  if (ids.length > 0 && prefix.length > 0) ids[0] = [...prefix, ids[0]].join(':');
  const terms: string[] = [];
  const j = slope ? levels.indexOf(slope) : -1;
  if (j < 0) {
    if (ids.length > 0) terms.push(`(1 | ${ids.join('/')})`);
  } else {
    if (j > 0) terms.push(`(1 | ${ids.slice(0, j).join('/')})`);
    terms.push(`(1 + time | ${ids.slice(0, j + 1).join(':')})`);
    for (let i = j + 1; i < ids.length; i++) terms.push(`(1 | ${ids.slice(0, i + 1).join(':')})`);
  }
  for (const c of crossed) terms.push(`(1 | ${c})`);
  return terms;
}

function buildPlan(f: DesignFacts): ModelPlan {
  const d = f.design;
  const fam = familyFor(d);
  const logScale = !fam && isSkewedPositive(d);
  const outcome = identifier(d.outcome.name, 'y');
  const response = logScale ? `log(${outcome})` : outcome;
  const treatment = treatmentTerm(d);
  const crossover = f.crossover !== undefined;
  const occasions = f.occasions.length;
  const hasBaseline = f.baselines.length > 0 && f.followUps.length > 0;
  const repeatedOverTime = f.subject !== undefined && f.followUps.length >= 2 && !crossover;
  const trajectory = repeatedOverTime && d.occasions.trajectoryOfInterest;

  let timeModel: Analysis['timeModel'] = 'not-applicable';
  let treatmentPart = treatment;
  if (trajectory) {
    timeModel = occasions >= 4 ? 'spline' : 'linear';
    treatmentPart = `${treatment} * ${timeModel === 'spline' ? 'ns(time, df = 3)' : 'time'}`;
  }
  const perOccasion = d.analysis.method === 'per-occasion-tests' && repeatedOverTime && !trajectory;
  const fixed = [perOccasion ? `${treatment} * occasion` : treatmentPart];
  if (repeatedOverTime && !trajectory) {
    if (!perOccasion) fixed.push('occasion');
    timeModel = 'categorical';
  }
  if (crossover) fixed.push('period');
  const base = hasBaseline ? baselineTerm(d, outcome) : undefined;
  if (base) fixed.push(base);

  const covariates = d.outcome.explanatoryVariables.filter((v) => v.role !== 'treatment' && variableTerm(v, '') !== treatment && variableTerm(v, '') !== base);
  for (const v of covariates) if (v.role === 'covariate' || v.role === 'exposure') fixed.push(variableTerm(v, 'x'));

  // Levels with too few units for a variance become fixed effects (rule few-units says why).
  const grouping = randomLevels(f);
  const fixedLevels = fixedEffectLevels(f, grouping);
  const levels = grouping.filter((l) => !fixedLevels.includes(l));
  for (const l of fixedLevels) fixed.push(levelTerm(l));
  const crossed: string[] = [];
  const fixedCrossed: string[] = [];
  for (const c of d.structure.crossedFactors) (c.count < FEW_LEVELS ? fixedCrossed : crossed).push(identifier(c.name, 'factor'));
  fixed.push(...fixedCrossed);

  const blocking = d.assignment.blocking;
  const paired = blocking.kind === 'matched' || blocking.kind === 'paired';
  // An unnamed blocking factor is still in the model, as `block` (or `pair`).
  const blockName = blocking.kind !== 'none' ? identifier(blocking.factor, paired ? 'pair' : 'block') : undefined;
  let blockTerm: string | undefined;
  let blockEffect: ModelPlan['blockEffect'];
  if (blockName) {
    if (fixedLevels.some((l) => levelTerm(l) === blockName)) blockEffect = 'fixed';
    else if (levels.some((l) => levelTerm(l) === blockName)) blockEffect = 'random';
    else {
      blockEffect = paired ? 'random' : 'fixed';
      (blockEffect === 'random' ? crossed : fixed).push(blockName);
      blockTerm = blockName;
    }
  }
  if (d.outcome.type === 'count') fixed.push(COUNT_OFFSET);

  const slopeLevel = trajectory && occasions >= 3 && f.subject && levels.includes(f.subject) ? f.subject : undefined;
  const random = randomPart(levels, fixedLevels, slopeLevel, crossed);

  const mixed = random.length > 0;
  const method: ModelPlan['method'] = mixed ? (fam ? 'glmm' : 'mixed-model') : fam ? 'glm' : base ? 'ancova' : 'linear-regression';

  const serial = d.occasions.correlationStructure === 'ar1' || f.levels.some((l) => l.level.kind === 'repeated' && l.level.spatialOrSerial);
  const repeated = f.subject !== undefined && (f.levels.some((l) => l.level.kind === 'repeated') || f.implicitRepeats);
  const covarianceStructure: Analysis['covarianceStructure'] = !repeated || !mixed ? 'not-applicable' : serial ? 'ar1' : 'exchangeable';

  const units = f.eu?.total ?? Infinity;
  const dfMethod: Analysis['dfMethod'] = method === 'glmm' ? 'between-within' : method === 'mixed-model' ? (units < FEW_CLUSTERS ? 'kenward-roger' : 'satterthwaite') : 'residual';

  const formula = `${response} ~ ${[...fixed, ...random].join(' + ')}`;
  return {
    method,
    family: fam?.family,
    link: fam?.link,
    logScale,
    response,
    treatment,
    fixed,
    randomLevels: levels,
    fixedLevels,
    fixedCrossed,
    slopeLevel,
    timeModel,
    covarianceStructure,
    dfMethod,
    baselineTerm: base,
    blockTerm,
    ...(blockEffect ? { blockEffect } : {}),
    perOccasion,
    formula,
  };
}
