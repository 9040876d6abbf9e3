/**
 * The one reader of a design (lib/design/schema.ts). Everything that interprets a design — the
 * checks (lib/rules), the Plan (lib/plan), the stress test (lib/sim), the wizard's progress and
 * diagram — asks this module, so that they cannot read it two ways. Computed once per design
 * object. Every function tolerates a half-filled design: missing parts give `undefined`, never
 * an exception.
 *
 * Counting convention. The top level's count is the number in the whole study, over all arms (its
 * `countIsTotal` changes nothing). Every lower level's count is the number per unit of the level
 * above, unless `countIsTotal` says it is the number in the whole study; then the number per
 * parent is that total divided by the parent level's total (an average, which need not be whole).
 * Both conventions describe the same study and give the same facts. Observations are counted at
 * the bottom level.
 *
 * What it reads:
 * - levels: each with its number per parent and in total, the observations per unit, whether it
 *   groups observations (adds a variance component), and the ICC given for it;
 * - arms: their shares, and the units of a level in each arm (split by the allocation);
 * - the level of assignment, the experimental unit (the unit that counts as n) and whether the
 *   treatment varies within it (cross-over, or occasions of one unit assigned to arms);
 * - the observational unit (the bottom level) and the subject of repeated measures;
 * - occasions: baselines and follow-ups in time order, their times, the largest attrition;
 * - the outcome: its family (the type, continuous when none is given) and its parameters, each
 *   with its source: SD and effect (continuous); control proportion and effect as stated
 *   (binary); baseline rate, rate ratio, follow-up time, overdispersion and between-cluster CV
 *   (counts) — the Plan and the stress test both read these;
 * - whether whole clusters are randomised (`clusterRandomised`), which decides the count and
 *   binary calculations, the simulation's clusters and the numbers the Assumptions step asks for;
 * - ICCs per level (shares of the total variance) and which levels need one;
 * - whether the planned analysis accounts for the dependence a level creates.
 */
import type { Analysis, Assumptions, Design, Level, Outcome, Source } from './schema';

/** An assumed number with where it came from. */
export interface Sourced {
  value: number;
  source: Source;
}

/** The ICC given for a level: its share of the total variance of the outcome. */
export type IccValue = Sourced;

export interface LevelInfo {
  level: Level;
  index: number;
  /** Average number per unit of the level above; for the top level, the number in the study. */
  perParent: number;
  /** Number in the whole study. */
  total: number;
  /** Observations (bottom-level units) per unit of this level, M = total observations / units. */
  obsPerUnit: number;
  /**
   * More than one observation per unit, spread over more than one unit of the level below:
   * the level adds a variance component (a random intercept) that the analysis must face.
   */
  groupsObservations: boolean;
  /** The ICC given for this level in the assumptions, if any. */
  icc?: IccValue;
}

export interface OutcomeFacts {
  /** The outcome type as the Outcome step gives it; undefined while it is not given. */
  type?: NonNullable<Outcome['type']>;
  /** The type the calculations and simulations use: the given type, continuous when none is given. */
  family: NonNullable<Outcome['type']>;
  shape?: Outcome['shape'];
  /** The outcome takes only positive values (undefined when not said). */
  positiveOnly?: boolean;
  /** The outcome's SD (continuous outcomes). */
  sd?: Sourced;
  /** The smallest difference worth detecting, in the outcome's units. */
  effect?: Sourced;
  /** Binary: the proportion expected without the intervention. */
  controlProportion?: Sourced;
  /** Binary: the effect as the Assumptions step states it (second proportion, difference, risk ratio or odds ratio). */
  proportionEffect?: NonNullable<Assumptions['proportionEffect']>;
  /** Counts: events per unit of follow-up time without the intervention. */
  baselineRate?: Sourced;
  /** Counts: the rate ratio worth detecting. */
  rateRatio?: Sourced;
  /** Counts: follow-up time of each unit, in the time unit of the rate. */
  followUpTime?: Sourced;
  /** Counts: negative-binomial dispersion between units (variance = mean + dispersion × mean²); 0 for Poisson counts. */
  dispersion?: Sourced;
  /** Counts: coefficient of variation of the true rates between clusters. */
  betweenClusterCv?: Sourced;
}

export interface CrossoverFacts {
  periods: number;
  carryoverPossible?: boolean;
}

type OccasionList = Design['occasions']['list'];

export interface DesignFacts {
  design: Design;
  levels: LevelInfo[];
  /** The observational unit: the bottom level, where the outcome is measured. */
  bottom?: LevelInfo;
  totalObs: number;
  /** Shares of the arms, normalised to sum to 1 (empty when no arms are given). */
  armShares: number[];
  /** The level at which the treatment or exposure varies. */
  assignment?: LevelInfo;
  /**
   * The experimental unit, the unit that counts as n: the assignment level, or — when the
   * treatment varies within a unit (cross-over, or nights of one volunteer assigned to
   * schedules) — that unit.
   */
  eu?: LevelInfo;
  /** The treatment varies within the experimental unit: every unit receives more than one arm. */
  withinUnit: boolean;
  /** The cross-over, when the Assignment step describes one. */
  crossover?: CrossoverFacts;
  /**
   * The treatment changes over time within each experimental unit: a described cross-over, or
   * repeated measurements of one unit (nights, sessions, visits) assigned to the arms — a
   * cross-over in effect even when the Assignment step does not call it one. Period effects and
   * carry-over threaten both alike.
   */
  changesOverTime: boolean;
  /** The level measured over time: parent of the first repeated level, or the bottom level when several follow-ups are listed and no repeated level is. */
  subject?: LevelInfo;
  /** The occasions imply repeated measurement of the bottom level that the structure does not show. */
  implicitRepeats: boolean;
  /** Occasions in time order: all, baselines, follow-ups. */
  occasions: OccasionList;
  baselines: OccasionList;
  followUps: OccasionList;
  /** The largest cumulative attrition of any occasion (0 when none is expected). */
  maxAttrition: number;
  /** A unit is measured more than once over time: a level of repeated measurements, or more than one occasion. */
  measuredOverTime: boolean;
  /** The correlation between two occasions of one unit, when the Assumptions step gives it. */
  occasionCorrelation?: Sourced;
  outcome: OutcomeFacts;
  /** Levels whose ICC the design needs: every level above the bottom that groups observations. */
  iccLevels: LevelInfo[];
  /** An analysis method or unit of analysis has been chosen. */
  planGiven: boolean;
  /** The analysis plan works on the log of the outcome. */
  analysedOnLogScale: boolean;
  /** The level the analysis counts as n, if stated. */
  unitOfAnalysis?: LevelInfo;
}

const cache = new WeakMap<Design, DesignFacts>();

export function designFacts(design: Design): DesignFacts {
  const hit = cache.get(design);
  if (hit) return hit;
  const f = computeFacts(design);
  cache.set(design, f);
  return f;
}

/** Number per parent and in total of each level, by the counting convention above. */
function counts(design: Design): { perParent: number; total: number }[] {
  const out: { perParent: number; total: number }[] = [];
  let parentTotal = 1;
  design.structure.levels.forEach((level, index) => {
    const total = index === 0 || level.countIsTotal ? level.count : level.count * parentTotal;
    out.push({ perParent: index === 0 ? total : total / parentTotal, total });
    parentTotal = total;
  });
  return out;
}

const sourced = (x: { value: number; source: Source } | undefined): Sourced | undefined => (x ? { value: x.value, source: x.source } : undefined);

function computeFacts(design: Design): DesignFacts {
  const c = counts(design);
  const totalObs = c.at(-1)?.total ?? 0;
  const iccById = new Map(design.assumptions.iccs.map((x) => [x.levelId, { value: x.value, source: x.source }]));
  const levels: LevelInfo[] = design.structure.levels.map((level, index) => {
    const { perParent, total } = c[index]!;
    const obsPerUnit = total > 0 ? totalObs / total : 0;
    const next = c[index + 1];
    const icc = iccById.get(level.id);
    return { level, index, perParent, total, obsPerUnit, groupsObservations: next !== undefined && obsPerUnit > 1 && next.total > total, ...(icc ? { icc } : {}) };
  });
  const byId = (id: string | undefined) => (id ? levels.find((l) => l.level.id === id) : undefined);
  const bottom = levels[levels.length - 1];
  const assignment = byId(design.assignment.levelId);
  const cross = design.assignment.crossover;

  const occasions = [...design.occasions.list].sort((a, b) => a.time - b.time);
  const baselines = occasions.filter((o) => o.baseline);
  const followUps = occasions.filter((o) => !o.baseline);
  const firstRepeated = levels.find((l) => l.level.kind === 'repeated');
  let subject = firstRepeated && firstRepeated.index > 0 ? levels[firstRepeated.index - 1] : undefined;
  const implicitRepeats = !firstRepeated && followUps.length >= 2 && bottom !== undefined;
  if (implicitRepeats) subject = bottom;

  let eu = assignment;
  let withinUnit = false;
  if (assignment && (assignment.level.kind === 'repeated' || assignment.level.kind === 'replicate')) {
    const parent = [...levels.slice(0, assignment.index)].reverse().find((l) => l.level.kind === 'independent' || l.level.kind === 'grouping');
    if (parent) {
      eu = parent;
      withinUnit = true;
    }
  } else if (assignment && cross.enabled && (assignment.groupsObservations || (implicitRepeats && assignment === bottom))) {
    // A cross-over whose periods are listed only as occasions of the assigned unit is still one.
    withinUnit = true;
  }

  const shares = (() => {
    const arms = design.assignment.arms;
    const sum = arms.reduce((s, a) => s + a.allocation, 0);
    return arms.map((a) => a.allocation / sum);
  })();

  const o = design.outcome;
  const as = design.assumptions;
  const outcome: OutcomeFacts = {
    ...(o.type ? { type: o.type } : {}),
    family: o.type ?? 'continuous',
    ...(o.shape ? { shape: o.shape } : {}),
    ...(o.positiveOnly !== undefined ? { positiveOnly: o.positiveOnly } : {}),
    ...(as.outcomeSd ? { sd: sourced(as.outcomeSd) } : {}),
    ...(as.effect ? { effect: sourced(as.effect) } : {}),
    ...(as.controlProportion ? { controlProportion: sourced(as.controlProportion) } : {}),
    ...(as.proportionEffect ? { proportionEffect: { measure: as.proportionEffect.measure, value: as.proportionEffect.value, source: as.proportionEffect.source } } : {}),
    ...(as.baselineRate ? { baselineRate: sourced(as.baselineRate) } : {}),
    ...(as.rateRatio ? { rateRatio: sourced(as.rateRatio) } : {}),
    ...(as.followUpTime ? { followUpTime: sourced(as.followUpTime) } : {}),
    ...(as.dispersion ? { dispersion: sourced(as.dispersion) } : {}),
    ...(as.betweenClusterCv ? { betweenClusterCv: sourced(as.betweenClusterCv) } : {}),
  };

  const a = design.analysis;
  return {
    design,
    levels,
    bottom,
    totalObs,
    armShares: shares,
    assignment,
    eu,
    withinUnit,
    ...(cross.enabled ? { crossover: { periods: cross.periods, ...(cross.carryoverPossible !== undefined ? { carryoverPossible: cross.carryoverPossible } : {}) } } : {}),
    changesOverTime: withinUnit && (cross.enabled || assignment?.level.kind === 'repeated'),
    subject,
    implicitRepeats,
    occasions,
    baselines,
    followUps,
    maxAttrition: Math.max(0, ...occasions.map((x) => x.attrition)),
    measuredOverTime: occasions.length > 1 || firstRepeated !== undefined,
    ...(design.assumptions.occasionCorrelation ? { occasionCorrelation: sourced(design.assumptions.occasionCorrelation) } : {}),
    outcome,
    iccLevels: levels.filter((l) => l !== bottom && l.groupsObservations),
    planGiven: a.method !== undefined || a.unitOfAnalysisLevelId !== undefined,
    analysedOnLogScale: a.transformation === 'log',
    unitOfAnalysis: byId(a.unitOfAnalysisLevelId),
  };
}

export function levelById(f: DesignFacts, id: string | undefined): LevelInfo | undefined {
  return id ? f.levels.find((l) => l.level.id === id) : undefined;
}

/**
 * Measurements of each unit of level L over the whole study: its observations, times the
 * follow-up occasions when the occasions repeat the bottom level without a level of their own
 * (a cross-over whose periods are listed only as occasions, or visits of one patient).
 */
export function measurementsPerUnit(f: DesignFacts, L: LevelInfo): number {
  return f.implicitRepeats ? L.obsPerUnit * f.followUps.length : L.obsPerUnit;
}

/**
 * The correlation within the units of level L as a share of the total variance: its ICC, or — for
 * the unit measured over time with no ICC of its own — the correlation between two of its
 * occasions less the shares of the levels above it (which that correlation also contains).
 * The Assumptions step asks for one or the other; both say how alike two measurements of one
 * unit are.
 */
export function withinCorrelation(f: DesignFacts, L: LevelInfo): IccValue | undefined {
  if (L.icc) return L.icc;
  if (L !== f.subject || !f.occasionCorrelation) return undefined;
  const above = f.levels.slice(0, L.index).reduce((s, l) => s + (l.icc?.value ?? 0), 0);
  return { value: Math.max(0, f.occasionCorrelation.value - above), source: f.occasionCorrelation.source };
}

/** The ICC given for a level (a share of the total variance), if any. */
export function iccOf(f: DesignFacts, levelId: string): IccValue | undefined {
  return levelById(f, levelId)?.icc;
}

/** ICCs given for the levels of the structure, as a map from level id. */
export function givenIccs(f: DesignFacts): Map<string, number> {
  return new Map(f.levels.flatMap((l) => (l.icc ? [[l.level.id, l.icc.value] as const] : [])));
}

/** The sum of the ICCs given for levels above the bottom: more than 1 means they cannot be shares of one variance. */
export function iccsInconsistent(f: DesignFacts): boolean {
  const sum = f.levels.slice(0, Math.max(0, f.levels.length - 1)).reduce((s, l) => s + (l.icc?.value ?? 0), 0);
  return sum > 1 + 1e-9;
}

/**
 * The units of level L in each arm: its total split by the arms' allocation, rounded to whole
 * units that add up to the total (largest remainder; a tie goes to the earlier arm). Empty when
 * no arms are given.
 */
export function unitsByArm(f: DesignFacts, L: LevelInfo): number[] {
  const total = Math.round(L.total);
  const exact = f.armShares.map((s) => total * s);
  const out = exact.map((x) => Math.floor(x + 1e-9));
  let left = total - out.reduce((s, x) => s + x, 0);
  const order = exact.map((x, i) => ({ i, r: x - out[i]! })).sort((p, q) => q.r - p.r || p.i - q.i);
  for (const { i } of order) {
    if (left <= 0) break;
    out[i]!++;
    left--;
  }
  return out;
}

/**
 * Whole clusters are randomised: the experimental unit holds several observations of members
 * below it that are not repeated measurements over time (pupils of a classroom, plants of a
 * tray), and the treatment does not vary within it. Decides the Plan's count and binary
 * calculations, the stress test's clusters and whether the Assumptions step asks for the
 * variation of rates between clusters.
 */
export function clusterRandomised(f: DesignFacts): boolean {
  const E = f.eu;
  if (!E || f.withinUnit) return false;
  const below = f.levels[E.index + 1];
  return below !== undefined && E.groupsObservations && below.level.kind !== 'repeated';
}

/**
 * Units of level L per unit of the level above that are analysed: the number per parent less the
 * largest attrition of the occasions, rounded down (at least 1). A cluster keeps its members, so
 * attrition shrinks what each cluster contributes; the Plan's cluster size and the stress test's
 * simulated clusters are both this number. `dropout` is the attrition the caller uses (the Plan's
 * input, which it refuses above 90%); by default the design's largest attrition.
 */
export function analysedPerParent(f: DesignFacts, L: LevelInfo, dropout = f.maxAttrition): number {
  return Math.max(1, Math.floor(L.perParent * (1 - (dropout < 1 ? dropout : 0)) + 1e-9));
}

/** Units of level L in the smallest arm; undefined with fewer than two arms. */
export function smallestArm(f: DesignFacts, L: LevelInfo): number | undefined {
  if (f.armShares.length < 2) return undefined;
  return Math.min(...unitsByArm(f, L));
}

/** Experimental units in the smallest arm (all of them when every unit receives every arm). */
export function unitsPerArm(f: DesignFacts): number | undefined {
  if (!f.eu) return undefined;
  if (f.withinUnit) return f.eu.total;
  return smallestArm(f, f.eu);
}

/**
 * Coefficient of variation of the number of units of level `to` per unit of level `from`
 * (from < to), built from each level's `countCv` (the CV of its count per parent). For a random
 * sum of N children, each holding X units, Var(S) = E[N]·Var(X) + Var(N)·E[X]² (law of total
 * variance), so CV²(S) = cv_N² + CV²(X)/E[N]; applied from `to` upwards. With one step it is the
 * child level's own CV. Common practice for combining size variation; not from a named source.
 */
export function sizeCv(f: DesignFacts, from: number, to: number): number {
  let cv2 = 0;
  for (let k = to; k > from; k--) {
    const child = f.levels[k];
    if (!child) return 0;
    const n = child.perParent;
    cv2 = child.level.countCv ** 2 + (n > 0 ? cv2 / n : 0);
  }
  return Math.sqrt(cv2);
}

const MIXED: ReadonlySet<Analysis['method']> = new Set(['mixed-model', 'glmm']);
const MODELS: ReadonlySet<Analysis['method']> = new Set(['mixed-model', 'glmm', 'glm', 'linear-regression', 'ancova', 'robust-regression']);

/**
 * Is the treatment compared within the units of level L? Yes for a level above the experimental
 * unit (sites, litters, donors, blocks whose units are split between the arms), and for the
 * experimental unit itself when every unit receives more than one arm (cross-over, nights of one
 * volunteer under both schedules). Then differences between L's units drop out of the comparison:
 * no design effect applies to L, and a higher correlation within L helps rather than hurts.
 */
export function comparedWithin(f: DesignFacts, L: LevelInfo): boolean {
  if (!f.eu) return false;
  return L.index < f.eu.index || (L === f.eu && f.withinUnit);
}

/**
 * The level whose units a paired comparison pairs: the experimental unit when it receives every
 * arm, else a grouping level of pairs (twins), else the unit measured over time (before and after).
 */
export function pairingLevel(f: DesignFacts): LevelInfo | undefined {
  if (f.eu && f.withinUnit) return f.eu;
  return f.levels.find((l) => l.level.kind === 'grouping' && l.level.groupingType === 'pair' && l.groupsObservations) ?? f.subject;
}

/**
 * Does the planned analysis account for the dependence that level L creates? Yes when
 * - the method is a mixed model (mixed-model, glmm) with a random intercept for L;
 * - the method is GEE, or the standard errors are cluster-robust (CR or CR2), clustered on the
 *   experimental unit, and L is that unit or nested in it (the sandwich estimator covers any
 *   correlation inside a cluster);
 * - the method analyses cluster means and the unit of analysis is L or a level above it (a
 *   cluster-means analysis with no unit stated is taken to average within experimental units);
 * - the unit of analysis is L or a level above L (observations below are averaged first);
 * - a model (linear, generalised or mixed) has a fixed effect for L and the treatment is compared
 *   within L's units (`comparedWithin`): the fixed effect absorbs the differences between them;
 * - a paired t-test pairs within L's units or within units of a level above L, or pairs within
 *   units of a level the treatment is compared within (the differences remove L).
 * Tests per occasion account for nothing: they leave out the correlation between occasions of a
 * unit (rule `per-occasion`) and any clustering.
 */
export function accountsFor(f: DesignFacts, L: LevelInfo): boolean {
  const a = f.design.analysis;
  if (MIXED.has(a.method) && a.randomIntercepts.includes(L.level.id)) return true;
  if (MODELS.has(a.method) && (a.fixedEffectLevels ?? []).includes(L.level.id) && comparedWithin(f, L)) return true;
  if (a.method === 'paired-t-test') {
    const P = pairingLevel(f);
    if (P && (L.index >= P.index || comparedWithin(f, P) || (f.eu !== undefined && P.index < f.eu.index))) return true;
  }
  const robust = a.method === 'gee' || a.standardErrors === 'cluster-robust' || a.standardErrors === 'cr2';
  if (robust && f.eu && L.index >= f.eu.index) return true;
  const unitIndex = f.unitOfAnalysis?.index ?? (a.method === 'cluster-means' ? f.eu?.index : undefined);
  return unitIndex !== undefined && unitIndex <= L.index;
}
