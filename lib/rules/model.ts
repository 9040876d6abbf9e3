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
import { FEW_CLUSTERS } from './clustering';
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
  slopeLevel?: LevelInfo;
  timeModel: Analysis['timeModel'];
  covarianceStructure: Analysis['covarianceStructure'];
  dfMethod: Analysis['dfMethod'];
  baselineTerm?: string;
  blockTerm?: string;
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

/** The treatment (or exposure) as a model term. */
export function treatmentTerm(design: Design): string {
  const vars = design.outcome.explanatoryVariables;
  const v = vars.find((x) => x.role === 'treatment') ?? vars.find((x) => x.role === 'exposure');
  if (v) return identifier(v.id, 'arm');
  return identifier(design.assignment.variableName, 'arm');
}

function baselineTerm(design: Design, response: string): string | undefined {
  const vars = design.outcome.explanatoryVariables;
  const named = vars.find((x) => x.role === 'covariate' && /baseline|pre-?test/i.test(`${x.id} ${x.name}`));
  return named ? identifier(named.id, `${response}_baseline`) : `${response}_baseline`;
}

/** The levels that must get a random intercept: those that group observations, plus the measured unit when occasions repeat it implicitly. */
export function randomLevels(f: DesignFacts): LevelInfo[] {
  return f.levels.filter((l) => l.groupsObservations || (f.implicitRepeats && l === f.bottom));
}

function randomPart(levels: LevelInfo[], slope: LevelInfo | undefined, crossed: string[]): string[] {
  const ids = levels.map((l) => identifier(l.level.name, 'unit'));
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
  const fixed = [treatmentPart];
  if (repeatedOverTime && !trajectory) {
    fixed.push('occasion');
    timeModel = 'categorical';
  }
  if (crossover) fixed.push('period');
  const base = hasBaseline ? baselineTerm(d, outcome) : undefined;
  if (base) fixed.push(base);

  const covariates = d.outcome.explanatoryVariables.filter((v) => v.role !== 'treatment' && identifier(v.id, '') !== treatment && identifier(v.id, '') !== base);
  for (const v of covariates) if (v.role === 'covariate' || v.role === 'exposure') fixed.push(identifier(v.id, 'x'));

  const blocking = d.assignment.blocking;
  const blockName = blocking.kind !== 'none' && blocking.factor ? identifier(blocking.factor, 'block') : undefined;
  const levels = randomLevels(f);
  const levelIds = new Set(levels.map((l) => identifier(l.level.name, 'unit')));
  const crossed = d.structure.crossedFactors.map((c) => identifier(c.name, 'factor'));
  let blockTerm: string | undefined;
  if (blockName && !levelIds.has(blockName)) {
    if (blocking.kind === 'matched' || blocking.kind === 'paired') crossed.push(blockName);
    else fixed.push(blockName);
    blockTerm = blockName;
  }
  if (d.outcome.type === 'count') fixed.push(COUNT_OFFSET);

  const slopeLevel = trajectory && occasions >= 3 && f.subject && levels.includes(f.subject) ? f.subject : undefined;
  const random = randomPart(levels, slopeLevel, crossed);

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
    slopeLevel,
    timeModel,
    covarianceStructure,
    dfMethod,
    baselineTerm: base,
    blockTerm,
    formula,
  };
}
