// Source: 5 % governor droop as in Glover, Sarma & Overbye Example 12.4 (REFERENCES.md 1.3a); the rest is internal behaviour.
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { caseSchema } from '../../src/case/schema.js';

const minimal = {
  name: 'Tiny invented island',
  system: { frequencyHz: 60, voltageKv: 0.48, baseKva: 500 },
  sources: [{ id: 'g1', kind: 'genset', bus: 'main', ratingKw: 400, inertiaS: 1 }],
  loads: [{ id: 'l1', bus: 'main', tier: 'critical', peakKw: 200 }],
  network: { buses: [{ id: 'main' }], pccBus: 'main' },
  events: { islandingRatePerYear: 2, outageDurationH: { kind: 'fixed', value: 4 } },
};

describe('case schema', () => {
  it('fills documented defaults into a minimal case', () => {
    const c = caseSchema.parse(minimal);
    const g = c.sources[0];
    expect(g?.kind).toBe('genset');
    // 5 % droop: the common governor setting (REFERENCES 1.3a, Glover Example 12.4 uses R = 0.05)
    if (g?.kind === 'genset') expect(g.droopPu).toBe(0.05);
    expect(c.monteCarlo.confidenceLevel).toBe(0.95);
  });

  it('rejects unknown keys so typos in a case file are caught', () => {
    const r = caseSchema.safeParse({ ...minimal, sytem: {} });
    expect(r.success).toBe(false);
  });

  it('converts to a JSON Schema document', () => {
    const js = z.toJSONSchema(caseSchema, { io: 'input' }) as Record<string, unknown>;
    expect(js.type).toBe('object');
  });
});
