/**
 * Benchmark of the run pipeline on the demo case (cases/kestrel-island.yaml, invented):
 * - full_scenarios_per_s_thread: the kernel (sample, ride-through, frequency event, voltage,
 *   outage hours) called directly in this thread, no pool, no writer;
 * - full_scenarios_per_s_all_workers / _one_worker: runAssessment end to end (pool, ordered
 *   writes, summary, files) with all cores and with one worker;
 * - parallel_efficiency: all-workers rate over the one-worker rate of the same run (2 cores:
 *   ideal 2);
 * - pool_overhead_fraction: 1 - one-worker marginal rate / in-thread rate: what the pool,
 *   transfer, Arrow writer and summary add per scenario, the marginal rate being taken between a
 *   run of n/4 and one of n (so the fixed start-up, reported as pool_startup_s, drops out); the
 *   in-thread and one-worker runs are repeated alternately and the best of each kept;
 * - peakRssMb(n): peak memory of an n-scenario run in a child process (`peak_rss_mb_1e6` with
 *   n = 1e6; it takes n / full_scenarios_per_s_all_workers seconds);
 * - writerPeakRssMb(n): the same for the writer and summary alone on synthetic rows.
 * Timing belongs here, never in tests.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadCase } from '../case/load.js';
import { compileKernel } from '../run/kernel.js';
import { runAssessment } from '../run/run.js';

export const demoCasePath = fileURLToPath(
  new URL('../../cases/kestrel-island.yaml', import.meta.url),
);

function seconds(t0: bigint): number {
  return Number(process.hrtime.bigint() - t0) / 1e9;
}

export async function benchPool(
  opts: { threadScenarios?: number; poolScenarios?: number; repeats?: number } = {},
): Promise<Record<string, number>> {
  const poolN = opts.poolScenarios ?? 40000;
  const threadN = opts.threadScenarios ?? poolN;
  // the in-thread and one-worker figures are taken `repeats` times, alternating, and the best
  // of each kept: on a shared machine another process only ever slows a run down
  const repeats = Math.max(1, opts.repeats ?? 2);
  const loaded = await loadCase(demoCasePath);
  const c = loaded.case;

  // in-thread kernel over the same ids as the pool runs (scenario cost varies with the id, so
  // rates over different ids do not compare); warm up the JIT on other ids first. Batches of
  // 1000 as the pool's default tasks.
  const kernel = compileKernel(c, loaded.dir, { seed: c.monteCarlo.seed });
  kernel.runBatch(10_000_000, 200);
  const threadOnce = (): number => {
    const t0 = process.hrtime.bigint();
    for (let id = 0; id < threadN; id += 1000) kernel.runBatch(id, Math.min(1000, threadN - id));
    return threadN / seconds(t0);
  };

  const dir = mkdtempSync(join(tmpdir(), 'holdfast-bench-'));
  const timeRun = async (n: number, workers: number, name: string): Promise<number> => {
    const t = process.hrtime.bigint();
    await runAssessment(loaded, { outDir: join(dir, name), scenarios: n, workers });
    return seconds(t);
  };
  try {
    const workers = availableParallelism();
    // each worker count at two sizes: the difference is the per-scenario cost without the
    // start-up (worker start, case compilation, JIT warm-up), which a long study amortises
    const small = Math.max(100, Math.round(poolN / 4 / 100) * 100);
    let threadRate = 0;
    let tOneSmall = Number.POSITIVE_INFINITY;
    let tOne = Number.POSITIVE_INFINITY;
    for (let r = 0; r < repeats; r++) {
      threadRate = Math.max(threadRate, threadOnce());
      tOneSmall = Math.min(tOneSmall, await timeRun(small, 1, `one-small-${r}`));
      tOne = Math.min(tOne, await timeRun(poolN, 1, `one-${r}`));
    }
    const tAllSmall = await timeRun(small, workers, 'all-small');
    const tAll = await timeRun(poolN, workers, 'all');
    const marginalOne = (poolN - small) / (tOne - tOneSmall);
    const marginalAll = (poolN - small) / (tAll - tAllSmall);
    const startupS = tOneSmall - small / marginalOne;
    return {
      workers,
      scenarios: poolN,
      full_scenarios_per_s_thread: threadRate,
      full_scenarios_per_s_one_worker: poolN / tOne,
      full_scenarios_per_s_one_worker_marginal: marginalOne,
      full_scenarios_per_s_all_workers: poolN / tAll,
      full_scenarios_per_s_all_workers_marginal: marginalAll,
      // the contract's figure: the same run (same ids) with all workers over one, start-up included
      parallel_efficiency: tOne / tAll,
      parallel_efficiency_marginal: marginalAll / marginalOne,
      pool_overhead_fraction: 1 - marginalOne / threadRate,
      pool_startup_s: startupS,
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Peak resident memory (MB) of an n-scenario run of the demo case in a child process (all
 * workers; worker threads share the process, so their memory is included). Needs the built
 * `dist/` (it runs dist/bench/rss-child.js).
 */
export function peakRssMb(scenarios = 1_000_000): number {
  return childPeakRssMb(demoCasePath, scenarios);
}

/**
 * Peak resident memory (MB) of the main-thread half of a run at `rows` rows (writer and summary,
 * synthetic column values): `writerPeakRssMb(1e7)` shows the 10-million-row streaming bound.
 */
export function writerPeakRssMb(rows = 10_000_000): number {
  return childPeakRssMb('--writer', rows);
}

function childPeakRssMb(first: string, count: number): number {
  const child = fileURLToPath(new URL('./rss-child.js', import.meta.url));
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-rss-'));
  try {
    const out = execFileSync(process.execPath, [child, first, String(count), dir], {
      encoding: 'utf8',
      maxBuffer: 1 << 20,
    });
    return (JSON.parse(out) as { peakRssMb: number }).peakRssMb;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Why the worker copies its result instead of transferring it (worker.ts): the in-thread
 * kernel rate on ids 0..n before and after one ArrayBuffer of this isolate is detached (by a
 * transfer). It poisons the calling isolate for good, so run it in a fresh process:
 * `node -e "import('./dist/bench/pool.js').then(m=>m.benchDetachEffect()).then(console.log)"`.
 */
export async function benchDetachEffect(scenarios = 10000): Promise<Record<string, number>> {
  const loaded = await loadCase(demoCasePath);
  const c = loaded.case;
  const kernel = compileKernel(c, loaded.dir, { seed: c.monteCarlo.seed });
  kernel.runBatch(10_000_000, 200);
  const rate = (): number => {
    const t0 = process.hrtime.bigint();
    for (let id = 0; id < scenarios; id += 1000)
      kernel.runBatch(id, Math.min(1000, scenarios - id));
    return scenarios / seconds(t0);
  };
  const before = rate();
  const probe = new ArrayBuffer(8);
  structuredClone(probe, { transfer: [probe] });
  if (probe.byteLength !== 0) throw new Error('the probe buffer was not detached');
  const after = rate();
  return {
    scenarios,
    full_scenarios_per_s_thread_before_detach: before,
    full_scenarios_per_s_thread_after_detach: after,
    slowdown_fraction: 1 - after / before,
  };
}
