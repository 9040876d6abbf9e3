import { logPoissonDensity } from './saddle-point';

/**
 * Poisson mixtures of tail probabilities, S = Σⱼ wⱼ Bⱼ (j = 0, 1, …), the form in which the
 * noncentral beta, F, chi-square and t distributions are computed:
 *
 *   wⱼ = e^(−λ) λ^(j+s) / Γ(j + s + 1)   (Poisson weights; the shift s = ½ gives the second series
 *                                          of the noncentral t),
 *   Bⱼ = a central tail probability at shape a₀ + j, with Bⱼ₊₁ = Bⱼ ± Gⱼ and Gⱼ₊₁ = ρⱼ Gⱼ.
 *
 * For the incomplete beta, Gⱼ = x^a y^b / (a B(a, b)) and ρⱼ = x(a + b)/(a + 1) at a = a₀ + j;
 * for the incomplete gamma, Gⱼ = x^a e^(−x)/Γ(a + 1) and ρⱼ = x/(a + 1) (Abramowitz & Stegun
 * 26.5.16 and 6.5.21).
 *
 * Method: the recurrence is always run in the direction in which B grows, so every step adds
 * positive numbers and no cancellation can build up (running it the other way subtracts, and
 * its rounding errors grow like the Poisson weights, which destroyed tiny tails in a first
 * version). For the lower tails (B shrinks with j) the sum starts at j = m + 12√λ + 50 (m the
 * mode of the weights; every term beyond is below e^(−72) of the largest term) and runs down to
 * 0; for the upper tails (B grows with j) it starts at max(0, m − 12√λ − 50) and runs up. The
 * start values Bⱼ and Gⱼ are computed directly in logs, and the running products
 * Tⱼ = wⱼBⱼ, Hⱼ = wⱼGⱼ and the sum are carried with a common scale factor, so nothing
 * underflows even when the start term is far below the smallest double. This is the
 * organisation of Ding (1992, Appl. Statist. 41:478, AS 275) and Benton & Krishnamoorthy (2003,
 * Comput. Stat. Data Anal. 43:249) — start near the Poisson mode rather than at j = 0 as AS 226
 * and AS 243 do, whose terms underflow for λ beyond about 700 — with each recurrence run only in
 * its stable direction.
 *
 * The sum stops when the rest of the Poisson mass in the direction of travel (at most
 * wⱼ r/(1 − r), r the next weight ratio, once the ratios are below 1), times the largest B still
 * to come (at most 1), is below 1e-17 of the running sum. The terms are all positive, so the
 * result keeps its relative accuracy (a few ε times the number of steps, which is O(√λ) for
 * the upper tails and at most O(λ) for the lower ones), also for tiny results.
 */

export interface MixtureTerms {
  /** Poisson mean λ > 0. */
  lambda: number;
  /** Shift s ≥ 0 of the weight index (0 for the usual Poisson weights). */
  shift: number;
  /** log Bⱼ, computed directly. */
  logTail: (j: number) => number;
  /** log Gⱼ = log |Bⱼ₊₁ − Bⱼ|. */
  logStep: (j: number) => number;
  /** ρⱼ = Gⱼ₊₁ / Gⱼ. */
  stepRatio: (j: number) => number;
  /** true if Bⱼ₊₁ = Bⱼ + Gⱼ (B grows with j), false if Bⱼ₊₁ = Bⱼ − Gⱼ. */
  increasing: boolean;
}

const RELATIVE_CUTOFF = 1e-17;
/**
 * At most this many terms (some 40 ms): λ up to about 7e9 from the Poisson mode outward. A sum
 * that needs more — λ beyond that, or a lower tail running from far above the mode down to 0 —
 * returns NaN rather than computing for minutes or without end; the callers' special cases
 * answer the far tails (0 or 1 to the last bit) without the sum.
 */
export const MAX_TERMS = 2_000_000;
/** Rescale the running values when they exceed this (and multiply the scale by it). */
const RESCALE_ABOVE = 1e200;
const LOG_RESCALE = Math.log(RESCALE_ABOVE);

export function poissonMixture(terms: MixtureTerms): number {
  const { lambda, shift, increasing } = terms;
  const mode = Math.max(0, Math.floor(lambda - shift));
  const reach = Math.ceil(12 * Math.sqrt(lambda) + 50);
  const start = increasing ? Math.max(0, mode - reach) : mode + reach;
  if (2 * reach > MAX_TERMS) return NaN;
  const last = increasing ? start + MAX_TERMS : Math.max(0, start - MAX_TERMS);

  // Values at the start, in logs; then scaled by e^(−scale).
  let logW = logPoissonDensity(start + shift, lambda);
  const logT = logW + terms.logTail(start);
  const logH = logW + terms.logStep(start);
  let scale = Math.max(logT, logH);
  if (!Number.isFinite(scale)) return scale === Infinity ? NaN : 0;
  let t = Math.exp(logT - scale);
  let h = Math.exp(logH - scale);
  let sum = t;

  if (increasing) {
    // Up: T_{j+1} = (λ/(j + s + 1)) (T_j + H_j), H_{j+1} = (λ/(j + s + 1)) ρ_j H_j.
    for (let j = start; ; j++) {
      if (j > last) return NaN;
      const ratio = lambda / (j + shift + 1);
      t = ratio * (t + h);
      h *= ratio * terms.stepRatio(j);
      logW += Math.log(ratio);
      sum += t;
      if (sum > RESCALE_ABOVE) {
        t /= RESCALE_ABOVE;
        h /= RESCALE_ABOVE;
        sum /= RESCALE_ABOVE;
        scale += LOG_RESCALE;
      }
      const r = lambda / (j + shift + 2);
      if (r < 1 && (Math.exp(logW - scale) * r) / (1 - r) <= RELATIVE_CUTOFF * sum) break;
      if (t === 0 && h === 0 && j > mode) break;
    }
  } else {
    // Down: H_{j−1} = ((j + s)/λ) H_j / ρ_{j−1}, T_{j−1} = ((j + s)/λ) T_j + H_{j−1}.
    for (let j = start; j > 0; j--) {
      if (j < last) return NaN;
      const ratio = (j + shift) / lambda;
      h = (h * ratio) / terms.stepRatio(j - 1);
      t = ratio * t + h;
      logW += Math.log(ratio);
      sum += t;
      if (sum > RESCALE_ABOVE) {
        t /= RESCALE_ABOVE;
        h /= RESCALE_ABOVE;
        sum /= RESCALE_ABOVE;
        scale += LOG_RESCALE;
      }
      const r = (j - 1 + shift) / lambda;
      if (r < 1 && (Math.exp(logW - scale) * r) / (1 - r) <= RELATIVE_CUTOFF * sum) break;
    }
  }
  return sum === 0 ? 0 : Math.exp(Math.log(sum) + scale);
}
