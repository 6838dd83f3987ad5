/**
 * `untilRelError`, the pilot-then-fixed stopping rule (src/run/stopping-rule.ts): the sizing
 * formula, an unbiasedness simulation on a synthetic Bernoulli problem (against the old
 * checkpoint rule), and the runner end to end on a small invented case: the result equals a
 * fixed-count run of the planned size bit for bit, the pilot's streams are not the main run's,
 * a zero-event pilot goes to the cap, and resume follows run.json's plan.
 */
import { cpSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import pl from 'nodejs-polars';
import { describe, expect, it } from 'vitest';
import { caseSchema } from '../../src/case/schema.js';
import { CaseError } from '../../src/errors.js';
import { StreamRng, seedHash, streamKey } from '../../src/numeric/random-stream.js';
import { columnsOf } from '../../src/results/columns.js';
import { compileKernel, kernelGroups } from '../../src/run/kernel.js';
import { doublingCounts, feedBlockOf, shardRange } from '../../src/run/plan.js';
import { feedBatch, runAssessment } from '../../src/run/run.js';
import {
  countHeadlineEvents,
  type PilotDriver,
  pilotHasEnough,
  pilotMinEvents,
  pilotSeed,
  pilotStages,
  plannedScenarioCount,
  requiredScenarios,
  runPilot,
  stoppingRuleSentence,
} from '../../src/run/stopping-rule.js';
import { createSummary, summarySettings } from '../../src/run/summary-feed.js';
import { twoSidedZ } from '../../src/stats/normal.js';
import { proportionInterval } from '../../src/stats/proportion.js';
import { inventedCaseInput, inventedRunInput } from './fixture.js';

/** All rows of an Arrow IPC file, read by polars (an Arrow reader independent of the writer). */
function readRows(path: string): Record<string, unknown>[] {
  return pl.readIPC(readFileSync(path)).toRecords() as Record<string, unknown>[];
}

describe('the plan of ids', () => {
  it('doubles the pilot stages from the first up to the cap', () => {
    expect(doublingCounts(200, 3000, 100)).toEqual([200, 400, 800, 1600, 3000]);
    expect(pilotStages(250, 250, 100)).toEqual([250]);
    expect(pilotStages(1000, 5000, 108)).toEqual([1080, 2160, 4320, 5000]);
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

describe('the planned size', () => {
  const rule = { relError: 0.3, confidenceLevel: 0.95, cap: 100_000, block: 100 };

  it('solves z sqrt(p (1 - p) / N) = X p for N', () => {
    // normal-approximation sizing of a Bernoulli estimate (Rubinstein & Kroese 2017, sec. 4.2,
    // from memory), by hand: 1.959964^2 x 0.98 / (0.3^2 x 0.02) = 3.841459 x 0.98 / 0.0018
    // = 2091.46
    const z = twoSidedZ(0.95);
    const n = requiredScenarios(0.02, 0.3, z);
    expect(n).toBeCloseTo(2091.46, 1);
    // the identity it solves, to round-off
    expect(z * Math.sqrt((0.02 * 0.98) / n)).toBeCloseTo(0.3 * 0.02, 12);
    // at that size the reported Wilson interval (Wilson 1927; REFERENCES.md 9.1) has a
    // half-width within 1 % of X p: its centre and width differ from Wald's by O(z^2 / n)
    const w = proportionInterval(0.02 * n, n, 0.95, 'wilson');
    expect(Math.abs((w.high - w.low) / 2 / (0.3 * 0.02) - 1)).toBeLessThan(0.01);
  });

  it('uses the lower bound, rounds up to whole blocks and stays within one block and the cap', () => {
    const lowerBound = 0.013;
    const n = plannedScenarioCount({ events: 20, lowerBound }, rule);
    expect(n % 100).toBe(0);
    const exact = requiredScenarios(lowerBound, 0.3, twoSidedZ(0.95));
    expect(n).toBeGreaterThanOrEqual(exact);
    expect(n - exact).toBeLessThan(100);
    expect(plannedScenarioCount({ events: 5, lowerBound: 1e-6 }, rule)).toBe(rule.cap);
    expect(plannedScenarioCount({ events: 900, lowerBound: 0.9 }, rule)).toBe(100); // one block
    expect(plannedScenarioCount({ events: 20, lowerBound }, { ...rule, cap: 250 })).toBe(250);
  });

  it('goes to the cap with zero pilot events', () => {
    expect(plannedScenarioCount({ events: 0, lowerBound: 0 }, rule)).toBe(rule.cap);
  });

  it('ends the pilot at 10 events, at the cap, or once even its upper bound plans the cap', () => {
    const few = { events: pilotMinEvents - 1, scenarios: 1000, upperBound: 0.02 };
    expect(pilotHasEnough(few, rule)).toBe(false); // N(0.02) = 2091 < cap
    expect(pilotHasEnough({ ...few, events: pilotMinEvents }, rule)).toBe(true);
    expect(pilotHasEnough({ ...few, scenarios: rule.cap }, rule)).toBe(true);
    // zero events in 1000: Clopper-Pearson upper 0.003682 (REFERENCES.md 9.3 (c)); at X = 0.3
    // N(p_U) = 3.8415 x 0.9963 / (0.09 x 0.003682) = 11550: the pilot goes on under a cap of
    // 100000 and stops under a cap of 10000
    const none = { events: 0, scenarios: 1000, upperBound: 0.003682 };
    expect(pilotHasEnough(none, rule)).toBe(false);
    expect(pilotHasEnough(none, { ...rule, cap: 10_000 })).toBe(true);
  });
});

describe('unbiasedness on a synthetic Bernoulli problem', () => {
  // p = 0.02, X = 0.3, 1000 repetitions, each with its own xorshift stream; binomial draws as
  // sums of Bernoulli trials, the pilot and the main sample on separate streams (as in the run).
  // The intervals are the summary's (proportionInterval 'auto': Wilson from 5 events on).
  const p = 0.02;
  const relError = 0.3;
  const level = 0.95;
  const cap = 100_000;
  const block = 100;
  const reps = 1000;
  const rng = new StreamRng();
  const events = (n: number) => {
    let k = 0;
    for (let i = 0; i < n; i++) if (rng.uniform() < p) k++;
    return k;
  };
  const meanAndError = (xs: number[]) => {
    const m = xs.reduce((a, b) => a + b, 0) / xs.length;
    const v = xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1);
    return { mean: m, standardError: Math.sqrt(v / xs.length) };
  };

  it('gives a mean estimate within 4 standard errors of p, unlike the old checkpoint rule', () => {
    const pilotThenFixed: number[] = [];
    const checkpointRule: number[] = [];
    let met = 0;
    for (let r = 0; r < reps; r++) {
      // pilot: stream (r, 1); stages as the runner's, stop at 10 events or the cap
      rng.reseed(streamKey(seedHash(2026), r, 1, 0));
      let n = 0;
      let k = 0;
      let lowerBound = 0;
      for (const stage of pilotStages(1000, cap, block)) {
        k += events(stage - n);
        n = stage;
        const iv = proportionInterval(k, n, level);
        lowerBound = iv.low;
        const pilot = { events: k, scenarios: n, upperBound: iv.high };
        if (pilotHasEnough(pilot, { relError, confidenceLevel: level, cap })) break;
      }
      const planned = plannedScenarioCount(
        { events: k, lowerBound },
        { relError, confidenceLevel: level, cap, block },
      );
      // main run: stream (r, 2), a fixed count
      rng.reseed(streamKey(seedHash(2026), r, 2, 0));
      const x = events(planned);
      pilotThenFixed.push(x / planned);
      const iv = proportionInterval(x, planned, level);
      if ((iv.high - iv.low) / 2 <= relError * (x / planned)) met++;

      // the old rule: one sample looked at at doubling checkpoints, stop once the target holds
      rng.reseed(streamKey(seedHash(2026), r, 3, 0));
      let on = 0;
      let ok = 0;
      for (const c of doublingCounts(1000, cap, block)) {
        ok += events(c - on);
        on = c;
        const w = proportionInterval(ok, on, level);
        if (ok > 0 && (w.high - w.low) / 2 <= relError * (ok / on)) break;
      }
      checkpointRule.push(ok / on);
    }
    const fresh = meanAndError(pilotThenFixed);
    // E[x / N] = E[E[x / N | N]] = p because N comes from the pilot's streams alone (Stein
    // 1945 two-stage design); 4 standard errors: a false alarm has probability about 6e-5
    expect(Math.abs(fresh.mean - p)).toBeLessThan(4 * fresh.standardError);
    // the old rule stops early exactly when its estimate is high: at seed 2026 its mean is
    // 0.02063 (+3 %, about 7 standard errors), a deterministic figure of this fixed seed
    const old = meanAndError(checkpointRule);
    expect(old.mean - p).toBeGreaterThan(4 * old.standardError);
    // the lower bound makes the target likely but not certain (93 % at this seed)
    expect(met / reps).toBeGreaterThan(0.85);
    expect(met).toBeLessThan(reps);
  });
});

describe('runPilot', () => {
  // a synthetic pilot: the headline event is scenario id % 50 === 0 (p = 0.02, events at ids
  // 0, 50, 100, ...), batches resolve out of order; the summary is a plain count
  const driver = (signal?: AbortSignal): { fed: number[]; d: PilotDriver } => {
    const fed: number[] = [];
    let events = 0;
    let n = 0;
    return {
      fed,
      d: {
        runBatch: async (task) => {
          const shutdown = new Uint8Array(task.count);
          for (let i = 0; i < task.count; i++) shutdown[i] = (task.firstId + i) % 50 === 0 ? 1 : 0;
          // batches at even hundreds resolve after the next one: the pilot must still feed
          // them in id order
          const hops = task.firstId % 200 === 0 ? 5 : 1;
          for (let k = 0; k < hops; k++) await Promise.resolve();
          return { firstId: task.firstId, count: task.count, columns: { shutdown } };
        },
        feed: (b) => {
          fed.push(b.firstId);
          n += b.count;
        },
        countEvents: (b) => {
          let k = 0;
          for (let i = 0; i < b.count; i++) k += Number(b.columns['shutdown']![i]);
          events += k;
          return k;
        },
        headline: () => {
          const iv = proportionInterval(events, n, 0.95);
          return { estimate: iv.estimate, lowerBound: iv.low, upperBound: iv.high };
        },
        cap: 10_000,
        relError: 0.3,
        confidenceLevel: 0.95,
        block: 100,
        first: 200,
        batchSize: 100,
        window: 3,
        seed: pilotSeed(7),
        signal,
      },
    };
  };

  it('grows in doubling stages until 10 events, feeding batches in id order', async () => {
    const { fed, d } = driver();
    const out = await runPilot(d);
    // stages 200 (4 events), 400 (8), 800 (16): stops at 800
    expect(out).toMatchObject({ seed: '7/pilot', scenarios: 800, events: 16, estimate: 0.02 });
    expect(fed).toEqual([0, 100, 200, 300, 400, 500, 600, 700]);
  });

  it('returns null when aborted', async () => {
    const stop = new AbortController();
    stop.abort();
    expect(await runPilot(driver(stop.signal).d)).toBeNull();
  });
});

describe('runAssessment with untilRelError', () => {
  const { input, dir } = inventedRunInput();
  const specs = columnsOf(kernelGroups());
  const settings = summarySettings(input.case);
  // p_failure is about 2 % in the invented case; X = 0.6 keeps every run to a few hundred ids
  const common = { scenarios: 3200, untilRelError: 0.6, pilotFirstScenarios: 200 };

  it('runs a pilot on its own seed, then exactly the fixed-count run of the planned size', async () => {
    const seq = await runAssessment(input, { ...common, outDir: join(dir, 'seq'), workers: 2 });
    const rule = seq.manifest.untilRelError!;
    const pilot = rule.pilot!;
    expect(seq.status).toBe('complete');
    expect(rule.design).toBe('pilot-then-fixed');
    expect(rule.headlineMetric).toBe('p_failure');
    expect(pilot.seed).toBe(pilotSeed(7));
    expect(pilotStages(200, 3200, 100)).toContain(pilot.scenarios);
    const sizing = { relError: 0.6, confidenceLevel: 0.95, cap: 3200 };
    expect(pilotHasEnough(pilot, sizing)).toBe(true);
    const planned = plannedScenarioCount(pilot, {
      relError: 0.6,
      confidenceLevel: input.case.monteCarlo.confidenceLevel,
      cap: 3200,
      block: 100,
    });
    expect(rule.plannedScenarios).toBe(planned);
    expect(seq.manifest.scenarioCount).toBe(planned);
    expect(planned).toBeLessThan(3200);
    expect(rule.capped).toBe(false);
    const head = seq.summary.find((r) => r.metric === 'p_failure')!;
    expect(rule.achievedHalfWidth).toBe((head.ciHigh - head.ciLow) / 2);
    expect(rule.targetMet).toBe(rule.achievedHalfWidth! <= 0.6 * head.estimate);
    expect(stoppingRuleSentence(rule)).toContain(`fixed the run at ${planned} scenarios`);
    // the pilot's rows are kept out of the output folder
    expect(readdirSync(seq.paths.dir).sort()).toEqual([
      'exceedance.arrow',
      'run.json',
      'scenarios.arrow',
      'summary.arrow',
    ]);

    const fixed = await runAssessment(input, {
      outDir: join(dir, 'fixed'),
      scenarios: planned,
      workers: 1,
      batchSize: 300,
    });
    const rows = readRows(seq.paths.scenarios);
    expect(rows).toEqual(readRows(fixed.paths.scenarios));
    expect(seq.summary).toEqual(fixed.summary);

    // the pilot recomputed here, in this thread: ids 0.. on the pilot seed give the recorded
    // events, estimate and lower bound, and rows other than the main run's
    const kernel = compileKernel(input.case, input.dir, { seed: pilotSeed(7) });
    const b = kernel.runBatch(0, pilot.scenarios);
    expect(countHeadlineEvents(b, 'p_failure', settings.failureDefinition)).toBe(pilot.events);
    const sink = createSummary(settings);
    feedBatch(sink, specs, b, 100);
    const pilotHead = sink.rows().find((r) => r.metric === 'p_failure')!;
    expect(pilotHead.estimate).toBe(pilot.estimate);
    expect(pilotHead.ciLow).toBe(pilot.lowerBound);
    const pilotLoad = b.columns['load_kw'] as Float64Array;
    const overlap = Math.min(pilot.scenarios, rows.length);
    let same = 0;
    for (let i = 0; i < overlap; i++) if (pilotLoad[i] === rows[i]!['load_kw']) same++;
    expect(same).toBe(0); // continuous draws from unrelated streams: no id repeats a value
  });

  it('goes to the cap when the pilot sees no event, and says the target was not met', async () => {
    const sturdy = structuredClone(inventedCaseInput) as typeof inventedCaseInput & {
      sources: {
        ratingKw: number;
        inertiaS?: number;
        energyKwh?: number;
        forcedOutageRate?: number;
      }[];
      loads: { peakKw: number }[];
    };
    sturdy.sources[0]!.ratingKw = 4000;
    sturdy.sources[0]!.inertiaS = 5;
    sturdy.sources[1]!.energyKwh = 5000;
    // no forced outages either: otherwise both sources out at once still fail a scenario now and then
    for (const src of sturdy.sources) src.forcedOutageRate = 0;
    sturdy.loads[0]!.peakKw = 20;
    sturdy.loads[1]!.peakKw = 30;
    const loaded = { ...input, case: caseSchema.parse(sturdy), raw: sturdy };
    const out = await runAssessment(loaded, {
      outDir: join(dir, 'sturdy'),
      scenarios: 300,
      untilRelError: 0.6,
      pilotFirstScenarios: 200,
      workers: 2,
    });
    const rule = out.manifest.untilRelError!;
    // zero events in 200: the upper bound already plans the cap (N(p_U) > 300), so the pilot
    // stops after its first stage
    expect(rule.pilot).toMatchObject({ scenarios: 200, events: 0, estimate: 0, lowerBound: 0 });
    expect(rule.plannedScenarios).toBe(300);
    expect(rule.capped).toBe(true);
    expect(out.manifest.scenarioCount).toBe(300);
    expect(rule.targetMet).toBe(false); // a zero estimate never meets a relative target
    expect(stoppingRuleSentence(rule)).toMatch(/NOT within 60 %.*not extended/);
  });

  it('resumes to the planned size of run.json, rerunning only an interrupted pilot', async () => {
    const whole = await runAssessment(input, { ...common, outDir: join(dir, 'ref'), workers: 2 });
    const d = join(dir, 'cut');
    const cut = await runAssessment(input, {
      ...common,
      outDir: d,
      workers: 1,
      batchSize: 100,
      stopAfterBatches: 1,
    });
    expect(cut.status).toBe('partial');
    expect(cut.manifest.untilRelError!.targetMet).toBeNull();
    expect(cut.manifest.untilRelError!.plannedScenarios).toBe(whole.manifest.scenarioCount);
    const edited = join(dir, 'cut-edited');
    cpSync(d, edited, { recursive: true });

    const resumed = await runAssessment(input, { ...common, outDir: d, workers: 2, resume: true });
    expect(resumed.status).toBe('complete');
    expect(resumed.manifest.untilRelError).toEqual(whole.manifest.untilRelError);
    expect(readRows(resumed.paths.scenarios)).toEqual(readRows(whole.paths.scenarios));
    expect(resumed.summary).toEqual(whole.summary);

    // a plan no pilot of this case gives (one block past the cut) is followed as written: the
    // pilot is not rerun
    const plan = cut.manifest.scenarioCount + 100;
    expect(plan).not.toBe(whole.manifest.scenarioCount);
    const path = join(edited, 'run.json');
    const m = JSON.parse(readFileSync(path, 'utf8'));
    m.untilRelError.plannedScenarios = plan;
    m.idEnd = plan;
    writeFileSync(path, JSON.stringify(m));
    const followed = await runAssessment(input, {
      ...common,
      outDir: edited,
      workers: 1,
      resume: true,
    });
    expect(followed.manifest.scenarioCount).toBe(plan);
    expect(followed.manifest.untilRelError!.pilot).toEqual(whole.manifest.untilRelError!.pilot);

    // interrupted during the pilot: no plan yet, nothing written; resume reruns the pilot
    const early = join(dir, 'pilot-cut');
    const stop = new AbortController();
    stop.abort();
    const none = await runAssessment(input, {
      ...common,
      outDir: early,
      workers: 1,
      signal: stop.signal,
    });
    expect(none.status).toBe('partial');
    expect(none.stopReason).toBe('interrupted');
    expect(none.manifest.scenarioCount).toBe(0);
    expect(none.manifest.untilRelError).toMatchObject({ pilot: null, plannedScenarios: null });
    expect(stoppingRuleSentence(none.manifest.untilRelError!)).toContain('during the pilot');
    const again = await runAssessment(input, {
      ...common,
      outDir: early,
      workers: 1,
      resume: true,
    });
    expect(again.manifest.untilRelError).toEqual(whole.manifest.untilRelError);
    expect(again.summary).toEqual(whole.summary);
  });

  it('refuses --shard (exit 2, before anything is written)', async () => {
    await expect(
      runAssessment(input, {
        ...common,
        outDir: join(dir, 'sharded'),
        shard: { index: 1, count: 2 },
      }),
    ).rejects.toThrow(CaseError);
  });
});
