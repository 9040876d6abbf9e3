/**
 * The standard normal distribution: density, distribution function, upper tail and quantile.
 * Pure functions of one number; they never throw.
 *
 * Φ and 1 − Φ use W. J. Cody's rational Chebyshev approximations ("Rational Chebyshev
 * approximations for the error function", Math. Comp. 23 (1969) 631–637) in the form Cody
 * scaled for the normal distribution, routine ANORM of his SPECFUN package (ACM TOMS Algorithm
 * 715, 1993). Working in x rather than x/√2 avoids the rounding of x/√2, which would cost
 * about x² units in the last place in the far tail.
 *
 * Φ⁻¹ is Wichura's AS 241, PPND16 (Appl. Statist. 37 (1988) 477–484).
 *
 * Accuracy is tested in `normal.test.ts` against 80-digit values and against SciPy (fixtures
 * and the script that writes them in `fixtures/`). ε below is 2⁻⁵² ≈ 2.2e-16.
 */

/** 1/√(2π). */
const INV_SQRT_2PI = 0.3989422804014327;

/** Beyond this |x|, exp(−x²/2) and 1 − Φ(|x|) are below the smallest subnormal double. */
const UNDERFLOW_X = 39;

/**
 * exp(−y²/2) for y ≥ 0 without the rounding error of y² (Cody's device): y is split into
 * s = ⌊16y⌋/16, whose square is exact, and the remainder, (y − s)(y + s) = y² − s².
 */
function expHalfSquare(y: number): number {
  if (y >= UNDERFLOW_X) return 0;
  const s = Math.trunc(y * 16) / 16;
  const del = (y - s) * (y + s);
  return Math.exp(-s * s * 0.5) * Math.exp(-del * 0.5);
}

// Cody (ANORM), |x| ≤ 0.66291: Φ(x) = 1/2 + x·A(x²)/B(x²).
const A = [
  2.2352520354606839287, 161.02823106855587881, 1067.6894854603709582, 18154.981253343561249,
  0.065682337918207449113,
] as const;
const B = [
  47.20258190468824187, 976.09855173777669322, 10260.932208618978205, 45507.789335026729956,
] as const;

// Cody (ANORM), 0.66291 < |x| ≤ √32: 1 − Φ(|x|) = exp(−x²/2)·C(|x|)/D(|x|).
const C = [
  0.39894151208813466764, 8.8831497943883759412, 93.506656132177855979, 597.27027639480026226,
  2494.5375852903726711, 6848.1904505362823326, 11602.651437647350124, 9842.7148383839780218,
  1.0765576773720192317e-8,
] as const;
const D = [
  22.266688044328115691, 235.38790178262499861, 1519.3775994075548050, 6485.5582982667607550,
  18615.571640885098091, 34900.952721145977266, 38912.003286093271411, 19685.429676859990727,
] as const;

// Cody (ANORM), |x| > √32: 1 − Φ(|x|) = exp(−x²/2)/|x| · (1/√(2π) − x⁻²·P(x⁻²)/Q(x⁻²)).
const P = [
  0.21589853405795699, 0.1274011611602473639, 0.022235277870649807, 0.001421619193227893466,
  2.9112874951168792e-5, 0.02307344176494017303,
] as const;
const Q = [
  1.28426009614491121, 0.468238212480865118, 0.0659881378689285515, 0.00378239633202758244,
  7.29751555083966205e-5,
] as const;

/** Cody's break points: Φ(0.66291) ≈ 0.75, and √32 (as Cody rounds it). */
const CENTRAL_LIMIT = 0.66291;
const ROOT_32 = 5.656854248;

/** x·A(x²)/B(x²) = Φ(x) − 1/2 for |x| ≤ 0.66291. */
function centralPart(x: number): number {
  const xsq = Math.abs(x) > 1.11e-16 ? x * x : 0;
  let num = A[4] * xsq;
  let den = xsq;
  for (let i = 0; i < 3; i++) {
    num = (num + A[i]!) * xsq;
    den = (den + B[i]!) * xsq;
  }
  return (x * (num + A[3])) / (den + B[3]);
}

/** 1 − Φ(y) for y > 0.66291, computed directly (never as 1 − Φ). */
function upperTail(y: number): number {
  if (y >= UNDERFLOW_X) return 0;
  let ratio: number;
  if (y <= ROOT_32) {
    let num = C[8] * y;
    let den = y;
    for (let i = 0; i < 7; i++) {
      num = (num + C[i]!) * y;
      den = (den + D[i]!) * y;
    }
    ratio = (num + C[7]) / (den + D[7]);
  } else {
    const r = 1 / (y * y);
    let num = P[5] * r;
    let den = r;
    for (let i = 0; i < 4; i++) {
      num = (num + P[i]!) * r;
      den = (den + Q[i]!) * r;
    }
    ratio = (INV_SQRT_2PI - (r * (num + P[4])) / (den + Q[4])) / y;
  }
  return expHalfSquare(y) * ratio;
}

/**
 * Standard normal distribution function Φ(x) = P(Z ≤ x) = ½·erfc(−x/√2).
 *
 * Source: Cody (1969), as ANORM of ACM TOMS Algorithm 715 (Cody 1993): a rational
 * approximation for |x| ≤ 0.66291, exp(−x²/2)·R(|x|) up to √32, and an asymptotic-form
 * rational function in 1/x² beyond; the lower tail (x < 0) is computed directly, so it
 * keeps its relative accuracy down to about 1e-300.
 *
 * Valid range: all x. Accuracy: relative error below 1e-14 (measured: 6.2e-16, about 3ε)
 * wherever Φ(x) > 1e-300, i.e. x > −37; below that the result is subnormal, loses relative
 * precision gradually, and is 0 for x ≤ −39. For x > 8.3, Φ(x) rounds to 1 — use `normalSf`
 * for the upper tail.
 *
 * Bad input: NaN → NaN; −∞ → 0; +∞ → 1. Never throws.
 */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x === Infinity) return 1;
  if (x === -Infinity) return 0;
  if (Math.abs(x) <= CENTRAL_LIMIT) return 0.5 + centralPart(x);
  return x < 0 ? upperTail(-x) : 1 - upperTail(x);
}

/**
 * Standard normal upper tail 1 − Φ(x) = P(Z > x) = Φ(−x).
 *
 * Source: as `normalCdf` (Cody 1969/1993), evaluated at −x, which is exact by symmetry: the
 * upper tail is computed directly, never as 1 − Φ(x), so there is no cancellation.
 *
 * Valid range: all x. Accuracy: as `normalCdf` mirrored: relative error below 1e-14 (measured
 * 6.2e-16) wherever the value exceeds 1e-300, i.e. x < 37; subnormal with reduced relative
 * precision beyond, 0 for x ≥ 39.
 *
 * Bad input: NaN → NaN; −∞ → 1; +∞ → 0. Never throws.
 */
export function normalSf(x: number): number {
  return normalCdf(-x);
}

/**
 * Standard normal density φ(x) = exp(−x²/2)/√(2π).
 *
 * Source: the formula itself; exp(−x²/2) is evaluated with Cody's splitting of x (as in
 * ANORM), so x² is not rounded before the exponential.
 *
 * Valid range: all x. Accuracy: relative error below 1e-14 (a few units in the last place)
 * while φ(x) > 1e-300, i.e. |x| < 37; subnormal beyond, 0 for |x| ≥ 39.
 *
 * Bad input: NaN → NaN; ±∞ → 0. Never throws.
 */
export function normalPdf(x: number): number {
  if (Number.isNaN(x)) return NaN;
  return INV_SQRT_2PI * expHalfSquare(Math.abs(x));
}

// AS 241 (PPND16), |p − 0.5| ≤ 0.425: z = q·A(r)/B(r), r = 0.180625 − q².
const AS241_A = [
  3.387132872796366608, 133.14166789178437745, 1971.5909503065514427, 13731.693765509461125,
  45921.953931549871457, 67265.770927008700853, 33430.575583588128105, 2509.0809287301226727,
] as const;
const AS241_B = [
  1, 42.313330701600911252, 687.1870074920579083, 5394.1960214247511077, 21213.794301586595867,
  39307.89580009271061, 28729.085735721942674, 5226.495278852854561,
] as const;
// r = √(−log min(p, 1 − p)) ≤ 5: z = C(r − 1.6)/D(r − 1.6).
const AS241_C = [
  1.42343711074968357734, 4.6303378461565452959, 5.7694972214606914055, 3.64784832476320460504,
  1.27045825245236838258, 0.24178072517745061177, 0.0227238449892691845833, 7.7454501427834140764e-4,
] as const;
const AS241_D = [
  1, 2.05319162663775882187, 1.6763848301838038494, 0.68976733498510000455, 0.14810397642748007459,
  0.0151986665636164571966, 5.475938084995344946e-4, 1.05075007164441684324e-9,
] as const;
// r > 5: z = E(r − 5)/F(r − 5).
const AS241_E = [
  6.6579046435011037772, 5.4637849111641143699, 1.7848265399172913358, 0.29656057182850489123,
  0.026532189526576123093, 0.0012426609473880784386, 2.71155556874348757815e-5,
  2.01033439929228813265e-7,
] as const;
const AS241_F = [
  1, 0.59983220655588793769, 0.13692988092273580531, 0.0148753612908506148525,
  7.868691311456132591e-4, 1.8463183175100546818e-5, 1.4215117583164458887e-7,
  2.04426310338993978564e-15,
] as const;

/** Ratio of two degree-7 polynomials in t, coefficients from the constant term up (Horner). */
function rational7(num: readonly number[], den: readonly number[], t: number): number {
  let n = num[7]!;
  let d = den[7]!;
  for (let i = 6; i >= 0; i--) {
    n = n * t + num[i]!;
    d = d * t + den[i]!;
  }
  return n / d;
}

/**
 * Standard normal quantile Φ⁻¹(p): the z with Φ(z) = p.
 *
 * Source: Wichura, "Algorithm AS 241: The percentage points of the normal distribution",
 * Appl. Statist. 37 (1988) 477–484, PPND16: rational functions of degree 7 in
 * r = 0.180625 − (p − ½)² for |p − ½| ≤ 0.425, otherwise in r = √(−log min(p, 1 − p)), split at
 * r = 5. The tail branch works on min(p, 1 − p); 1 − p is exact for p ≥ ½, so p close to 1
 * keeps the precision its double can hold.
 *
 * Valid range: 0 < p < 1, subnormal p included. Accuracy: Wichura states about 1 part in 10¹⁶;
 * relative error below 1e-14 (measured: 7.5e-16) over 5e-318 ≤ p ≤ 1 − 2⁻⁵³, absolute below
 * 1e-15 where the quantile is near 0. For p near 1 the limit is p's own rounding: use
 * −normalQuantile(q) with q = 1 − p when q is known more precisely than p.
 *
 * Bad input: NaN → NaN; p < 0 or p > 1 → NaN; p = 0 → −∞; p = 1 → +∞. Never throws.
 */
export function normalQuantile(p: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    return q * rational7(AS241_A, AS241_B, 0.180625 - q * q);
  }
  const r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  const z = r <= 5 ? rational7(AS241_C, AS241_D, r - 1.6) : rational7(AS241_E, AS241_F, r - 5);
  return q < 0 ? -z : z;
}
