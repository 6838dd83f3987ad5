/**
 * AC power flow of a radial network by backward/forward sweep on branch powers, with the root
 * bus holding its voltage through a Q-V droop and further voltage-holding (PV) buses.
 *
 * Backward sweep (leaves to root), for the branch i -> j feeding bus j:
 *   P_j = Pd_j(V_j) - Pg_j + sum over children k of (P_k + r_k (P_k^2 + Q_k^2) / V_k^2), Q alike
 * where P_j, Q_j are the powers arriving at the receiving end j and Pd = P0 * scale * V^alpha
 * (loads with exponential voltage dependence, exponents voltageExponentP/Q).
 * Forward sweep (root to leaves): with a = r P_j + x Q_j, b = x P_j - r Q_j the receiving
 * voltage solves the branch quadratic
 *   V_j^4 + (2a - V_i^2) V_j^2 + (r^2 + x^2)(P_j^2 + Q_j^2) = 0,
 * V_j^2 = ((V_i^2 - 2a) + sqrt(D)) / 2, D = (V_i^2 - 2a)^2 - 4 (a^2 + b^2), the high-voltage root;
 * the angle follows from theta_j = theta_i - atan2(b, V_j^2 + a). D < 0 means the branch cannot
 * carry the power at any voltage: past the nose point (voltage collapse).
 * This is the DistFlow branch model of Baran & Wu, IEEE Trans. Power Delivery 4(2):1401-1407,
 * 1989 (REFERENCES.md 7), solved per branch in closed form as in Das, Kothari & Kalam, "Simple and
 * efficient method for load flow solution of radial distribution networks", Int. J. Electrical
 * Power & Energy Systems 17(5):335-346, 1995 (citation from memory).
 *
 * Voltage control: the root (the island's angle reference and the bus that takes the power
 * mismatch, i.e. the losses) holds V_root = V0 - n_root Q_root; every other voltage-holding bus k
 * holds V_k = V0_k - n_k Q_k within [-Qmax_k, Qmax_k], its reactive output corrected each sweep by
 * (X + diag(n)) dQ = V0 - n Q - V, with X_kj the reactance of the path shared by k and j from the
 * root (the usual radial sensitivity dV_k/dQ_j ~ X_kj at V ~ 1 pu; breakpoint compensation,
 * Shirmohammadi et al., IEEE Trans. Power Systems 3(2):753-762, 1988, citation from memory).
 *
 * Converged when the largest voltage change between sweeps and the largest PV residual are both
 * below tolPu. Status: 0 converged, 1 voltage collapse (a negative discriminant persists or the
 * voltage falls below 0.2 pu), 2 no convergence within maxIter. Never NaN.
 */
import type { NetworkData, RadialTree } from './network.js';

export const FLOW_OK = 0;
export const FLOW_COLLAPSE = 1;
export const FLOW_NO_CONVERGENCE = 2;
export type FlowStatus = typeof FLOW_OK | typeof FLOW_COLLAPSE | typeof FLOW_NO_CONVERGENCE;

/** Below this a bus voltage is taken as collapsed, pu (common practice, no source). */
const COLLAPSE_VOLTAGE_PU = 0.2;

/** Depth and cumulative reactance from the root of each bus of a tree. */
interface TreeMetrics {
  depth: Int32Array;
  xFromRootPu: Float64Array;
}

export class RadialFlow {
  /** Per load: demand at 1 pu voltage, pu of the power base (before loadScale). */
  readonly loadP0: Float64Array;
  readonly loadQ0: Float64Array;
  /** Per bus: fixed injections of grid-following sources and PV buses' active power, pu. */
  readonly genP: Float64Array;
  readonly genQ: Float64Array;
  /** Per bus: share of the load growth (loadScale - 1) picked up there (non-root buses). */
  readonly growthShare: Float64Array;
  loadScale = 1;
  /** Treat every load as constant power (exponents 0); the loading margin search sets it. */
  constantPowerLoads = false;
  /**
   * Give up as soon as the sweep evidently cannot converge within maxIter: from the 4th sweep on,
   * the contraction rho = dV_k / dV_(k-1) is read as that of a linear iteration, and when
   * dV_k * rho^(maxIter - k) stays above tolPu (or rho >= 1) on 3 sweeps in a row the solve stops
   * with the status it would have reached at maxIter (no convergence, or collapse past the nose).
   * The margin search sets it; its trials only decide solvability.
   */
  stopWhenHopeless = false;

  rootV0Pu = 1;
  /** Root Q-V droop, pu voltage per pu reactive power on the system base. */
  rootDroopPu = 0;

  /** Voltage-holding buses other than the root. */
  pvCount = 0;
  readonly pvBus: Int32Array;
  readonly pvV0Pu: Float64Array;
  readonly pvDroopPu: Float64Array;
  readonly pvQMaxPu: Float64Array;
  /** Reactive output of each PV bus, pu (state of the iteration; the result when converged). */
  readonly pvQ: Float64Array;

  // results
  readonly vPu: Float64Array;
  readonly angleRad: Float64Array;
  /** Per bus: power arriving over its parent branch at the bus end, pu. */
  readonly branchPIn: Float64Array;
  readonly branchQIn: Float64Array;
  lossesPu = 0;
  rootPPu = 0;
  rootQPu = 0;
  iterations = 0;

  private readonly vOld: Float64Array;
  private readonly sumP: Float64Array;
  private readonly sumQ: Float64Array;
  private readonly mat: Float64Array;
  private readonly rhs: Float64Array;
  private readonly active: Uint8Array;
  private readonly metrics: (TreeMetrics | undefined)[];

  constructor(readonly net: NetworkData) {
    const n = net.busCount;
    this.loadP0 = new Float64Array(net.loadCount);
    this.loadQ0 = new Float64Array(net.loadCount);
    this.genP = new Float64Array(n);
    this.genQ = new Float64Array(n);
    this.growthShare = new Float64Array(n);
    this.pvBus = new Int32Array(n);
    this.pvV0Pu = new Float64Array(n);
    this.pvDroopPu = new Float64Array(n);
    this.pvQMaxPu = new Float64Array(n);
    this.pvQ = new Float64Array(n);
    this.vPu = new Float64Array(n);
    this.angleRad = new Float64Array(n);
    this.branchPIn = new Float64Array(n);
    this.branchQIn = new Float64Array(n);
    this.vOld = new Float64Array(n);
    this.sumP = new Float64Array(n);
    this.sumQ = new Float64Array(n);
    this.mat = new Float64Array(n * n);
    this.rhs = new Float64Array(n);
    this.active = new Uint8Array(n);
    this.metrics = net.trees.map((t) => (t ? treeMetrics(net, t) : undefined));
  }

  /** Clears injections, PV buses, growth shares and scale (loads are left as they are). */
  resetInjections(): void {
    this.genP.fill(0);
    this.genQ.fill(0);
    this.growthShare.fill(0);
    this.pvCount = 0;
    this.loadScale = 1;
    this.rootV0Pu = 1;
    this.rootDroopPu = 0;
  }

  /** Flat start: every bus at the root set-point, PV outputs at zero. */
  flatStart(): void {
    this.vPu.fill(this.rootV0Pu);
    this.angleRad.fill(0);
    this.pvQ.fill(0);
  }

  /**
   * Solves the flow on `tree`; warm-starts from the present vPu and pvQ (call flatStart first for
   * a cold start). Returns the status; results are in vPu, angleRad, branch powers and losses.
   */
  solve(tree: RadialTree, tolPu: number, maxIter: number): FlowStatus {
    const net = this.net;
    const { rPu, xPu } = net;
    const { order, parent, parentBranch } = tree;
    const n = net.busCount;
    const root = tree.root;
    const v = this.vPu;
    const sumP = this.sumP;
    const sumQ = this.sumQ;
    const pIn = this.branchPIn;
    const qIn = this.branchQIn;
    const scale = this.loadScale;
    let loadTotalP0 = 0;
    for (let l = 0; l < net.loadCount; l++) loadTotalP0 += this.loadP0[l]!;
    const growthPu = (scale - 1) * loadTotalP0;

    let status: FlowStatus = FLOW_NO_CONVERGENCE;
    let iter = 0;
    let prevDv = Number.POSITIVE_INFINITY;
    let hopeless = 0;
    for (iter = 1; iter <= maxIter; iter++) {
      // bus demand at the present voltages, minus fixed generation
      for (let b = 0; b < n; b++) {
        sumP[b] = -this.genP[b]! - growthPu * this.growthShare[b]!;
        sumQ[b] = -this.genQ[b]!;
      }
      for (let k = 0; k < this.pvCount; k++) sumQ[this.pvBus[k]!]! -= this.pvQ[k]!;
      if (this.constantPowerLoads) {
        for (let l = 0; l < net.loadCount; l++) {
          const b = net.loadBus[l]!;
          sumP[b]! += this.loadP0[l]! * scale;
          sumQ[b]! += this.loadQ0[l]! * scale;
        }
      } else {
        for (let l = 0; l < net.loadCount; l++) {
          const b = net.loadBus[l]!;
          const vb = v[b]!;
          sumP[b]! += this.loadP0[l]! * scale * voltagePower(vb, net.loadExpP[l]!);
          sumQ[b]! += this.loadQ0[l]! * scale * voltagePower(vb, net.loadExpQ[l]!);
        }
      }
      // backward sweep: leaves first
      let losses = 0;
      for (let o = n - 1; o > 0; o--) {
        const j = order[o]!;
        const br = parentBranch[j]!;
        const pj = sumP[j]!;
        const qj = sumQ[j]!;
        pIn[j] = pj;
        qIn[j] = qj;
        const vj = v[j]!;
        const s2OverV2 = (pj * pj + qj * qj) / (vj * vj);
        const lossP = rPu[br]! * s2OverV2;
        losses += lossP;
        const i = parent[j]!;
        sumP[i]! += pj + lossP;
        sumQ[i]! += qj + xPu[br]! * s2OverV2;
      }
      this.rootPPu = sumP[root]!;
      this.rootQPu = sumQ[root]!;
      this.lossesPu = losses;
      // forward sweep: the root holds its droop voltage
      for (let b = 0; b < n; b++) this.vOld[b] = v[b]!;
      v[root] = this.rootV0Pu - this.rootDroopPu * this.rootQPu;
      let nose = false;
      let collapsed = v[root]! < COLLAPSE_VOLTAGE_PU;
      let maxDv = Math.abs(v[root]! - this.vOld[root]!);
      for (let o = 1; o < n; o++) {
        const j = order[o]!;
        const br = parentBranch[j]!;
        const r = rPu[br]!;
        const x = xPu[br]!;
        const pj = pIn[j]!;
        const qj = qIn[j]!;
        const vi = v[parent[j]!]!;
        const a = r * pj + x * qj;
        const b = x * pj - r * qj;
        const c1 = vi * vi - 2 * a;
        const disc = c1 * c1 - 4 * (a * a + b * b);
        let vj2: number;
        if (disc >= 0 && c1 > 0) {
          vj2 = 0.5 * (c1 + Math.sqrt(disc));
        } else {
          // past the nose on this sweep: hold the nose voltage and let the iteration decide
          nose = true;
          vj2 = c1 > 0 ? 0.5 * c1 : 0;
        }
        const vj = Math.sqrt(vj2);
        if (vj < COLLAPSE_VOLTAGE_PU) collapsed = true;
        v[j] = Math.max(vj, COLLAPSE_VOLTAGE_PU);
        const dv = Math.abs(v[j]! - this.vOld[j]!);
        if (dv > maxDv) maxDv = dv;
      }
      if (collapsed) {
        status = FLOW_COLLAPSE;
        break;
      }
      const pvResidual = this.pvCount > 0 ? this.updatePvOutputs(tree) : 0;
      if (maxDv < tolPu && pvResidual < tolPu) {
        status = nose ? FLOW_COLLAPSE : FLOW_OK;
        break;
      }
      if (iter === maxIter && nose) status = FLOW_COLLAPSE;
      if (this.stopWhenHopeless) {
        const rho = maxDv / prevDv;
        const left = maxIter - iter;
        hopeless = iter >= 4 && (rho >= 1 || maxDv * rho ** left > tolPu) ? hopeless + 1 : 0;
        if (hopeless >= 3) {
          if (nose) status = FLOW_COLLAPSE;
          break;
        }
      }
      prevDv = maxDv;
    }
    this.iterations = Math.min(iter, maxIter);
    if (status === FLOW_OK) this.computeAngles(tree);
    return status;
  }

  /** Sum over buses of the angle relative to the root, filled only after convergence. */
  private computeAngles(tree: RadialTree): void {
    const { rPu, xPu } = this.net;
    const { order, parent, parentBranch } = tree;
    const v = this.vPu;
    this.angleRad[tree.root] = 0;
    for (let o = 1; o < order.length; o++) {
      const j = order[o]!;
      const br = parentBranch[j]!;
      const pj = this.branchPIn[j]!;
      const qj = this.branchQIn[j]!;
      const a = rPu[br]! * pj + xPu[br]! * qj;
      const b = xPu[br]! * pj - rPu[br]! * qj;
      this.angleRad[j] = this.angleRad[parent[j]!]! - Math.atan2(b, v[j]! * v[j]! + a);
    }
  }

  /**
   * One Newton-like correction of the PV buses' reactive outputs; returns the largest residual
   * |V0 - n Q - V| over the buses not held at a reactive limit.
   */
  private updatePvOutputs(tree: RadialTree): number {
    const m = this.metrics[tree.root]!;
    const np = this.pvCount;
    const mat = this.mat;
    const rhs = this.rhs;
    let worst = 0;
    let na = 0;
    for (let k = 0; k < np; k++) {
      const b = this.pvBus[k]!;
      const res = this.pvV0Pu[k]! - this.pvDroopPu[k]! * this.pvQ[k]! - this.vPu[b]!;
      const q = this.pvQ[k]!;
      const qMax = this.pvQMaxPu[k]!;
      // at a limit and pushed beyond it: the bus is PQ for this sweep
      const held = (q >= qMax && res > 0) || (q <= -qMax && res < 0);
      this.active[k] = held ? 0 : 1;
      if (!held) {
        rhs[na++] = res;
        if (Math.abs(res) > worst) worst = Math.abs(res);
      }
    }
    if (na === 0) return 0;
    // (X + diag n) dQ = residual over the active PV buses
    let r = 0;
    for (let k = 0; k < np; k++) {
      if (!this.active[k]) continue;
      let c = 0;
      for (let j = 0; j < np; j++) {
        if (!this.active[j]) continue;
        let xkj = commonPathReactance(tree, m, this.pvBus[k]!, this.pvBus[j]!);
        if (k === j) xkj += this.pvDroopPu[k]!;
        mat[r * na + c] = xkj;
        c++;
      }
      r++;
    }
    solveDenseInPlace(mat, rhs, na);
    let a = 0;
    for (let k = 0; k < np; k++) {
      if (!this.active[k]) continue;
      const qMax = this.pvQMaxPu[k]!;
      const q = this.pvQ[k]! + rhs[a++]!;
      this.pvQ[k] = Math.min(Math.max(q, -qMax), qMax);
    }
    return worst;
  }
}

/** V^alpha with the three common exponents (constant power, current, impedance) done exactly. */
function voltagePower(v: number, alpha: number): number {
  if (alpha === 0) return 1;
  if (alpha === 1) return v;
  if (alpha === 2) return v * v;
  return v ** alpha;
}

function treeMetrics(net: NetworkData, t: RadialTree): TreeMetrics {
  const depth = new Int32Array(net.busCount);
  const xFromRootPu = new Float64Array(net.busCount);
  for (let o = 1; o < t.order.length; o++) {
    const j = t.order[o]!;
    const i = t.parent[j]!;
    depth[j] = depth[i]! + 1;
    xFromRootPu[j] = xFromRootPu[i]! + net.xPu[t.parentBranch[j]!]!;
  }
  return { depth, xFromRootPu };
}

/** Reactance of the path from the root shared by buses a and b: that of their lowest common ancestor. */
function commonPathReactance(t: RadialTree, m: TreeMetrics, a: number, b: number): number {
  while (m.depth[a]! > m.depth[b]!) a = t.parent[a]!;
  while (m.depth[b]! > m.depth[a]!) b = t.parent[b]!;
  while (a !== b) {
    a = t.parent[a]!;
    b = t.parent[b]!;
  }
  return m.xFromRootPu[a]!;
}

/**
 * Gaussian elimination with partial pivoting on an n x n row-major matrix; the solution replaces
 * `rhs`. A singular pivot leaves that unknown at zero (the PV correction is then skipped for it).
 */
export function solveDenseInPlace(a: Float64Array, rhs: Float64Array, n: number): void {
  for (let c = 0; c < n; c++) {
    let piv = c;
    let best = Math.abs(a[c * n + c]!);
    for (let r = c + 1; r < n; r++) {
      const v = Math.abs(a[r * n + c]!);
      if (v > best) {
        best = v;
        piv = r;
      }
    }
    if (best < 1e-300) continue;
    if (piv !== c) {
      for (let k = 0; k < n; k++) {
        const t = a[c * n + k]!;
        a[c * n + k] = a[piv * n + k]!;
        a[piv * n + k] = t;
      }
      const t = rhs[c]!;
      rhs[c] = rhs[piv]!;
      rhs[piv] = t;
    }
    const d = a[c * n + c]!;
    for (let r = c + 1; r < n; r++) {
      const f = a[r * n + c]! / d;
      if (f === 0) continue;
      for (let k = c; k < n; k++) a[r * n + k]! -= f * a[c * n + k]!;
      rhs[r]! -= f * rhs[c]!;
    }
  }
  for (let c = n - 1; c >= 0; c--) {
    const d = a[c * n + c]!;
    if (Math.abs(d) < 1e-300) {
      rhs[c] = 0;
      continue;
    }
    let s = rhs[c]!;
    for (let k = c + 1; k < n; k++) s -= a[c * n + k]! * rhs[k]!;
    rhs[c] = s / d;
  }
}
