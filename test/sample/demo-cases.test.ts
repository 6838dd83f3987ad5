// Source: invariants of the sampler on the invented demo cases (PV within rating, zero at night; common practice, no source).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { loadCase } from '../../src/case/load.js';
import { conditionsAtHour } from '../../src/sample/conditions.js';
import { compileSampler, sampleScenario } from '../../src/sample/sampler.js';
import { Scenario } from '../../src/sample/scenario.js';

const demoCases = [
  'cases/kestrel-island.yaml',
  'cases/ridgeway-hospital.yaml',
  'cases/tern-atoll/tern-atoll.yaml',
];

describe('sampler on the demo cases (invented data)', () => {
  for (const file of demoCases) {
    it(`${file}: every scenario keeps the invariants of the Scenario struct`, async () => {
      const loaded = await loadCase(file);
      const c = loaded.case;
      const ctx = compileSampler(c, loaded.dir);
      const s = new Scenario(c.sources.length, c.loads.length);
      const n = 2000;
      let bad = 0;
      for (let id = 0; id < n; id++) {
        sampleScenario(ctx, c.monteCarlo.seed, id, s);
        let load = 0;
        let dispatch = 0;
        for (let i = 0; i < c.loads.length; i++) {
          const kw = s.loadKw[i]!;
          if (!(kw >= 0 && Number.isFinite(kw))) bad++;
          load += kw;
        }
        for (let i = 0; i < c.sources.length; i++) {
          const src = c.sources[i]!;
          dispatch += s.dispatchKw[i]!;
          if (!(s.availableKw[i]! >= 0 && s.availableKw[i]! <= src.ratingKw)) bad++;
          if (src.kind !== 'battery' && s.dispatchKw[i]! > s.availableKw[i]! + 1e-9) bad++;
          if (src.kind === 'battery' && Math.abs(s.dispatchKw[i]!) > src.ratingKw) bad++;
          if (!(s.timeToFailureH[i]! > 0)) bad++;
        }
        if (Math.abs(s.gridImportKw - (load - dispatch)) > 1e-6) bad++;
        if (!(s.outageDurationH >= 0 && Number.isFinite(s.outageDurationH))) bad++;
        if (!(s.weight > 0 || c.events.monthlyRateWeights)) bad++;
        if (!(s.hourOfYear >= 0 && s.hourOfYear < 8760)) bad++;
      }
      expect(bad).toBe(0);
    });

    it(`${file}: the expected resource of conditionsAtHour is the mean of the sampled resource`, async () => {
      const loaded = await loadCase(file);
      const c = loaded.case;
      const ctx = compileSampler(c, loaded.dir);
      const load = new Float64Array(c.loads.length);
      const avail = new Float64Array(c.sources.length);
      for (const h of [12, 2000 + 14, 5000 + 9, 8000 + 16]) {
        conditionsAtHour(ctx, h, load, avail);
        for (let i = 0; i < c.sources.length; i++) {
          const pv = ctx.pv[i];
          const wind = ctx.wind[i];
          const m = 4096;
          let sum = 0;
          if (pv) for (let j = 0; j < m; j++) sum += pv.sampleKw(h, (j + 0.5) / m);
          else if (wind) for (let j = 0; j < m; j++) sum += wind.sampleKw(h, (j + 0.5) / m);
          else continue;
          // The expectation uses 16 (PV) or 256 (wind) midpoints; both are midpoint-rule estimates
          // of the same integral over u, which agree to about 2 % of the rating for smooth curves.
          expect(Math.abs(sum / m - avail[i]!)).toBeLessThan(0.02 * c.sources[i]!.ratingKw);
        }
      }
    });
  }

  it('regenerates any (seed, id) alone, for arbitrary seeds and ids (property test)', async () => {
    const loaded = await loadCase(demoCases[0]!);
    const c = loaded.case;
    // Two contexts with different histories: A always draws another id first, B never does.
    const warm = compileSampler(c, loaded.dir);
    const other2 = compileSampler(c, loaded.dir);
    const a = new Scenario(c.sources.length, c.loads.length);
    const b = new Scenario(c.sources.length, c.loads.length);
    fc.assert(
      fc.property(
        fc.oneof(fc.integer(), fc.string({ minLength: 1, maxLength: 12 })),
        fc.integer({ min: 0, max: 1e9 }),
        fc.integer({ min: 0, max: 1e9 }),
        (seed, id, other) => {
          sampleScenario(warm, seed, other, a);
          sampleScenario(warm, seed, id, a);
          sampleScenario(other2, seed, id, b);
          expect(a.hourOfYear).toBe(b.hourOfYear);
          expect([...a.loadKw]).toEqual([...b.loadKw]);
          expect([...a.dispatchKw]).toEqual([...b.dispatchKw]);
          expect(a.outageDurationH).toBe(b.outageDurationH);
        },
      ),
      { seed: 20261201, numRuns: 200 },
    );
  });
});
