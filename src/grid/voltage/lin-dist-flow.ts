/**
 * Linearised DistFlow: the lossless, linear approximation of the radial branch-flow equations,
 * used as a cross-check of the full sweep and as a cheap first guess.
 *
 * Equations (Baran & Wu, "Optimal capacitor placement on radial distribution systems", IEEE
 * Trans. Power Delivery 4(1):725-734, 1989; REFERENCES.md 7), for branch i -> j, w = |V|^2:
 *   P_ij = sum of the net demand at and below j (losses neglected), Q_ij likewise;
 *   w_j = w_i - 2 (r_ij P_ij + x_ij Q_ij).
 * Loads are taken at their nominal-voltage demand (constant power). On the 33-bus feeder it
 * gives V18 = 0.91593 pu against the exact 0.91309 pu (REFERENCES.md 7, recomputed).
 */
import type { NetworkData, RadialTree } from './network.js';

/**
 * Fills vPu (per bus) from per-bus net demand pDemand, qDemand (pu, load minus generation) with
 * the root held at rootVPu. `scratchP` and `scratchQ` are per-bus work arrays.
 */
export function linDistFlow(
  net: NetworkData,
  tree: RadialTree,
  pDemand: Float64Array,
  qDemand: Float64Array,
  rootVPu: number,
  vPu: Float64Array,
  scratchP: Float64Array,
  scratchQ: Float64Array,
): void {
  const { order, parent, parentBranch } = tree;
  const n = net.busCount;
  scratchP.set(pDemand);
  scratchQ.set(qDemand);
  // downstream sums: leaves first
  for (let o = n - 1; o > 0; o--) {
    const j = order[o]!;
    const i = parent[j]!;
    scratchP[i]! += scratchP[j]!;
    scratchQ[i]! += scratchQ[j]!;
  }
  // squared voltages root first; vPu holds w until the final square root
  vPu[tree.root] = rootVPu * rootVPu;
  for (let o = 1; o < n; o++) {
    const j = order[o]!;
    const br = parentBranch[j]!;
    vPu[j] = vPu[parent[j]!]! - 2 * (net.rPu[br]! * scratchP[j]! + net.xPu[br]! * scratchQ[j]!);
  }
  for (let b = 0; b < n; b++) vPu[b] = Math.sqrt(Math.max(vPu[b]!, 0));
}
