/**
 * `untilRelError`: the run looks only at checkpoints fixed in advance (doubling from the first),
 * stops at the first whose headline half-width is below the target fraction of its estimate,
 * and reports how many looks it made. The rows and summary at the stopping count are exactly
 * those of a fixed-count run of that size (the rule only chooses among fixed-count designs).
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkpoints, feedBlockOf, shardRange } from '../../src/run/plan.js';
import { runAssessment } from '../../src/run/run.js';
import { inventedRunInput } from './fixture.js';

describe('the plan of ids', () => {
  it('doubles the checkpoints from the first up to the cap', () => {
    expect(checkpoints(200, 3000, 100)).toEqual([200, 400, 800, 1600, 3000]);
    expect(checkpoints(250, 250, 100)).toEqual([250]);
  });

  it('cuts shards into disjoint whole-block ranges covering every id', () => {
    for (const [total, n] of [
      [1000, 3],
      [1234, 4],
      [150, 5],
    ] as const) {
      let next = 0;
      for (let i = 1; i <= n; i++) {
        const r = shardRange(total, 100, { index: i, count: n });
        expect(r.start).toBe(next);
        if (r.end < total) expect(r.end % 100).toBe(0);
        next = r.end;
      }
      expect(next).toBe(total);
    }
  });

  it('aligns feed blocks with the sampling plan blocks', () => {
    expect(feedBlockOf('plain')).toBe(100);
    expect(feedBlockOf('stratified-month')).toBe(108);
    expect(feedBlockOf('stratified-month-hour')).toBe(288);
    expect(feedBlockOf('latin-hypercube')).toBe(256);
  });
});

describe('runAssessment with untilRelError', () => {
  const { input, dir } = inventedRunInput();

  it('stops at a checkpoint with the target met and equals the fixed-count run of that size', async () => {
    const target = 0.5;
    const cap = 3200;
    const seq = await runAssessment(input, {
      outDir: join(dir, 'seq'),
      scenarios: cap,
      workers: 2,
      batchSize: 100,
      untilRelError: target,
      firstCheckpoint: 200,
    });
    const rule = seq.manifest.untilRelError!;
    expect(rule.checkpoints).toEqual([200, 400, 800, 1600, 3200]);
    const stoppedAt = seq.manifest.scenarioCount;
    expect(rule.checkpoints).toContain(stoppedAt);
    expect(rule.checks).toBe(rule.checkpoints.indexOf(stoppedAt) + 1);
    expect(seq.status).toBe('complete');
    const head = seq.summary.find((r) => r.metric === rule.headlineMetric)!;
    expect(stoppedAt).toBeLessThan(cap); // p_failure is a few % here: about 600 scenarios suffice
    expect((head.ciHigh - head.ciLow) / 2).toBeLessThanOrEqual(target * head.estimate);

    const fixed = await runAssessment(input, {
      outDir: join(dir, 'fixed'),
      scenarios: stoppedAt,
      workers: 1,
      batchSize: 300,
    });
    expect(fixed.summary).toEqual(seq.summary);

    // interrupted after the first batch, resumed with another worker count: the same looks,
    // the same stopping count, the same summary
    const d = join(dir, 'seq-resumed');
    const common = { scenarios: cap, untilRelError: target, firstCheckpoint: 200, batchSize: 100 };
    const cut = await runAssessment(input, {
      ...common,
      outDir: d,
      workers: 1,
      stopAfterBatches: 1,
    });
    expect(cut.status).toBe('partial');
    const resumed = await runAssessment(input, { ...common, outDir: d, workers: 2, resume: true });
    expect(resumed.manifest.scenarioCount).toBe(stoppedAt);
    expect(resumed.manifest.untilRelError!.checks).toBe(rule.checks);
    expect(resumed.summary).toEqual(seq.summary);
  });
});
