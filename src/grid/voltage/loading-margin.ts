/**
 * Loadability margin of the island: the factor lambda by which every load can grow at constant
 * power factor before the power flow has no solution (the nose point of the P-V curve).
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
  constructor(busCount: number) {
    this.vBest = new Float64Array(busCount);
    this.qBest = new Float64Array(busCount);
  }
}

/**
 * The loading margin of the flow's present inputs (loads, generation, growth shares); expects the
 * flow to hold the converged base solution (lambda = 1). Leaves the flow's loadScale at 1 but its
 * voltages at the last trial: read the base results before calling.
 */
export function loadingMargin(
  flow: RadialFlow,
  tree: RadialTree,
  ws: MarginWorkspace,
  opts: MarginOptions,
): number {
  ws.vBest.set(flow.vPu);
  ws.qBest.set(flow.pvQ);
  let lo = 1;
  let hi = 2;
  let bracketed = false;
  while (!bracketed) {
    if (trial(flow, tree, ws, hi, opts)) {
      lo = hi;
      if (hi >= opts.maxFactor) {
        flow.loadScale = 1;
        return opts.maxFactor;
      }
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
  flow.loadScale = 1;
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
