import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import {
  applyQ,
  applyQt,
  choleskyDecompose,
  choleskySolve,
  formThinQ,
  inverseFromUpper,
  qrDecompose,
  solveUpper,
  spdInverse,
  symmetricEigen,
} from './linalg';

/**
 * Identities of the decompositions on seeded random matrices (A = QR with QᵀQ = I, A = VΛVᵀ,
 * A·A⁻¹ = I), and a hand-checked least-squares fit. The estimators built on them are checked
 * against R in models.test.ts.
 */

function randomMatrix(seed: string, m: number, n: number): Float64Array {
  const rng = seedrandom(seed);
  return Float64Array.from({ length: m * n }, () => rng() * 2 - 1);
}

function maxAbs(a: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s = Math.max(s, Math.abs(a[i]!));
  return s;
}

function expectSmall(label: string, value: number, tolerance: number): void {
  expect(value <= tolerance, `${label}: ${value.toExponential(3)} exceeds ${tolerance.toExponential(3)}`).toBe(true);
}

describe('qrDecompose', () => {
  it.each([
    [50, 4],
    [7, 7],
    [400, 6],
  ])('A = QR and QᵀQ = I for a %i × %i matrix, to 1e-13', (m, n) => {
    const a = randomMatrix(`qr${m}`, m, n);
    const f = a.slice();
    const tau = new Float64Array(n);
    expect(qrDecompose(f, m, n, tau)).toBe(n);
    const q = new Float64Array(m * n);
    formThinQ(f, m, n, tau, q);
    let residual = 0;
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let k = 0; k <= j; k++) s += q[i + k * m]! * f[k + j * m]!;
        residual = Math.max(residual, Math.abs(s - a[i + j * m]!));
      }
    }
    expectSmall('max |QR − A|', residual, 1e-13);
    let orthogonality = 0;
    for (let j = 0; j < n; j++) {
      for (let k = 0; k < n; k++) {
        let s = 0;
        for (let i = 0; i < m; i++) s += q[i + j * m]! * q[i + k * m]!;
        orthogonality = Math.max(orthogonality, Math.abs(s - (j === k ? 1 : 0)));
      }
    }
    expectSmall('max |QᵀQ − I|', orthogonality, 1e-13);
    // Q·(Qᵀb) restores b.
    const b = randomMatrix('b', m, 1);
    const c = b.slice();
    applyQt(f, m, n, tau, c);
    applyQ(f, m, n, tau, c);
    expectSmall('max |Q Qᵀ b − b|', maxAbs(c.map((v, i) => v - b[i]!)), 1e-13);
  });

  it('fits a straight line exactly: y = 3 + 2x', () => {
    const m = 5;
    const a = Float64Array.from([1, 1, 1, 1, 1, 0, 1, 2, 3, 4]);
    const y = Float64Array.from([3, 5, 7, 9, 11]);
    const tau = new Float64Array(2);
    qrDecompose(a, m, 2, tau);
    applyQt(a, m, 2, tau, y);
    solveUpper(a, m, 2, y);
    expectSmall('intercept', Math.abs(y[0]! - 3), 1e-14);
    expectSmall('slope', Math.abs(y[1]! - 2), 1e-14);
    // (XᵀX)⁻¹ for x = 0…4: XᵀX = [[5, 10], [10, 30]], inverse [[0.6, −0.2], [−0.2, 0.1]].
    const inv = new Float64Array(4);
    inverseFromUpper(a, m, 2, inv, new Float64Array(4));
    [0.6, -0.2, -0.2, 0.1].forEach((v, i) => expectSmall(`(XᵀX)⁻¹[${i}]`, Math.abs(inv[i]! - v), 1e-15));
  });

  it('reports the rank of a matrix with a repeated column', () => {
    const a = randomMatrix('rank', 20, 3);
    a.copyWithin(40, 0, 20); // column 2 = column 0
    expect(qrDecompose(a, 20, 3, new Float64Array(3))).toBe(2);
  });
});

describe('Cholesky and the SPD inverse', () => {
  it('A·A⁻¹ = I and A·x = b for a 6 × 6 SPD matrix, to 1e-12', () => {
    const n = 6;
    const b = randomMatrix('spd', 10, n);
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) for (let k = 0; k < 10; k++) a[i + j * n]! += b[k + i * 10]! * b[k + j * 10]!;
    const inv = new Float64Array(n * n);
    expect(spdInverse(a.slice(), n, inv, new Float64Array(n * n))).toBe(true);
    let worst = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let k = 0; k < n; k++) s += a[i + k * n]! * inv[k + j * n]!;
        worst = Math.max(worst, Math.abs(s - (i === j ? 1 : 0)));
      }
    }
    expectSmall('max |A·A⁻¹ − I|', worst, 1e-12);
    const l = a.slice();
    expect(choleskyDecompose(l, n)).toBe(true);
    const rhs = Float64Array.from({ length: n }, (_, i) => i + 1);
    const x = rhs.slice();
    choleskySolve(l, n, x);
    let r = 0;
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += a[i + k * n]! * x[k]!;
      r = Math.max(r, Math.abs(s - rhs[i]!));
    }
    expectSmall('max |A·x − b|', r, 1e-12);
  });

  it('refuses a matrix that is not positive definite', () => {
    expect(choleskyDecompose(Float64Array.from([1, 2, 2, 1]), 2)).toBe(false);
    expect(spdInverse(Float64Array.from([0, 0, 0, 1]), 2, new Float64Array(4), new Float64Array(4))).toBe(false);
  });
});

describe('symmetricEigen', () => {
  it('A = VΛVᵀ with VᵀV = I for a 7 × 7 symmetric matrix, to 1e-13', () => {
    const n = 7;
    const r = randomMatrix('eig', n, n);
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i + j * n] = r[i + j * n]! + r[j + i * n]!;
    const values = new Float64Array(n);
    const vectors = new Float64Array(n * n);
    symmetricEigen(a.slice(), n, values, vectors);
    let worst = 0;
    let orth = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let s = 0;
        let o = 0;
        for (let k = 0; k < n; k++) {
          s += vectors[i + k * n]! * values[k]! * vectors[j + k * n]!;
          o += vectors[k + i * n]! * vectors[k + j * n]!;
        }
        worst = Math.max(worst, Math.abs(s - a[i + j * n]!));
        orth = Math.max(orth, Math.abs(o - (i === j ? 1 : 0)));
      }
    }
    expectSmall('max |VΛVᵀ − A|', worst, 1e-13);
    expectSmall('max |VᵀV − I|', orth, 1e-13);
  });

  it('gives the eigenvalues 1 and 3 of [[2, 1], [1, 2]], eigenvectors (1, −1)/√2 and (1, 1)/√2', () => {
    const values = new Float64Array(2);
    const vectors = new Float64Array(4);
    symmetricEigen(Float64Array.from([2, 1, 1, 2]), 2, values, vectors);
    const small = values[0]! < values[1]! ? 0 : 1;
    expectSmall('|λ_min − 1|', Math.abs(values[small]! - 1), 1e-15);
    expectSmall('|λ_max − 3|', Math.abs(values[1 - small]! - 3), 1e-15);
    // The eigenvector of 1 is ±(1, −1)/√2: its components have opposite signs and size 1/√2.
    expectSmall('|v₁ + v₂|', Math.abs(vectors[small * 2]! + vectors[small * 2 + 1]!), 1e-15);
    expectSmall('||v₁| − 1/√2|', Math.abs(Math.abs(vectors[small * 2]!) - Math.SQRT1_2), 1e-15);
  });
});
