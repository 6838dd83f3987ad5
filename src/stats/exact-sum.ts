/**
 * Exact floating-point summation, so that summary figures do not depend on the order or the
 * grouping in which rows arrive (workers, batch sizes, shards, --resume, merge).
 *
 * The running sum is kept as a non-overlapping expansion: a list of doubles, increasing in
 * magnitude, whose exact real sum is the exact sum of every value added so far. Adding x walks
 * the list with the error-free transformation two-sum (hi = x + y, lo = y - (hi - x), exact when
 * |x| >= |y|), keeping each non-zero rounding error as a new component (Shewchuk's
 * grow-expansion). `value()` rounds the exact sum once, to nearest with ties to even, so two
 * ExactSums holding the same exact real return the same double bit for bit, however that real
 * was reached.
 *
 * Source: J. R. Shewchuk, "Adaptive precision floating-point arithmetic and fast robust
 * geometric predicates", Discrete & Computational Geometry 18:305-363, 1997 (sec. 2,
 * Grow-Expansion and two-sum); the final correctly rounded read-out follows the description of
 * the same method in the Python documentation of `math.fsum` (R. Hettinger, from memory).
 *
 * Inputs must be finite (callers validate; a non-finite value throws RangeError).
 */

export class ExactSum {
  private parts: Float64Array;
  private size = 0;

  constructor() {
    // A double expansion needs at most about 40 components (2098-bit exponent range / 53 bits);
    // 4 are typical, the array grows on demand.
    this.parts = new Float64Array(4);
  }

  /** Adds x exactly. */
  add(x: number): void {
    if (!Number.isFinite(x))
      throw new RangeError(`ExactSum.add: expected a finite number, got ${x}`);
    const p = this.parts;
    let kept = 0;
    for (let j = 0; j < this.size; j++) {
      let y = p[j]!;
      if (Math.abs(x) < Math.abs(y)) {
        const t = x;
        x = y;
        y = t;
      }
      const hi = x + y;
      const lo = y - (hi - x);
      if (lo !== 0) p[kept++] = lo;
      x = hi;
    }
    if (kept >= p.length) this.grow();
    this.parts[kept++] = x;
    this.size = kept;
  }

  /** Adds the exact content of another sum (the other is unchanged). */
  addSum(other: ExactSum): void {
    // Copy first: `other` may be `this`.
    const src = other.parts.slice(0, other.size);
    for (let j = 0; j < src.length; j++) this.add(src[j]!);
  }

  /** Back to zero, keeping the storage. */
  reset(): void {
    this.size = 0;
  }

  /** The exact sum rounded once to the nearest double (ties to even). */
  value(): number {
    const p = this.parts;
    let n = this.size;
    if (n === 0) return 0;
    let hi = p[--n]!;
    let lo = 0;
    while (n > 0) {
      const x = hi;
      const y = p[--n]!;
      hi = x + y;
      lo = y - (hi - x);
      if (lo !== 0) break;
    }
    // hi + lo rounded to hi; if the rest of the expansion pushes past the half-way point that
    // rounding assumed, step hi one ulp in the direction of lo.
    if (n > 0 && ((lo < 0 && p[n - 1]! < 0) || (lo > 0 && p[n - 1]! > 0))) {
      const y = lo * 2;
      const x = hi + y;
      if (y === x - hi) hi = x;
    }
    return hi + 0; // one zero: -0 + 0 = +0
  }

  /** The expansion's components (for serialisation); their exact sum is the sum. */
  components(): number[] {
    return Array.from(this.parts.subarray(0, this.size));
  }

  /** Rebuilds a sum from `components()` output. */
  static fromComponents(values: readonly number[]): ExactSum {
    const s = new ExactSum();
    for (const v of values) s.add(v);
    return s;
  }

  private grow(): void {
    const bigger = new Float64Array(this.parts.length * 2);
    bigger.set(this.parts);
    this.parts = bigger;
  }
}
