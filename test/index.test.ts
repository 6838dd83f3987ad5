/**
 * The library entry (src/index.ts): the design, case, run and stats API import from one place,
 * and a tiny assessment of the bundled demo case runs through it end to end. Checks: the rows
 * and summary it writes, the case API's error path, and the exported estimators against
 * published check values (sources beside each).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  applyOverrides,
  CaseError,
  caseSchema,
  clopperPearsonInterval,
  compareDesigns,
  computeDrivers,
  evaluateRiskGates,
  loadCase,
  mergeShards,
  newcombePairedDifference,
  parseRiskGate,
  readScenarioFrame,
  replayScenario,
  runAssessment,
  runComparison,
  runSweep,
  validateCase,
  wilsonInterval,
} from '../src/index.js';

const work = mkdtempSync(join(tmpdir(), 'holdfast-index-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('the library entry', () => {
  it('exports the design, case, run and stats functions', () => {
    for (const f of [
      runComparison,
      runSweep,
      compareDesigns,
      computeDrivers,
      evaluateRiskGates,
      parseRiskGate,
      loadCase,
      validateCase,
      applyOverrides,
      runAssessment,
      mergeShards,
      replayScenario,
      wilsonInterval,
      clopperPearsonInterval,
      newcombePairedDifference,
    ])
      expect(typeof f).toBe('function');
    expect(typeof caseSchema.parse).toBe('function');
  });

  it('runs 200 scenarios of the demo case with one worker, drivers and a gate included', async () => {
    const loaded = await loadCase('cases/kestrel-island.yaml');
    const outcome = await runAssessment(loaded, {
      outDir: join(work, 'kestrel'),
      scenarios: 200,
      workers: 1,
    });
    expect(outcome.status).toBe('complete');
    const frame = readScenarioFrame(outcome.paths.scenarios);
    expect(frame.n).toBe(200);
    // the summary's shutdown probability is the weighted share of shutdown rows
    const shutdown = frame.numeric('shutdown')!;
    let sw = 0;
    let swx = 0;
    for (let i = 0; i < frame.n; i++) {
      sw += frame.weight[i]!;
      swx += frame.weight[i]! * shutdown[i]!;
    }
    const row = outcome.summary.find((r) => r.metric === 'p_shutdown')!;
    // exact sums in the summary against a plain loop of 200 terms: 1e-12
    expect(Math.abs(row.estimate - swx / sw)).toBeLessThan(1e-12);
    expect(row.ciLow).toBeLessThanOrEqual(row.estimate);
    expect(row.ciHigh).toBeGreaterThanOrEqual(row.estimate);
    const drivers = computeDrivers(frame, { confidenceLevel: 0.95 });
    expect(drivers.overall.shutdown).toBeCloseTo(swx / sw, 12);
    // a gate above the upper bound passes, one below it fails (riskGate.ts: judged on ci_high)
    const gates = [
      parseRiskGate(`p_shutdown>${row.ciHigh + 0.01}`)!,
      parseRiskGate(`p_shutdown>${Math.max(0, row.ciHigh - 0.01)}`)!,
    ];
    const verdicts = evaluateRiskGates(outcome.summary, gates);
    expect(verdicts.map((v) => v.exceeded)).toEqual([false, row.ciHigh - 0.01 >= 0]);
  });

  it('reports a bad case field through the case API as a CaseError', () => {
    expect(() => validateCase({ name: 'x' })).toThrow(CaseError);
    expect(() => applyOverrides({ sources: [] }, ['nonsense'])).toThrow(CaseError);
  });

  it('gives the published check values of the interval estimators', () => {
    // Newcombe, Statistics in Medicine 17:857-872, 1998, Table II (REFERENCES.md 9.3(b), from
    // memory, recomputed to match): 81/263 -> Wilson 95 % 0.2553-0.3662 (4 decimals: 5e-5).
    // Clopper-Pearson after 0 of n events: upper bound 1 - (alpha/2)^(1/n) in closed form.
    const w = wilsonInterval(81, 263, 0.95);
    expect(Math.abs(w.low - 0.2553)).toBeLessThanOrEqual(5e-5);
    expect(Math.abs(w.high - 0.3662)).toBeLessThanOrEqual(5e-5);
    expect(clopperPearsonInterval(0, 10, 0.95).high).toBeCloseTo(1 - 0.025 ** 0.1, 12);
    // Newcombe, Statistics in Medicine 17:2635-2650, 1998, method 10, example (36, 12, 2, 0):
    // 0.200 (0.0569, 0.3404); REFERENCES.md 9.5, from memory, recomputed identical. The values
    // are printed to 4 decimals: half a unit of the last place, 5e-5.
    const d = newcombePairedDifference(
      { both: 36, firstOnly: 12, secondOnly: 2, neither: 0 },
      0.95,
    );
    expect(d.estimate).toBeCloseTo(0.2, 14);
    expect(Math.abs(d.low - 0.0569)).toBeLessThanOrEqual(5e-5);
    expect(Math.abs(d.high - 0.3404)).toBeLessThanOrEqual(5e-5);
  });
});
