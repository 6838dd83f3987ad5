// Source: Baran & Wu, IEEE Trans. Power Delivery 4(2):1401-1407, 1989 (REFERENCES.md 7: V18 0.91309 pu, 202.677 kW).
import { describe, expect, it } from 'vitest';
import { linDistFlow } from '../../../src/grid/voltage/lin-dist-flow.js';
import { compileNetworkData, type NetworkData } from '../../../src/grid/voltage/network.js';
import { FLOW_OK, RadialFlow } from '../../../src/grid/voltage/radial-flow.js';
import { baranWuCase } from './fixtures.js';

// Baran & Wu 33-bus feeder, REFERENCES.md 7: |V| profile recomputed with an exact
// backward/forward sweep (converged to 1e-12), listed there to 5 decimals.
const BARAN_WU_V = [
  1.0, 0.99703, 0.98294, 0.97546, 0.96806, 0.94966, 0.94617, 0.94133, 0.93506, 0.92924, 0.92838,
  0.92688, 0.92077, 0.9185, 0.91709, 0.91572, 0.9137, 0.91309, 0.9965, 0.99293, 0.99222, 0.99158,
  0.97935, 0.97268, 0.96936, 0.94773, 0.94517, 0.93373, 0.92551, 0.92195, 0.91779, 0.91687, 0.91659,
];

function peakFlow(): { net: NetworkData; flow: RadialFlow } {
  const c = baranWuCase();
  const net = compileNetworkData(c);
  const flow = new RadialFlow(net);
  c.loads.forEach((l, i) => {
    flow.loadP0[i] = l.peakKw / net.baseKva;
    flow.loadQ0[i] = (l.peakKw * net.loadTanPhi[i]!) / net.baseKva;
  });
  flow.resetInjections();
  flow.flatStart();
  return { net, flow };
}

/** Complex power injected into the network at each bus from V and the branch currents (KCL). */
function injections(net: NetworkData, v: Float64Array, th: Float64Array) {
  const p = new Float64Array(net.busCount);
  const q = new Float64Array(net.busCount);
  for (let k = 0; k < net.branchCount; k++) {
    const i = net.branchFrom[k]!;
    const j = net.branchTo[k]!;
    const dr = v[i]! * Math.cos(th[i]!) - v[j]! * Math.cos(th[j]!);
    const di = v[i]! * Math.sin(th[i]!) - v[j]! * Math.sin(th[j]!);
    const r = net.rPu[k]!;
    const x = net.xPu[k]!;
    const z2 = r * r + x * x;
    const ir = (dr * r + di * x) / z2; // I = dV / Z
    const ii = (di * r - dr * x) / z2;
    for (const [b, s] of [
      [i, 1],
      [j, -1],
    ] as const) {
      const vr = v[b]! * Math.cos(th[b]!);
      const vi = v[b]! * Math.sin(th[b]!);
      p[b]! += s * (vr * ir + vi * ii); // S = V conj(I)
      q[b]! += s * (vi * ir - vr * ii);
    }
  }
  return { p, q };
}

describe('radial power flow on the Baran & Wu 33-bus feeder', () => {
  it('gives 0.91309 pu at bus 18 and 202.677 kW of losses (Baran & Wu 1989, REFERENCES.md 7)', () => {
    const { net, flow } = peakFlow();
    // tolerance 1e-10 pu on the sweep: far below the 1e-5 pu of the published digits
    expect(flow.solve(net.trees[0]!, 1e-10, 100)).toBe(FLOW_OK);
    const b18 = net.busIds.indexOf('b18');
    // REFERENCES.md 7: V_min 0.913090 pu at bus 18, to 1e-4 pu (issue tolerance)
    expect(flow.vPu[b18]).toBeCloseTo(0.91309, 4);
    expect(Math.abs(flow.vPu[b18]! - 0.91309)).toBeLessThan(1e-5);
    let vMin = 2;
    for (const v of flow.vPu) vMin = Math.min(vMin, v);
    expect(vMin).toBe(flow.vPu[b18]);
    // losses 202.677 kW, to 0.05 kW (REFERENCES.md 7 suggested tolerance)
    expect(Math.abs(flow.lossesPu * net.baseKva - 202.677)).toBeLessThan(0.05);
    // substation supply 3917.68 kW + j2435.14 kvar (REFERENCES.md 7, recomputed)
    expect(Math.abs(flow.rootPPu * net.baseKva - 3917.68)).toBeLessThan(0.05);
    expect(Math.abs(flow.rootQPu * net.baseKva - 2435.14)).toBeLessThan(0.05);
    // angle at bus 18: -0.495 deg (REFERENCES.md 7)
    expect((flow.angleRad[b18]! * 180) / Math.PI).toBeCloseTo(-0.495, 3);
  });

  it('matches the whole published voltage profile to 1e-4 pu (REFERENCES.md 7)', () => {
    const { net, flow } = peakFlow();
    flow.solve(net.trees[0]!, 1e-10, 100);
    BARAN_WU_V.forEach((v, i) => {
      const b = net.busIds.indexOf(`b${i + 1}`);
      // the list is rounded to 5 decimals: 0.5e-5 rounding plus the sweep tolerance
      expect(Math.abs(flow.vPu[b]! - v)).toBeLessThan(1e-5);
    });
  });

  it("satisfies Kirchhoff's current law at every bus with the solved complex voltages", () => {
    // an independent check of the sweep: branch currents from (V_i - V_j) / Z, no branch powers
    const { net, flow } = peakFlow();
    flow.solve(net.trees[0]!, 1e-12, 200);
    const { p, q } = injections(net, flow.vPu, flow.angleRad);
    for (let i = 0; i < net.loadCount; i++) {
      const b = net.loadBus[i]!;
      // constant-power loads: injection = -load; residual bounded by the 1e-12 pu sweep tolerance
      // times the largest admittance (~1/0.0029 pu), so 1e-8 pu
      expect(Math.abs(p[b]! + flow.loadP0[i]!)).toBeLessThan(1e-8);
      expect(Math.abs(q[b]! + flow.loadQ0[i]!)).toBeLessThan(1e-8);
    }
    expect(Math.abs(p[0]! - flow.rootPPu)).toBeLessThan(1e-8);
  });

  it('converges in a handful of sweeps from a flat start', () => {
    const { net, flow } = peakFlow();
    expect(flow.solve(net.trees[0]!, 1e-8, 100)).toBe(FLOW_OK);
    // the branch-power sweep contracts by roughly the loss fraction (~5 %) per sweep
    expect(flow.iterations).toBeLessThanOrEqual(8);
  });

  it('holds a second voltage-controlled bus at its set-point within its reactive limit', () => {
    const { net, flow } = peakFlow();
    const b18 = net.busIds.indexOf('b18');
    flow.pvCount = 1;
    flow.pvBus[0] = b18;
    flow.pvV0Pu[0] = 1;
    flow.pvDroopPu[0] = 0;
    flow.pvQMaxPu[0] = 0.2;
    expect(flow.solve(net.trees[0]!, 1e-10, 200)).toBe(FLOW_OK);
    // the residual |V0 - V| is below the sweep tolerance once converged
    expect(Math.abs(flow.vPu[b18]! - 1)).toBeLessThan(1e-8);
    expect(flow.pvQ[0]!).toBeGreaterThan(0);
    expect(flow.pvQ[0]!).toBeLessThan(0.2);
    // KCL with the PV injection at bus 18
    const { q } = injections(net, flow.vPu, flow.angleRad);
    const load18 = flow.loadQ0[net.loadBus.indexOf(b18)]!;
    expect(Math.abs(q[b18]! - (flow.pvQ[0]! - load18))).toBeLessThan(1e-7);
  });

  it('stops a voltage-controlled bus at its reactive limit and lets the voltage sag', () => {
    const { net, flow } = peakFlow();
    const b18 = net.busIds.indexOf('b18');
    flow.pvCount = 1;
    flow.pvBus[0] = b18;
    flow.pvV0Pu[0] = 1;
    flow.pvDroopPu[0] = 0;
    flow.pvQMaxPu[0] = 0.01; // 100 kvar: not enough to reach 1 pu at the feeder end
    expect(flow.solve(net.trees[0]!, 1e-10, 200)).toBe(FLOW_OK);
    expect(flow.pvQ[0]).toBe(0.01);
    expect(flow.vPu[b18]!).toBeLessThan(1);
    expect(flow.vPu[b18]!).toBeGreaterThan(0.91309);
  });

  it('follows the Q-V droop at the root: V_root = V0 - n Q_root', () => {
    const { net, flow } = peakFlow();
    flow.rootDroopPu = 0.01;
    flow.flatStart();
    expect(flow.solve(net.trees[0]!, 1e-11, 200)).toBe(FLOW_OK);
    expect(Math.abs(flow.vPu[0]! - (1 - 0.01 * flow.rootQPu))).toBeLessThan(1e-9);
  });

  it('reports voltage collapse, not NaN, when the feeder is loaded past its nose', () => {
    const { net, flow } = peakFlow();
    flow.loadScale = 8;
    const st = flow.solve(net.trees[0]!, 1e-8, 100);
    expect(st).not.toBe(FLOW_OK);
    for (const v of flow.vPu) expect(Number.isFinite(v)).toBe(true);
  });
});

describe('LinDistFlow on the 33-bus feeder', () => {
  it('gives V18 = 0.91593 pu, 0.0028 pu above the exact flow (REFERENCES.md 7, recomputed)', () => {
    const { net, flow } = peakFlow();
    const pd = new Float64Array(net.busCount);
    const qd = new Float64Array(net.busCount);
    for (let i = 0; i < net.loadCount; i++) {
      pd[net.loadBus[i]!]! += flow.loadP0[i]!;
      qd[net.loadBus[i]!]! += flow.loadQ0[i]!;
    }
    const v = new Float64Array(net.busCount);
    linDistFlow(
      net,
      net.trees[0]!,
      pd,
      qd,
      1,
      v,
      new Float64Array(net.busCount),
      new Float64Array(net.busCount),
    );
    const b18 = net.busIds.indexOf('b18');
    // listed to 5 decimals: rounding 0.5e-5
    expect(Math.abs(v[b18]! - 0.91593)).toBeLessThan(1e-5);
    flow.solve(net.trees[0]!, 1e-10, 100);
    // the lossless model overestimates every voltage below the root
    for (let b = 1; b < net.busCount; b++) expect(v[b]!).toBeGreaterThan(flow.vPu[b]!);
    expect(v[b18]! - flow.vPu[b18]!).toBeCloseTo(0.0028, 4);
  });
});
