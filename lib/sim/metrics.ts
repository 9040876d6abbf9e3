/**
 * Performance measures of one analysis in one scenario, from its per-replicate estimates under
 * the planned effect (the alternative run) and at zero effect (the paired null run), each with
 * its Monte Carlo standard error.
 *
 * Source: Morris, White & Crowther (2019), "Using simulation studies to evaluate statistical
 * methods", Stat Med 38:2074–2102, Table 6. With n usable replicates, estimates θ̂ᵢ, model SEs
 * sᵢ, true effect θ, θ̄ = mean θ̂ᵢ:
 *
 *   bias        θ̄ − θ                                MCSE √(Σ(θ̂ᵢ − θ̄)² / (n(n − 1)))
 *   empiricalSe EmpSE = √(Σ(θ̂ᵢ − θ̄)² / (n − 1))        MCSE EmpSE / √(2(n − 1))
 *   modelSe     ModSE = √(Σ sᵢ² / n)                  MCSE √(Var(s²) / (4n·ModSE²))
 *   seRatio     ModSE / EmpSE                         MCSE (ModSE/EmpSE)·√(Var(s²)/(4n·ModSE⁴) + 1/(2(n − 1)))
 *               (Table 6's relative error in ModSE is 100·(seRatio − 1), with the same MCSE × 100)
 *   coverage    share of replicates with |θ̂ᵢ − θ| ≤ c(νᵢ)·sᵢ     MCSE √(p(1 − p)/n)
 *   power       share rejecting, |θ̂ᵢ/sᵢ| > c(νᵢ), alternative run   MCSE √(p(1 − p)/n)
 *   typeIError  the same share in the null run (θ = 0)                MCSE √(p(1 − p)/n)
 *
 * where Var(s²) = Σ(sᵢ² − ModSE²)²/(n − 1) and c(ν) = t_{1−α/2, ν}, the t quantile with the
 * estimate's own degrees of freedom (the normal quantile when ν = ∞); so the interval has level
 * 1 − α (95% for α = 0.05). Two more, not in Table 6:
 *
 *   ciWidth       mean of 2·c(νᵢ)·sᵢ, MCSE SD(width)/√n (the MCSE of a mean);
 *   nonConverged  the number of fits of both runs that did not converge (or gave a non-finite
 *                 estimate, a non-positive SE or no df), out of N = 2·replicates; MCSE
 *                 √(N·q(1 − q)) with q = count/N (a binomial count).
 *
 * `trueEffect` is the value on the analysis's own scale (`estimand.ts`); when it is NaN (no
 * single true value), coverage and bias are NaN with MCSE NaN.
 *
 * Only usable fits enter the other measures (converged, finite estimate, SE > 0, df > 0):
 * power, coverage, bias and the SEs over the alternative run, typeIError over the null run.
 * A measure with no usable replicate (or, for SEs, fewer than 2) is NaN with MCSE NaN.
 * Sums run in replicate order with Neumaier's compensated summation, so the result depends only
 * on the estimates, never on how the replicates were chunked.
 */
import { normalQuantile } from '@/lib/stats/normal';
import { tQuantileUpper } from '@/lib/stats/t';

export const METRIC_NAMES = ['power', 'typeIError', 'coverage', 'bias', 'empiricalSe', 'modelSe', 'seRatio', 'ciWidth', 'nonConverged'] as const;
export type MetricName = (typeof METRIC_NAMES)[number];

export interface Metric {
  value: number;
  mcse: number;
}

export type Metrics = Record<MetricName, Metric>;

/** One analysis's fits over the replicates of one run, in replicate order. */
export interface FitColumns {
  estimate: ArrayLike<number>;
  se: ArrayLike<number>;
  df: ArrayLike<number>;
  /** 1 when the fit converged, else 0. */
  converged: ArrayLike<number>;
}

/** Neumaier's compensated sum (Neumaier 1974, ZAMM 54:39), accumulated in call order. */
class CompensatedSum {
  private sum = 0;
  private compensation = 0;

  add(x: number): void {
    const t = this.sum + x;
    if (Math.abs(this.sum) >= Math.abs(x)) this.compensation += this.sum - t + x;
    else this.compensation += x - t + this.sum;
    this.sum = t;
  }

  get value(): number {
    return this.sum + this.compensation;
  }
}

/** c(ν) = t_{1−α/2, ν}, cached by ν (the df of most analyses repeat exactly). */
export class CriticalValues {
  private readonly cache = new Map<number, number>();

  constructor(readonly alpha: number) {
    if (!(alpha > 0 && alpha < 1)) throw new RangeError(`alpha must be between 0 and 1, got ${alpha}`);
  }

  at(df: number): number {
    let c = this.cache.get(df);
    if (c === undefined) {
      c = df === Infinity ? -normalQuantile(this.alpha / 2) : tQuantileUpper(this.alpha / 2, df);
      this.cache.set(df, c);
    }
    return c;
  }
}

function usable(fits: FitColumns, i: number): boolean {
  const se = fits.se[i]!;
  const df = fits.df[i]!;
  return fits.converged[i] === 1 && Number.isFinite(fits.estimate[i]!) && se > 0 && se < Infinity && df > 0;
}

const NOT_AVAILABLE: Metric = { value: NaN, mcse: NaN };

function proportion(hits: number, n: number): Metric {
  if (n === 0) return NOT_AVAILABLE;
  const p = hits / n;
  return { value: p, mcse: Math.sqrt((p * (1 - p)) / n) };
}

/** The share of usable fits whose interval excludes `value` (a rejection of θ = value). */
function rejections(fits: FitColumns, critical: CriticalValues): Metric {
  let n = 0;
  let hits = 0;
  for (let i = 0; i < fits.estimate.length; i++) {
    if (!usable(fits, i)) continue;
    n++;
    if (Math.abs(fits.estimate[i]! / fits.se[i]!) > critical.at(fits.df[i]!)) hits++;
  }
  return proportion(hits, n);
}

/**
 * All measures of one analysis in one scenario. `alternative` and `nullRun` hold the same
 * replicates' fits under the planned effect `trueEffect` and under zero effect.
 */
export function computeMetrics(alternative: FitColumns, nullRun: FitColumns, trueEffect: number, alpha: number): Metrics {
  const critical = new CriticalValues(alpha);
  const total = alternative.estimate.length + nullRun.estimate.length;
  let failures = 0;
  for (let i = 0; i < alternative.estimate.length; i++) if (!usable(alternative, i)) failures++;
  for (let i = 0; i < nullRun.estimate.length; i++) if (!usable(nullRun, i)) failures++;
  const q = total > 0 ? failures / total : 0;
  const nonConverged = { value: failures, mcse: Math.sqrt(total * q * (1 - q)) };

  // First pass over the alternative run: sums for the means, coverage.
  let n = 0;
  let covered = 0;
  const sumEstimate = new CompensatedSum();
  const sumVariance = new CompensatedSum();
  const sumWidth = new CompensatedSum();
  for (let i = 0; i < alternative.estimate.length; i++) {
    if (!usable(alternative, i)) continue;
    const est = alternative.estimate[i]!;
    const se = alternative.se[i]!;
    const c = critical.at(alternative.df[i]!);
    n++;
    if (Math.abs(est - trueEffect) <= c * se) covered++;
    sumEstimate.add(est);
    sumVariance.add(se * se);
    sumWidth.add(2 * c * se);
  }
  const power = rejections(alternative, critical);
  const typeIError = rejections(nullRun, critical);
  const known = Number.isFinite(trueEffect);
  const coverage = known ? proportion(covered, n) : NOT_AVAILABLE;
  if (n < 2) {
    return { power, typeIError, coverage, bias: NOT_AVAILABLE, empiricalSe: NOT_AVAILABLE, modelSe: NOT_AVAILABLE, seRatio: NOT_AVAILABLE, ciWidth: NOT_AVAILABLE, nonConverged };
  }
  const meanEstimate = sumEstimate.value / n;
  const meanVariance = sumVariance.value / n;
  const meanWidth = sumWidth.value / n;

  // Second pass: squared deviations about the means.
  const ssEstimate = new CompensatedSum();
  const ssVariance = new CompensatedSum();
  const ssWidth = new CompensatedSum();
  for (let i = 0; i < alternative.estimate.length; i++) {
    if (!usable(alternative, i)) continue;
    const se = alternative.se[i]!;
    ssEstimate.add((alternative.estimate[i]! - meanEstimate) ** 2);
    ssVariance.add((se * se - meanVariance) ** 2);
    ssWidth.add((2 * critical.at(alternative.df[i]!) * se - meanWidth) ** 2);
  }
  const empSe = Math.sqrt(ssEstimate.value / (n - 1));
  const modSe = Math.sqrt(meanVariance);
  const varOfVariance = ssVariance.value / (n - 1);
  const ratio = modSe / empSe;
  return {
    power,
    typeIError,
    coverage,
    bias: known ? { value: meanEstimate - trueEffect, mcse: Math.sqrt(ssEstimate.value / (n * (n - 1))) } : NOT_AVAILABLE,
    empiricalSe: { value: empSe, mcse: empSe / Math.sqrt(2 * (n - 1)) },
    modelSe: { value: modSe, mcse: Math.sqrt(varOfVariance / (4 * n * meanVariance)) },
    seRatio: { value: ratio, mcse: ratio * Math.sqrt(varOfVariance / (4 * n * meanVariance * meanVariance) + 1 / (2 * (n - 1))) },
    ciWidth: { value: meanWidth, mcse: Math.sqrt(ssWidth.value / (n - 1) / n) },
    nonConverged,
  };
}
