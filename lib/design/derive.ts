/**
 * Quantities read off a design's structure, shared by the rules, the diagram and the Plan tab.
 *
 * Counting convention (shown in the wizard): the top level's count is the total number in the
 * study, over all arms; every lower level's count is the number per unit of the level above,
 * unless `countIsTotal` says it is the total over the study (then the number per parent is the
 * total divided by the parent total). Observations are counted at the bottom level.
 */
import type { Design, Level } from './schema';

export interface LevelTotal {
  level: Level;
  index: number;
  /** Average number per unit of the level above (the total for the top level). */
  perParent: number;
  /** Number in the whole study. */
  total: number;
}

export function levelTotals(design: Design): LevelTotal[] {
  const out: LevelTotal[] = [];
  let parentTotal = 1;
  design.structure.levels.forEach((level, index) => {
    const total = index === 0 ? level.count : level.countIsTotal ? level.count : level.count * parentTotal;
    const perParent = index === 0 ? level.count : total / parentTotal;
    out.push({ level, index, perParent, total });
    parentTotal = total;
  });
  return out;
}

export function findLevel(design: Design, id: string | undefined): LevelTotal | undefined {
  if (!id) return undefined;
  return levelTotals(design).find((t) => t.level.id === id);
}

/** The level at which the treatment or exposure is assigned, if set. */
export function assignmentLevel(design: Design): LevelTotal | undefined {
  return findLevel(design, design.assignment.levelId);
}

/** The bottom level: where the outcome is measured. */
export function measurementLevel(design: Design): LevelTotal | undefined {
  const t = levelTotals(design);
  return t[t.length - 1];
}

export function totalObservations(design: Design): number {
  return measurementLevel(design)?.total ?? 0;
}

/** Observations per unit of the given level (e.g. pupils per classroom). */
export function observationsPerUnit(design: Design, levelId: string): number {
  const level = findLevel(design, levelId);
  const total = totalObservations(design);
  if (!level || level.total === 0) return 0;
  return total / level.total;
}

/** Shares of the arms, normalised to sum to 1 (equal shares when none are given). */
export function armShares(design: Design): number[] {
  const arms = design.assignment.arms;
  if (arms.length === 0) return [];
  const sum = arms.reduce((s, a) => s + a.allocation, 0);
  return arms.map((a) => a.allocation / sum);
}

/** Units of the assignment level in the smallest arm (the binding constraint for few-cluster problems). */
export function unitsInSmallestArm(design: Design): number | undefined {
  const level = assignmentLevel(design);
  const shares = armShares(design);
  if (!level || shares.length === 0) return undefined;
  return Math.floor(level.total * Math.min(...shares));
}

/** Levels strictly between the top and the bottom that group units: clusters, trays, litters. */
export function groupingLevels(design: Design): LevelTotal[] {
  return levelTotals(design).filter((t) => t.level.kind === 'grouping');
}

export function iccFor(design: Design, levelId: string): number | undefined {
  return design.assumptions.iccs.find((c) => c.levelId === levelId)?.value;
}

/** Baseline and follow-up occasions, in time order. */
export function occasionsSplit(design: Design): { baselines: Design['occasions']['list']; followUps: Design['occasions']['list'] } {
  const sorted = [...design.occasions.list].sort((a, b) => a.time - b.time);
  return { baselines: sorted.filter((o) => o.baseline), followUps: sorted.filter((o) => !o.baseline) };
}
