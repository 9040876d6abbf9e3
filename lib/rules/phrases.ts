/**
 * Phrases several findings share, built from the design: the treatment's name, the planned
 * method, the ICC as a figure or a range. Kept here so the findings word things the same way.
 */
import type { Analysis, Design } from '@/lib/design/schema';
import type { DesignFacts, LevelInfo } from '@/lib/design/facts';
import type { ModelPlan } from './model';
import { count, dec, list, noun, num } from './text';

const METHOD_NAMES: Record<NonNullable<Analysis['method']>, string> = {
  't-test': 't-test',
  'linear-regression': 'linear regression',
  ancova: 'ANCOVA',
  'mixed-model': 'mixed model',
  gee: 'GEE analysis (generalised estimating equations)',
  'cluster-means': 'analysis of cluster means',
  glm: 'generalised linear model',
  glmm: 'generalised linear mixed model',
  'robust-regression': 'robust regression',
  'paired-t-test': 'paired t-test',
  'per-occasion-tests': 'series of tests, one per occasion',
  other: 'analysis',
};

/** "the planned t-test", or "the planned analysis" when no method is chosen yet. */
export function plannedMethod(design: Design): string {
  return `the planned ${design.analysis.method ? METHOD_NAMES[design.analysis.method] : 'analysis'}`;
}

export function methodName(method: NonNullable<Analysis['method']>): string {
  return METHOD_NAMES[method];
}

/** "the reading-support programme", "the treatment" when unnamed. */
export function treatmentName(design: Design): string {
  const v = design.assignment.variableName ?? design.outcome.explanatoryVariables.find((x) => x.role === 'treatment' || x.role === 'exposure')?.name;
  if (!v) return design.assignment.kind === 'observed' || design.assignment.kind === 'continuous' ? 'the exposure' : 'the treatment';
  const lower = v.length > 1 && v[1] === v[1]!.toLowerCase() ? v[0]!.toLowerCase() + v.slice(1) : v;
  return `the ${lower}`;
}

/** "reading score", "the outcome" when unnamed. */
export function outcomeName(design: Design): string {
  const n = design.outcome.name;
  if (!n) return 'the outcome';
  return n.length > 1 && n[1] === n[1]!.toLowerCase() ? n[0]!.toLowerCase() + n.slice(1) : n;
}

/** "assigned" for randomised designs, "varies" for observed exposures. */
export function assignedVerb(design: Design): string {
  return design.assignment.kind === 'randomised' || design.assignment.kind === undefined ? 'is assigned' : 'varies';
}

/** What a cluster-level analysis compares: "means", "event rates" for counts, "proportions" for yes-or-no and k-of-n outcomes. */
export function clusterSummaries(design: Design): string {
  const t = design.outcome.type;
  return t === 'count' ? 'event rates' : t === 'binary' || t === 'proportion' ? 'proportions' : 'means';
}

/** "a mixed model", or "a generalised linear mixed model (poisson family, log link)" when the outcome needs a family. */
export function mixedModelName(plan: { family?: string | undefined; link?: string | undefined }): string {
  return plan.family ? `a generalised linear mixed model (${plan.family} family, ${plan.link} link)` : 'a mixed model';
}

const FAMILY_WORDS: Record<NonNullable<Analysis['glmFamily']>, string> = {
  gaussian: 'linear',
  binomial: 'logistic (binomial)',
  poisson: 'Poisson',
  'negative-binomial': 'negative binomial',
  gamma: 'gamma',
  beta: 'beta',
};

/** The recommended model's kind in a few words: "a linear mixed model", "a Poisson GLMM", "a logistic (binomial) regression". */
export function modelKind(plan: ModelPlan): string {
  const fam = plan.family ? FAMILY_WORDS[plan.family] : undefined;
  const mixed = plan.method === 'mixed-model' || plan.method === 'glmm';
  if (mixed) return fam ? `a ${fam} GLMM (generalised linear mixed model, ${plan.link} link)` : 'a linear mixed model';
  if (fam) return `a ${fam} regression (generalised linear model, ${plan.link} link)`;
  return plan.method === 'ancova' ? 'ANCOVA (a linear regression with the baseline)' : 'a linear regression';
}

/**
 * What the recommended model does with the given levels, then its kind, so that a finding and the
 * recommendation name the same model: "a model with a random intercept for care home, here a
 * negative binomial GLMM", "a model with a fixed effect for site, here a linear regression". A
 * level the model carries as a fixed effect (too few units) is named as one.
 */
export function modelFor(plan: ModelPlan, levels: readonly LevelInfo[]): string {
  const random = levels.filter((l) => plan.randomLevels.includes(l)).map((l) => noun(l.level));
  const fixed = levels.filter((l) => plan.fixedLevels.includes(l)).map((l) => noun(l.level));
  const parts = [
    random.length > 0 ? `${random.length > 1 ? 'random intercepts' : 'a random intercept'} for ${list(random)}` : '',
    fixed.length > 0 ? `${fixed.length > 1 ? 'fixed effects' : 'a fixed effect'} for ${list(fixed)}` : '',
  ].filter(Boolean);
  return parts.length > 0 ? `a model with ${parts.join(' and ')}, here ${modelKind(plan)}` : modelKind(plan);
}

/** "20 classrooms (10 per arm)". */
export function unitsWithArms(f: DesignFacts, L: LevelInfo, perArm: number | undefined): string {
  return perArm !== undefined && !f.withinUnit && f.design.assignment.arms.length >= 2 ? `${count(L.total, L.level)} (${num(perArm)} per arm)` : count(L.total, L.level);
}

/** "25 pupils per classroom" (average per parent of the level below). */
export function perUnit(child: LevelInfo, parent: LevelInfo): string {
  return `${num(child.perParent)} ${noun(child.level, child.perParent !== 1)} per ${noun(parent.level)}`;
}

/** The two ends of a range: "1.2 to 5.8". */
export function range(lo: number, hi: number, digits = 1): string {
  return `${dec(lo, digits)} to ${dec(hi, digits)}`;
}

/** "an expert guess with low certainty", "a published source", for an assumption's source. */
export function sourcePhrase(source: Design['assumptions']['iccs'][number]['source']): string {
  const kind = { published: 'a published source', pilot: 'a pilot study', expert: 'an expert guess', none: 'no stated source' }[source.kind];
  return `${kind}, with ${source.certainty} certainty`;
}
