/**
 * What the rules read off a design, computed once per design object: the levels with their
 * counts (counting convention of `lib/design/derive.ts`), the experimental unit, which levels
 * make observations dependent, whether the planned analysis accounts for each of them, and the
 * design effect of ignoring them. Every function tolerates a half-filled design: missing parts
 * give `undefined`, never an exception.
 */
import type { Design, Level } from '@/lib/design/schema';
import { armShares, levelTotals, occasionsSplit, totalObservations, type LevelTotal } from '@/lib/design/derive';
import { designEffect, multilevelDesignEffect } from '@/lib/stats/design-effect';

export interface LevelInfo extends LevelTotal {
  /** Observations (bottom-level units) per unit of this level, M = total observations / units. */
  obsPerUnit: number;
  /**
   * More than one observation per unit, spread over more than one unit of the level below:
   * the level adds a variance component (a random intercept) that the analysis must face.
   */
  groupsObservations: boolean;
}

export interface DesignFacts {
  design: Design;
  levels: LevelInfo[];
  bottom?: LevelInfo;
  totalObs: number;
  /** The level at which the treatment or exposure varies. */
  assignment?: LevelInfo;
  /**
   * The unit that counts as n: the assignment level, or — when the treatment varies within a
   * unit (cross-over, or nights of one volunteer assigned to schedules) — that unit.
   */
  eu?: LevelInfo;
  /** The treatment varies within the experimental unit: every unit receives more than one arm. */
  withinUnit: boolean;
  /** The level measured over time: parent of the first repeated level, or the bottom level when several follow-ups are listed and no repeated level is. */
  subject?: LevelInfo;
  /** The occasions imply repeated measurement of the bottom level that the structure does not show. */
  implicitRepeats: boolean;
  /** Occasions sorted by time. */
  baselines: Design['occasions']['list'];
  followUps: Design['occasions']['list'];
  /** An analysis method or unit of analysis has been chosen. */
  planGiven: boolean;
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

function computeFacts(design: Design): DesignFacts {
  const totals = levelTotals(design);
  const totalObs = totalObservations(design);
  const levels: LevelInfo[] = totals.map((t, i) => {
    const obsPerUnit = t.total > 0 ? totalObs / t.total : 0;
    const next = totals[i + 1];
    return { ...t, obsPerUnit, groupsObservations: next !== undefined && obsPerUnit > 1 && next.total > t.total };
  });
  const byId = (id: string | undefined) => (id ? levels.find((l) => l.level.id === id) : undefined);
  const bottom = levels[levels.length - 1];
  const assignment = byId(design.assignment.levelId);

  let eu = assignment;
  let withinUnit = false;
  if (assignment && (assignment.level.kind === 'repeated' || assignment.level.kind === 'replicate')) {
    const parent = [...levels.slice(0, assignment.index)].reverse().find((l) => l.level.kind === 'independent' || l.level.kind === 'grouping');
    if (parent) {
      eu = parent;
      withinUnit = true;
    }
  } else if (assignment && design.assignment.crossover.enabled && assignment.groupsObservations) {
    withinUnit = true;
  }

  const { baselines, followUps } = occasionsSplit(design);
  const firstRepeated = levels.find((l) => l.level.kind === 'repeated');
  let subject = firstRepeated && firstRepeated.index > 0 ? levels[firstRepeated.index - 1] : undefined;
  const implicitRepeats = !firstRepeated && followUps.length >= 2 && bottom !== undefined;
  if (implicitRepeats) subject = bottom;

  const a = design.analysis;
  return {
    design,
    levels,
    bottom,
    totalObs,
    assignment,
    eu,
    withinUnit,
    subject,
    implicitRepeats,
    baselines,
    followUps,
    planGiven: a.method !== undefined || a.unitOfAnalysisLevelId !== undefined,
    unitOfAnalysis: byId(a.unitOfAnalysisLevelId),
  };
}

export function levelById(f: DesignFacts, id: string | undefined): LevelInfo | undefined {
  return id ? f.levels.find((l) => l.level.id === id) : undefined;
}

/**
 * Does the planned analysis account for the dependence that level L creates? Yes when
 * - the method is a mixed model (mixed-model, glmm) with a random intercept for L;
 * - the method is GEE, or the standard errors are cluster-robust (CR or CR2), clustered on the
 *   experimental unit, and L is that unit or nested in it (the sandwich estimator covers any
 *   correlation inside a cluster);
 * - the method analyses cluster means and the unit of analysis is L or a level above it (a
 *   cluster-means analysis with no unit stated is taken to average within experimental units);
 * - the unit of analysis is L or a level above L (observations below are averaged first).
 */
export function accountsFor(f: DesignFacts, L: LevelInfo): boolean {
  const a = f.design.analysis;
  if ((a.method === 'mixed-model' || a.method === 'glmm') && a.randomIntercepts.includes(L.level.id)) return true;
  const robust = a.method === 'gee' || a.standardErrors === 'cluster-robust' || a.standardErrors === 'cr2';
  if (robust && f.eu && L.index >= f.eu.index) return true;
  const unitIndex = f.unitOfAnalysis?.index ?? (a.method === 'cluster-means' ? f.eu?.index : undefined);
  return unitIndex !== undefined && unitIndex <= L.index;
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

export interface IccValue {
  value: number;
  source: Design['assumptions']['iccs'][number]['source'];
}

export function iccOf(f: DesignFacts, levelId: string): IccValue | undefined {
  const c = f.design.assumptions.iccs.find((x) => x.levelId === levelId);
  return c ? { value: c.value, source: c.source } : undefined;
}

/**
 * A plausible ICC range to show when none is given. Clusters of people or plots (classrooms,
 * practices, trays): 0.01–0.2; repeated measurements or sub-samples of one unit (volunteers over
 * nights, leaves of a plant): 0.2–0.8. Common practice for a sensitivity range, not a published
 * bound; published values for the outcome and setting are better (Donner & Klar 2000).
 */
export function plausibleIccRange(level: Level): [number, number] {
  return level.kind === 'grouping' ? [0.01, 0.2] : [0.2, 0.8];
}

export interface ClusteringEffect {
  /** Design effect with the planned unequal sizes (Eldridge et al. 2006 term for the top ignored level). */
  designEffect: number;
  /** The same with equal sizes (Kish 1965; several levels: 1 + Σ(mₖ − 1)ρₖ). */
  equalSizes: number;
  /** Levels whose ICC was missing and counted as 0 (so the design effect is a lower bound). */
  missing: LevelInfo[];
}

/**
 * The design effect an analysis suffers when it treats the units of level `unit` as independent
 * although they sit in the units of levels `top` … `unit − 1`, whose ICCs ρₖ are shares of the
 * total variance. The means of the analysed units have variance
 * V = Σ_{top ≤ k ≤ unit} ρₖ + Σ_{k > unit} ρₖ·Mₖ/M_unit (the residual share is 1 − Σρ), so on
 * their scale level k has ICC ρₖ/V and holds Mₖ/M_unit analysed units; the design effect is then
 * 1 + Σ (mₖ − 1)ρₖ' (`multilevelDesignEffect`), which for one level and the observation scale is
 * Kish's 1 + (m − 1)ρ. Unequal sizes add Eldridge et al.'s cv²·m·ρ for the top level (the
 * difference of `designEffect` with and without cv). Variance components of levels above `top`
 * are left out of both sides (blocks the treatment is balanced over).
 *
 * `iccs` maps level id → ICC; returns undefined when the ICCs cannot all be shares of one
 * variance (their sum exceeds 1) or the counts are inconsistent (fewer analysed units than units
 * above them).
 */
export function clusteringEffect(f: DesignFacts, top: number, unit: number, iccs: Map<string, number>): ClusteringEffect | undefined {
  const B = f.levels.length - 1;
  const U = f.levels[unit];
  const T = f.levels[top];
  if (!U || !T || top >= unit || U.obsPerUnit <= 0) return undefined;
  const shares = f.levels.map((l, k) => (k < B ? iccs.get(l.level.id) ?? 0 : 0));
  const upper = shares.reduce((s, x) => s + x, 0);
  if (upper > 1 + 1e-9) return undefined;
  shares[B] = Math.max(0, 1 - upper);
  let variance = 0;
  for (let k = top; k <= B; k++) variance += k <= unit ? shares[k]! : (shares[k]! * f.levels[k]!.obsPerUnit) / U.obsPerUnit;
  if (!(variance > 0)) return undefined;
  const ignored: { observationsPerUnit: number; icc: number }[] = [];
  const missing: LevelInfo[] = [];
  for (let k = top; k < unit; k++) {
    const L = f.levels[k]!;
    const m = L.obsPerUnit / U.obsPerUnit;
    if (m < 1) return undefined;
    if (!iccs.has(L.level.id)) missing.push(L);
    ignored.push({ observationsPerUnit: m, icc: Math.min(1, shares[k]! / variance) });
  }
  const equalSizes = multilevelDesignEffect(ignored);
  const head = ignored[0]!;
  const cv = sizeCv(f, top, unit);
  const extra = designEffect({ clusterSize: head.observationsPerUnit, icc: head.icc, cv }) - designEffect({ clusterSize: head.observationsPerUnit, icc: head.icc });
  return { designEffect: equalSizes + extra, equalSizes, missing };
}

/** ICCs given in the assumptions, as a map for `clusteringEffect`. */
export function givenIccs(f: DesignFacts): Map<string, number> {
  return new Map(f.design.assumptions.iccs.map((c) => [c.levelId, c.value]));
}

/** The sum of the ICCs given for levels above the bottom: more than 1 means they cannot be shares of one variance. */
export function iccsInconsistent(f: DesignFacts): boolean {
  const B = f.levels.length - 1;
  const sum = f.levels.slice(0, Math.max(0, B)).reduce((s, l) => s + (iccOf(f, l.level.id)?.value ?? 0), 0);
  return sum > 1 + 1e-9;
}

/** Units of the experimental unit in the smallest arm (all units when every unit receives every arm). */
export function unitsPerArm(f: DesignFacts): number | undefined {
  if (!f.eu) return undefined;
  if (f.withinUnit) return f.eu.total;
  const shares = armShares(f.design);
  if (shares.length < 2) return undefined;
  return Math.floor(f.eu.total * Math.min(...shares));
}

/** Common-practice limit below which small-sample corrections matter for clustered data (about 40–50 clusters). */
export const FEW_CLUSTERS = 40;
