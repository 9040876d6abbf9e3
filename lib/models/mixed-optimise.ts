/**
 * Derivative-free minimisers for the profiled REML criterion of lib/models/mixed*.ts.
 *
 * - `brentMinimise`: Brent's method for a function of one variable on a closed interval —
 *   golden-section search combined with successive parabolic interpolation (Brent 1973,
 *   Algorithms for Minimization without Derivatives, ch. 5, procedure `localmin`). Finds a local
 *   minimum to within about tol·|x| + tolAbs; the end points themselves are never evaluated,
 *   so callers compare a boundary value separately.
 * - `nelderMead`: the Nelder–Mead simplex method (Nelder & Mead 1965, Comput J 7:308) with the
 *   standard coefficients (reflection 1, expansion 2, contraction ½, shrink ½) and the ordering
 *   and tie-breaking rules of Lagarias, Reeds, Wright & Wright (1998, SIAM J Optim 9:112),
 *   restarted once from its result (the usual guard against a simplex that collapsed early).
 *
 * Both work on plain numbers and allocate only at the start of a call.
 */

export interface BrentResult {
  x: number;
  f: number;
  evaluations: number;
}

const GOLDEN = 0.3819660112501051; // (3 − √5)/2

/**
 * Minimises f on [a, b]. `tol` is the relative and `tolAbs` the absolute tolerance in x
 * (Brent's advice: tol no smaller than about √ε ≈ 1.5e-8, since f is flat near a minimum).
 * Returns the best point found and the number of evaluations; stops after `maxEvaluations`.
 */
export function brentMinimise(
  f: (x: number) => number,
  a: number,
  b: number,
  tol = 1e-8,
  tolAbs = 1e-10,
  maxEvaluations = 200,
): BrentResult {
  let x = a + GOLDEN * (b - a);
  let w = x;
  let v = x;
  let fx = f(x);
  let fw = fx;
  let fv = fx;
  let evaluations = 1;
  let d = 0;
  let e = 0;
  while (evaluations < maxEvaluations) {
    const m = 0.5 * (a + b);
    const tol1 = tol * Math.abs(x) + tolAbs;
    const tol2 = 2 * tol1;
    if (Math.abs(x - m) <= tol2 - 0.5 * (b - a)) break;
    let golden = true;
    if (Math.abs(e) > tol1) {
      // Try a parabola through x, w, v.
      let r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      r = e;
      e = d;
      if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = x < m ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      e = (x < m ? b : a) - x;
      d = GOLDEN * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1);
    const fu = f(u);
    evaluations++;
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, f: fx, evaluations };
}

export interface NelderMeadOptions {
  /** Initial step along each coordinate (default 0.25 each). */
  step?: Float64Array;
  /** Stop when the simplex's function values agree to ftolRel·(|f| + ftolAbs)… */
  ftolRel?: number;
  ftolAbs?: number;
  /** …and its vertices to xtol (max-norm). */
  xtol?: number;
  maxEvaluations?: number;
}

export interface NelderMeadResult {
  x: Float64Array;
  f: number;
  evaluations: number;
  /** False when the evaluation budget ran out before the tolerances were met. */
  converged: boolean;
}

function nelderMeadOnce(
  f: (x: Float64Array) => number,
  start: Float64Array,
  step: Float64Array,
  ftolRel: number,
  ftolAbs: number,
  xtol: number,
  maxEvaluations: number,
): NelderMeadResult {
  const k = start.length;
  const m = k + 1;
  const simplex: Float64Array[] = [];
  const values = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const vertex = Float64Array.from(start);
    if (i > 0) vertex[i - 1]! += step[i - 1]!;
    simplex.push(vertex);
    values[i] = f(vertex);
  }
  let evaluations = m;
  const order = Array.from({ length: m }, (_, i) => i);
  const centroid = new Float64Array(k);
  const xr = new Float64Array(k);
  const xe = new Float64Array(k);
  const xc = new Float64Array(k);
  const valueOf = (i: number) => (Number.isNaN(values[i]!) ? Infinity : values[i]!);
  let converged = false;
  while (evaluations < maxEvaluations) {
    order.sort((i, j) => valueOf(i) - valueOf(j) || i - j);
    const best = order[0]!;
    const worst = order[k]!;
    const secondWorst = order[k - 1] ?? best;
    const fBest = valueOf(best);
    const fWorst = valueOf(worst);
    let spread = 0;
    for (const i of order) {
      for (let j = 0; j < k; j++) spread = Math.max(spread, Math.abs(simplex[i]![j]! - simplex[best]![j]!));
    }
    if (fWorst - fBest <= ftolRel * (Math.abs(fBest) + ftolAbs) && spread <= xtol) {
      converged = true;
      break;
    }
    centroid.fill(0);
    for (let r = 0; r < k; r++) {
      const vertex = simplex[order[r]!]!;
      for (let j = 0; j < k; j++) centroid[j]! += vertex[j]! / k;
    }
    const xw = simplex[worst]!;
    for (let j = 0; j < k; j++) xr[j] = 2 * centroid[j]! - xw[j]!;
    const fr = f(xr);
    evaluations++;
    if (fr < fBest) {
      for (let j = 0; j < k; j++) xe[j] = 3 * centroid[j]! - 2 * xw[j]!;
      const fe = f(xe);
      evaluations++;
      if (fe < fr) {
        xw.set(xe);
        values[worst] = fe;
      } else {
        xw.set(xr);
        values[worst] = fr;
      }
      continue;
    }
    if (fr < valueOf(secondWorst)) {
      xw.set(xr);
      values[worst] = fr;
      continue;
    }
    // Contraction: outside when the reflected point beats the worst, inside otherwise.
    const outside = fr < fWorst;
    for (let j = 0; j < k; j++) {
      xc[j] = outside ? 1.5 * centroid[j]! - 0.5 * xw[j]! : 0.5 * centroid[j]! + 0.5 * xw[j]!;
    }
    const fc = f(xc);
    evaluations++;
    if (outside ? fc <= fr : fc < fWorst) {
      xw.set(xc);
      values[worst] = fc;
      continue;
    }
    // Shrink towards the best vertex.
    const xb = simplex[best]!;
    for (let r = 1; r < m; r++) {
      const i = order[r]!;
      const vertex = simplex[i]!;
      for (let j = 0; j < k; j++) vertex[j] = 0.5 * (xb[j]! + vertex[j]!);
      values[i] = f(vertex);
      evaluations++;
    }
  }
  order.sort((i, j) => valueOf(i) - valueOf(j) || i - j);
  const best = order[0]!;
  return { x: Float64Array.from(simplex[best]!), f: values[best]!, evaluations, converged };
}

/**
 * Minimises f over ℝᵏ (k ≥ 1) from `start`, then restarts once from the result with a step a
 * tenth of the first. NaN values of f count as +∞ (the simplex moves away from them).
 */
export function nelderMead(f: (x: Float64Array) => number, start: Float64Array, options: NelderMeadOptions = {}): NelderMeadResult {
  const k = start.length;
  const step = options.step ?? new Float64Array(k).fill(0.25);
  const ftolRel = options.ftolRel ?? 1e-13;
  const ftolAbs = options.ftolAbs ?? 1;
  const xtol = options.xtol ?? 1e-7;
  const maxEvaluations = options.maxEvaluations ?? 4000;
  const first = nelderMeadOnce(f, start, step, ftolRel, ftolAbs, xtol, maxEvaluations);
  const smallStep = step.map((s) => s / 10);
  const second = nelderMeadOnce(f, first.x, smallStep, ftolRel, ftolAbs, xtol, Math.max(maxEvaluations - first.evaluations, 2 * (k + 1)));
  const better = second.f <= first.f ? second : first;
  return { x: better.x, f: better.f, evaluations: first.evaluations + second.evaluations, converged: first.converged && second.converged };
}
