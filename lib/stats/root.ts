/**
 * Root finding in one variable: Brent's method, and a search for a bracket to start it from.
 *
 * Source: R. P. Brent, "Algorithms for Minimization without Derivatives" (Prentice-Hall, 1973),
 * chapter 4, procedure zero: inverse quadratic interpolation (secant when only two points are
 * distinct), safeguarded by bisection, so the root stays bracketed at every step and the number
 * of evaluations is at most about the square of what bisection needs (in practice far fewer).
 *
 * Valid range: any function continuous on [lo, hi] whose values at lo and hi differ in sign
 * (or one of which is 0). The result is within 4ε|x| + xTolerance of a root (ε = 2⁻⁵²), or of a
 * sign change if f is discontinuous.
 *
 * Bad input: `brentRoot` throws a RangeError when f(lo) and f(hi) do not bracket a root (same
 * sign, or either is NaN), or when lo or hi is not finite — a calling mistake, not a numerical
 * outcome. If maxIterations is reached it returns the best point found so far.
 */

export interface BrentOptions {
  /** Absolute tolerance in x added to 4ε|x|; default 0 (full double precision). */
  xTolerance?: number;
  /** Default 200; Brent's method rarely needs more than 50 even at full precision. */
  maxIterations?: number;
}

const EPS = 2 ** -52;

/** A zero of f in [lo, hi] by Brent's method (Brent 1973, ch. 4). See the module comment. */
export function brentRoot(
  f: (x: number) => number,
  lo: number,
  hi: number,
  { xTolerance = 0, maxIterations = 200 }: BrentOptions = {},
): number {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) {
    throw new RangeError(`brentRoot: the interval [${lo}, ${hi}] must be finite`);
  }
  let a = lo;
  let b = hi;
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (!(Math.sign(fa) * Math.sign(fb) < 0)) {
    throw new RangeError(`brentRoot: f(${lo}) = ${fa} and f(${hi}) = ${fb} do not bracket a root`);
  }
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    if (Math.sign(fb) === Math.sign(fc)) {
      // Keep the root between b and c.
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      // b is the best estimate so far.
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * EPS * Math.abs(b) + 0.5 * xTolerance;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) < tol || Math.abs(fa) <= Math.abs(fb)) {
      d = m;
      e = m;
    } else {
      let p: number;
      let q: number;
      const s = fb / fa;
      if (a === c) {
        // Secant step.
        p = 2 * m * s;
        q = 1 - s;
      } else {
        // Inverse quadratic interpolation through a, b, c.
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}

export interface Bracket {
  lo: number;
  hi: number;
}

/**
 * Widens [lo, hi] until f changes sign over it: each round moves the end whose |f| is smaller
 * outward by `factor` times the current width (default 1.6), within the optional limits
 * `min` and `max`. Returns the bracket, or null after `maxRounds` (default 60) or when both ends
 * are at their limits without a sign change. Never throws.
 */
export function expandBracket(
  f: (x: number) => number,
  lo: number,
  hi: number,
  { factor = 1.6, maxRounds = 60, min = -Infinity, max = Infinity } = {},
): Bracket | null {
  if (!(lo < hi)) return null;
  let flo = f(lo);
  let fhi = f(hi);
  for (let round = 0; round < maxRounds; round++) {
    if (Math.sign(flo) * Math.sign(fhi) <= 0 && !Number.isNaN(flo) && !Number.isNaN(fhi)) {
      return { lo, hi };
    }
    const width = hi - lo;
    const moveLo = (Math.abs(flo) < Math.abs(fhi) && lo > min) || hi >= max;
    if (moveLo) {
      if (lo <= min) return null;
      lo = Math.max(min, lo - factor * width);
      flo = f(lo);
    } else {
      hi = Math.min(max, hi + factor * width);
      fhi = f(hi);
    }
  }
  return null;
}
