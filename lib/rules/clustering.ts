/**
 * What the rules compute from the design's facts (lib/design/facts.ts) about clustering: the
 * design effect of ignoring levels of clustering, the ICC range to show when none is given, and
 * the number of clusters below which small-sample corrections matter.
 */
import { comparedWithin, sizeCv, type DesignFacts, type LevelInfo } from '@/lib/design/facts';
import { designEffect, multilevelDesignEffect } from '@/lib/stats/design-effect';

/**
 * A plausible ICC range to show when none is given. Clusters of people or plots (classrooms,
 * practices, trays), and periods that hold several people or plots (the patients of a ward in one
 * period of a stepped or cluster cross-over): 0.01–0.2; repeated measurements or sub-samples of
 * one unit (volunteers over nights, leaves of a plant): 0.2–0.8. Common practice for a
 * sensitivity range, not a published bound; published values for the outcome and setting are
 * better (Donner & Klar 2000).
 */
export function plausibleIccRange(f: DesignFacts, L: LevelInfo): [number, number] {
  const below = f.levels[L.index + 1]?.level.kind;
  const clusterOfMembers = L.level.kind === 'grouping' || (L.level.kind === 'repeated' && (below === 'independent' || below === 'grouping'));
  return clusterOfMembers ? [0.01, 0.2] : [0.2, 0.8];
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

/** Common-practice limit below which small-sample corrections matter for clustered data (about 40–50 clusters). */
export const FEW_CLUSTERS = 40;

/**
 * Below this many units a level cannot support an estimate of its variance: a random intercept
 * for 5 or fewer sites, donors, litters or batches rests on at most 4 degrees of freedom and is
 * often estimated as exactly 0. The rule of thumb ("at least five or six levels for a random
 * effect") is common practice; Gomes (2022) examines it by simulation.
 */
export const FEW_LEVELS = 6;

/**
 * The levels the model should carry as fixed effects rather than random intercepts: levels that
 * would get a random intercept (`randomLevels`), hold fewer than `FEW_LEVELS` units, and within
 * which the treatment is compared (`comparedWithin`), so that a fixed effect for them leaves the
 * comparison intact. (A level of assignment with few units cannot take a fixed effect: it would
 * absorb the treatment; rule `few-units` says what to do there.)
 */
export function fixedEffectLevels(f: DesignFacts, candidates: readonly LevelInfo[]): LevelInfo[] {
  return candidates.filter((l) => l.total < FEW_LEVELS && comparedWithin(f, l));
}
