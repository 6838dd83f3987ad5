/**
 * Benchmark of the scenario sampler alone: scenarios sampled per second on one thread, for the
 * demo case (cases/kestrel-island.yaml), plus the one-off compile time of the case's tables.
 * Speed belongs here, never in a test.
 */
import { fileURLToPath } from 'node:url';
import { loadCase } from '../case/load.js';
import { compileSampler, sampleScenario } from '../sample/sampler.js';
import { Scenario } from '../sample/scenario.js';

/** Demo case, resolved from this file so it works from src/ (tsx) and dist/ alike. */
const demoCasePath = fileURLToPath(new URL('../../cases/kestrel-island.yaml', import.meta.url));

export async function benchSampler(
  casePath: string = demoCasePath,
  scenarios = 200_000,
): Promise<Record<string, number>> {
  const loaded = await loadCase(casePath);
  const c = loaded.case;
  const t0 = performance.now();
  const ctx = compileSampler(c, loaded.dir);
  const compileMs = performance.now() - t0;
  const s = new Scenario(c.sources.length, c.loads.length);
  // Warm-up so the timed loop measures optimised code.
  for (let id = 0; id < 20_000; id++) sampleScenario(ctx, c.monteCarlo.seed, id, s);
  const t1 = performance.now();
  let checksum = 0;
  for (let id = 0; id < scenarios; id++) {
    sampleScenario(ctx, c.monteCarlo.seed, id, s);
    checksum += s.gridImportKw;
  }
  const seconds = (performance.now() - t1) / 1000;
  if (!Number.isFinite(checksum)) throw new Error('sampler produced a non-finite grid import');
  return {
    scenarios_sampled_per_s: scenarios / seconds,
    sampler_us_per_scenario: (seconds * 1e6) / scenarios,
    sampler_compile_ms: compileMs,
  };
}

// Run directly: `npx tsx src/bench/sampler.ts [case.yaml]`.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  benchSampler(process.argv[2] ?? demoCasePath).then((r) => console.log(JSON.stringify(r)));
}
