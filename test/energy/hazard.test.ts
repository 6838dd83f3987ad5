// Source: Billinton & Allan, Reliability Evaluation of Power Systems, 2nd ed., 1996 (exponential law); Wilson 1927 score interval (REFERENCES.md 9.1).
import { describe, expect, it } from 'vitest';
import { buildOutageModel, OutageResult, simulateOutage } from '../../src/energy/outage.js';
import { conditionsAtHour } from '../../src/sample/conditions.js';
import { compileSampler, sampleScenario } from '../../src/sample/sampler.js';
import { Scenario } from '../../src/sample/scenario.js';
import { FakeEvent, inventedCase, load } from './fixture.js';

/**
 * Constant hazard: with failure rate lambda per hour, the share of outages of length T in which a
 * running unit fails is 1 - exp(-lambda T) (exponential law of times to failure; Billinton &
 * Allan, Reliability Evaluation of Power Systems, 2nd ed., 1996, ch. 6). lambda = 0.0144 /h is
 * the "poorly maintained" constant-hazard equivalent of REFERENCES.md 5.2 (ln 2 / 48 h, from
 * Marqusee & Jenket 2020): about half the sets fail within 48 h. The sampler draws the times
 * (timeToFailureH), the outage counts the failures as contingencies; the observed share must lie
 * in the Wilson score interval at 99.9 % (REFERENCES.md 9.1, Wilson 1927), z = 3.2905.
 */
function wilson(x: number, n: number, z: number): [number, number] {
  const p = x / n;
  const centre = 2 * n * p + z * z;
  const half = z * Math.sqrt(z * z + 4 * n * p * (1 - p));
  const denom = 2 * (n + z * z);
  return [(centre - half) / denom, (centre + half) / denom];
}

describe('failures during the outage', () => {
  it('happen in a share 1 - exp(-lambda T) of the outages (constant hazard)', () => {
    const lambdaPerH = Math.LN2 / 48;
    const outageH = 48;
    const c = inventedCase(
      [
        {
          id: 'g1',
          bus: 'main',
          kind: 'genset',
          ratingKw: 200,
          inertiaS: 1,
          forcedOutageRate: 0,
          failurePerHour: lambdaPerH,
        },
        {
          id: 'g2',
          bus: 'main',
          kind: 'genset',
          ratingKw: 200,
          inertiaS: 1,
          forcedOutageRate: 0,
        },
      ],
      [load('plant', 'critical', 100)],
    );
    c.events.outageDurationH = { kind: 'fixed', value: outageH };
    const sampler = compileSampler(c, '.');
    const ev = new FakeEvent(2, 1);
    const model = buildOutageModel(c, {
      conditionsAtHour: (h, l, a) => conditionsAtHour(sampler, h, l, a),
      runContingency: (op) => {
        ev.runningAtEnd.set(op.running);
        ev.runningAtEnd[0] = 0;
        return ev;
      },
    });
    const sc = new Scenario(2, 1);
    const out = new OutageResult(2, 1);
    const n = 4000;
    let failed = 0;
    for (let id = 0; id < n; id++) {
      sampleScenario(sampler, 'hazard', id, sc);
      simulateOutage(model, sc, new FakeEvent(2, 1), out);
      expect(out.contingencies).toBeLessThanOrEqual(1);
      if (out.contingencies === 1) failed++;
    }
    const expected = 1 - Math.exp(-lambdaPerH * outageH); // 0.5
    const [lo, hi] = wilson(failed, n, 3.2905);
    expect(expected).toBeGreaterThanOrEqual(lo);
    expect(expected).toBeLessThanOrEqual(hi);
  });
});
