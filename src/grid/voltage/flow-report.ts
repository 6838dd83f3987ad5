/**
 * One operating point of the island in detail, for `holdfast flow`: the power flow, the loading
 * margin and the small-signal modes, as a plain object (the --json document) and as text.
 *
 * The operating point (documented choice, not a sampled scenario): the hour H given, else the
 * hour of the year's largest expected total demand; loads at their expected demand that hour
 * (the sampler's conditionsAtHour, no forecast error); every source running; PV and wind at their
 * expected available power (curtailed pro rata if they exceed the load); the dispatchable sources
 * (gensets, batteries, fuel cells) share the rest in proportion to rating / droop, as steady-state
 * droop sharing does, each capped at its rating. The root source takes the losses.
 *
 * Screening estimates only: protection settings and interconnection are decided under local codes
 * by licensed engineers.
 */
import type { Case } from '../../case/schema.js';
import { conditionsAtHour } from '../../sample/conditions.js';
import { compileSampler } from '../../sample/sampler.js';
import { Scenario } from '../../sample/scenario.js';
import { eigenvalues } from './droop-damping.js';
import {
  assessIsland,
  compileNetwork,
  FLOW_TOL_PU,
  type SettledIsland,
  VoltageResult,
} from './island-voltage.js';

export interface FlowReport {
  case_name: string;
  hour_of_year: number;
  status: VoltageResult['status'];
  v_min_pu: number;
  v_min_bus: string;
  v_max_pu: number;
  v_max_bus: string;
  voltage_band: { min_pu: number; max_pu: number; source: string };
  voltage_violation: boolean;
  losses_kw: number;
  load_kw: number;
  loading_margin: number;
  low_margin: boolean;
  min_damping_ratio: number;
  low_damping: boolean;
  unstable: boolean;
  max_branch: string | null;
  max_branch_loading_fraction: number;
  reactive_limited: boolean;
  iterations: number;
  tolerance_pu: number;
  buses: { id: string; v_pu: number; angle_deg: number }[];
  branches: { id: string; from: string; to: string; p_kw: number; q_kvar: number }[];
  sources: { id: string; kind: string; bus: string; role: string; p_kw: number; q_kvar: number }[];
  modes: { real_per_s: number; imag_rad_per_s: number; damping_ratio: number; freq_hz: number }[];
  note: string;
}

const NOTE =
  'Screening estimate of one operating point; protection settings and interconnection are ' +
  'decided under local codes by licensed engineers.';

export function flowReport(c: Case, caseDir: string, hour?: number): FlowReport {
  const ctx = compileSampler(c, caseDir);
  const nS = c.sources.length;
  const nL = c.loads.length;
  const loadKw = new Float64Array(nL);
  const availKw = new Float64Array(nS);
  let h = hour;
  if (h === undefined) {
    let best = -1;
    h = 0;
    for (let t = 0; t < 8760; t++) {
      let total = 0;
      for (let l = 0; l < nL; l++) total += ctx.expectedLoadKw[l]![t]!;
      if (total > best) {
        best = total;
        h = t;
      }
    }
  }
  conditionsAtHour(ctx, h, loadKw, availKw);
  const output = dispatchIsland(c, loadKw, availKw);

  const m = compileNetwork(c);
  const sc = new Scenario(nS, nL);
  sc.hourOfYear = h;
  sc.loadKw.set(loadKw);
  const ev: SettledIsland = {
    shutdown: false,
    runningAtEnd: new Uint8Array(nS).fill(1),
    outputKwAtEnd: output,
    loadServedFraction: new Float64Array(nL).fill(1),
  };
  const r = new VoltageResult();
  assessIsland(m, sc, ev, r);

  const d = m.data;
  const base = d.baseKva;
  const flow = m.flow;
  const root = rootBus(m.data, ev);
  const tree = root >= 0 ? d.trees[root]! : undefined;
  const branches: FlowReport['branches'] = [];
  if (tree)
    for (let o = 1; o < tree.order.length; o++) {
      const j = tree.order[o]!;
      const br = tree.parentBranch[j]!;
      branches.push({
        id: d.branchIds[br]!,
        from: d.busIds[tree.parent[j]!]!,
        to: d.busIds[j]!,
        p_kw: flow.branchPIn[j]! * base,
        q_kvar: flow.branchQIn[j]! * base,
      });
    }
  const sources: FlowReport['sources'] = c.sources.map((s, k) => {
    const b = d.sourceBus[k]!;
    const frac = d.gridForming[k] ? d.sourceKva[k]! / m.busGfKva[b]! : 0;
    const slot = m.busPvSlot[b]!;
    const isRoot = d.gridForming[k] && b === root;
    const p = isRoot ? flow.rootPPu * frac * base : output[k]!;
    const q = isRoot
      ? flow.rootQPu * frac * base
      : d.gridForming[k]
        ? (slot >= 0 ? flow.pvQ[slot]! : 0) * frac * base
        : output[k]! * d.sourceTanPhi[k]!;
    const role = isRoot ? 'reference bus' : d.gridForming[k] ? 'voltage-holding' : 'grid-following';
    return { id: s.id, kind: s.kind, bus: s.bus, role, p_kw: p, q_kvar: q };
  });
  const modes = eigenvalues(m.stateMatrix, m.modes.stateCount)
    .filter(([re, im]) => Math.hypot(re, im) > 1e-9 && im >= 0)
    .map(([re, im]) => ({
      real_per_s: re,
      imag_rad_per_s: im,
      damping_ratio: -re / Math.hypot(re, im),
      freq_hz: im / (2 * Math.PI),
    }))
    .sort((a, b) => a.damping_ratio - b.damping_ratio);
  let totalLoadKw = 0;
  for (const v of loadKw) totalLoadKw += v;
  return {
    case_name: c.name,
    hour_of_year: h,
    status: r.status,
    v_min_pu: r.vMinPu,
    v_min_bus: r.vMinBus >= 0 ? d.busIds[r.vMinBus]! : '',
    v_max_pu: r.vMaxPu,
    v_max_bus: r.vMaxBus >= 0 ? d.busIds[r.vMaxBus]! : '',
    voltage_band: {
      min_pu: m.limits.voltageMinPu,
      max_pu: m.limits.voltageMaxPu,
      source: m.limits.voltageSource,
    },
    voltage_violation: r.voltageViolation,
    losses_kw: r.lossesKw,
    load_kw: totalLoadKw,
    loading_margin: r.loadingMargin,
    low_margin: r.lowMargin,
    min_damping_ratio: r.minDampingRatio,
    low_damping: r.lowDamping,
    unstable: r.unstable,
    max_branch: r.maxBranch >= 0 ? d.branchIds[r.maxBranch]! : null,
    max_branch_loading_fraction: r.maxBranchLoadingFraction,
    reactive_limited: r.reactiveLimited,
    iterations: r.iterations,
    tolerance_pu: FLOW_TOL_PU,
    buses: d.busIds.map((id, b) => ({
      id,
      v_pu: m.baseVPu[b]!,
      angle_deg: (m.baseAngleRad[b]! * 180) / Math.PI,
    })),
    branches,
    sources,
    modes,
    note: NOTE,
  };
}

function rootBus(d: ReturnType<typeof compileNetwork>['data'], ev: SettledIsland): number {
  let best = -1;
  for (let k = 0; k < d.sourceCount; k++) {
    if (!d.gridForming[k] || !ev.runningAtEnd[k]) continue;
    if (best < 0 || d.sourceKva[k]! > d.sourceKva[best]!) best = k;
  }
  return best < 0 ? -1 : d.sourceBus[best]!;
}

/** The documented steady-state dispatch of the flow command (see the header). */
export function dispatchIsland(c: Case, loadKw: Float64Array, availKw: Float64Array): Float64Array {
  const out = new Float64Array(c.sources.length);
  let load = 0;
  for (const v of loadKw) load += v;
  let renewable = 0;
  c.sources.forEach((s, k) => {
    if (s.kind === 'pv' || s.kind === 'wind') renewable += availKw[k]!;
  });
  const renewableScale = renewable > load && renewable > 0 ? load / renewable : 1;
  let rest = load;
  c.sources.forEach((s, k) => {
    if (s.kind === 'pv' || s.kind === 'wind') {
      out[k] = availKw[k]! * renewableScale;
      rest -= out[k]!;
    }
  });
  // droop sharing of the rest by rating / droop, capped at rating (redistributed once capped)
  const free = c.sources.map((s) => s.kind !== 'pv' && s.kind !== 'wind');
  for (let pass = 0; pass < c.sources.length && rest > 1e-9; pass++) {
    let weight = 0;
    c.sources.forEach((s, k) => {
      if (free[k] && s.kind !== 'pv' && s.kind !== 'wind') weight += s.ratingKw / s.droopPu;
    });
    if (weight === 0) break;
    let capped = false;
    let given = 0;
    c.sources.forEach((s, k) => {
      if (!free[k] || s.kind === 'pv' || s.kind === 'wind') return;
      const want = out[k]! + (rest * (s.ratingKw / s.droopPu)) / weight;
      const cap = availKw[k]!;
      const next = Math.min(want, cap);
      given += next - out[k]!;
      out[k] = next;
      if (want >= cap) {
        free[k] = false;
        capped = true;
      }
    });
    rest -= given;
    if (!capped) break;
  }
  return out;
}

const f3 = (v: number): string => v.toFixed(3);
const f5 = (v: number): string => v.toFixed(5);

/** The report as text for a terminal: summary, buses, branches, sources, modes. */
export function formatFlowReport(r: FlowReport): string {
  const lines: string[] = [];
  lines.push(`${r.case_name}: island operating point at hour ${r.hour_of_year}`);
  lines.push(
    `power flow        ${r.status} in ${r.iterations} sweeps (tolerance ${r.tolerance_pu} pu)`,
  );
  lines.push(`load              ${f3(r.load_kw)} kW, losses ${f3(r.losses_kw)} kW`);
  lines.push(
    `voltage           min ${f5(r.v_min_pu)} pu at ${r.v_min_bus}, max ${f5(r.v_max_pu)} pu at ${r.v_max_bus}`,
  );
  lines.push(
    `band              ${f3(r.voltage_band.min_pu)}-${f3(r.voltage_band.max_pu)} pu (${r.voltage_band.source}): ${r.voltage_violation ? 'VIOLATED' : 'met'}`,
  );
  lines.push(
    `loading margin    ${f3(r.loading_margin)} x load at the nose${r.low_margin ? ' (LOW)' : ''}`,
  );
  lines.push(
    `damping           min ratio ${f3(r.min_damping_ratio)}${r.unstable ? ' (UNSTABLE)' : r.low_damping ? ' (LOW)' : ''}`,
  );
  if (r.max_branch !== null)
    lines.push(
      `branch loading    ${f3(r.max_branch_loading_fraction)} of rating on ${r.max_branch}`,
    );
  if (r.reactive_limited)
    lines.push('note              the reference source is beyond its reactive limit');
  lines.push('');
  const idW = Math.max(4, ...r.buses.map((b) => b.id.length));
  lines.push(`${'bus'.padEnd(idW)}  ${'v_pu'.padStart(8)}  ${'angle_deg'.padStart(10)}`);
  for (const b of r.buses)
    lines.push(
      `${b.id.padEnd(idW)}  ${f5(b.v_pu).padStart(8)}  ${b.angle_deg.toFixed(4).padStart(10)}`,
    );
  lines.push('');
  const srcW = Math.max(6, ...r.sources.map((s) => s.id.length));
  lines.push(
    `${'source'.padEnd(srcW)}  ${'kind'.padEnd(8)}  ${'role'.padEnd(15)}  ${'p_kw'.padStart(10)}  ${'q_kvar'.padStart(10)}`,
  );
  for (const s of r.sources)
    lines.push(
      `${s.id.padEnd(srcW)}  ${s.kind.padEnd(8)}  ${s.role.padEnd(15)}  ${f3(s.p_kw).padStart(10)}  ${f3(s.q_kvar).padStart(10)}`,
    );
  lines.push('');
  lines.push('modes (least damped first): real 1/s, frequency Hz, damping ratio');
  for (const md of r.modes)
    lines.push(
      `  ${md.real_per_s.toFixed(3).padStart(10)}  ${md.freq_hz.toFixed(3).padStart(8)}  ${f3(md.damping_ratio).padStart(7)}`,
    );
  lines.push('');
  lines.push(r.note);
  return `${lines.join('\n')}\n`;
}
