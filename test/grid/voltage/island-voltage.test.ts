// Source: Baran & Wu 1989 (REFERENCES.md 7) and the reduced droop model of REFERENCES.md 10.
import { describe, expect, it } from 'vitest';
import {
  assessIsland,
  compileNetwork,
  VoltageResult,
} from '../../../src/grid/voltage/island-voltage.js';
import { Scenario } from '../../../src/sample/scenario.js';
import { baranWuCase, inventedIslandInput, parseCase, settled } from './fixtures.js';

function finiteFields(r: VoltageResult): void {
  for (const [k, v] of Object.entries(r))
    if (typeof v === 'number') expect([k, Number.isFinite(v)]).toEqual([k, true]);
}

describe('assessIsland', () => {
  it('reproduces the Baran & Wu result through the island path (REFERENCES.md 7)', () => {
    const c = baranWuCase();
    const m = compileNetwork(c);
    const sc = new Scenario(1, c.loads.length);
    c.loads.forEach((l, i) => {
      sc.loadKw[i] = l.peakKw;
    });
    const out = new VoltageResult();
    assessIsland(
      m,
      sc,
      settled(
        [3715],
        [1],
        c.loads.map(() => 1),
      ),
      out,
    );
    expect(out.status).toBe('ok');
    // FLOW_TOL_PU = 1e-8: the 1e-4 pu / 0.1 kW of the issue are met with margin
    expect(Math.abs(out.vMinPu - 0.91309)).toBeLessThan(1e-5);
    expect(m.data.busIds[out.vMinBus]).toBe('b18');
    expect(Math.abs(out.lossesKw - 202.677)).toBeLessThan(0.05);
    // the case asks for ANSI Range B (0.9167 pu min): 0.913 pu violates it
    expect(out.voltageViolation).toBe(true);
    expect(out.loadingMargin).toBeGreaterThan(3);
    finiteFields(out);
  });

  it('balances the invented island: sources deliver the served load plus the losses', () => {
    const c = parseCase(inventedIslandInput());
    const m = compileNetwork(c);
    const sc = new Scenario(4, 3);
    sc.loadKw.set([250, 300, 200]);
    const served = [1, 1, 0.5]; // UFLS shed half the pool
    const outputs = [300, 150, 120, 80];
    const out = new VoltageResult();
    assessIsland(m, sc, settled(outputs, [1, 1, 1, 1], served), out);
    expect(out.status).toBe('ok');
    // loads are voltage dependent (P ~ V^1 by default): demand drawn at the solved voltages
    let drawnKw = 0;
    c.loads.forEach((l, i) => {
      drawnKw += sc.loadKw[i]! * served[i]! * m.flow.vPu[m.data.loadBus[i]!]! ** l.voltageExponentP;
    });
    // the root (gen1 and bess1 at 'main') supplies what the others do not, to the 1e-8 pu sweep
    // tolerance times the 1000 kVA base: 1e-3 kW
    const rootKw = m.flow.rootPPu * c.system.baseKva;
    expect(Math.abs(rootKw + 120 + 80 - drawnKw - out.lossesKw)).toBeLessThan(1e-3);
    expect(out.lossesKw).toBeGreaterThan(0);
    expect(out.maxBranchLoadingFraction).toBeGreaterThan(0);
    expect(out.maxBranchLoadingFraction).toBeLessThan(1);
    // bess2 at 'east' holds its droop voltage V = 1 - n Q (n = 0.04 pu on its 200 kVA)
    const east = m.data.busIds.indexOf('east');
    const nSys = (0.04 * 1000) / 200;
    expect(Math.abs(m.flow.vPu[east]! - (1 - nSys * m.flow.pvQ[0]!))).toBeLessThan(1e-7);
    expect(out.minDampingRatio).toBeGreaterThan(0);
    finiteFields(out);
  });

  it('reports an island that shut down as not assessed', () => {
    const c = parseCase(inventedIslandInput());
    const m = compileNetwork(c);
    const sc = new Scenario(4, 3);
    const out = new VoltageResult();
    assessIsland(m, sc, { ...settled([0, 0, 0, 0], [0, 0, 0, 0], [0, 0, 0]), shutdown: true }, out);
    expect(out.assessed).toBe(false);
    expect(out.status).toBe('no solution');
    finiteFields(out);
  });

  it('gives no solution without a running grid-forming source', () => {
    const c = parseCase(inventedIslandInput());
    const m = compileNetwork(c);
    const sc = new Scenario(4, 3);
    sc.loadKw.set([100, 100, 100]);
    const out = new VoltageResult();
    assessIsland(m, sc, settled([0, 0, 0, 200], [0, 0, 0, 1], [1, 1, 1]), out);
    expect(out.status).toBe('no solution');
    expect(out.voltageViolation).toBe(true);
    finiteFields(out);
  });

  it('records voltage collapse, never NaN, when the load is far past the nose', () => {
    const input = inventedIslandInput();
    input.network.branches![0]!.rOhm = 0.2;
    input.network.branches![0]!.xOhm = 0.2;
    for (const l of input.loads) {
      l.voltageExponentP = 0;
      l.voltageExponentQ = 0;
    }
    const c = parseCase(input);
    const m = compileNetwork(c);
    const sc = new Scenario(4, 3);
    sc.loadKw.set([250, 3000, 200]);
    const out = new VoltageResult();
    assessIsland(m, sc, settled([3000, 400, 0, 0], [1, 1, 0, 0], [1, 1, 1]), out);
    expect(out.status).not.toBe('ok');
    expect(out.voltageViolation).toBe(true);
    expect(out.lowMargin).toBe(true);
    finiteFields(out);
  });

  it('loses damping as the droop of grid-forming inverters is raised (REFERENCES.md 10 trend)', () => {
    const zetas: number[] = [];
    for (const droopPu of [0.01, 0.03, 0.1, 0.2]) {
      const input = inventedIslandInput();
      input.sources = input.sources.filter((s) => s.kind !== 'genset');
      for (const s of input.sources) if (s.kind === 'battery') s.droopPu = droopPu;
      const c = parseCase(input);
      const m = compileNetwork(c);
      const sc = new Scenario(3, 3);
      sc.loadKw.set([250, 300, 200]);
      const out = new VoltageResult();
      assessIsland(m, sc, settled([350, 200, 200], [1, 1, 1], [1, 1, 1]), out);
      expect(out.status).toBe('ok');
      zetas.push(out.minDampingRatio);
    }
    for (let i = 1; i < zetas.length; i++) expect(zetas[i]!).toBeLessThan(zetas[i - 1]!);
  });

  it('gives the same result for the same inputs after other scenarios (no hidden state)', () => {
    const c = parseCase(inventedIslandInput());
    const m = compileNetwork(c);
    const sc = new Scenario(4, 3);
    const a = new VoltageResult();
    const b = new VoltageResult();
    sc.loadKw.set([250, 300, 200]);
    assessIsland(m, sc, settled([300, 150, 120, 80], [1, 1, 1, 1], [1, 1, 1]), a);
    sc.loadKw.set([50, 600, 10]);
    assessIsland(m, sc, settled([400, 0, 200, 0], [1, 0, 1, 0], [1, 1, 1]), b);
    sc.loadKw.set([250, 300, 200]);
    assessIsland(m, sc, settled([300, 150, 120, 80], [1, 1, 1, 1], [1, 1, 1]), b);
    expect(b).toEqual(a);
  });
});
