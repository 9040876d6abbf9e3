/**
 * Which wizard steps are complete: enough of each part for the checks and the calculations to
 * use it. "started" means something is filled in but not enough yet.
 */
import { clusterRandomised as wholeClustersRandomised, designFacts } from './facts';
import type { Assumptions, Design, DesignPart, Level } from './schema';

export type StepState = 'complete' | 'started' | 'empty';

export function stepStates(d: Design): Record<DesignPart, StepState> {
  const o = d.outcome;
  const outcome: StepState = o.name && o.type ? 'complete' : o.name || o.type ? 'started' : 'empty';
  const structure: StepState = designFacts(d).levels.length > 0 ? 'complete' : 'empty';
  const a = d.assignment;
  const assignmentDone = a.kind && a.levelId && (a.kind === 'continuous' || a.arms.length >= 2);
  const assignment: StepState = assignmentDone ? 'complete' : a.kind || a.levelId || a.arms.length ? 'started' : 'empty';
  const occasions: StepState = d.occasions.list.length > 0 ? 'complete' : 'empty';
  const needIcc = iccLevels(d);
  const s = d.assumptions;
  const iccsDone = needIcc.every((l) => s.iccs.some((c) => c.levelId === l.id));
  const given = outcomeAssumptions(d).map((name) => s[name] !== undefined);
  const assumptions: StepState = given.every(Boolean) && iccsDone ? 'complete' : given.some(Boolean) || s.iccs.length ? 'started' : 'empty';
  const an = d.analysis;
  const analysis: StepState = an.method && an.unitOfAnalysisLevelId ? 'complete' : an.method || an.unitOfAnalysisLevelId ? 'started' : 'empty';
  return { outcome, structure, assignment, occasions, assumptions, analysis };
}

/** Levels whose ICC the design needs (lib/design/facts.ts): every level above the bottom that groups observations. */
export function iccLevels(d: Design): Level[] {
  return designFacts(d).iccLevels.map((l) => l.level);
}

/**
 * The outcome's own numbers the Assumptions step asks for: a yes-or-no outcome its control
 * proportion and effect; counts a baseline rate, rate ratio, follow-up time and overdispersion
 * (with the variation of rates between clusters when clusters are randomised); any other outcome
 * its SD and the smallest important difference.
 */
export function outcomeAssumptions(d: Design): (keyof Assumptions)[] {
  if (d.outcome.type === 'binary') return ['controlProportion', 'proportionEffect'];
  if (d.outcome.type === 'count') return ['baselineRate', 'rateRatio', 'followUpTime', 'dispersion', ...(clusterRandomised(d) ? (['betweenClusterCv'] as const) : [])];
  return ['outcomeSd', 'effect'];
}

/** Whether whole clusters are randomised (lib/design/facts.ts `clusterRandomised`, the reading the Plan uses). */
export function clusterRandomised(d: Design): boolean {
  return wholeClustersRandomised(designFacts(d));
}
