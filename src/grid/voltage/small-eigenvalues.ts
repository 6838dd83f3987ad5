/**
 * Eigenvalues (no eigenvectors) of a small dense real matrix, without allocation: the state
 * matrices of the damping model (droop-damping.ts, about 2-30 states) once per scenario.
 *
 * Method: balancing first, a similarity D^-1 A D by powers of 2 that brings each row's and
 * column's off-diagonal norms near each other (Parlett & Reinsch, Numerische Mathematik
 * 13:293-304, 1969, from memory; the damping model mixes 1e-5 and 1e7 entries), then reduction
 * to upper Hessenberg form by Householder reflections, A <- H A H with
 * H = I - 2 v v^T / (v^T v) (Golub & Van Loan, Matrix Computations, 4th ed., section 7.4.3),
 * then the Francis double-shift QR iteration on the Hessenberg matrix with deflation on negligible
 * subdiagonal entries and exceptional shifts after 10 and 20 iterations without deflation
 * (Golub & Van Loan section 7.5.5; the EISPACK hqr scheme, Wilkinson & Reinsch, Handbook for
 * Automatic Computation vol. II, 1971, from memory). A 2 x 2 block that deflates gives a real
 * pair or a complex-conjugate pair from its characteristic quadratic.
 * Notation: a = the matrix (row-major, overwritten), wr / wi = real / imaginary parts.
 * Returns false when some eigenvalue needs more than 30 iterations (the caller falls back to
 * ml-matrix). Checked against ml-matrix EigenvalueDecomposition in
 * test/grid/voltage/small-eigenvalues.test.ts.
 */

/** Largest number of QR iterations for one eigenvalue before giving up. */
const MAX_ITER_PER_EIGENVALUE = 30;

function sign(a: number, b: number): number {
  return b >= 0 ? Math.abs(a) : -Math.abs(a);
}

/** Balancing by powers of 2 (eigenvalues unchanged: a diagonal similarity). */
function balance(a: Float64Array, n: number): void {
  let done = false;
  for (let sweep = 0; !done && sweep < 100; sweep++) {
    done = true;
    for (let i = 0; i < n; i++) {
      let c = 0;
      let r = 0;
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        c += Math.abs(a[j * n + i]!);
        r += Math.abs(a[i * n + j]!);
      }
      if (c === 0 || r === 0) continue;
      const total = c + r;
      let f = 1;
      while (c < r / 2) {
        f *= 2;
        c *= 4;
      }
      while (c > r * 2) {
        f /= 2;
        c /= 4;
      }
      if ((c + r) / f < 0.95 * total) {
        done = false;
        for (let j = 0; j < n; j++) a[i * n + j]! /= f;
        for (let j = 0; j < n; j++) a[j * n + i]! *= f;
      }
    }
  }
}

/** Householder reduction of the n x n row-major `a` to upper Hessenberg form, in place. */
function toHessenberg(a: Float64Array, n: number, v: Float64Array): void {
  for (let k = 0; k < n - 2; k++) {
    let norm = 0;
    for (let i = k + 1; i < n; i++) norm += a[i * n + k]! ** 2;
    if (norm === 0) continue;
    const x0 = a[(k + 1) * n + k]!;
    const alpha = -sign(Math.sqrt(norm), x0);
    let vv = 0;
    for (let i = k + 1; i < n; i++) {
      v[i] = a[i * n + k]!;
      if (i === k + 1) v[i] = v[i]! - alpha;
      vv += v[i]! ** 2;
    }
    if (vv === 0) continue;
    // left: rows k+1.. of columns k..
    for (let j = k; j < n; j++) {
      let s = 0;
      for (let i = k + 1; i < n; i++) s += v[i]! * a[i * n + j]!;
      const f = (2 * s) / vv;
      for (let i = k + 1; i < n; i++) a[i * n + j]! -= f * v[i]!;
    }
    // right: columns k+1.. of every row
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = k + 1; j < n; j++) s += a[i * n + j]! * v[j]!;
      const f = (2 * s) / vv;
      for (let j = k + 1; j < n; j++) a[i * n + j]! -= f * v[j]!;
    }
    for (let i = k + 2; i < n; i++) a[i * n + k] = 0;
  }
}

/**
 * Eigenvalues of the n x n row-major matrix `a` (destroyed) into wr, wi; `work` needs n entries.
 * Returns false if the QR iteration does not converge.
 */
export function eigenvaluesInPlace(
  a: Float64Array,
  n: number,
  wr: Float64Array,
  wi: Float64Array,
  work: Float64Array,
): boolean {
  if (n === 0) return true;
  balance(a, n);
  toHessenberg(a, n, work);
  const at = (i: number, j: number) => i * n + j;
  let anorm = 0;
  for (let i = 0; i < n; i++)
    for (let j = Math.max(i - 1, 0); j < n; j++) anorm += Math.abs(a[at(i, j)]!);
  if (anorm === 0) anorm = 1;
  let nn = n - 1;
  let t = 0;
  let p = 0;
  let q = 0;
  let r = 0;
  let s = 0;
  let w = 0;
  let x = 0;
  let y = 0;
  let z = 0;
  while (nn >= 0) {
    let its = 0;
    let l: number;
    do {
      // look for a negligible subdiagonal entry
      for (l = nn; l >= 1; l--) {
        s = Math.abs(a[at(l - 1, l - 1)]!) + Math.abs(a[at(l, l)]!);
        if (s === 0) s = anorm;
        if (Math.abs(a[at(l, l - 1)]!) + s === s) {
          a[at(l, l - 1)] = 0;
          break;
        }
      }
      if (l < 0) l = 0;
      x = a[at(nn, nn)]!;
      if (l === nn) {
        // one real eigenvalue deflates
        wr[nn] = x + t;
        wi[nn] = 0;
        nn--;
      } else {
        y = a[at(nn - 1, nn - 1)]!;
        w = a[at(nn, nn - 1)]! * a[at(nn - 1, nn)]!;
        if (l === nn - 1) {
          // a 2 x 2 block deflates: roots of its characteristic quadratic
          p = 0.5 * (y - x);
          q = p * p + w;
          z = Math.sqrt(Math.abs(q));
          x += t;
          if (q >= 0) {
            z = p + sign(z, p);
            wr[nn - 1] = x + z;
            wr[nn] = z !== 0 ? x - w / z : x + z;
            wi[nn - 1] = 0;
            wi[nn] = 0;
          } else {
            wr[nn - 1] = x + p;
            wr[nn] = x + p;
            wi[nn - 1] = -z;
            wi[nn] = z;
          }
          nn -= 2;
        } else {
          if (its === MAX_ITER_PER_EIGENVALUE) return false;
          if (its === 10 || its === 20) {
            // exceptional shift
            t += x;
            for (let i = 0; i <= nn; i++) a[at(i, i)]! -= x;
            s = Math.abs(a[at(nn, nn - 1)]!) + Math.abs(a[at(nn - 1, nn - 2)]!);
            x = 0.75 * s;
            y = x;
            w = -0.4375 * s * s;
          }
          its++;
          // two consecutive small subdiagonal entries: where the double-shift step starts
          let m: number;
          for (m = nn - 2; m >= l; m--) {
            z = a[at(m, m)]!;
            r = x - z;
            s = y - z;
            p = (r * s - w) / a[at(m + 1, m)]! + a[at(m, m + 1)]!;
            q = a[at(m + 1, m + 1)]! - z - r - s;
            r = a[at(m + 2, m + 1)]!;
            s = Math.abs(p) + Math.abs(q) + Math.abs(r);
            p /= s;
            q /= s;
            r /= s;
            if (m === l) break;
            const u = Math.abs(a[at(m, m - 1)]!) * (Math.abs(q) + Math.abs(r));
            const vv =
              Math.abs(p) *
              (Math.abs(a[at(m - 1, m - 1)]!) + Math.abs(z) + Math.abs(a[at(m + 1, m + 1)]!));
            if (u + vv === vv) break;
          }
          for (let i = m + 2; i <= nn; i++) {
            a[at(i, i - 2)] = 0;
            if (i !== m + 2) a[at(i, i - 3)] = 0;
          }
          // the double-shift QR step on rows and columns l..nn, as 3-element reflections
          for (let k = m; k <= nn - 1; k++) {
            if (k !== m) {
              p = a[at(k, k - 1)]!;
              q = a[at(k + 1, k - 1)]!;
              r = k !== nn - 1 ? a[at(k + 2, k - 1)]! : 0;
              x = Math.abs(p) + Math.abs(q) + Math.abs(r);
              if (x !== 0) {
                p /= x;
                q /= x;
                r /= x;
              }
            }
            s = sign(Math.sqrt(p * p + q * q + r * r), p);
            if (s === 0) continue;
            if (k === m) {
              if (l !== m) a[at(k, k - 1)] = -a[at(k, k - 1)]!;
            } else a[at(k, k - 1)] = -s * x;
            p += s;
            x = p / s;
            y = q / s;
            z = r / s;
            q /= p;
            r /= p;
            for (let j = k; j <= nn; j++) {
              p = a[at(k, j)]! + q * a[at(k + 1, j)]!;
              if (k !== nn - 1) {
                p += r * a[at(k + 2, j)]!;
                a[at(k + 2, j)]! -= p * z;
              }
              a[at(k + 1, j)]! -= p * y;
              a[at(k, j)]! -= p * x;
            }
            const iMax = Math.min(nn, k + 3);
            for (let i = l; i <= iMax; i++) {
              p = x * a[at(i, k)]! + y * a[at(i, k + 1)]!;
              if (k !== nn - 1) {
                p += z * a[at(i, k + 2)]!;
                a[at(i, k + 2)]! -= p * r;
              }
              a[at(i, k + 1)]! -= p * q;
              a[at(i, k)]! -= p;
            }
          }
        }
      }
    } while (l < nn - 1);
  }
  return true;
}
