/**
 * Design effect of clustering: how much the variance of an estimated mean grows when
 * observations share clusters, and what that does to sample size and to a naive test.
 */
import { normalQuantile, normalSf } from './normal';

function requireFinite(name: string, value: number): void {
  if (!Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number, got ${value}`);
  }
}

function requireIcc(name: string, icc: number): void {
  requireFinite(name, icc);
  if (icc < 0 || icc > 1) {
    throw new RangeError(`${name} must be between 0 and 1, got ${icc}`);
  }
}

export interface DesignEffectInput {
  /** Mean number of observations per cluster, m ≥ 1 (need not be a whole number). */
  clusterSize: number;
  /** Intracluster correlation ρ, 0 ≤ ρ ≤ 1. */
  icc: number;
  /** Coefficient of variation of the cluster sizes (SD / mean), ≥ 0; 0 for equal sizes. */
  cv?: number;
}

/**
 * Design effect for a two-level design: DE = 1 + ((cv² + 1)·m − 1)·ρ.
 *
 * Source: Eldridge, Ashby & Kerry (2006), "Sample size for cluster randomized trials: effect of
 * coefficient of variation of cluster size and analysis method", Int J Epidemiol 35:1292. With
 * equal cluster sizes (cv = 0) it is Kish's (1965, Survey Sampling) 1 + (m − 1)·ρ.
 *
 * Valid range: m ≥ 1, 0 ≤ ρ ≤ 1, cv ≥ 0, all finite. Accuracy: exact up to rounding (a few
 * units in the last place). The cv form is an approximation for unequal cluster sizes; it is
 * conservative when the analysis weights clusters well (Eldridge et al.).
 *
 * Bad input: throws RangeError naming the argument and the value it got.
 */
export function designEffect({ clusterSize, icc, cv = 0 }: DesignEffectInput): number {
  requireFinite('clusterSize', clusterSize);
  if (clusterSize < 1) {
    throw new RangeError(`clusterSize must be at least 1, got ${clusterSize}`);
  }
  requireIcc('icc', icc);
  requireFinite('cv', cv);
  if (cv < 0) throw new RangeError(`cv must not be negative, got ${cv}`);
  return 1 + ((cv * cv + 1) * clusterSize - 1) * icc;
}

/**
 * Effective sample size N / DE: the number of independent observations that would give the
 * same variance of the mean as N clustered ones.
 *
 * Source: Kish (1965), Survey Sampling. Valid range: N ≥ 0 and DE > 0, both finite. Accuracy:
 * one rounding. Not rounded to a whole number: round up where a count of units is needed.
 *
 * Bad input: throws RangeError naming the argument and the value it got.
 */
export function effectiveSampleSize(totalObservations: number, designEffect: number): number {
  requireFinite('totalObservations', totalObservations);
  if (totalObservations < 0) {
    throw new RangeError(`totalObservations must not be negative, got ${totalObservations}`);
  }
  requireFinite('designEffect', designEffect);
  if (designEffect <= 0) throw new RangeError(`designEffect must be positive, got ${designEffect}`);
  return totalObservations / designEffect;
}

export interface NaiveTypeIErrorInput {
  /** The design effect DE > 0 of the clustering the test ignores. */
  designEffect: number;
  /** The nominal two-sided level α, 0 < α < 1. */
  alpha?: number;
}

/**
 * Real false-positive rate of a two-sided z test at level α that ignores clustering:
 * 2·(1 − Φ(z₁₋α/₂ / √DE)).
 *
 * Reasoning: the naive standard error understates the true one by √DE, so under the null the
 * naive statistic is N(0, DE) and exceeds the critical value z₁₋α/₂ with this probability.
 * It is a large-sample (normal) figure; with few clusters the real rate is higher still.
 * (Design effect: Kish 1965; the consequence for tests: Donner & Klar 2000.)
 *
 * Valid range: DE > 0 (DE < 1 gives a rate below α), 0 < α < 1. Accuracy: relative error
 * below 1e-13, from `normalQuantile` and `normalSf`; z₁₋α/₂ is taken as −Φ⁻¹(α/2), which is
 * exact where 1 − α/2 would round.
 *
 * Bad input: throws RangeError naming the argument and the value it got.
 */
export function naiveTypeIError({ designEffect, alpha = 0.05 }: NaiveTypeIErrorInput): number {
  requireFinite('designEffect', designEffect);
  if (designEffect <= 0) throw new RangeError(`designEffect must be positive, got ${designEffect}`);
  requireFinite('alpha', alpha);
  if (alpha <= 0 || alpha >= 1) throw new RangeError(`alpha must be between 0 and 1, got ${alpha}`);
  const critical = -normalQuantile(alpha / 2);
  return 2 * normalSf(critical / Math.sqrt(designEffect));
}

export interface GroupingLevel {
  /**
   * Observations (lowest-level measurements) per unit of this level, m ≥ 1. For leaves on
   * plants in trays: leaves per plant for the plant level, leaves per tray for the tray level.
   */
  observationsPerUnit: number;
  /** Share of the total variance at this level, ρ = σ²_level / σ²_total, 0 ≤ ρ ≤ 1. */
  icc: number;
}

/**
 * Design effect for several nested grouping levels: DE = 1 + Σₖ (mₖ − 1)·ρₖ.
 *
 * Reasoning: under a nested random-intercept model y = μ + Σₖ uₖ + e with balanced levels,
 * the mean of N observations averages N/mₖ independent effects of level k, so
 * Var(ȳ) = Σₖ σₖ²·mₖ/N + σₑ²/N = (σ²/N)·(1 + Σₖ (mₖ − 1)·ρₖ), with σ² the total variance and
 * ρₖ = σₖ²/σ². This is common practice for balanced nested designs (the usual extension of
 * Kish's design effect); with one level it is Kish's 1 + (m − 1)·ρ.
 *
 * Valid range: each mₖ ≥ 1 and 0 ≤ ρₖ ≤ 1, with Σ ρₖ ≤ 1 (they are shares of one variance). The
 * order of the levels does not matter; no levels gives 1. Accuracy: exact up to rounding.
 * Unbalanced designs need a cluster-size correction such as Eldridge et al.'s cv term.
 *
 * Bad input: throws RangeError naming the level, the argument and the value it got.
 */
export function multilevelDesignEffect(levels: readonly GroupingLevel[]): number {
  let total = 1;
  let iccSum = 0;
  levels.forEach(({ observationsPerUnit: m, icc }, k) => {
    requireFinite(`levels[${k}].observationsPerUnit`, m);
    if (m < 1) {
      throw new RangeError(`levels[${k}].observationsPerUnit must be at least 1, got ${m}`);
    }
    requireIcc(`levels[${k}].icc`, icc);
    iccSum += icc;
    total += (m - 1) * icc;
  });
  if (iccSum > 1 + 1e-12) {
    throw new RangeError(`the levels' ICCs are shares of one variance and must sum to at most 1, got ${Number(iccSum.toPrecision(12))}`);
  }
  return total;
}
