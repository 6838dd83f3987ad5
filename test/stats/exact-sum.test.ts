import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ExactSum } from '../../src/stats/exact-sum.js';

/** The exact value of a double as a BigInt multiple of 2^-scaleBits (x must be a multiple). */
const scaleBits = 200n;
function toScaledBigInt(x: number): bigint {
  if (x === 0) return 0n;
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  const sign = bits >> 63n ? -1n : 1n;
  const exponentField = (bits >> 52n) & 0x7ffn;
  let mantissa = bits & ((1n << 52n) - 1n);
  let exponent: bigint;
  if (exponentField === 0n) exponent = -1074n;
  else {
    mantissa |= 1n << 52n;
    exponent = exponentField - 1075n;
  }
  const shift = exponent + scaleBits;
  if (shift < 0n) throw new Error('value too small for the test scale');
  return sign * (mantissa << shift);
}
/** Correctly rounded double of the scaled exact sum (Number(BigInt) rounds to nearest). */
function fromScaledBigInt(v: bigint): number {
  return Number(v) * 2 ** -Number(scaleBits);
}

// Values in +/-1e10 whose bits lie above 2^-200: the BigInt oracle represents them exactly.
const moderateDouble = fc
  .double({ min: -1e10, max: 1e10, noNaN: true, noDefaultInfinity: true })
  .filter((x) => x === 0 || Math.abs(x) > 1e-20);

describe('ExactSum', () => {
  it('returns the correctly rounded exact sum (oracle: BigInt arithmetic on the exact binary values)', () => {
    fc.assert(
      fc.property(fc.array(moderateDouble, { maxLength: 60 }), (xs) => {
        const s = new ExactSum();
        for (const x of xs) s.add(x);
        const exact = xs.reduce((acc, x) => acc + toScaledBigInt(x), 0n);
        expect(s.value()).toBe(fromScaledBigInt(exact) + 0); // toBe is Object.is: bit for bit
      }),
      { seed: 20261201, numRuns: 300 },
    );
  });

  it('gives the same bits in any order and any split into merged parts', () => {
    fc.assert(
      fc.property(
        fc.array(moderateDouble, { minLength: 1, maxLength: 40 }),
        fc.nat(),
        (xs, cut) => {
          const forward = new ExactSum();
          for (const x of xs) forward.add(x);
          const backward = new ExactSum();
          for (let i = xs.length - 1; i >= 0; i--) backward.add(xs[i]!);
          const k = cut % (xs.length + 1);
          const left = new ExactSum();
          const right = new ExactSum();
          for (let i = 0; i < xs.length; i++) (i < k ? left : right).add(xs[i]!);
          right.addSum(left);
          expect(backward.value()).toBe(forward.value());
          expect(right.value()).toBe(forward.value());
          expect(ExactSum.fromComponents(forward.components()).value()).toBe(forward.value());
        },
      ),
      { seed: 7, numRuns: 200 },
    );
  });

  it('keeps what naive summation loses: 1e16 + 1 - 1e16 = 1', () => {
    const s = new ExactSum();
    for (const x of [1e16, 1, -1e16]) s.add(x);
    expect(s.value()).toBe(1);
    expect(1e16 + 1 - 1e16).not.toBe(1); // the naive sum, for contrast
  });

  it('rounds half-way cases by the rest of the expansion, ties to even (IEEE 754 round to nearest)', () => {
    const sumOf = (xs: number[]) => ExactSum.fromComponents(xs).value();
    expect(sumOf([1, 2 ** -53])).toBe(1); // exact tie: to even
    expect(sumOf([1, 2 ** -53, 2 ** -106])).toBe(1 + 2 ** -52); // just above the tie: up
    expect(sumOf([1, 2 ** -53, -(2 ** -106)])).toBe(1); // just below: down
  });

  it('rejects non-finite input', () => {
    expect(() => new ExactSum().add(Number.NaN)).toThrow(RangeError);
  });
});
