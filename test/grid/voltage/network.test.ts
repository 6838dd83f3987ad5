// Source: per-unit impedance Z_base = V_base^2 / S_base (Glover, Sarma & Overbye, Power System Analysis & Design, ch. 3, from memory).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CaseError } from '../../../src/errors.js';
import { linDistFlow } from '../../../src/grid/voltage/lin-dist-flow.js';
import { compileNetworkData } from '../../../src/grid/voltage/network.js';
import { FLOW_OK, RadialFlow } from '../../../src/grid/voltage/radial-flow.js';
import { baranWuCase, inventedIslandInput, parseCase } from './fixtures.js';

describe('network compilation', () => {
  it('converts ohms with Z_base = kV^2 * 1000 / kVA (16.0276 ohm for 12.66 kV, 10 MVA)', () => {
    const net = compileNetworkData(baranWuCase());
    // REFERENCES.md 7: base 10 MVA, 12.66 kV -> Z_base = 16.0276 ohm; branch 1-2 r = 0.0922 ohm
    expect(net.rPu[0]! * 16.0276).toBeCloseTo(0.0922, 4);
    // the five tie switches are open and left out
    expect(net.branchCount).toBe(32);
  });

  it('rejects a loop of closed branches, naming the branch', () => {
    const input = inventedIslandInput();
    input.network.branches!.push({
      id: 'tie-ew',
      from: 'east',
      to: 'west',
      rOhm: 0.01,
      xOhm: 0.01,
    });
    const c = parseCase(input);
    expect(() => compileNetworkData(c)).toThrow(CaseError);
    expect(() => compileNetworkData(c)).toThrow(/radial/);
  });

  it('rejects a bus cut off from the rest', () => {
    const input = inventedIslandInput();
    input.network.branches![1]!.closed = false;
    expect(() => compileNetworkData(parseCase(input))).toThrow(/not reached/);
  });

  it('names a branch end that is not a bus', () => {
    const input = inventedIslandInput();
    input.network.branches![0]!.to = 'nowhere';
    try {
      compileNetworkData(parseCase(input));
      expect.unreachable();
    } catch (e) {
      expect((e as CaseError).problems[0]!.path).toBe('/network/branches/0/to');
    }
  });
});

/** Random radial feeders: bus i > 0 hangs from a random earlier bus. */
const feederArb = fc.integer({ min: 2, max: 25 }).chain((n) =>
  fc.record({
    parent: fc.tuple(...Array.from({ length: n - 1 }, (_, i) => fc.integer({ min: 0, max: i }))),
    r: fc.array(fc.double({ min: 1e-4, max: 0.02, noNaN: true }), {
      minLength: n - 1,
      maxLength: n - 1,
    }),
    x: fc.array(fc.double({ min: 1e-4, max: 0.02, noNaN: true }), {
      minLength: n - 1,
      maxLength: n - 1,
    }),
    p: fc.array(fc.double({ min: 0, max: 0.05, noNaN: true }), { minLength: n, maxLength: n }),
    tan: fc.array(fc.double({ min: 0, max: 0.75, noNaN: true }), { minLength: n, maxLength: n }),
  }),
);

function feederCase(f: { parent: number[]; r: number[]; x: number[]; p: number[]; tan: number[] }) {
  const n = f.p.length;
  const bus = (i: number) => `n${i}`;
  return parseCase({
    name: 'Invented random feeder',
    invented: true,
    system: { frequencyHz: 60, voltageKv: 12.47, baseKva: 1000 },
    sources: [
      { id: 'g', kind: 'genset', bus: 'n0', ratingKw: 5000, inertiaS: 1, voltageDroopPu: 0 },
    ],
    loads: f.p.map((p, i) => ({
      id: `l${i}`,
      bus: bus(i),
      tier: 'essential' as const,
      peakKw: 1 + p * 1000,
      kvarPerKw: f.tan[i]!,
      voltageExponentP: 0,
      voltageExponentQ: 0,
    })),
    network: {
      pccBus: 'n0',
      buses: Array.from({ length: n }, (_, i) => ({ id: bus(i) })),
      branches: f.parent.map((p, i) => ({
        from: bus(p),
        to: bus(i + 1),
        rPu: f.r[i]!,
        xPu: f.x[i]!,
      })),
    },
    events: { islandingRatePerYear: 1, outageDurationH: { kind: 'fixed', value: 1 } },
  });
}

describe('radial flow properties (fast-check, fixed seed)', () => {
  it('balances power, keeps losses non-negative and stays below LinDistFlow on random feeders', () => {
    fc.assert(
      fc.property(feederArb, (f) => {
        const c = feederCase(f);
        const net = compileNetworkData(c);
        const flow = new RadialFlow(net);
        c.loads.forEach((l, i) => {
          flow.loadP0[i] = l.peakKw / 1000;
          flow.loadQ0[i] = (l.peakKw * net.loadTanPhi[i]!) / 1000;
        });
        flow.resetInjections();
        flow.flatStart();
        // light loads on short lines (<= 25 x 51 kW over <= 0.02 pu): always solvable
        expect(flow.solve(net.trees[0]!, 1e-11, 500)).toBe(FLOW_OK);
        let load = 0;
        for (const p of flow.loadP0) load += p;
        // supply = load + losses, to the 1e-11 pu sweep tolerance times the branch count
        expect(Math.abs(flow.rootPPu - load - flow.lossesPu)).toBeLessThan(1e-8);
        expect(flow.lossesPu).toBeGreaterThanOrEqual(0);
        const pd = new Float64Array(net.busCount);
        const qd = new Float64Array(net.busCount);
        for (let i = 0; i < net.loadCount; i++) {
          pd[net.loadBus[i]!]! += flow.loadP0[i]!;
          qd[net.loadBus[i]!]! += flow.loadQ0[i]!;
        }
        const v = new Float64Array(net.busCount);
        const s1 = new Float64Array(net.busCount);
        const s2 = new Float64Array(net.busCount);
        linDistFlow(net, net.trees[0]!, pd, qd, 1, v, s1, s2);
        // LinDistFlow drops the losses, so it never lies below the exact voltages
        for (let b = 0; b < net.busCount; b++)
          expect(v[b]! + 1e-9).toBeGreaterThanOrEqual(flow.vPu[b]!);
      }),
      { seed: 20261201, numRuns: 60 },
    );
  });
});
