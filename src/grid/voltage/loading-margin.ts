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
 * Method: bracket the nose by doubling lambda from the operating point, then narrow the bracket
 * [lo, hi] with a predictor: the weakest bus's P-V curve near the nose is a parabola lambda(V), so
 * the vertex of the parabola through the last three solved points predicts the nose; the next
 * trial goes just below it and the bracket is confirmed one tolerance step above (bisection
 * whenever the prediction falls outside the bracket, as in Brent's safeguarded methods). When the
 * parabola puts the nose at or beyond a failed trial hi, the next trial goes one tolerance step
 * below hi (once in a row; bisection if it fails too), which closes the bracket when it solves.
 * A sweep that reports voltage collapse (a branch discriminant stays negative, see
 * radial-flow.ts) or does not converge counts as beyond the nose; trials stop a sweep as soon as
 * it evidently cannot converge within maxIter (RadialFlow.stopWhenHopeless). Each trial warm-starts from the
 * last solvable point. The growth in demand is picked up by the voltage-holding sources in
 * proportion to their share (growthShare; the root takes the rest and the losses).
 * Continuation power flow (Ajjarapu & Christy, IEEE Trans. Power Systems 7(1):416-423, 1992,
 * citation from memory) would trace the curve itself; bisection is enough for the margin.
 *
 * Accuracy: the result lies within relTol (relative) below the nose found by the sweep; near the
 * nose the sweep's convergence slows (its contraction factor tends to 1), so a trial that runs out
 * of iterations is counted as collapsed and the margin errs low by that much. With the default
 * options: at most 1 % below the nose plus that effect, measured at most 1.2 % below a tight
 * search (relTol 1e-5, 3000 sweeps) over 2,962 sampled scenarios of the demo and 33-bus cases.
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
  /** The last solved points of the search, for the nose predictor. */
  readonly fitL = new Float64Array(3);
  readonly fitV = new Float64Array(3);
  fitCount = 0;
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
  flow.stopWhenHopeless = true;
  const lambda = searchNose(flow, tree, ws, opts);
  flow.stopWhenHopeless = false;
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
  // watch the weakest bus: its P-V curve is a parabola lambda(V) near the nose
  let watch = 0;
  for (let b = 1; b < flow.vPu.length; b++) if (flow.vPu[b]! < flow.vPu[watch]!) watch = b;
  ws.fitCount = 0;
  pushPoint(ws, 1, flow.vPu[watch]!);
  let lo = 1;
  let hi = Number.POSITIVE_INFINITY;
  let nearHiFailed = false;
  for (let guard = 0; guard < 60; guard++) {
    if (hi - lo <= opts.relTol * lo) break;
    let t: number;
    const predicted = ws.fitCount === 3 ? predictNose(ws) : Number.NaN;
    const usePrediction = predicted > lo && predicted < hi;
    // the parabola puts the nose at or beyond a failed trial: the nose is likely just below it,
    // so try one tolerance step below hi (once; bisection if that fails too)
    const nearHi: boolean =
      !usePrediction && predicted >= hi && Number.isFinite(hi) && !nearHiFailed;
    if (usePrediction) {
      // just below the predicted nose, or one tolerance step above lo if that is nearer
      t = Math.max(predicted * (1 - 0.5 * opts.relTol), lo * (1 + opts.relTol));
      if (t >= hi) t = 0.5 * (lo + hi);
    } else if (nearHi) {
      t = Math.max(hi / (1 + 0.99 * opts.relTol), 0.5 * (lo + hi));
    } else {
      t = Number.isFinite(hi) ? 0.5 * (lo + hi) : Math.min(2 * lo, opts.maxFactor);
    }
    if (trial(flow, tree, ws, t, opts)) {
      lo = t;
      pushPoint(ws, t, flow.vPu[watch]!);
      if (lo >= opts.maxFactor) return opts.maxFactor;
      // confirm the bracket one tolerance step above
      if (usePrediction && hi > lo * (1 + opts.relTol)) {
        const up = lo * (1 + opts.relTol);
        if (trial(flow, tree, ws, up, opts)) {
          lo = up;
          pushPoint(ws, up, flow.vPu[watch]!);
        } else hi = up;
      }
    } else {
      hi = t;
      nearHiFailed = nearHi;
    }
  }
  return lo;
}

/** Keeps the last three solved points (lambda, V_watch). */
function pushPoint(ws: MarginWorkspace, lambda: number, v: number): void {
  if (ws.fitCount === 3) {
    ws.fitL[0] = ws.fitL[1]!;
    ws.fitV[0] = ws.fitV[1]!;
    ws.fitL[1] = ws.fitL[2]!;
    ws.fitV[1] = ws.fitV[2]!;
    ws.fitCount = 2;
  }
  ws.fitL[ws.fitCount] = lambda;
  ws.fitV[ws.fitCount] = v;
  ws.fitCount++;
}

/**
 * Vertex of the parabola lambda = A + B V + C V^2 through the three points (Newton divided
 * differences); NaN unless it opens downward (a nose).
 */
function predictNose(ws: MarginWorkspace): number {
  const [v0, v1, v2] = [ws.fitV[0]!, ws.fitV[1]!, ws.fitV[2]!];
  const [l0, l1, l2] = [ws.fitL[0]!, ws.fitL[1]!, ws.fitL[2]!];
  if (v0 === v1 || v1 === v2 || v0 === v2) return Number.NaN;
  const d01 = (l1 - l0) / (v1 - v0);
  const d12 = (l2 - l1) / (v2 - v1);
  const c = (d12 - d01) / (v2 - v0);
  if (!(c < 0)) return Number.NaN;
  // lambda = l0 + d01 (V - v0) + c (V - v0)(V - v1): vertex where the derivative vanishes
  const vStar = (c * (v0 + v1) - d01) / (2 * c);
  return l0 + d01 * (vStar - v0) + c * (vStar - v0) * (vStar - v1);
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
