/**
 * Small-signal damping of the island's power sharing: the linearised reduced model of droop
 * inverters with power-measurement filters, genset governors and swing, and its eigenvalues.
 *
 * Per grid-forming inverter k (angle theta_k, filtered power Pf_k, all deviations):
 *   omega_k = -m_k Pf_k,          m_k = droopPu_k * omega0 * S_base / S_k   (rad/s per pu)
 *   dPf_k/dt = omega_c,k (P_k - Pf_k)
 * Per genset k (per-unit speed w_k, mechanical power Pm_k on the system base):
 *   omega_k = omega0 w_k,  M_k dw_k/dt = Pm_k - P_k - D_s,k (S_k / S_base) w_k,
 *   M_k = 2 H_k S_k / S_base, D_s the damper-winding damping (swingDampingPu; without it the
 *   classical model leaves the swing of gensets against each other almost undamped)
 *   first-order governor   T_g dPm_k/dt = u_k - Pm_k
 *   second-order governor  Pm'' + 2 zeta omega_n Pm' + omega_n^2 Pm = omega_n^2 u_k
 *   u_k = -(S_k / S_base) w_k / R_k - z_k,   dz_k/dt = K_i (S_k / S_base) w_k   (isochronous)
 * Network and loads: P_k = sum_j K_kj theta_j + d_k omega_k / omega0, with K = dP/dtheta of the
 * Kron-reduced network at the operating point (island-damping.ts) and d_k the load damping
 * (sum of frequencySensitivityPu * P_load) shared by rating. The uniform rotation of all angles
 * is removed by measuring angles from the first source: delta_j = theta_j - theta_0, j >= 1.
 *
 * Sources: the reduced power-sharing model of Coelho, Cortizo & Garcia, IEEE Trans. Industry
 * Applications 38(2):533-542, 2002, and Pogaku, Prodanovic & Green, IEEE Trans. Power
 * Electronics 22(2):613-625, 2007 (both from memory); for one inverter against a stiff bus it
 * reduces to s^2 + omega_c s + m omega_c K = 0, omega_n = sqrt(m omega_c K),
 * zeta = 0.5 sqrt(omega_c / (m K)) (REFERENCES.md 10, derived, recomputed). The genset part is the
 * swing-governor model of REFERENCES.md 1.5. Notation: m = m_p, omega_c = the filter corner,
 * K = the synchronising coefficient (W/rad in the reference, pu/rad here).
 *
 * Eigenvalues: small-eigenvalues.ts (Householder-Hessenberg reduction and Francis double-shift QR,
 * eigenvalues only, no allocation), checked against ml-matrix EigenvalueDecomposition, which is
 * the fallback should the QR iteration give up; a probe found ml-matrix robust where mathjs eigs
 * failed to converge (TOOLCHAIN.md 5).
 * Damping ratio of a mode lambda: zeta = -Re(lambda) / |lambda| (1 for a stable real mode, -1 for
 * an unstable real one); modes with |lambda| below 1e-9 rad/s (neutral drift of isochronous
 * sharing) are skipped.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { eigenvaluesInPlace } from './small-eigenvalues.js';

export const UNIT_INVERTER = 0;
export const UNIT_GENSET = 1;

/** Parameters of one voltage-holding source in the reduced model (filled per scenario). */
export class DroopUnits {
  count = 0;
  readonly kind: Uint8Array;
  /** P-f droop, pu frequency per pu power on the unit's rating. */
  readonly droopPu: Float64Array;
  /** Rating over the system base. */
  readonly ratingPu: Float64Array;
  /** Inverters: power-measurement filter corner, rad/s. */
  readonly filterRadPerS: Float64Array;
  /** Gensets: inertia constant on the rating, s. */
  readonly inertiaS: Float64Array;
  readonly governorOrder: Uint8Array;
  readonly governorTimeConstantS: Float64Array;
  readonly governorNaturalRadPerS: Float64Array;
  readonly governorDampingRatio: Float64Array;
  readonly isochronousGainPuPerS: Float64Array;
  /** Load damping assigned to the unit, pu power (system base) per pu frequency. */
  readonly loadDampingPu: Float64Array;
  /** Gensets: swing damping of the damper windings, pu power per pu speed on the rating. */
  readonly swingDampingPu: Float64Array;
  /** Work: index of each unit's first own state. */
  readonly firstState: Int32Array;

  constructor(readonly capacity: number) {
    this.kind = new Uint8Array(capacity);
    this.droopPu = new Float64Array(capacity);
    this.ratingPu = new Float64Array(capacity);
    this.filterRadPerS = new Float64Array(capacity);
    this.inertiaS = new Float64Array(capacity);
    this.governorOrder = new Uint8Array(capacity);
    this.governorTimeConstantS = new Float64Array(capacity);
    this.governorNaturalRadPerS = new Float64Array(capacity);
    this.governorDampingRatio = new Float64Array(capacity);
    this.isochronousGainPuPerS = new Float64Array(capacity);
    this.loadDampingPu = new Float64Array(capacity);
    this.swingDampingPu = new Float64Array(capacity);
    this.firstState = new Int32Array(capacity);
  }
}

export interface ModeSummary {
  /** Smallest damping ratio over the modes (1 when every mode is real and stable). */
  minDampingRatio: number;
  /** The mode with that ratio: real part, 1/s, and imaginary part, rad/s. */
  criticalRealPerS: number;
  criticalImagRadPerS: number;
  /** Some mode has a positive real part. */
  unstable: boolean;
  stateCount: number;
}

/** Number of states of unit i in the reduced model. */
function unitStates(u: DroopUnits, i: number): number {
  if (u.kind[i] === UNIT_INVERTER) return 1;
  return 1 + u.governorOrder[i]! + (u.isochronousGainPuPerS[i]! > 0 ? 1 : 0);
}

export function stateCount(u: DroopUnits): number {
  let n = u.count > 0 ? u.count - 1 : 0;
  for (let i = 0; i < u.count; i++) n += unitStates(u, i);
  return n;
}

/**
 * Fills the row-major state matrix `a` (stateCount^2) of the reduced model.
 * k: row-major count x count synchronising matrix dP_i/dtheta_j, pu per rad (rows sum to zero).
 */
export function assembleStateMatrix(
  u: DroopUnits,
  k: Float64Array,
  omega0RadPerS: number,
  a: Float64Array,
): number {
  const g = u.count;
  const n = stateCount(u);
  a.fill(0, 0, n * n);
  if (g === 0) return 0;
  // offsets of each unit's first own state; angles delta_1..delta_{g-1} occupy 0..g-2
  const first = u.firstState;
  let off = g - 1;
  for (let i = 0; i < g; i++) {
    first[i] = off;
    off += unitStates(u, i);
  }
  // angle rows: d delta_j / dt = omega_j - omega_0 (omega_i sits on the unit's first state)
  for (let j = 1; j < g; j++) {
    const row = j - 1;
    a[row * n + first[j]!]! += omegaCoef(u, j, omega0RadPerS);
    a[row * n + first[0]!]! -= omegaCoef(u, 0, omega0RadPerS);
  }
  for (let i = 0; i < g; i++) {
    const s = first[i]!;
    if (u.kind[i] === UNIT_INVERTER) {
      const wc = u.filterRadPerS[i]!;
      addPowerRow(u, k, a, n, s, wc, i, omega0RadPerS);
      a[s * n + s]! -= wc;
      continue;
    }
    const m = 2 * u.inertiaS[i]! * u.ratingPu[i]!;
    const pm = s + 1;
    // M dw/dt = Pm - P
    a[s * n + pm]! += 1 / m;
    addPowerRow(u, k, a, n, s, -1 / m, i, omega0RadPerS);
    // damper windings: D_s w on the unit's rating opposes its own speed deviation
    a[s * n + s]! -= (u.swingDampingPu[i]! * u.ratingPu[i]!) / m;
    const rGain = u.ratingPu[i]! / u.droopPu[i]!;
    const iso = u.isochronousGainPuPerS[i]! > 0;
    const z = s + 1 + u.governorOrder[i]!;
    if (u.governorOrder[i] === 1) {
      const tg = u.governorTimeConstantS[i]!;
      a[pm * n + s]! += -rGain / tg;
      a[pm * n + pm]! += -1 / tg;
      if (iso) a[pm * n + z]! += -1 / tg;
    } else {
      const wn = u.governorNaturalRadPerS[i]!;
      const ze = u.governorDampingRatio[i]!;
      const pmd = s + 2;
      a[pm * n + pmd]! += 1;
      a[pmd * n + s]! += -wn * wn * rGain;
      a[pmd * n + pm]! += -wn * wn;
      a[pmd * n + pmd]! += -2 * ze * wn;
      if (iso) a[pmd * n + z]! += -wn * wn;
    }
    if (iso) a[z * n + s]! += u.isochronousGainPuPerS[i]! * u.ratingPu[i]!;
  }
  return n;
}

/** omega_i (rad/s) per unit of the unit's first state: -m for an inverter, omega0 for a genset. */
function omegaCoef(u: DroopUnits, i: number, omega0RadPerS: number): number {
  return u.kind[i] === UNIT_INVERTER
    ? (-u.droopPu[i]! * omega0RadPerS) / u.ratingPu[i]!
    : omega0RadPerS;
}

/** Adds c * P_i to row `row`: P_i = sum_{j>=1} K_ij delta_j + d_i omega_i / omega0. */
function addPowerRow(
  u: DroopUnits,
  k: Float64Array,
  a: Float64Array,
  n: number,
  row: number,
  c: number,
  i: number,
  omega0RadPerS: number,
): void {
  const g = u.count;
  for (let j = 1; j < g; j++) a[row * n + (j - 1)]! += c * k[i * g + j]!;
  a[row * n + u.firstState[i]!]! +=
    (c * u.loadDampingPu[i]! * omegaCoef(u, i, omega0RadPerS)) / omega0RadPerS;
}

/** Neutral modes below this magnitude are skipped, rad/s (numerical zero of a drift mode). */
const NEUTRAL_MODE_RAD_PER_S = 1e-9;

/**
 * Work arrays of the eigenvalue routine, grown to the largest model seen (one set per module
 * instance, i.e. per worker thread; summariseModes is not re-entrant).
 */
const scratch = {
  h: new Float64Array(0),
  re: new Float64Array(0),
  im: new Float64Array(0),
  work: new Float64Array(0),
};

/** Eigenvalues of the n x n row-major matrix and their damping summary. */
export function summariseModes(a: Float64Array, n: number, out: ModeSummary): void {
  out.stateCount = n;
  out.minDampingRatio = 1;
  out.criticalRealPerS = 0;
  out.criticalImagRadPerS = 0;
  out.unstable = false;
  if (n === 0) return;
  if (scratch.h.length < n * n) {
    scratch.h = new Float64Array(n * n);
    scratch.re = new Float64Array(n);
    scratch.im = new Float64Array(n);
    scratch.work = new Float64Array(n);
  }
  scratch.h.set(a.subarray(0, n * n));
  let re: ArrayLike<number> = scratch.re;
  let im: ArrayLike<number> = scratch.im;
  if (!eigenvaluesInPlace(scratch.h, n, scratch.re, scratch.im, scratch.work)) {
    // the QR iteration gave up (not seen in the tests): ml-matrix's routine instead
    const m = new Matrix(n, n);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) m.set(r, c, a[r * n + c]!);
    const e = new EigenvalueDecomposition(m, { assumeSymmetric: false });
    re = e.realEigenvalues;
    im = e.imaginaryEigenvalues;
  }
  for (let i = 0; i < n; i++) {
    const lr = re[i]!;
    const li = im[i]!;
    const mag = Math.hypot(lr, li);
    if (!(mag > NEUTRAL_MODE_RAD_PER_S)) continue;
    const zeta = -lr / mag;
    if (lr > 0) out.unstable = true;
    if (zeta < out.minDampingRatio) {
      out.minDampingRatio = zeta;
      out.criticalRealPerS = lr;
      out.criticalImagRadPerS = Math.abs(li);
    }
  }
}

/** Eigenvalues as [re, im] pairs (for the flow command and tests). */
export function eigenvalues(a: Float64Array, n: number): Array<[number, number]> {
  if (n === 0) return [];
  const m = new Matrix(n, n);
  for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) m.set(r, c, a[r * n + c]!);
  const e = new EigenvalueDecomposition(m, { assumeSymmetric: false });
  return e.realEigenvalues.map((r, i) => [r, e.imaginaryEigenvalues[i]!]);
}
