/**
 * Frequency-dependent load: each load's power varies with frequency by its damping D,
 *   P_j(f) = P_j,served (1 + D_j dw),
 * so the island's load is sum(P_served) + sum(P_served D_j) dw. D = 1-2 % power per % frequency
 * is typical (from memory, REFERENCES.md 6). Source: Kundur, Power System Stability and Control,
 * McGraw-Hill 1994, sec. 11.1 (load damping constant D).
 */
import type { Island } from './island.js';

/** The island's load at deviation dw, pu; also stores nothing (pure). */
export function loadDemandPu(isl: Island, dwPu: number): number {
  let served = 0;
  let damping = 0;
  for (let j = 0; j < isl.loadCount; j++) {
    const p = isl.loadServedPu[j]!;
    served += p;
    damping += p * isl.loadDamping[j]!;
  }
  return served + damping * dwPu;
}
