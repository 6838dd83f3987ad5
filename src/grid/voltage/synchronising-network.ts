/**
 * The synchronising coefficients dP_i/dtheta_j between the internal voltages of the island's
 * voltage-holding sources: the network seen by the droop and swing dynamics.
 *
 * Each grid-forming source is an internal voltage E_k behind a reactance x_k (genset transient
 * reactance 0.25 pu, inverter coupling reactance 0.10 pu, both on the unit's rating, from memory;
 * the case has no key for them). Loads are constant power and so inject no current change: the
 * bus nodes are eliminated by Kron reduction, Y_red = Y_gg - Y_gb Y_bb^-1 Y_bg (Kundur, Power
 * System Stability and Control, 1994, sec. 12.3, from memory), once per case. Per scenario the
 * sources that are not running are eliminated the same way (a node without injection carries no
 * current through its reactance, which equals an open unit), and at the operating point
 *   K_ij = |E_i||E_j| (G_ij sin theta_ij - B_ij cos theta_ij)  (i != j),  K_ii = -sum_j K_ij
 * (Y_red = G + jB, theta_ij = theta_i - theta_j), the Jacobian of P_i = Re(E_i conj(sum_j Y_ij E_j)).
 */
import { Matrix, solve } from 'ml-matrix';
import { type NetworkData, SourceKindCode } from './network.js';

/** Genset transient reactance, pu on its rating (0.2-0.3 pu typical, from memory). */
export const GENSET_REACTANCE_PU = 0.25;
/** Inverter output filter / coupling reactance, pu on its rating (0.05-0.15 pu, from memory). */
export const INVERTER_REACTANCE_PU = 0.1;
/** Floor on a branch impedance so that bus ties stay invertible, pu. */
const MIN_IMPEDANCE_PU = 1e-6;

export class SynchronisingNetwork {
  /** Source index of each grid-forming unit, in source order. */
  readonly unitSource: Int32Array;
  readonly unitCount: number;
  /** Internal reactance of each unit, pu on the system base. */
  readonly reactancePu: Float64Array;
  /** Kron-reduced admittance between all units' internal nodes (row-major). */
  private readonly yRe: Float64Array;
  private readonly yIm: Float64Array;
  private readonly wRe: Float64Array;
  private readonly wIm: Float64Array;
  private readonly alive: Uint8Array;

  constructor(readonly net: NetworkData) {
    const units: number[] = [];
    for (let k = 0; k < net.sourceCount; k++) if (net.gridForming[k]) units.push(k);
    const g = units.length;
    this.unitCount = g;
    this.unitSource = Int32Array.from(units);
    this.reactancePu = new Float64Array(g);
    for (let u = 0; u < g; u++) {
      const k = units[u]!;
      const xOwn =
        net.sourceKind[k] === SourceKindCode.Genset ? GENSET_REACTANCE_PU : INVERTER_REACTANCE_PU;
      this.reactancePu[u] = (xOwn * net.baseKva) / net.sourceKva[k]!;
    }
    this.yRe = new Float64Array(g * g);
    this.yIm = new Float64Array(g * g);
    this.wRe = new Float64Array(g * g);
    this.wIm = new Float64Array(g * g);
    this.alive = new Uint8Array(g);
    if (g > 0) this.reduce();
  }

  /** Kron reduction onto the internal nodes, in the real 2x2-block form of complex matrices. */
  private reduce(): void {
    const net = this.net;
    const n = net.busCount;
    const g = this.unitCount;
    const N = n + g;
    const yr = new Float64Array(N * N);
    const yi = new Float64Array(N * N);
    const addBranch = (a: number, b: number, r: number, x: number): void => {
      const zr = r;
      let zi = x;
      if (Math.hypot(zr, zi) < MIN_IMPEDANCE_PU) zi = MIN_IMPEDANCE_PU;
      const d = zr * zr + zi * zi;
      const gr = zr / d;
      const bi = -zi / d;
      yr[a * N + a]! += gr;
      yi[a * N + a]! += bi;
      yr[b * N + b]! += gr;
      yi[b * N + b]! += bi;
      yr[a * N + b]! -= gr;
      yi[a * N + b]! -= bi;
      yr[b * N + a]! -= gr;
      yi[b * N + a]! -= bi;
    };
    for (let k = 0; k < net.branchCount; k++)
      addBranch(net.branchFrom[k]!, net.branchTo[k]!, net.rPu[k]!, net.xPu[k]!);
    for (let u = 0; u < g; u++)
      addBranch(n + u, net.sourceBus[this.unitSource[u]!]!, 0, this.reactancePu[u]!);
    // real block form [[G, -B], [B, G]]
    const block = (r0: number, c0: number, rows: number, cols: number): Matrix => {
      const m = new Matrix(2 * rows, 2 * cols);
      for (let r = 0; r < rows; r++)
        for (let c = 0; c < cols; c++) {
          const gr = yr[(r0 + r) * N + c0 + c]!;
          const bi = yi[(r0 + r) * N + c0 + c]!;
          m.set(r, c, gr);
          m.set(r, cols + c, -bi);
          m.set(rows + r, c, bi);
          m.set(rows + r, cols + c, gr);
        }
      return m;
    };
    const ybb = block(0, 0, n, n);
    const ybg = block(0, n, n, g);
    const ygb = block(n, 0, g, n);
    const ygg = block(n, n, g, g);
    const red = ygg.sub(ygb.mmul(solve(ybb, ybg)));
    for (let r = 0; r < g; r++)
      for (let c = 0; c < g; c++) {
        this.yRe[r * g + c] = red.get(r, c);
        this.yIm[r * g + c] = red.get(g + r, c);
      }
  }

  /**
   * Synchronising matrix of the running units at internal voltages (eRe, eIm per unit, pu).
   * Writes the running units' indices into `outUnits` and K (count^2, row-major) into `outK`;
   * returns the count.
   */
  synchronising(
    running: Uint8Array,
    eRe: Float64Array,
    eIm: Float64Array,
    outUnits: Int32Array,
    outK: Float64Array,
  ): number {
    const g = this.unitCount;
    const wr = this.wRe;
    const wi = this.wIm;
    wr.set(this.yRe);
    wi.set(this.yIm);
    let count = 0;
    for (let u = 0; u < g; u++) {
      this.alive[u] = running[u]!;
      if (running[u]) outUnits[count++] = u;
    }
    // eliminate units that are not running: W_ij -= W_ip W_pj / W_pp
    for (let p = 0; p < g; p++) {
      if (this.alive[p]) continue;
      const pr = wr[p * g + p]!;
      const pi = wi[p * g + p]!;
      const d = pr * pr + pi * pi;
      if (d === 0) continue;
      for (let i = 0; i < g; i++) {
        if (i === p || (!this.alive[i] && i < p)) continue;
        const ar = wr[i * g + p]!;
        const ai = wi[i * g + p]!;
        // f = W_ip / W_pp
        const fr = (ar * pr + ai * pi) / d;
        const fi = (ai * pr - ar * pi) / d;
        for (let j = 0; j < g; j++) {
          if (j === p) continue;
          const br = wr[p * g + j]!;
          const bi = wi[p * g + j]!;
          wr[i * g + j]! -= fr * br - fi * bi;
          wi[i * g + j]! -= fr * bi + fi * br;
        }
      }
    }
    for (let a = 0; a < count; a++) {
      const i = outUnits[a]!;
      const ei = Math.hypot(eRe[i]!, eIm[i]!);
      const ti = Math.atan2(eIm[i]!, eRe[i]!);
      let diag = 0;
      for (let b = 0; b < count; b++) {
        if (a === b) continue;
        const j = outUnits[b]!;
        const ej = Math.hypot(eRe[j]!, eIm[j]!);
        const tij = ti - Math.atan2(eIm[j]!, eRe[j]!);
        const kij = ei * ej * (wr[i * g + j]! * Math.sin(tij) - wi[i * g + j]! * Math.cos(tij));
        outK[a * count + b] = kij;
        diag -= kij;
      }
      outK[a * count + a] = diag;
    }
    return count;
  }
}
