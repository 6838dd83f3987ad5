/**
 * Loadability margin of the island: the factor lambda by which every load can grow at constant
 * power factor before the power flow has no solution (the nose point of the P-V curve).
 *
 * Load model: the growth is at constant power and constant power factor from the operating
 * point's actual demand P0 V^alpha: voltage-dependent loads are taken as restored to constant
 * power in the time frame of voltage stability (thermostats, motors re-accelerating; load
 * restoration, Van Cutsem & Vournas, Voltage Stability of Electric Power Systems, Kluwer 1998,
 * ch. 4, from memory). This also makes the nose exist for impedance-like loads.
 *
 * Method: bracket the nose by doubling lambda from the operating point, then bisect on lambda;
 * a sweep that reports voltage collapse (a branch discriminant stays negative, see
 * radial-flow.ts) or does not converge counts as beyond the nose. Each trial warm-starts from the
 * last solvable point. The growth in demand is picked up by the voltage-holding sources in
 * proportion to their share (growthShare; the root takes the rest and the losses).
 * Continuation power flow (Ajjarapu & Christy, IEEE Trans. Power Systems 7(1):416-423, 1992,
 * citation from memory) would trace the curve itself; bisection is enough for the margin.
 *
 * Accuracy: the result lies within relTol (relative) below the nose found by the sweep; near the
 * nose the sweep's convergence slows (its contraction factor tends to 1), so a trial that runs out
 * of iterations is counted as collapsed and the margin errs low by that much.
 * Check: a two-bus line feeding a constant-power load has the closed-form nose
 * S_max = E^2 / (2 |Z| (1 + cos(theta - phi))) (test/grid/voltage/loading-margin.test.ts).
 */
import type { RadialTree } from './network.js';
import { FLOW_OK, type RadialFlow } from './radial-flow.js';

export interface MarginOptions {
  /** Sweep convergence tolerance, pu. */
  readonly tolPu: number;
  /** Sweep iteration limit per trial. */
  readonly maxIter: number;
  /** Bisection stops when (hi - lo) <= relTol * lo. */
  readonly relTol: number;
  /** Largest factor searched; returned when the flow still solves there. */
  readonly maxFactor: number;
}

/**
 * 1 % relative on lambda: well inside the spread of load forecasts, and it keeps the search to
 * about 8 sweeps (common practice, no source). Trials only decide solvability, so their sweep
 * tolerance is looser than the operating point's.
 */
export const defaultMarginOptions: MarginOptions = {
  tolPu: 1e-6,
  maxIter: 40,
  relTol: 1e-2,
  maxFactor: 20,
};

/** Work arrays for the warm start, one per bus. */
export class MarginWorkspace {
  readonly vBest: Float64Array;
  readonly qBest: Float64Array;
  loadP0: Float64Array = new Float64Array(0);
  loadQ0: Float64Array = new Float64Array(0);
  constructor(busCount: number) {
    this.vBest = new Float64Array(busCount);
    this.qBest = new Float64Array(busCount);
  }
}

/**
 * The loading margin of the flow's present inputs (loads, generation, growth shares); expects the
 * flow to hold the converged base solution (lambda = 1). Restores the loads and loadScale but
 * leaves the voltages at the last trial: read the base results before calling.
 */
export function loadingMargin(
  flow: RadialFlow,
  tree: RadialTree,
  ws: MarginWorkspace,
  opts: MarginOptions,
): number {
  ws.vBest.set(flow.vPu);
  ws.qBest.set(flow.pvQ);
  const net = flow.net;
  if (ws.loadP0.length !== net.loadCount) {
    ws.loadP0 = new Float64Array(net.loadCount);
    ws.loadQ0 = new Float64Array(net.loadCount);
  }
  // freeze each load at its operating-point demand, as constant power
  ws.loadP0.set(flow.loadP0);
  ws.loadQ0.set(flow.loadQ0);
  for (let l = 0; l < net.loadCount; l++) {
    const v = flow.vPu[net.loadBus[l]!]!;
    flow.loadP0[l] = flow.loadP0[l]! * v ** net.loadExpP[l]!;
    flow.loadQ0[l] = flow.loadQ0[l]! * v ** net.loadExpQ[l]!;
  }
  flow.constantPowerLoads = true;
  const lambda = searchNose(flow, tree, ws, opts);
  flow.constantPowerLoads = false;
  flow.loadP0.set(ws.loadP0);
  flow.loadQ0.set(ws.loadQ0);
  flow.loadScale = 1;
  return lambda;
}

function searchNose(
  flow: RadialFlow,
  tree: RadialTree,
  ws: MarginWorkspace,
  opts: MarginOptions,
): number {
  let lo = 1;
  let hi = 2;
  let bracketed = false;
  while (!bracketed) {
    if (trial(flow, tree, ws, hi, opts)) {
      lo = hi;
      if (hi >= opts.maxFactor) return opts.maxFactor;
      hi = Math.min(2 * hi, opts.maxFactor);
    } else {
      bracketed = true;
    }
  }
  while (hi - lo > opts.relTol * lo) {
    const mid = 0.5 * (lo + hi);
    if (trial(flow, tree, ws, mid, opts)) lo = mid;
    else hi = mid;
  }
  return lo;
}

function trial(
  flow: RadialFlow,
  tree: RadialTree,
  ws: MarginWorkspace,
  factor: number,
  opts: MarginOptions,
): boolean {
  flow.vPu.set(ws.vBest);
  flow.pvQ.set(ws.qBest);
  flow.loadScale = factor;
  const ok = flow.solve(tree, opts.tolPu, opts.maxIter) === FLOW_OK;
  if (ok) {
    ws.vBest.set(flow.vPu);
    ws.qBest.set(flow.pvQ);
  }
  return ok;
}
