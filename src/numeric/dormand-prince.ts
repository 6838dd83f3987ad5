/**
 * Dormand-Prince 5(4) explicit Runge-Kutta pair with step-size control and dense output.
 *
 * The method: seven stages k1..k7 (FSAL: k7 of one step is k1 of the next), a fifth-order
 * solution y1 = y0 + h sum(b_i k_i) and an embedded fourth-order one whose difference gives the
 * local error estimate err = h sum(e_i k_i). The step is accepted when the scaled RMS norm
 *   ||err|| = sqrt(mean((err_i / (absTol + relTol max(|y0_i|, |y1_i|)))^2)) <= 1
 * and the next step is h * clamp(0.9 ||err||^(-alpha) ||err_old||^beta, 0.2, 5) (PI controller).
 * Dense output is the fourth-order continuous extension
 *   y(t0 + theta h) = r1 + theta (r2 + (1 - theta) (r3 + theta (r4 + (1 - theta) r5)))
 * with r1 = y0, r2 = y1 - y0, r3 = h k1 - r2, r4 = r2 - h k7 - r3, r5 = h sum(d_i k_i).
 *
 * Sources: J. R. Dormand and P. J. Prince, "A family of embedded Runge-Kutta formulae",
 * J. Comput. Appl. Math. 6(1):19-26, 1980 (table 5.2, the RK5(4)7M coefficients);
 * E. Hairer, S. P. Norsett, G. Wanner, Solving Ordinary Differential Equations I, 2nd ed.,
 * Springer 1993, sec. II.4 (step control) and sec. II.6 (dense output of DOPRI5).
 *
 * Knows nothing of microgrids: the system is any object with `derivatives(t, y, dydt)`.
 * All buffers are allocated once in the constructor; `step` allocates nothing.
 *
 * Quadrature components: when the right-hand side never reads components `readCount..n-1`
 * (pure integrals such as delivered energy, y_q' = g(t, y_0..y_{readCount-1})), their stage
 * values are never needed, so the stage sums are formed for the first `readCount` components
 * only; y1, the error estimate and the dense output still cover all n. The result is identical
 * to the full computation (the skipped values are never read).
 */

/** A first-order system y' = f(t, y); fills `dydt` in place. */
export interface OdeSystem {
  derivatives(tS: number, y: Float64Array, dydt: Float64Array): void;
}

// Butcher tableau, Dormand & Prince 1980 table 5.2 (exact fractions).
const C2 = 1 / 5;
const C3 = 3 / 10;
const C4 = 4 / 5;
const C5 = 8 / 9;
const A21 = 1 / 5;
const A31 = 3 / 40;
const A32 = 9 / 40;
const A41 = 44 / 45;
const A42 = -56 / 15;
const A43 = 32 / 9;
const A51 = 19372 / 6561;
const A52 = -25360 / 2187;
const A53 = 64448 / 6561;
const A54 = -212 / 729;
const A61 = 9017 / 3168;
const A62 = -355 / 33;
const A63 = 46732 / 5247;
const A64 = 49 / 176;
const A65 = -5103 / 18656;
// Fifth-order weights b (also row 7 of A: the FSAL property).
const B1 = 35 / 384;
const B3 = 500 / 1113;
const B4 = 125 / 192;
const B5 = -2187 / 6784;
const B6 = 11 / 84;
// Error weights e = b - b_hat (b_hat: the embedded fourth-order weights).
const E1 = 71 / 57600;
const E3 = -71 / 16695;
const E4 = 71 / 1920;
const E5 = -17253 / 339200;
const E6 = 22 / 525;
const E7 = -1 / 40;
// Dense-output coefficients d_i, Hairer, Norsett & Wanner (1993) sec. II.6.
const D1 = -12715105075 / 11282082432;
const D3 = 87487479700 / 32700410799;
const D4 = -10690763975 / 1880347072;
const D5 = 701980252875 / 199316789632;
const D6 = -1453857185 / 822651844;
const D7 = 69997945 / 29380423;

/** The tableau as readonly tables, for invariant tests (rows of A sum to c, b sums to one). */
export const dormandPrinceTableau = {
  c: [0, C2, C3, C4, C5, 1, 1],
  a: [
    [],
    [A21],
    [A31, A32],
    [A41, A42, A43],
    [A51, A52, A53, A54],
    [A61, A62, A63, A64, A65],
    [B1, 0, B3, B4, B5, B6],
  ],
  b: [B1, 0, B3, B4, B5, B6, 0],
  e: [E1, 0, E3, E4, E5, E6, E7],
  d: [D1, 0, D3, D4, D5, D6, D7],
} as const;

/** PI step-size controller exponents; beta = 0.04 for DOPRI5 (from memory). */
const PI_BETA = 0.04;
const PI_ALPHA = 0.2 - 0.75 * PI_BETA;

export interface StepControl {
  relTol: number;
  absTol: number;
  maxStepS: number;
  minStepS: number;
}

/** Outcome of one call to `step`: 'accepted', or 'failed' (step underflow or non-finite state). */
export type StepOutcome = 'accepted' | 'failed';

export class DormandPrince {
  readonly n: number;
  /** Leading components the right-hand side reads; the rest are quadratures (see header). */
  readonly readCount: number;
  /** State at the start of the last accepted step (t0) and at its end (t1). */
  readonly y0: Float64Array;
  readonly y1: Float64Array;
  /** Derivative at t0 (k1) and at t1 (k7). */
  readonly k1: Float64Array;
  readonly k7: Float64Array;
  t0 = 0;
  t1 = 0;
  /** Step size of the last accepted step. */
  hS = 0;
  /** Proposed size of the next step. */
  nextHS = 0;
  steps = 0;
  rejected = 0;
  evaluations = 0;
  private readonly k2: Float64Array;
  private readonly k3: Float64Array;
  private readonly k4: Float64Array;
  private readonly k5: Float64Array;
  private readonly k6: Float64Array;
  private readonly yStage: Float64Array;
  private readonly r1: Float64Array;
  private readonly r2: Float64Array;
  private readonly r3: Float64Array;
  private readonly r4: Float64Array;
  private readonly r5: Float64Array;
  /** Dense-output coefficients are built per component on demand: stamp = step they belong to. */
  private readonly denseStamp: Int32Array;
  private stepId = 1;
  /** Error norm of the last accepted step (PI controller memory), floored at 1e-4. */
  private errOld = 1e-4;

  constructor(n: number, readCount = n) {
    if (!(readCount >= 0 && readCount <= n))
      throw new RangeError(`readCount must be in [0, ${n}], got ${readCount}`);
    this.n = n;
    this.readCount = readCount;
    this.y0 = new Float64Array(n);
    this.y1 = new Float64Array(n);
    this.k1 = new Float64Array(n);
    this.k2 = new Float64Array(n);
    this.k3 = new Float64Array(n);
    this.k4 = new Float64Array(n);
    this.k5 = new Float64Array(n);
    this.k6 = new Float64Array(n);
    this.k7 = new Float64Array(n);
    this.yStage = new Float64Array(n);
    this.r1 = new Float64Array(n);
    this.r2 = new Float64Array(n);
    this.r3 = new Float64Array(n);
    this.r4 = new Float64Array(n);
    this.r5 = new Float64Array(n);
    this.denseStamp = new Int32Array(n);
  }

  /**
   * Starts (or restarts after a discontinuity) at (tS, y): copies y into y1, evaluates k7 = f(t, y)
   * so that the next `step` begins there. `firstStepS` seeds the step size (0: keep the last one).
   */
  restart(sys: OdeSystem, tS: number, y: Float64Array, firstStepS: number): void {
    this.y1.set(y);
    this.t1 = tS;
    sys.derivatives(tS, this.y1, this.k7);
    this.evaluations++;
    if (firstStepS > 0) this.nextHS = firstStepS;
    this.errOld = 1e-4;
    this.stepId++;
  }

  /**
   * Takes one accepted step from the current end point (t1, y1) of at most `maxHS`, retrying with
   * smaller steps until the error test passes. After 'accepted', [t0, t1] is the new step and the
   * dense output is ready. `fixedHS > 0` switches off step control (for convergence tests).
   */
  step(sys: OdeSystem, maxHS: number, ctl: StepControl, fixedHS = 0): StepOutcome {
    const n = this.n;
    const m = this.readCount;
    // The new step starts where the last one ended (FSAL: k1 = old k7).
    this.y0.set(this.y1);
    this.k1.set(this.k7);
    this.t0 = this.t1;
    const y0 = this.y0;
    const y1 = this.y1;
    const k1 = this.k1;
    const k2 = this.k2;
    const k3 = this.k3;
    const k4 = this.k4;
    const k5 = this.k5;
    const k6 = this.k6;
    const k7 = this.k7;
    const ys = this.yStage;
    const t = this.t0;
    let h = fixedHS > 0 ? fixedHS : Math.min(this.nextHS, maxHS, ctl.maxStepS);
    if (fixedHS > 0 && h > maxHS) h = maxHS;
    for (;;) {
      // Fail on underflow (a step below minStepS that is not just the short rest of the
      // interval) and on a NaN step size (a non-finite derivative at the start).
      if (!(h > 0) || (h < ctl.minStepS && h < maxHS)) {
        this.restoreAfterFailure();
        return 'failed';
      }
      for (let i = 0; i < m; i++) ys[i] = y0[i]! + h * A21 * k1[i]!;
      sys.derivatives(t + C2 * h, ys, k2);
      for (let i = 0; i < m; i++) ys[i] = y0[i]! + h * (A31 * k1[i]! + A32 * k2[i]!);
      sys.derivatives(t + C3 * h, ys, k3);
      for (let i = 0; i < m; i++) ys[i] = y0[i]! + h * (A41 * k1[i]! + A42 * k2[i]! + A43 * k3[i]!);
      sys.derivatives(t + C4 * h, ys, k4);
      for (let i = 0; i < m; i++)
        ys[i] = y0[i]! + h * (A51 * k1[i]! + A52 * k2[i]! + A53 * k3[i]! + A54 * k4[i]!);
      sys.derivatives(t + C5 * h, ys, k5);
      for (let i = 0; i < m; i++)
        ys[i] =
          y0[i]! + h * (A61 * k1[i]! + A62 * k2[i]! + A63 * k3[i]! + A64 * k4[i]! + A65 * k5[i]!);
      sys.derivatives(t + h, ys, k6);
      // The stage values are spent: ys now holds the error sum up to k6 (k7 is added below; the
      // same left-to-right sum as written out in one expression).
      for (let i = 0; i < n; i++) {
        const a1 = k1[i]!;
        const a3 = k3[i]!;
        const a4 = k4[i]!;
        const a5 = k5[i]!;
        const a6 = k6[i]!;
        y1[i] = y0[i]! + h * (B1 * a1 + B3 * a3 + B4 * a4 + B5 * a5 + B6 * a6);
        ys[i] = E1 * a1 + E3 * a3 + E4 * a4 + E5 * a5 + E6 * a6;
      }
      sys.derivatives(t + h, y1, k7);
      this.evaluations += 6;
      let errSq = 0;
      let finite = true;
      for (let i = 0; i < n; i++) {
        const yi = y1[i]!;
        if (!Number.isFinite(yi)) finite = false;
        const e = h * (ys[i]! + E7 * k7[i]!);
        const sc = ctl.absTol + ctl.relTol * Math.max(Math.abs(y0[i]!), Math.abs(yi));
        errSq += (e / sc) * (e / sc);
      }
      const err = Math.sqrt(errSq / n);
      if (fixedHS > 0) {
        if (!finite) {
          this.restoreAfterFailure();
          return 'failed';
        }
        this.accept(h, h);
        return 'accepted';
      }
      if (finite && err <= 1) {
        // PI controller (Gustafsson, Lundh & Soderlind, BIT 28:270-287, 1988): alpha = 1/5 -
        // 0.75 beta, safety 0.9, growth limited to [0.2, 5]; fewer rejected steps than the
        // elementary controller when the error estimate oscillates.
        const e = Math.max(err, 1e-10);
        const fac = Math.min(5, Math.max(0.2, 0.9 * e ** -PI_ALPHA * this.errOld ** PI_BETA));
        this.errOld = Math.max(e, 1e-4);
        this.accept(h, h * fac);
        return 'accepted';
      }
      this.rejected++;
      h *= finite ? Math.max(0.2, 0.9 * err ** -0.2) : 0.25;
    }
  }

  private accept(h: number, next: number): void {
    this.hS = h;
    this.t1 = this.t0 + h;
    this.nextHS = next;
    this.steps++;
    this.stepId++;
  }

  private restoreAfterFailure(): void {
    this.y1.set(this.y0);
    this.t1 = this.t0;
    this.stepId++;
  }

  /** Builds the dense-output coefficients of component i for the last accepted step. */
  private prepareDense(i: number): void {
    const h = this.hS;
    const diff = this.y1[i]! - this.y0[i]!;
    const bspl = h * this.k1[i]! - diff;
    this.r1[i] = this.y0[i]!;
    this.r2[i] = diff;
    this.r3[i] = bspl;
    this.r4[i] = diff - h * this.k7[i]! - bspl;
    this.r5[i] =
      h *
      (D1 * this.k1[i]! +
        D3 * this.k3[i]! +
        D4 * this.k4[i]! +
        D5 * this.k5[i]! +
        D6 * this.k6[i]! +
        D7 * this.k7[i]!);
    this.denseStamp[i] = this.stepId;
  }

  /** Component `i` of the dense output at theta in [0, 1] of the last accepted step. */
  interpolateComponent(i: number, theta: number): number {
    if (this.denseStamp[i] !== this.stepId) this.prepareDense(i);
    const s = 1 - theta;
    return (
      this.r1[i]! +
      theta * (this.r2[i]! + s * (this.r3[i]! + theta * (this.r4[i]! + s * this.r5[i]!)))
    );
  }

  /** d/dtheta of component `i` of the dense output (divide by h for d/dt). */
  interpolateComponentSlope(i: number, theta: number): number {
    if (this.denseStamp[i] !== this.stepId) this.prepareDense(i);
    const s = 1 - theta;
    return (
      this.r2[i]! +
      (1 - 2 * theta) * this.r3[i]! +
      theta * (2 - 3 * theta) * this.r4[i]! +
      2 * theta * s * (1 - 2 * theta) * this.r5[i]!
    );
  }

  /** The whole state at theta in [0, 1] of the last accepted step, into `out`. */
  interpolate(theta: number, out: Float64Array): void {
    const s = 1 - theta;
    for (let i = 0; i < this.n; i++) {
      if (this.denseStamp[i] !== this.stepId) this.prepareDense(i);
      out[i] =
        this.r1[i]! +
        theta * (this.r2[i]! + s * (this.r3[i]! + theta * (this.r4[i]! + s * this.r5[i]!)));
    }
  }

  /** Initial step guess, HNW I sec. II.4 (simplified): h = 0.01 ||y|| / ||f||, bounded. */
  static initialStepS(y: Float64Array, dydt: Float64Array, ctl: StepControl): number {
    let d0 = 0;
    let d1 = 0;
    for (let i = 0; i < y.length; i++) {
      const sc = ctl.absTol + ctl.relTol * Math.abs(y[i]!);
      d0 += (y[i]! / sc) ** 2;
      d1 += (dydt[i]! / sc) ** 2;
    }
    d0 = Math.sqrt(d0 / y.length);
    d1 = Math.sqrt(d1 / y.length);
    const h = d0 < 1e-5 || d1 < 1e-5 ? 1e-6 : (0.01 * d0) / d1;
    return Math.min(Math.max(h, 1e-6), ctl.maxStepS);
  }
}
