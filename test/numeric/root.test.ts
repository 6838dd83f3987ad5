// Source: Dowell & Jarratt, BIT 11:168-174, 1971 (Illinois method, from memory).
import { describe, expect, it } from 'vitest';
import { illinoisRoot, type ScalarFunction } from '../../src/numeric/root.js';

class CosMinusX implements ScalarFunction {
  calls = 0;
  value(x: number): number {
    this.calls++;
    return Math.cos(x) - x;
  }
}

describe('illinoisRoot', () => {
  it('finds the fixed point of cos (the Dottie number 0.7390851332151607)', () => {
    // The Dottie number: the unique real solution of cos x = x (e.g. Kaplan, "The Dottie
    // number", Math. Magazine 80(1):73-74, 2007).
    const f = new CosMinusX();
    const r = illinoisRoot(f, 0, 1, f.value(0), f.value(1), 1e-14);
    expect(r).toBeCloseTo(0.7390851332151607, 13);
    // Superlinear (Dowell & Jarratt 1971): fewer calls than the 47 bisection needs for 1e-14.
    expect(f.calls).toBeLessThan(30);
  });

  it("returns a point on b's side of the root, where f has the sign of f(b)", () => {
    const f = new CosMinusX();
    for (const [a, b] of [
      [0, 1],
      [1, 0],
    ] as const) {
      const r = illinoisRoot(f, a, b, f.value(a), f.value(b), 1e-6);
      expect(Math.sign(f.value(r))).toBe(Math.sign(f.value(b)));
      expect(Math.abs(r - 0.7390851332151607)).toBeLessThan(1e-6);
    }
  });

  it('handles a zero at either end', () => {
    const lin: ScalarFunction = { value: (x) => x - 0.25 };
    expect(illinoisRoot(lin, 0, 0.25, -0.25, 0, 1e-12)).toBe(0.25);
    const r = illinoisRoot(lin, 0.25, 1, 0, 0.75, 1e-12);
    expect(r).toBeGreaterThan(0.25);
    expect(r - 0.25).toBeLessThan(1e-11);
  });
});
