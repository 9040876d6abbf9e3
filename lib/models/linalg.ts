/**
 * Small dense linear algebra for the estimators of lib/models: Householder QR of a tall matrix,
 * triangular solves, the inverse of a triangular or symmetric positive-definite matrix, and the
 * eigen-decomposition of a small symmetric matrix.
 *
 * Matrices are column-major `Float64Array`s: entry (i, j) of an m × n matrix `a` is `a[i + j·m]`.
 * Every routine works in place or writes into an array the caller passes, so a loop over
 * thousands of replicates allocates nothing. Dimensions are passed explicitly; arrays may be
 * longer than needed (only the leading m·n entries are used).
 *
 * Algorithms (Golub & Van Loan, Matrix Computations, 4th ed., 2013; algorithm numbers from memory):
 * - `qrDecompose`: Householder QR (Algorithm 5.2.1), backward stable, in the storage scheme of
 *   LAPACK's DGEQR2 (R on and above the diagonal, the Householder vectors below it with an
 *   implicit leading 1, the scalars τ in a separate array). Least squares through it avoids the
 *   squaring of the condition number that normal equations on raw sums cause.
 * - `choleskyDecompose`: the outer-product Cholesky (Algorithm 4.2.1), for small SPD systems.
 * - `symmetricEigen`: cyclic Jacobi (Algorithm 8.5.3), accurate to a few ε·‖A‖ for the p × p
 *   matrices (p ≤ ~20) it is meant for; cost O(p³) per sweep, usually 5–8 sweeps.
 *
 * Nothing here throws on numerical trouble: a rank-deficient QR and a non-positive-definite
 * Cholesky are reported by the return value, and the caller decides what that means.
 */

/**
 * Householder QR of the m × n matrix `a` (m ≥ n) in place. On return R is on and above the
 * diagonal of `a`, the essential parts of the Householder vectors v_j (v_j[j] = 1 implied)
 * below it, and `tau[j]` holds τ_j so that H_j = I − τ_j·v_j·v_jᵀ and Qᵀ = H_{n−1}⋯H_0.
 *
 * Returns the numerical rank: the number of leading columns whose |R_jj| exceeds
 * `tolerance` (default 1e-7, as R's lm) times the norm of the original column j. A return
 * value below n means the columns are (nearly) linearly dependent; R is then not invertible.
 */
export function qrDecompose(a: Float64Array, m: number, n: number, tau: Float64Array, tolerance = 1e-7): number {
  let rank = n;
  for (let j = 0; j < n; j++) {
    const col = j * m;
    const norm = partialNorm(a, col + j, col + m);
    if (norm === 0) {
      tau[j] = 0;
      if (rank === n) rank = j;
      continue;
    }
    // The earlier reflections are orthogonal, so the norm of the original column j is that of
    // its current entries: R's entries above row j and the part below.
    const above = partialNorm(a, col, col + j);
    const fullNorm = Math.hypot(above, norm);
    const alpha = a[col + j]!;
    const beta = alpha >= 0 ? -norm : norm;
    tau[j] = (beta - alpha) / beta;
    const inv = 1 / (alpha - beta);
    for (let i = j + 1; i < m; i++) a[col + i]! *= inv;
    a[col + j] = beta;
    if (Math.abs(beta) <= tolerance * fullNorm && rank === n) rank = j;
    // Apply H_j to the remaining columns.
    for (let k = j + 1; k < n; k++) reflect(a, m, j, tau[j]!, a, k * m);
  }
  return rank;
}

/**
 * ‖a[from … to)‖₂: one pass of plain squares, and a second, scaled pass only when the sum
 * overflowed or fell into the range where squares lose precision (as LAPACK's DNRM2 guards).
 */
function partialNorm(a: Float64Array, from: number, to: number): number {
  let sum = 0;
  for (let i = from; i < to; i++) sum += a[i]! * a[i]!;
  if (sum < Infinity && (sum > 1e-280 || sum === 0)) return Math.sqrt(sum);
  let scale = 0;
  for (let i = from; i < to; i++) scale = Math.max(scale, Math.abs(a[i]!));
  if (scale === 0) return 0;
  sum = 0;
  for (let i = from; i < to; i++) {
    const t = a[i]! / scale;
    sum += t * t;
  }
  return scale * Math.sqrt(sum);
}

/**
 * Applies H_j = I − τ_j·v_j·v_jᵀ (v_j from column j of the QR factor `a`, v_j[j] = 1) to the
 * m-vector stored in `b` from `offset` on.
 */
function reflect(a: Float64Array, m: number, j: number, t: number, b: Float64Array, offset: number): void {
  const col = j * m;
  let dot = b[offset + j]!;
  for (let i = j + 1; i < m; i++) dot += a[col + i]! * b[offset + i]!;
  dot *= t;
  b[offset + j]! -= dot;
  for (let i = j + 1; i < m; i++) b[offset + i]! -= dot * a[col + i]!;
}

/** b ← Qᵀ·b for the Q of `qrDecompose(a, m, n, tau)`; b has length m. */
export function applyQt(a: Float64Array, m: number, n: number, tau: Float64Array, b: Float64Array): void {
  for (let j = 0; j < n; j++) if (tau[j] !== 0) reflect(a, m, j, tau[j]!, b, 0);
}

/** b ← Q·b for the Q of `qrDecompose(a, m, n, tau)`; b has length m. */
export function applyQ(a: Float64Array, m: number, n: number, tau: Float64Array, b: Float64Array): void {
  for (let j = n - 1; j >= 0; j--) if (tau[j] !== 0) reflect(a, m, j, tau[j]!, b, 0);
}

/**
 * The thin Q (m × n, orthonormal columns) of `qrDecompose(a, m, n, tau)`, written into `q`
 * (length ≥ m·n). Row i of Q gives the leverage h_i = Σ_j Q_ij².
 */
export function formThinQ(a: Float64Array, m: number, n: number, tau: Float64Array, q: Float64Array): void {
  q.fill(0, 0, m * n);
  for (let j = 0; j < n; j++) q[j + j * m] = 1;
  for (let j = n - 1; j >= 0; j--) {
    if (tau[j] === 0) continue;
    for (let k = j; k < n; k++) reflect(a, m, j, tau[j]!, q, k * m);
  }
}

/**
 * Solves R·x = b in place (b ← x) for the upper triangle R of the n × n leading block of `r`,
 * stored with leading dimension `ld` (the m of a QR factor, or n for a square matrix).
 */
export function solveUpper(r: Float64Array, ld: number, n: number, b: Float64Array): void {
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let k = i + 1; k < n; k++) s -= r[i + k * ld]! * b[k]!;
    b[i] = s / r[i + i * ld]!;
  }
}

/** Solves Rᵀ·x = b in place (b ← x) for the upper triangle R as in `solveUpper`. */
export function solveUpperTransposed(r: Float64Array, ld: number, n: number, b: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let s = b[i]!;
    for (let k = 0; k < i; k++) s -= r[k + i * ld]! * b[k]!;
    b[i] = s / r[i + i * ld]!;
  }
}

/**
 * (RᵀR)⁻¹ = R⁻¹R⁻ᵀ for the upper triangle R of `r` (leading dimension `ld`), written into the
 * n × n matrix `out` (both triangles). With R from the QR of X this is (XᵀX)⁻¹ without forming
 * XᵀX. `work` needs n·n entries.
 */
export function inverseFromUpper(r: Float64Array, ld: number, n: number, out: Float64Array, work: Float64Array): void {
  // work ← R⁻¹ (upper triangular), column by column: R·w_j = e_j.
  work.fill(0, 0, n * n);
  for (let j = 0; j < n; j++) {
    const c = j * n;
    for (let i = j; i >= 0; i--) {
      let s = i === j ? 1 : 0;
      for (let k = i + 1; k <= j; k++) s -= r[i + k * ld]! * work[c + k]!;
      work[c + i] = s / r[i + i * ld]!;
    }
  }
  // out ← R⁻¹·R⁻ᵀ: out_ij = Σ_{k ≥ max(i, j)} Rinv_ik·Rinv_jk.
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let s = 0;
      for (let k = j; k < n; k++) s += work[i + k * n]! * work[j + k * n]!;
      out[i + j * n] = s;
      out[j + i * n] = s;
    }
  }
}

/**
 * Cholesky factor of the symmetric positive-definite n × n matrix `a` in place: on return the
 * lower triangle holds L with A = L·Lᵀ (the strict upper triangle is left as it was). Returns
 * false, leaving `a` partly overwritten, when a pivot is not positive (A not numerically SPD).
 */
export function choleskyDecompose(a: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    let d = a[j + j * n]!;
    for (let k = 0; k < j; k++) d -= a[j + k * n]! * a[j + k * n]!;
    if (!(d > 0)) return false;
    const ljj = Math.sqrt(d);
    a[j + j * n] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i + j * n]!;
      for (let k = 0; k < j; k++) s -= a[i + k * n]! * a[j + k * n]!;
      a[i + j * n] = s / ljj;
    }
  }
  return true;
}

/** Solves A·x = b in place (b ← x) given the Cholesky factor L of A in the lower triangle of `l`. */
export function choleskySolve(l: Float64Array, n: number, b: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let s = b[i]!;
    for (let k = 0; k < i; k++) s -= l[i + k * n]! * b[k]!;
    b[i] = s / l[i + i * n]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let k = i + 1; k < n; k++) s -= l[k + i * n]! * b[k]!;
    b[i] = s / l[i + i * n]!;
  }
}

/**
 * The inverse of the symmetric positive-definite n × n matrix `a`, written into `out` (both
 * triangles); `a` is overwritten by its Cholesky factor. Returns false when `a` is not
 * numerically SPD (then `out` is undefined). `work` needs n·n entries.
 */
export function spdInverse(a: Float64Array, n: number, out: Float64Array, work: Float64Array): boolean {
  if (!choleskyDecompose(a, n)) return false;
  // work ← L⁻¹ (lower triangular).
  work.fill(0, 0, n * n);
  for (let j = 0; j < n; j++) {
    for (let i = j; i < n; i++) {
      let s = i === j ? 1 : 0;
      for (let k = j; k < i; k++) s -= a[i + k * n]! * work[k + j * n]!;
      work[i + j * n] = s / a[i + i * n]!;
    }
  }
  // out ← L⁻ᵀ·L⁻¹: out_ij = Σ_{k ≥ max(i, j)} Linv_ki·Linv_kj.
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let s = 0;
      for (let k = j; k < n; k++) s += work[k + i * n]! * work[k + j * n]!;
      out[i + j * n] = s;
      out[j + i * n] = s;
    }
  }
  return true;
}

/**
 * Eigen-decomposition of the symmetric n × n matrix `a` by cyclic Jacobi rotations: on return
 * `values` holds the eigenvalues (in no particular order) and column k of `vectors` (n × n) the
 * unit eigenvector of `values[k]`. Only the upper triangle of `a` is read; `a` is overwritten.
 * Stops when the off-diagonal mass is below ε² times the diagonal's, or after 50 sweeps.
 * Returns the number of sweeps used.
 */
export function symmetricEigen(a: Float64Array, n: number, values: Float64Array, vectors: Float64Array): number {
  vectors.fill(0, 0, n * n);
  for (let i = 0; i < n; i++) vectors[i + i * n] = 1;
  // Symmetrise from the upper triangle.
  for (let j = 0; j < n; j++) for (let i = j + 1; i < n; i++) a[i + j * n] = a[j + i * n]!;
  let sweep = 0;
  for (; sweep < 50; sweep++) {
    let off = 0;
    let diag = 0;
    for (let j = 0; j < n; j++) {
      diag += a[j + j * n]! * a[j + j * n]!;
      for (let i = 0; i < j; i++) off += a[i + j * n]! * a[i + j * n]!;
    }
    if (off <= 1e-32 * diag || off === 0) break;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p + q * n]!;
        if (apq === 0) continue;
        const app = a[p + p * n]!;
        const aqq = a[q + q * n]!;
        // Rotation angle (Golub & Van Loan, Algorithm 8.5.1, sym.schur2).
        const theta = (aqq - app) / (2 * apq);
        const t = (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(1 + theta * theta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k + p * n]!;
          const akq = a[k + q * n]!;
          a[k + p * n] = c * akp - s * akq;
          a[k + q * n] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p + k * n]!;
          const aqk = a[q + k * n]!;
          a[p + k * n] = c * apk - s * aqk;
          a[q + k * n] = s * apk + c * aqk;
        }
        a[p + q * n] = 0;
        a[q + p * n] = 0;
        for (let k = 0; k < n; k++) {
          const vkp = vectors[k + p * n]!;
          const vkq = vectors[k + q * n]!;
          vectors[k + p * n] = c * vkp - s * vkq;
          vectors[k + q * n] = s * vkp + c * vkq;
        }
      }
    }
  }
  for (let i = 0; i < n; i++) values[i] = a[i + i * n]!;
  return sweep;
}
