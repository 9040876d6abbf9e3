/**
 * Which analyses suit a stress test: an analysis is offered only where it is defined for the data
 * the specification simulates, so that no run spends its fits on an analysis that cannot work
 * (a log-scale analysis of an outcome that can be 0 or negative fails every fit).
 *
 * - `ols`, `ols-hc3`: every data model.
 * - `cluster-robust`, `mixed`: data with clusters, occasions, blocks or a cross-over (something to
 *   cluster on or give a random intercept).
 * - `cluster-means`: data with clusters or occasions, outside a cross-over (the mean must hold one arm).
 * - `huber`: gaussian outcomes (an M-estimator of a location; it has nothing to downweight in 0/1
 *   data).
 * - `glm`: binary and count outcomes (logistic or Poisson regression).
 * - `glmm`: binary and count outcomes with clusters or occasions (a random intercept on the link scale).
 * - `glm-nb`: count outcomes (negative-binomial regression, for overdispersed counts).
 * - `period-difference`: a two-period (AB/BA) cross-over of a continuous outcome (Senn 2002).
 * - `log-ols`: outcomes that the data model makes positive. None of the models in
 *   lib/sim/generate.ts does: gaussian outcomes have normal random effects and errors (every
 *   scenario's errors can be negative), counts can be 0, binary outcomes are 0 or 1. A log-normal
 *   data model would be the place to offer it.
 *
 * What is offered is decided here, from the specification alone (which the design's facts
 * produced, lib/sim/from-design.ts), so the Stress test tab and the API agree.
 */
import { ANALYSIS_NAMES, type AnalysisName } from '@/lib/models/types';
import type { SimulationSpecInput, Violation } from './spec';

type Family = NonNullable<SimulationSpecInput['truth']['family']>;

/** Whether every outcome the family's data model generates is above 0 (so its log is defined). */
const POSITIVE: Record<Family, boolean> = { gaussian: false, binary: false, count: false };

/** Does `analysis` apply to the data that `spec` simulates? */
export function analysisApplies(analysis: AnalysisName, spec: SimulationSpecInput): boolean {
  const family: Family = spec.truth.family ?? 'gaussian';
  const grouped = spec.design.clustersPerArm !== undefined || spec.design.occasions !== undefined;
  /** Something a random intercept can sit on: clusters, occasions, blocks or a cross-over's units. */
  const intercept = grouped || spec.design.blocks !== undefined || spec.design.crossover !== undefined;
  switch (analysis) {
    case 'ols':
    case 'ols-hc3':
      return true;
    case 'cluster-robust':
    case 'mixed':
      return intercept;
    case 'cluster-means':
      // A mean per cluster or per unit over its occasions carries the contrast only where the
      // treatment is constant within it: not in a cross-over, nor in blocks of units.
      return grouped && spec.design.crossover === undefined;
    case 'huber':
      return family === 'gaussian';
    case 'glm':
      return family !== 'gaussian';
    case 'glmm':
      return family !== 'gaussian' && intercept;
    case 'glm-nb':
      return family === 'count';
    case 'period-difference':
      return spec.design.crossover?.periods === 2 && family === 'gaussian';
    case 'log-ols':
      return POSITIVE[family];
  }
}

/** The analyses that apply to `spec`'s data, in the engine's order. */
export function offeredAnalyses(spec: SimulationSpecInput): AnalysisName[] {
  return ANALYSIS_NAMES.filter((a) => analysisApplies(a, spec));
}

/**
 * Does the scenario `violation` apply to the data `spec` simulates (the engine's rules,
 * lib/sim/spec.ts)? Binary and count outcomes take only `none` and, in a cross-over,
 * `carry-over` (the other scenarios change normal errors); `carry-over` needs a cross-over;
 * `serial` needs occasions outside a cross-over.
 */
export function scenarioApplies(violation: Violation, spec: SimulationSpecInput): boolean {
  const gaussian = (spec.truth.family ?? 'gaussian') === 'gaussian';
  const crossover = spec.design.crossover !== undefined;
  if (violation === 'none') return true;
  if (violation === 'carry-over') return crossover;
  if (!gaussian) return false;
  if (violation === 'serial') return spec.design.occasions !== undefined && !crossover;
  return true;
}
