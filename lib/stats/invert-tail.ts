/**
 * Quantiles of a continuous distribution by inverting its tail probabilities: the x with
 * P(X ≤ x) = p (lower) or P(X > x) = q (upper).
 *
 * Method: the smaller tail is always the one solved for (P(X ≤ x) = p for p ≤ ½, otherwise
 * P(X > x) = 1 − p, which is exact in floating point), in the form h(x) = log tail(x) − log r = 0,
 * whose derivative is ∓density(x)/tail(x). Newton steps on h are safeguarded by a bracket that
 * always contains the root (bisection — geometric on a positive bracket spanning more than a
 * factor 4 — whenever a step leaves the bracket or fails to halve it), as in rtsafe of Press et
 * al., "Numerical Recipes", 3rd ed. (2007), §9.4. Working with log tail keeps Newton's method
 * well behaved in the far tails and keeps the relative precision of tiny p or q (e.g. 1e-8).
 * The bracket is found by doubling outward from a starting guess.
 *
 * Accuracy: as good as the tail functions allow; the loop stops when the step is below 2ε|x|,
 * so tail(x) matches r to about the tail's own error plus density·|x|·ε/r.
 *
 * Bad input: r outside [0, 1] or NaN → NaN; the ends 0 and 1 map to the ends of the support.
 */

export interface ContinuousDistribution {
  lower: (x: number) => number;
  upper: (x: number) => number;
  density: (x: number) => number;
  /** Lower end of the support (−∞ or 0 here); the upper end is +∞. */
  supportMin: number;
  /** A starting guess for the x whose lower (upper if `upper`) tail is r ≤ ½ (need not be accurate). */
  guess: (r: number, upper: boolean) => number;
}

const EPS = 2 ** -52;
const MAX_ITERATIONS = 300;

/**
 * x with lower(x) = prob (upperTail = false) or upper(x) = prob (upperTail = true).
 */
export function invertTail(dist: ContinuousDistribution, prob: number, upperTail: boolean): number {
  const x = solve(dist, prob, upperTail);
  return x === 0 ? 0 : x; // no −0
}

function solve(dist: ContinuousDistribution, prob: number, upperTail: boolean): number {
  if (Number.isNaN(prob) || prob < 0 || prob > 1) return NaN;
  if (prob === 0) return upperTail ? Infinity : dist.supportMin;
  if (prob === 1) return upperTail ? dist.supportMin : Infinity;
  // Solve the smaller tail: useUpper says which tail function equals r.
  let useUpper = upperTail;
  let r = prob;
  if (prob > 0.5) {
    useUpper = !upperTail;
    r = 1 - prob;
  }
  const tail = useUpper ? dist.upper : dist.lower;
  const logR = Math.log(r);
  /** h(x) = log tail(x) − log r, increasing in x for the lower tail, decreasing for the upper. */
  const h = (x: number): number => Math.log(tail(x)) - logR;
  const increasing = !useUpper;

  // Bracket: lo with h on the "below the root" side, hi beyond it.
  let x = dist.guess(r, useUpper);
  if (!Number.isFinite(x) || x <= dist.supportMin) {
    x = dist.supportMin === 0 ? 1 : 0;
  }
  const below = (value: number): boolean => (increasing ? value < 0 : value > 0);
  let hx = h(x);
  if (hx === 0) return x;
  let lo: number;
  let hi: number;
  let hLo: number;
  let hHi: number;
  if (below(hx)) {
    lo = x;
    hLo = hx;
    let step = Math.max(1, Math.abs(x));
    for (;;) {
      hi = dist.supportMin === 0 ? x * 2 + 1 : x + step;
      hHi = h(hi);
      if (!below(hHi) || !Number.isFinite(hi)) break;
      lo = hi;
      hLo = hHi;
      x = hi;
      step *= 2;
    }
  } else {
    hi = x;
    hHi = hx;
    let step = Math.max(1, Math.abs(x));
    for (;;) {
      lo = dist.supportMin === 0 ? x / 4 : x - step;
      hLo = h(lo);
      if (below(hLo) || lo === dist.supportMin || !Number.isFinite(lo)) break;
      hi = lo;
      hHi = hLo;
      x = lo;
      step *= 2;
    }
  }
  if (hLo === 0) return lo;
  if (hHi === 0) return hi;

  // Safeguarded Newton on h.
  x = Number.isFinite(hLo) && Math.abs(hLo) < Math.abs(hHi) ? lo : hi;
  let previousWidth = hi - lo;
  for (let iteration = 0; iteration < MAX_ITERATIONS; iteration++) {
    const t = tail(x);
    const value = Math.log(t) - logR;
    if (value === 0) return x;
    if (below(value)) lo = x;
    else hi = x;
    const slope = (increasing ? 1 : -1) * (dist.density(x) / t);
    let next = x - value / slope;
    const width = hi - lo;
    if (!(next > lo && next < hi) || !Number.isFinite(next) || Math.abs(next - x) > 0.5 * previousWidth) {
      next = lo > 0 && hi > 4 * lo ? Math.sqrt(lo) * Math.sqrt(hi) : lo + 0.5 * width;
    }
    previousWidth = width;
    if (Math.abs(next - x) <= 2 * EPS * Math.abs(x) || next === lo || next === hi) {
      return polish(tail, r, next);
    }
    x = next;
  }
  return polish(tail, r, x);
}

/**
 * The double among x and its two neighbours on either side whose tail is closest to r: Newton
 * stops within a few units in the last place, and where the tail is steep (a chi-square with
 * 1e6 degrees of freedom) one unit in x is worth about 5e-13 of the tail.
 */
function polish(tail: (x: number) => number, r: number, x: number): number {
  if (!Number.isFinite(x)) return x;
  let best = x;
  let bestError = Math.abs(tail(x) - r);
  const ulp = Math.max(Math.abs(x) * EPS, Number.MIN_VALUE);
  for (const k of [-2, -1, 1, 2]) {
    const candidate = x + k * ulp;
    const error = Math.abs(tail(candidate) - r);
    if (error < bestError) {
      best = candidate;
      bestError = error;
    }
  }
  return best;
}
