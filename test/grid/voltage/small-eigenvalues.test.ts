// Source: ml-matrix EigenvalueDecomposition as an independent oracle; companion-matrix roots (Golub & Van Loan, Matrix Computations, sec. 7.4, from memory).
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { eigenvaluesInPlace } from '../../../src/grid/voltage/small-eigenvalues.js';

/** Park-Miller minimal standard generator (fixed seed): deterministic test matrices. */
function lcg(seed: number) {
  let st = seed;
  return () => {
    st = (st * 16807) % 2147483647;
    return st / 2147483647;
  };
}

function sorted(re: ArrayLike<number>, im: ArrayLike<number>, n: number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let i = 0; i < n; i++) out.push([re[i]!, im[i]!]);
  // real parts rounded to 1e-6 for the order, so that rounding does not split conjugate pairs
  const key = (v: number) => Math.round(v * 1e6);
  return out.sort((p, q) => key(p[0]) - key(q[0]) || p[1] - q[1]);
}

describe('small eigenvalue routine', () => {
  it('agrees with ml-matrix EigenvalueDecomposition on random matrices of 1 to 30 states', () => {
    // oracle: ml-matrix 6.15.1 EigenvalueDecomposition (JAMA's Hessenberg-QR, TOOLCHAIN.md);
    // both are backward stable, so eigenvalues of these well-separated random matrices agree
    // to a few hundred ulps of the matrix norm: 1e-9 relative to the norm allowed
    const rnd = lcg(12345);
    for (let trial = 0; trial < 200; trial++) {
      const n = 1 + (trial % 30);
      const a = new Float64Array(n * n);
      for (let i = 0; i < n * n; i++) a[i] = 2 * rnd() - 1;
      // some with a stiff spread of scales, like the damping model (1e-2 .. 1e3 rad/s)
      if (trial % 3 === 0) for (let i = 0; i < n * n; i++) a[i]! *= 10 ** (5 * rnd() - 2);
      const m = new Matrix(n, n);
      let norm = 0;
      for (let r = 0; r < n; r++)
        for (let c = 0; c < n; c++) {
          m.set(r, c, a[r * n + c]!);
          norm = Math.max(norm, Math.abs(a[r * n + c]!));
        }
      const e = new EigenvalueDecomposition(m, { assumeSymmetric: false });
      const wr = new Float64Array(n);
      const wi = new Float64Array(n);
      expect(eigenvaluesInPlace(a, n, wr, wi, new Float64Array(n))).toBe(true);
      const mine = sorted(wr, wi, n);
      const ref = sorted(e.realEigenvalues, e.imaginaryEigenvalues, n);
      for (let i = 0; i < n; i++) {
        expect(Math.abs(mine[i]![0] - ref[i]![0])).toBeLessThan(1e-9 * norm * n);
        expect(Math.abs(mine[i]![1] - ref[i]![1])).toBeLessThan(1e-9 * norm * n);
      }
    }
  });

  it('finds the closed-form roots of a companion matrix', () => {
    // companion matrix of (s + 1)(s + 2)(s^2 + 2 s + 5): roots -1, -2, -1 +- 2j (linear algebra)
    // s^4 + 5 s^3 + 13 s^2 + 19 s + 10
    const a = Float64Array.from([-5, -13, -19, -10, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0]);
    const wr = new Float64Array(4);
    const wi = new Float64Array(4);
    expect(eigenvaluesInPlace(a, 4, wr, wi, new Float64Array(4))).toBe(true);
    const got = sorted(wr, wi, 4);
    const want: Array<[number, number]> = [
      [-2, 0],
      [-1, -2],
      [-1, 0],
      [-1, 2],
    ];
    for (let i = 0; i < 4; i++) {
      expect(got[i]![0]).toBeCloseTo(want[i]![0], 10);
      expect(got[i]![1]).toBeCloseTo(want[i]![1], 10);
    }
  });
});
