/**
 * Voltage, loadability and damping of the island once the frequency event has settled: one call
 * per scenario, assembling the power flow (radial-flow.ts), the loading margin
 * (loading-margin.ts) and the small-signal modes (droop-damping.ts) at that operating point.
 *
 * Operating point: each running source delivers ev.outputKwAtEnd; each load draws
 * sc.loadKw * ev.loadServedFraction at 1 pu voltage, with its exponential voltage dependence.
 * Angle reference and mismatch: the bus of the largest running grid-forming source (by kVA) is
 * the root of the sweep; its sources take the power mismatch (the losses and the voltage
 * dependence of the loads) and hold V = 1 pu - n Q through their Q-V droop (several sources on
 * one bus combine as parallel droops, 1/n = sum 1/n_k). Every other bus with a running
 * grid-forming source holds its own droop voltage within its reactive limit (reactiveKvarMax, or
 * for inverters sqrt(S^2 - P^2)); grid-following sources inject P with Q = P tan(phi) from their
 * power factor. The voltage set-points are 1 pu at zero reactive output (the case has no key for
 * them). The flow converges to FLOW_TOL_PU; a flow without a solution is a result: status
 * 'voltage collapse' (past the nose) or 'no solution' (no voltage-holding source, or no
 * convergence), with finite numbers and the violation flag set, never NaN.
 *
 * A NetworkModel carries its own work arrays: one per worker thread, reused scenario after
 * scenario (no allocation on the flow path, nor in the eigenvalue routine after its first call).
 *
 * Screening estimates only: protection settings and interconnection are decided under local codes
 * by licensed engineers.
 */
import type { Case } from '../../case/schema.js';
import type { Scenario } from '../../sample/scenario.js';
import {
  assembleStateMatrix,
  DroopUnits,
  type ModeSummary,
  stateCount,
  summariseModes,
  UNIT_GENSET,
  UNIT_INVERTER,
} from './droop-damping.js';
import { type ResolvedLimits, resolveLimits } from './limit-bands.js';
import { defaultMarginOptions, loadingMargin, MarginWorkspace } from './loading-margin.js';
import { compileNetworkData, type NetworkData, SourceKindCode } from './network.js';
import { FLOW_COLLAPSE, FLOW_OK, RadialFlow } from './radial-flow.js';
import { SynchronisingNetwork } from './synchronising-network.js';

/** Sweep tolerance on the largest voltage change between sweeps, pu (1e-8 of 1 pu). */
export const FLOW_TOL_PU = 1e-8;
/** Sweep iteration limit; the 33-bus feeder converges to 1e-8 pu in about 6. */
export const FLOW_MAX_ITER = 100;

/** The fields of the frequency engine's EventResult this module reads. */
export interface SettledIsland {
  readonly shutdown: boolean;
  readonly runningAtEnd: Uint8Array;
  readonly outputKwAtEnd: Float64Array;
  readonly loadServedFraction: Float64Array;
}

export class VoltageResult {
  status: 'ok' | 'voltage collapse' | 'no solution' = 'ok';
  /** False when the island shut down during the frequency event (nothing left to assess). */
  assessed = false;
  vMinPu = 0;
  /** Bus index (order of case.network.buses); -1 when not assessed. */
  vMinBus = -1;
  vMaxPu = 0;
  vMaxBus = -1;
  lossesKw = 0;
  /** Largest current over rating among rated branches (0 when no branch is rated). */
  maxBranchLoadingFraction = 0;
  /** Index among the closed branches (NetworkData.branchIds); -1 when none is rated. */
  maxBranch = -1;
  voltageViolation = false;
  /** Load factor at the nose point (capped at the search limit; 0 when the base point fails). */
  loadingMargin = 0;
  lowMargin = false;
  minDampingRatio = 1;
  lowDamping = false;
  unstable = false;
  /** Real part (1/s) and frequency (rad/s) of the least damped mode. */
  criticalModeRealPerS = 0;
  criticalModeImagRadPerS = 0;
  /** Root sources beyond their reactive limit: the voltage set-point is not really held. */
  reactiveLimited = false;
  iterations = 0;
}

export interface NetworkModel {
  readonly data: NetworkData;
  readonly limits: ResolvedLimits;
  readonly flow: RadialFlow;
  /**
   * Voltages, angles, PV outputs and branch powers of the last assessed operating point; the
   * flow itself is also restored to it after the margin search.
   */
  readonly baseVPu: Float64Array;
  readonly baseAngleRad: Float64Array;
  readonly basePvQ: Float64Array;
  readonly basePIn: Float64Array;
  readonly baseQIn: Float64Array;
  readonly sync: SynchronisingNetwork;
  readonly margin: MarginWorkspace;
  readonly units: DroopUnits;
  /** Per source: unit parameters for the damping model. */
  readonly droopPu: Float64Array;
  readonly inertiaS: Float64Array;
  readonly governorOrder: Uint8Array;
  readonly governorTimeConstantS: Float64Array;
  readonly governorNaturalRadPerS: Float64Array;
  readonly governorDampingRatio: Float64Array;
  readonly isochronousGainPuPerS: Float64Array;
  readonly swingDampingPu: Float64Array;
  readonly filterRadPerS: Float64Array;
  /** Work arrays. */
  readonly busPvSlot: Int32Array;
  readonly busGfKva: Float64Array;
  readonly busInvDroop: Float64Array;
  readonly busStiff: Uint8Array;
  readonly busShare: Float64Array;
  readonly unitRunning: Uint8Array;
  readonly unitIndex: Int32Array;
  readonly eRe: Float64Array;
  readonly eIm: Float64Array;
  readonly kMatrix: Float64Array;
  stateMatrix: Float64Array;
  readonly modes: ModeSummary;
}

export function compileNetwork(c: Case): NetworkModel {
  const data = compileNetworkData(c);
  const nS = data.sourceCount;
  const droopPu = new Float64Array(nS);
  const inertiaS = new Float64Array(nS);
  const governorOrder = new Uint8Array(nS);
  const governorTimeConstantS = new Float64Array(nS);
  const governorNaturalRadPerS = new Float64Array(nS);
  const governorDampingRatio = new Float64Array(nS);
  const isochronousGainPuPerS = new Float64Array(nS);
  const swingDampingPu = new Float64Array(nS);
  const filterRadPerS = new Float64Array(nS);
  c.sources.forEach((s, k) => {
    if (s.kind === 'genset') {
      droopPu[k] = s.droopPu;
      inertiaS[k] = s.inertiaS;
      governorOrder[k] = s.governor.order;
      if (s.governor.order === 1) governorTimeConstantS[k] = s.governor.timeConstantS;
      else {
        governorNaturalRadPerS[k] = s.governor.naturalFrequencyRadPerS;
        governorDampingRatio[k] = s.governor.dampingRatio;
      }
      isochronousGainPuPerS[k] = s.isochronousGainPuPerS;
      swingDampingPu[k] = s.swingDampingPu;
    } else if (s.kind === 'battery') {
      droopPu[k] = s.droopPu;
      // power-measurement filter corner taken as 1 / responseTimeConstantS (the case's only
      // inverter power-loop time constant; Pogaku et al. use 31.41 rad/s, from memory)
      filterRadPerS[k] = 1 / s.responseTimeConstantS;
    }
  });
  const sync = new SynchronisingNetwork(data);
  const g = sync.unitCount;
  const units = new DroopUnits(Math.max(g, 1));
  const n = data.busCount;
  return {
    data,
    limits: resolveLimits(c),
    flow: new RadialFlow(data),
    baseVPu: new Float64Array(n),
    baseAngleRad: new Float64Array(n),
    basePvQ: new Float64Array(n),
    basePIn: new Float64Array(n),
    baseQIn: new Float64Array(n),
    sync,
    margin: new MarginWorkspace(n),
    units,
    droopPu,
    inertiaS,
    governorOrder,
    governorTimeConstantS,
    governorNaturalRadPerS,
    governorDampingRatio,
    isochronousGainPuPerS,
    swingDampingPu,
    filterRadPerS,
    busPvSlot: new Int32Array(n),
    busGfKva: new Float64Array(n),
    busInvDroop: new Float64Array(n),
    busStiff: new Uint8Array(n),
    busShare: new Float64Array(n),
    unitRunning: new Uint8Array(Math.max(g, 1)),
    unitIndex: new Int32Array(Math.max(g, 1)),
    eRe: new Float64Array(Math.max(g, 1)),
    eIm: new Float64Array(Math.max(g, 1)),
    kMatrix: new Float64Array(Math.max(g * g, 1)),
    stateMatrix: new Float64Array(16),
    modes: {
      minDampingRatio: 1,
      criticalRealPerS: 0,
      criticalImagRadPerS: 0,
      unstable: false,
      stateCount: 0,
    },
  };
}

function resetResult(out: VoltageResult): void {
  out.status = 'ok';
  out.assessed = false;
  out.vMinPu = 0;
  out.vMinBus = -1;
  out.vMaxPu = 0;
  out.vMaxBus = -1;
  out.lossesKw = 0;
  out.maxBranchLoadingFraction = 0;
  out.maxBranch = -1;
  out.voltageViolation = false;
  out.loadingMargin = 0;
  out.lowMargin = false;
  out.minDampingRatio = 1;
  out.lowDamping = false;
  out.unstable = false;
  out.criticalModeRealPerS = 0;
  out.criticalModeImagRadPerS = 0;
  out.reactiveLimited = false;
  out.iterations = 0;
}

export function assessIsland(
  m: NetworkModel,
  sc: Scenario,
  ev: SettledIsland,
  out: VoltageResult,
): void {
  resetResult(out);
  if (ev.shutdown) {
    out.status = 'no solution';
    return;
  }
  const d = m.data;
  const flow = m.flow;
  const base = d.baseKva;
  out.assessed = true;

  // root: the largest running grid-forming source
  let rootSource = -1;
  for (let k = 0; k < d.sourceCount; k++) {
    if (!d.gridForming[k] || !ev.runningAtEnd[k]) continue;
    if (rootSource < 0 || d.sourceKva[k]! > d.sourceKva[rootSource]!) rootSource = k;
  }
  if (rootSource < 0) {
    out.status = 'no solution';
    out.voltageViolation = true;
    out.lowMargin = true;
    return;
  }
  const root = d.sourceBus[rootSource]!;
  const tree = d.trees[root]!;

  flow.resetInjections();
  for (let l = 0; l < d.loadCount; l++) {
    const p = (sc.loadKw[l]! * ev.loadServedFraction[l]!) / base;
    flow.loadP0[l] = p;
    flow.loadQ0[l] = p * d.loadTanPhi[l]!;
  }
  // aggregate the grid-forming sources per bus: kVA, parallel droop, reactive limit, share
  m.busPvSlot.fill(-1);
  m.busGfKva.fill(0);
  m.busInvDroop.fill(0);
  m.busStiff.fill(0);
  m.busShare.fill(0);
  let shareTotal = 0;
  let rootQMaxPu = 0;
  for (let k = 0; k < d.sourceCount; k++) {
    if (!ev.runningAtEnd[k]) continue;
    const b = d.sourceBus[k]!;
    const pPu = ev.outputKwAtEnd[k]! / base;
    if (!d.gridForming[k]) {
      flow.genP[b]! += pPu;
      flow.genQ[b]! += pPu * d.sourceTanPhi[k]!;
      continue;
    }
    const kva = d.sourceKva[k]!;
    const qMaxKvar = Number.isNaN(d.reactiveKvarMax[k]!)
      ? Math.sqrt(Math.max(kva * kva - ev.outputKwAtEnd[k]! ** 2, 0))
      : d.reactiveKvarMax[k]!;
    const nSys = (d.voltageDroopPu[k]! * base) / kva;
    if (nSys === 0) m.busStiff[b] = 1;
    else m.busInvDroop[b]! += 1 / nSys;
    m.busGfKva[b]! += kva;
    // P-f droop sharing of load growth: proportional to rating / droop
    const share = kva / m.droopPu[k]!;
    m.busShare[b]! += Number.isFinite(share) ? share : kva;
    shareTotal += Number.isFinite(share) ? share : kva;
    if (b === root) {
      rootQMaxPu += qMaxKvar / base;
      continue;
    }
    flow.genP[b]! += pPu;
    let slot = m.busPvSlot[b]!;
    if (slot < 0) {
      slot = flow.pvCount++;
      m.busPvSlot[b] = slot;
      flow.pvBus[slot] = b;
      flow.pvV0Pu[slot] = 1;
      flow.pvQMaxPu[slot] = 0;
    }
    flow.pvQMaxPu[slot]! += qMaxKvar / base;
  }
  for (let s = 0; s < flow.pvCount; s++) {
    const b = flow.pvBus[s]!;
    flow.pvDroopPu[s] = m.busStiff[b] ? 0 : 1 / m.busInvDroop[b]!;
    flow.growthShare[b] = m.busShare[b]! / shareTotal;
  }
  flow.rootV0Pu = 1;
  flow.rootDroopPu = m.busStiff[root] ? 0 : 1 / m.busInvDroop[root]!;
  flow.flatStart();
  const st = flow.solve(tree, FLOW_TOL_PU, FLOW_MAX_ITER);
  out.iterations = flow.iterations;
  out.status = st === FLOW_OK ? 'ok' : st === FLOW_COLLAPSE ? 'voltage collapse' : 'no solution';
  m.baseVPu.set(flow.vPu);
  m.baseAngleRad.set(flow.angleRad);

  // voltages, losses, branch loading
  let vMin = Number.POSITIVE_INFINITY;
  let vMax = 0;
  for (let b = 0; b < d.busCount; b++) {
    const v = flow.vPu[b]!;
    if (v < vMin) {
      vMin = v;
      out.vMinBus = b;
    }
    if (v > vMax) {
      vMax = v;
      out.vMaxBus = b;
    }
  }
  out.vMinPu = vMin;
  out.vMaxPu = vMax;
  out.lossesKw = flow.lossesPu * base;
  for (let o = 1; o < tree.order.length; o++) {
    const j = tree.order[o]!;
    const br = tree.parentBranch[j]!;
    const rating = d.ratingPu[br]!;
    if (!Number.isFinite(rating)) continue;
    const iPu = Math.hypot(flow.branchPIn[j]!, flow.branchQIn[j]!) / flow.vPu[j]!;
    const f = iPu / rating;
    if (f > out.maxBranchLoadingFraction) {
      out.maxBranchLoadingFraction = f;
      out.maxBranch = br;
    }
  }
  out.reactiveLimited = Math.abs(flow.rootQPu) > rootQMaxPu;
  out.voltageViolation =
    st !== FLOW_OK || vMin < m.limits.voltageMinPu || vMax > m.limits.voltageMaxPu;

  assessDamping(m, ev, root, rootSource, out);

  if (st === FLOW_OK) {
    const { rootPPu, rootQPu, lossesPu } = flow;
    m.basePvQ.set(flow.pvQ);
    m.basePIn.set(flow.branchPIn);
    m.baseQIn.set(flow.branchQIn);
    out.loadingMargin = loadingMargin(flow, tree, m.margin, defaultMarginOptions);
    // leave the flow at the operating point for callers that read it (holdfast flow)
    flow.vPu.set(m.baseVPu);
    flow.angleRad.set(m.baseAngleRad);
    flow.pvQ.set(m.basePvQ);
    flow.branchPIn.set(m.basePIn);
    flow.branchQIn.set(m.baseQIn);
    flow.rootPPu = rootPPu;
    flow.rootQPu = rootQPu;
    flow.lossesPu = lossesPu;
  }
  out.lowMargin = out.loadingMargin < m.limits.loadingMarginMin;
}

/** Small-signal modes of the running grid-forming sources at the solved operating point. */
function assessDamping(
  m: NetworkModel,
  ev: SettledIsland,
  root: number,
  _rootSource: number,
  out: VoltageResult,
): void {
  const d = m.data;
  const flow = m.flow;
  const base = d.baseKva;
  const sync = m.sync;
  const g = sync.unitCount;
  let loadDampingPu = 0;
  for (let l = 0; l < d.loadCount; l++) loadDampingPu += flow.loadP0[l]! * d.loadFreqSensPu[l]!;
  let runningKva = 0;
  for (let u = 0; u < g; u++) {
    const k = sync.unitSource[u]!;
    m.unitRunning[u] = ev.runningAtEnd[k]!;
    if (m.unitRunning[u]) runningKva += d.sourceKva[k]!;
  }
  // internal voltages E = V + j x I, I = conj(S / V); the bus's P and Q split by kVA
  for (let u = 0; u < g; u++) {
    if (!m.unitRunning[u]) continue;
    const k = sync.unitSource[u]!;
    const b = d.sourceBus[k]!;
    const frac = d.sourceKva[k]! / m.busGfKva[b]!;
    const slot = m.busPvSlot[b]!;
    const p = b === root ? flow.rootPPu * frac : ev.outputKwAtEnd[k]! / base;
    const q = b === root ? flow.rootQPu * frac : slot >= 0 ? flow.pvQ[slot]! * frac : 0;
    const v = flow.vPu[b]!;
    const th = flow.angleRad[b]!;
    const vr = v * Math.cos(th);
    const vi = v * Math.sin(th);
    // I = (P - jQ) / conj(V) = (P - jQ) V / |V|^2
    const ir = (p * vr + q * vi) / (v * v);
    const ii = (p * vi - q * vr) / (v * v);
    const x = sync.reactancePu[u]!;
    m.eRe[u] = vr - x * ii;
    m.eIm[u] = vi + x * ir;
  }
  const count = sync.synchronising(m.unitRunning, m.eRe, m.eIm, m.unitIndex, m.kMatrix);
  const units = m.units;
  units.count = count;
  for (let a = 0; a < count; a++) {
    const k = sync.unitSource[m.unitIndex[a]!]!;
    const genset = d.sourceKind[k] === SourceKindCode.Genset;
    units.kind[a] = genset ? UNIT_GENSET : UNIT_INVERTER;
    units.droopPu[a] = m.droopPu[k]!;
    units.ratingPu[a] = d.sourceKva[k]! / base;
    units.filterRadPerS[a] = m.filterRadPerS[k]!;
    units.inertiaS[a] = m.inertiaS[k]!;
    units.governorOrder[a] = m.governorOrder[k]!;
    units.governorTimeConstantS[a] = m.governorTimeConstantS[k]!;
    units.governorNaturalRadPerS[a] = m.governorNaturalRadPerS[k]!;
    units.governorDampingRatio[a] = m.governorDampingRatio[k]!;
    units.isochronousGainPuPerS[a] = m.isochronousGainPuPerS[k]!;
    units.swingDampingPu[a] = m.swingDampingPu[k]!;
    units.loadDampingPu[a] = (loadDampingPu * d.sourceKva[k]!) / runningKva;
  }
  const n = stateCount(units);
  if (m.stateMatrix.length < n * n) m.stateMatrix = new Float64Array(n * n);
  assembleStateMatrix(units, m.kMatrix, 2 * Math.PI * d.frequencyHz, m.stateMatrix);
  summariseModes(m.stateMatrix, n, m.modes);
  out.minDampingRatio = m.modes.minDampingRatio;
  out.criticalModeRealPerS = m.modes.criticalRealPerS;
  out.criticalModeImagRadPerS = m.modes.criticalImagRadPerS;
  out.unstable = m.modes.unstable;
  out.lowDamping = m.modes.minDampingRatio < m.limits.dampingRatioMin;
}
