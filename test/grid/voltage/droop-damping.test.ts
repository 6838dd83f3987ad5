import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import {
  assembleStateMatrix,
  DroopUnits,
  eigenvalues,
  type ModeSummary,
  stateCount,
  summariseModes,
  UNIT_GENSET,
  UNIT_INVERTER,
} from '../../../src/grid/voltage/droop-damping.js';

function summary(): ModeSummary {
  return {
    minDampingRatio: 1,
    criticalRealPerS: 0,
    criticalImagRadPerS: 0,
    unstable: false,
    stateCount: 0,
  };
}

/**
 * REFERENCES.md 10 example: one droop inverter (m_p = 9.4e-5 rad/(s W), omega_c = 31.41 rad/s)
 * behind X = 0.1 ohm to a stiff 230 V (phase) bus: K = 3 V E / X = 1.587e6 W/rad. The stiff bus is
 * a second unit with zero droop. Power base 1 W so that pu = W.
 */
function inverterAgainstStiffBus(mpRadPerSW: number): { units: DroopUnits; k: Float64Array } {
  const units = new DroopUnits(2);
  units.count = 2;
  const omega0 = 314.16;
  const ratingW = 10_000;
  units.kind.fill(UNIT_INVERTER);
  units.ratingPu.fill(ratingW);
  units.filterRadPerS.fill(31.41);
  units.droopPu[0] = 0; // stiff bus
  units.droopPu[1] = (mpRadPerSW * ratingW) / omega0; // m = droopPu omega0 S_base / S
  const kWPerRad = (3 * 230 * 230) / 0.1;
  const k = Float64Array.from([kWPerRad, -kWPerRad, -kWPerRad, kWPerRad]);
  return { units, k };
}

describe('reduced droop model', () => {
  it('reproduces omega_n = 68.45 rad/s and zeta = 0.229 of the closed form (REFERENCES.md 10)', () => {
    const { units, k } = inverterAgainstStiffBus(9.4e-5);
    const n = stateCount(units);
    const a = new Float64Array(n * n);
    assembleStateMatrix(units, k, 314.16, a);
    const modes = eigenvalues(a, n).filter(([, im]) => Math.abs(im) > 1e-9);
    expect(modes.length).toBe(2);
    const [re, im] = modes[0]!;
    const wn = Math.hypot(re, im);
    // REFERENCES.md 10 lists 4 digits: 68.45 (+/- 0.005) and 0.229 (+/- 0.0005)
    expect(Math.abs(wn - 68.45)).toBeLessThan(0.005);
    expect(Math.abs(-re / wn - 0.229)).toBeLessThan(0.0005);
    // and against the closed form itself: s^2 + omega_c s + m omega_c K = 0, to rounding (1e-9)
    const closedWn = Math.sqrt(9.4e-5 * 31.41 * ((3 * 230 * 230) / 0.1));
    expect(Math.abs(wn - closedWn) / closedWn).toBeLessThan(1e-9);
    // damped frequency 10.6 Hz (REFERENCES.md 10)
    expect(Math.abs(im) / (2 * Math.PI)).toBeCloseTo(10.6, 1);
  });

  it('loses damping as 1/sqrt(m) when the droop gain rises (REFERENCES.md 10)', () => {
    const ratios: number[] = [];
    for (const mp of [2.35e-5, 9.4e-5, 3.76e-4, 1.504e-3]) {
      const { units, k } = inverterAgainstStiffBus(mp);
      const n = stateCount(units);
      const a = new Float64Array(n * n);
      assembleStateMatrix(units, k, 314.16, a);
      const s = summary();
      summariseModes(a, n, s);
      ratios.push(s.minDampingRatio);
    }
    for (let i = 1; i < ratios.length; i++) {
      expect(ratios[i]!).toBeLessThan(ratios[i - 1]!);
      // m quadrupled -> zeta halved: zeta = 0.5 sqrt(omega_c / (m K)) (until zeta >= 1 clips it)
      if (ratios[i - 1]! < 1) expect(ratios[i]! / ratios[i - 1]!).toBeCloseTo(0.5, 9);
    }
  });

  it('gives the first-order governor closed form for one genset (REFERENCES.md 1.5)', () => {
    // H = 2 s, R = 0.05, D = 1, Tg = 0.5 s: omega_n = 3.2404 rad/s, zeta = 0.34718
    const units = new DroopUnits(1);
    units.count = 1;
    units.kind[0] = UNIT_GENSET;
    units.ratingPu[0] = 1;
    units.droopPu[0] = 0.05;
    units.inertiaS[0] = 2;
    units.governorOrder[0] = 1;
    units.governorTimeConstantS[0] = 0.5;
    units.loadDampingPu[0] = 1;
    const n = stateCount(units);
    expect(n).toBe(2);
    const a = new Float64Array(n * n);
    assembleStateMatrix(units, new Float64Array(1), 2 * Math.PI * 60, a);
    const s = summary();
    summariseModes(a, n, s);
    // REFERENCES.md 1.5 lists 5 digits
    expect(Math.abs(Math.hypot(s.criticalRealPerS, s.criticalImagRadPerS) - 3.2404)).toBeLessThan(
      5e-5,
    );
    expect(Math.abs(s.minDampingRatio - 0.34718)).toBeLessThan(5e-6);
    expect(s.unstable).toBe(false);
  });

  it('gives the damped swing of Saadat Example 11.2: omega_n 6.1405 rad/s, zeta 0.2131 (REFERENCES.md 1.3d)', () => {
    // one machine against a stiff bus: H = 9.94 s, Ps = 1.9884 pu/rad, D = 0.138 pu per rad/s
    // at 60 Hz, i.e. 0.138 * omega0 per pu speed; governor disabled by an infinite droop
    const omega0 = 2 * Math.PI * 60;
    const units = new DroopUnits(2);
    units.count = 2;
    units.kind[0] = UNIT_INVERTER; // the stiff bus: zero droop
    units.ratingPu.fill(1);
    units.filterRadPerS[0] = 10;
    units.kind[1] = UNIT_GENSET;
    units.droopPu[1] = 1e300;
    units.inertiaS[1] = 9.94;
    units.governorOrder[1] = 1;
    units.governorTimeConstantS[1] = 1;
    units.swingDampingPu[1] = 0.138 * omega0;
    const ps = 1.9884;
    const k = Float64Array.from([ps, -ps, -ps, ps]);
    const n = stateCount(units);
    const a = new Float64Array(n * n);
    assembleStateMatrix(units, k, omega0, a);
    const s = summary();
    summariseModes(a, n, s);
    // REFERENCES.md 1.3d lists 5 significant digits
    expect(Math.abs(Math.hypot(s.criticalRealPerS, s.criticalImagRadPerS) - 6.1405)).toBeLessThan(
      5e-4,
    );
    expect(Math.abs(s.minDampingRatio - 0.2131)).toBeLessThan(5e-5);
    expect(Math.abs(s.criticalImagRadPerS - 5.9995)).toBeLessThan(5e-4);
  });

  it('drives the low-frequency modes toward zero damping as three inverters raise their droop', () => {
    // invented all-inverter island: three 1 pu droop inverters on a line, 0.1 pu apart; the
    // behaviour Pogaku et al. (2007) report: the droop gain sets the low-frequency modes
    const zetas: number[] = [];
    for (const droop of [0.005, 0.01, 0.02, 0.05, 0.1, 0.2]) {
      const units = new DroopUnits(3);
      units.count = 3;
      units.kind.fill(UNIT_INVERTER);
      units.ratingPu.fill(1);
      units.droopPu.fill(droop);
      units.filterRadPerS.fill(20);
      units.loadDampingPu.fill(0.3);
      const k = Float64Array.from([10, -10, 0, -10, 20, -10, 0, -10, 10]);
      const n = stateCount(units);
      const a = new Float64Array(n * n);
      assembleStateMatrix(units, k, 2 * Math.PI * 60, a);
      const s = summary();
      summariseModes(a, n, s);
      zetas.push(s.minDampingRatio);
      expect(s.unstable).toBe(false);
    }
    for (let i = 1; i < zetas.length; i++) expect(zetas[i]!).toBeLessThan(zetas[i - 1]!);
    // at 20 % droop the least-damped mode is below the 5 % planning criterion (REFERENCES.md 10)
    expect(zetas.at(-1)!).toBeLessThan(0.05);
  });
});

describe('eigenvalue routine', () => {
  it('recovers the known eigenvalues of a similarity-transformed block matrix', () => {
    // D = diag(-2, 0.1) plus the block [[-0.5, 3], [-3, -0.5]] (eigenvalues -0.5 +/- 3j);
    // A = T D T^-1 with a fixed well-conditioned T has the same eigenvalues (linear algebra)
    const d = new Matrix([
      [-2, 0, 0, 0],
      [0, 0.1, 0, 0],
      [0, 0, -0.5, 3],
      [0, 0, -3, -0.5],
    ]);
    const t = new Matrix([
      [1, 0.2, 0, 0.1],
      [0.3, 1, 0.1, 0],
      [0, 0.4, 1, 0.2],
      [0.1, 0, 0.3, 1],
    ]);
    const tinv = invert(t);
    const a = t.mmul(d).mmul(tinv);
    const flat = Float64Array.from(a.to1DArray());
    const ev = eigenvalues(flat, 4).sort((x, y) => x[0] - y[0] || x[1] - y[1]);
    const expected = [
      [-2, 0],
      [-0.5, -3],
      [-0.5, 3],
      [0.1, 0],
    ];
    // double precision on a condition number ~ 3: 1e-10 absolute
    ev.forEach(([re, im], i) => {
      expect(Math.abs(re - expected[i]![0]!)).toBeLessThan(1e-10);
      expect(Math.abs(im - expected[i]![1]!)).toBeLessThan(1e-10);
    });
    const s = summary();
    summariseModes(flat, 4, s);
    expect(s.unstable).toBe(true);
    expect(s.minDampingRatio).toBeCloseTo(-1, 12); // the unstable real mode at +0.1
  });

  it('finds the roots of a companion matrix: (s + 1)(s + 2)(s^2 + 2 s + 5)', () => {
    // s^4 + 5 s^3 + 13 s^2 + 19 s + 10: roots -1, -2, -1 +/- 2j (expand by hand)
    const a = Float64Array.from([0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, -10, -19, -13, -5]);
    const s = summary();
    summariseModes(a, 4, s);
    // least damped: -1 +/- 2j, zeta = 1 / sqrt(5)
    expect(s.minDampingRatio).toBeCloseTo(1 / Math.sqrt(5), 10);
    expect(s.criticalImagRadPerS).toBeCloseTo(2, 10);
  });
});

function invert(m: Matrix): Matrix {
  // Gauss-Jordan through ml-matrix's solve against the identity
  const n = m.rows;
  const id = Matrix.eye(n, n);
  const cols: number[][] = [];
  for (let c = 0; c < n; c++) cols.push(solveColumn(m, id.getColumn(c)));
  return new Matrix(cols).transpose();
}

function solveColumn(m: Matrix, b: number[]): number[] {
  const n = m.rows;
  const a = m.to2DArray().map((row, i) => [...row, b[i]!]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r]![c]!) > Math.abs(a[p]![c]!)) p = r;
    [a[c], a[p]] = [a[p]!, a[c]!];
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = a[r]![c]! / a[c]![c]!;
      for (let k = c; k <= n; k++) a[r]![k]! -= f * a[c]![k]!;
    }
  }
  return a.map((row, i) => row[n]! / row[i]!);
}
