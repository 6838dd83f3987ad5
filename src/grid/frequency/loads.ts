/**
 * Frequency-dependent load: each load's power varies with frequency by its damping D,
 *   P_j(f) = P_j,served (1 + D_j dw),
 * so the island's load is sum(P_served) + sum(P_served D_j) dw. D = 1-2 % power per % frequency
 * is typical (from memory, REFERENCES.md 6). Source: Kundur, Power System Stability and Control,
 * McGraw-Hill 1994, sec. 11.1 (load damping constant D).
 */
import type { Island } from './island.js';

/** Recomputes the island's served load and its damping, pu (after separation and each shed). */
export function refreshLoadTotals(isl: Island): void {
  let served = 0;
  let damping = 0;
  for (let j = 0; j < isl.loadCount; j++) {
    const p = isl.loadServedPu[j]!;
    served += p;
    damping += p * isl.loadDamping[j]!;
  }
  isl.loadTotalPu = served;
  isl.loadDampingPu = damping;
}

/** The island's load at deviation dw, pu (totals kept by refreshLoadTotals). */
export function loadDemandPu(isl: Island, dwPu: number): number {
  return isl.loadTotalPu + isl.loadDampingPu * dwPu;
}
