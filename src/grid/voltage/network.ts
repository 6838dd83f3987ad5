/**
 * The island's network in per unit: buses, closed branches, where each source and load sits, and
 * the radial spanning trees the power flow walks.
 *
 * Per-unit system: power base S_base = case.system.baseKva; voltage base = the bus's baseKv
 * (line-to-line, the system voltageKv if omitted); impedance base Z_base = kV^2 * 1000 / kVA
 * (ohm), current base I_base = kVA / (sqrt(3) kV) (A). For the Baran & Wu feeder (10 MVA,
 * 12.66 kV) Z_base = 16.0276 ohm (REFERENCES.md 7).
 *
 * The power flow is radial: the closed branches must form one tree over all buses (a loop or an
 * unconnected bus is a CaseError naming the branch or bus). An island has no utility slack, so the
 * tree is rooted at the bus of the largest running grid-forming source (island-voltage.ts); a tree
 * is prepared here for every bus that can host one, and for the point of common coupling.
 */
import type { Case, Source } from '../../case/schema.js';
import { CaseError, type CaseProblem } from '../../errors.js';

/** Parent-pointer tree over the buses, rooted at `root`; `order` lists buses parents first. */
export interface RadialTree {
  readonly root: number;
  readonly order: Int32Array;
  /** Parent bus of each bus (-1 at the root). */
  readonly parent: Int32Array;
  /** Branch joining each bus to its parent (-1 at the root). */
  readonly parentBranch: Int32Array;
}

/** Source kinds as small integers for the typed arrays. */
export const SourceKindCode = { Genset: 0, Battery: 1, Pv: 2, Wind: 3, FuelCell: 4 } as const;
export type SourceKindCode = (typeof SourceKindCode)[keyof typeof SourceKindCode];

export interface NetworkData {
  readonly baseKva: number;
  readonly frequencyHz: number;
  readonly busIds: readonly string[];
  readonly busCount: number;
  readonly pccBus: number;

  readonly branchIds: readonly string[];
  readonly branchCount: number;
  readonly branchFrom: Int32Array;
  readonly branchTo: Int32Array;
  readonly rPu: Float64Array;
  readonly xPu: Float64Array;
  /** Thermal rating as a current in pu of the branch's current base; Infinity if unrated. */
  readonly ratingPu: Float64Array;

  readonly sourceIds: readonly string[];
  readonly sourceCount: number;
  readonly sourceBus: Int32Array;
  readonly sourceKind: Uint8Array;
  /** 1 for voltage-holding (grid-forming) sources: every genset, batteries set grid-forming. */
  readonly gridForming: Uint8Array;
  readonly sourceKva: Float64Array;
  /** Reactive limit, kvar; NaN: the inverter's remaining capability sqrt(S^2 - P^2). */
  readonly reactiveKvarMax: Float64Array;
  /** Q-V droop, pu voltage per pu reactive power on the source's own kVA. */
  readonly voltageDroopPu: Float64Array;
  /** Grid-following sources: Q = P * tanPhi (positive: supplying vars). */
  readonly sourceTanPhi: Float64Array;

  readonly loadCount: number;
  readonly loadBus: Int32Array;
  readonly loadTanPhi: Float64Array;
  readonly loadExpP: Float64Array;
  readonly loadExpQ: Float64Array;
  readonly loadFreqSensPu: Float64Array;

  /** Tree for each bus that may act as the root, or undefined. */
  readonly trees: readonly (RadialTree | undefined)[];
}

/** kVA rating of a source: ratingKva, or ratingKw / 0.8 for gensets (schema default). */
export function sourceKva(s: Source): number {
  if (s.ratingKva !== undefined) return s.ratingKva;
  // gensets: ratingKw / 0.8 (schema description, common practice, no source); inverters: ratingKw
  return s.kind === 'genset' ? s.ratingKw / 0.8 : s.ratingKw;
}

function kindCode(s: Source): SourceKindCode {
  switch (s.kind) {
    case 'genset':
      return SourceKindCode.Genset;
    case 'battery':
      return SourceKindCode.Battery;
    case 'pv':
      return SourceKindCode.Pv;
    case 'wind':
      return SourceKindCode.Wind;
    case 'fuelcell':
      return SourceKindCode.FuelCell;
  }
}

export function compileNetworkData(c: Case): NetworkData {
  const problems: CaseProblem[] = [];
  const busIds = c.network.buses.map((b) => b.id);
  const busIndex = new Map<string, number>();
  busIds.forEach((id, i) => {
    busIndex.set(id, i);
  });
  const busOf = (id: string, path: string): number => {
    const i = busIndex.get(id);
    if (i === undefined) {
      problems.push({ path, message: `expected the id of a bus in network.buses, got "${id}"` });
      return 0;
    }
    return i;
  };
  const busKv = c.network.buses.map((b) => b.baseKv ?? c.system.voltageKv);
  const baseKva = c.system.baseKva;
  const pccBus = busOf(c.network.pccBus, '/network/pccBus');

  const closed = c.network.branches.map((b, i) => ({ b, i })).filter((e) => e.b.closed);
  const branchCount = closed.length;
  const branchFrom = new Int32Array(branchCount);
  const branchTo = new Int32Array(branchCount);
  const rPu = new Float64Array(branchCount);
  const xPu = new Float64Array(branchCount);
  const ratingPu = new Float64Array(branchCount).fill(Number.POSITIVE_INFINITY);
  const branchIds: string[] = [];
  closed.forEach(({ b, i }, k) => {
    const path = `/network/branches/${i}`;
    branchFrom[k] = busOf(b.from, `${path}/from`);
    branchTo[k] = busOf(b.to, `${path}/to`);
    branchIds.push(b.id ?? `${b.from}-${b.to}`);
    const kv = busKv[branchTo[k]!]!;
    const zBaseOhm = (kv * kv * 1000) / baseKva;
    const hasOhm = b.rOhm !== undefined || b.xOhm !== undefined;
    const hasPu = b.rPu !== undefined || b.xPu !== undefined;
    if (hasOhm && hasPu)
      problems.push({ path, message: 'expected rOhm/xOhm or rPu/xPu, not both' });
    rPu[k] = hasOhm ? (b.rOhm ?? 0) / zBaseOhm : (b.rPu ?? 0);
    xPu[k] = hasOhm ? (b.xOhm ?? 0) / zBaseOhm : (b.xPu ?? 0);
    if (b.ratingA !== undefined) {
      const iBaseA = baseKva / (Math.sqrt(3) * kv);
      ratingPu[k] = b.ratingA / iBaseA;
    }
  });

  const n = busIds.length;
  const sourceCount = c.sources.length;
  const sourceBus = new Int32Array(sourceCount);
  const sourceKind = new Uint8Array(sourceCount);
  const gridForming = new Uint8Array(sourceCount);
  const kva = new Float64Array(sourceCount);
  const qMax = new Float64Array(sourceCount);
  const vDroop = new Float64Array(sourceCount);
  const tanPhiSrc = new Float64Array(sourceCount);
  c.sources.forEach((s, k) => {
    sourceBus[k] = busOf(s.bus, `/sources/${k}/bus`);
    sourceKind[k] = kindCode(s);
    kva[k] = sourceKva(s);
    if (s.kind === 'genset') {
      gridForming[k] = 1;
      // 0.6 of the kVA rating when omitted (schema default)
      qMax[k] = s.reactiveKvarMax ?? 0.6 * kva[k]!;
      vDroop[k] = s.voltageDroopPu;
    } else if (s.kind === 'battery' && s.control === 'grid-forming') {
      gridForming[k] = 1;
      qMax[k] = s.reactiveKvarMax ?? Number.NaN;
      vDroop[k] = s.voltageDroopPu;
    } else {
      qMax[k] = s.kind === 'battery' ? (s.reactiveKvarMax ?? Number.NaN) : Number.NaN;
      const pf = s.kind === 'pv' || s.kind === 'wind' ? s.powerFactor : 1;
      tanPhiSrc[k] = Math.sqrt(1 - pf * pf) / pf;
    }
  });

  const loadCount = c.loads.length;
  const loadBus = new Int32Array(loadCount);
  const loadTanPhi = new Float64Array(loadCount);
  const loadExpP = new Float64Array(loadCount);
  const loadExpQ = new Float64Array(loadCount);
  const loadFreqSensPu = new Float64Array(loadCount);
  c.loads.forEach((l, i) => {
    loadBus[i] = busOf(l.bus, `/loads/${i}/bus`);
    loadTanPhi[i] = l.kvarPerKw ?? Math.sqrt(1 - l.powerFactor * l.powerFactor) / l.powerFactor;
    loadExpP[i] = l.voltageExponentP;
    loadExpQ[i] = l.voltageExponentQ;
    loadFreqSensPu[i] = l.frequencySensitivityPu;
  });
  if (problems.length > 0) throw new CaseError(problems);

  // adjacency (closed branches)
  const adjStart = new Int32Array(n + 1);
  for (let k = 0; k < branchCount; k++) {
    adjStart[branchFrom[k]! + 1]!++;
    adjStart[branchTo[k]! + 1]!++;
  }
  for (let i = 0; i < n; i++) adjStart[i + 1]! += adjStart[i]!;
  const adjBranch = new Int32Array(2 * branchCount);
  const fill = adjStart.slice(0, n);
  for (let k = 0; k < branchCount; k++) {
    adjBranch[fill[branchFrom[k]!]!++] = k;
    adjBranch[fill[branchTo[k]!]!++] = k;
  }

  const buildTree = (root: number): RadialTree => {
    const parent = new Int32Array(n).fill(-2);
    const parentBranch = new Int32Array(n).fill(-1);
    const order = new Int32Array(n);
    parent[root] = -1;
    order[0] = root;
    let head = 0;
    let tail = 1;
    while (head < tail) {
      const u = order[head++]!;
      for (let a = adjStart[u]!; a < adjStart[u + 1]!; a++) {
        const k = adjBranch[a]!;
        if (k === parentBranch[u]) continue;
        const v = branchFrom[k] === u ? branchTo[k]! : branchFrom[k]!;
        if (parent[v] !== -2) {
          throw CaseError.single(
            `/network/branches`,
            `expected a radial network (closed branches forming a tree); closed branch "${branchIds[k]}" closes a loop: open a tie or mark it closed: false`,
          );
        }
        parent[v] = u;
        parentBranch[v] = k;
        order[tail++] = v;
      }
    }
    if (tail < n) {
      const lost = busIds.filter((_, i) => parent[i] === -2);
      throw CaseError.single(
        '/network/branches',
        `expected every bus connected through closed branches; not reached from "${busIds[root]}": ${lost.slice(0, 5).join(', ')}`,
      );
    }
    return { root, order, parent, parentBranch };
  };

  const trees: (RadialTree | undefined)[] = new Array(n).fill(undefined);
  trees[pccBus] = buildTree(pccBus);
  for (let k = 0; k < sourceCount; k++) {
    const b = sourceBus[k]!;
    if (gridForming[k] && trees[b] === undefined) trees[b] = buildTree(b);
  }

  return {
    baseKva,
    frequencyHz: c.system.frequencyHz,
    busIds,
    busCount: n,
    pccBus,
    branchIds,
    branchCount,
    branchFrom,
    branchTo,
    rPu,
    xPu,
    ratingPu,
    sourceIds: c.sources.map((s) => s.id),
    sourceCount,
    sourceBus,
    sourceKind,
    gridForming,
    sourceKva: kva,
    reactiveKvarMax: qMax,
    voltageDroopPu: vDroop,
    sourceTanPhi: tanPhiSrc,
    loadCount,
    loadBus,
    loadTanPhi,
    loadExpP,
    loadExpQ,
    loadFreqSensPu,
    trees,
  };
}
