// Source: none needed: gate parsing and evaluation on the confidence bounds (internal behaviour).
import { describe, expect, it } from 'vitest';
import {
  anyGateExceeded,
  evaluateRiskGates,
  parseRiskGate,
  parseRiskGates,
} from '../../src/design/riskGate.js';
import { CaseError } from '../../src/errors.js';

const rows = [
  { metric: 'p_shutdown', estimate: 0.008, ciLow: 0.005, ciHigh: 0.0132 },
  { metric: 'p_load_shed', estimate: 0.1, ciLow: 0.09, ciHigh: 0.11 },
];

describe('parseRiskGate', () => {
  it('reads both directions and tolerates spaces', () => {
    expect(parseRiskGate('p_shutdown>0.01')).toEqual({
      metric: 'p_shutdown',
      threshold: 0.01,
      direction: '>',
    });
    expect(parseRiskGate(' p_load_shed < 1e-2 ')).toEqual({
      metric: 'p_load_shed',
      threshold: 0.01,
      direction: '<',
    });
  });

  it('rejects malformed gates', () => {
    for (const bad of [
      'p_shutdown',
      '>0.1',
      'p_shutdown>',
      'p_shutdown>>1',
      'P-X>1',
      'a>b',
      'a>1<2',
    ])
      expect(parseRiskGate(bad)).toBeUndefined();
    expect(() => parseRiskGates(['p_shutdown>x'])).toThrow(CaseError);
  });
});

describe('evaluateRiskGates', () => {
  it('fails a > gate on the upper confidence bound, not the estimate', () => {
    // estimate 0.008 is below 0.01 but the upper bound 0.0132 is above: the gate is exceeded
    const v = evaluateRiskGates(rows, [{ metric: 'p_shutdown', threshold: 0.01 }]);
    expect(v[0]?.exceeded).toBe(true);
    expect(v[0]?.bound).toBe(0.0132);
    expect(anyGateExceeded(v)).toBe(true);
    expect(evaluateRiskGates(rows, [{ metric: 'p_shutdown', threshold: 0.02 }])[0]?.exceeded).toBe(
      false,
    );
  });

  it('fails a < gate on the lower confidence bound', () => {
    const gate = { metric: 'p_load_shed', threshold: 0.095, direction: '<' as const };
    expect(evaluateRiskGates(rows, [gate])[0]?.exceeded).toBe(true);
    expect(evaluateRiskGates(rows, [{ ...gate, threshold: 0.09 }])[0]?.exceeded).toBe(false);
  });

  it('names the known metrics when a gate names an unknown one', () => {
    try {
      evaluateRiskGates(rows, [{ metric: 'p_blackout', threshold: 0.1 }]);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(CaseError);
      const msg = (e as CaseError).problems[0]?.message ?? '';
      expect(msg).toContain('p_blackout');
      expect(msg).toContain('p_shutdown, p_load_shed, ');
      expect(msg).toContain('p_failure_in_year');
    }
  });

  it('treats a known metric this run did not report as exceeded', () => {
    const v = evaluateRiskGates(rows, [{ metric: 'p_voltage_violation', threshold: 0.5 }]);
    expect(v[0]?.exceeded).toBe(true);
    expect(v[0]?.text).toContain('not reported');
  });

  it('treats an unmeasured (NaN) bound as exceeded', () => {
    const v = evaluateRiskGates(
      [{ metric: 'p_shutdown', estimate: Number.NaN, ciLow: Number.NaN, ciHigh: Number.NaN }],
      [{ metric: 'p_shutdown', threshold: 0.5 }],
    );
    expect(v[0]?.exceeded).toBe(true);
  });
});
