/**
 * The shapes shared by the estimators (lib/models) and the simulation engine (lib/sim): one data
 * set in columns, the fixed part of the model, and what every analysis returns for the effect of
 * interest. Typed arrays keep a replicate's data in a few contiguous blocks, so that thousands of
 * replicates per second stay cheap.
 */

/** One grouping level, outermost first (classroom; or tray, then plant). */
export interface Grouping {
  name: string;
  /** Group of each observation, 0 … count − 1. Rows of one group are contiguous, and groups of an inner level nest in the outer ones. */
  id: Int32Array;
  count: number;
}

export interface Dataset {
  /** Number of observations (rows). */
  n: number;
  /** The outcome. */
  y: Float64Array;
  /** The treatment or exposure: 0/1 for two arms, or a continuous value. */
  treat: Float64Array;
  /** Time of each observation, when the design has occasions. */
  time?: Float64Array;
  /** Further fixed-effect columns by name (e.g. a baseline score, a period indicator). */
  covariates?: Record<string, Float64Array>;
  /** Grouping levels, outermost first; empty for independent observations. */
  groups: Grouping[];
}

/**
 * The fixed part of every analysis: intercept + treat [+ the named covariates] [+ time and
 * treat × time when `target` is the difference in slopes]. The effect of interest is the
 * coefficient of `treat`, or of `treat:time`.
 */
export interface FixedEffects {
  covariates: string[];
  includeTime: boolean;
  target: 'treat' | 'treat:time';
}

/** What an analysis reports about the effect of interest. */
export interface EffectEstimate {
  estimate: number;
  se: number;
  /** Degrees of freedom of the reference t distribution (Infinity for a z test). */
  df: number;
  /** False when the fit did not converge: the replicate is counted, not used. */
  converged: boolean;
}

export const ANALYSIS_NAMES = ['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed', 'huber', 'log-ols', 'glm', 'glm-nb', 'glmm', 'period-difference'] as const;
export type AnalysisName = (typeof ANALYSIS_NAMES)[number];
