/**
 * The scenario kernel: one scenario id in, one row of columns out. It calls the models in the
 * order of the data path (sampler, ride-through, frequency event, island voltage, outage hours)
 * and copies their results into the batch columns. A model that is not part of the build
 * contributes no columns (see `columns.ts`), never placeholder values.
 *
 * Reproducibility: every random number of scenario k comes from the sampler's stream derived
 * from (seed, k), so a row depends only on (case, seed, k): not on the worker, the batch or the
 * order in which batches finish.
 *
 * Hot path: the kernel owns one preallocated `Scenario` struct and the models' result structs;
 * per scenario it allocates nothing. The batch columns are allocated once per batch (they are
 * transferred to the main thread and cannot be reused).
 */
import type { Case } from '../case/schema.js';
import { RunError } from '../errors.js';
import {
  allocateBatch,
  type ColumnBatch,
  type ColumnGroup,
  type ColumnSpec,
  columnsOf,
  setInt64,
} from '../results/columns.js';

/** Test hooks that make the kernel fail on purpose (the pool's retry and exit-3 paths). */
export interface KernelFaults {
  /** Throw an error while computing this scenario id. */
  throwAtScenarioId?: number;
  /** Kill the worker thread (process.exit inside the worker) at this scenario id. */
  crashAtScenarioId?: number;
}

export interface KernelOptions {
  seed: number | string;
  faults?: KernelFaults;
}

export interface ScenarioKernel {
  readonly groups: readonly ColumnGroup[];
  readonly specs: readonly ColumnSpec[];
  /** Simulates scenarios firstId .. firstId + count - 1 into a freshly allocated batch. */
  runBatch(firstId: number, count: number): ColumnBatch;
}

/** The column groups this build produces, in kernel order. */
export function kernelGroups(): ColumnGroup[] {
  return ['core'];
}

/** Compiles the case once (per worker) into a kernel. `caseDir` resolves profile files. */
export function compileKernel(c: Case, caseDir: string, opts: KernelOptions): ScenarioKernel {
  void c;
  void caseDir;
  const groups = kernelGroups();
  const specs = columnsOf(groups);
  const faults = opts.faults ?? {};

  function runBatch(firstId: number, count: number): ColumnBatch {
    const batch = allocateBatch(specs, firstId, count);
    const cols = batch.columns;
    const idWords = new Int32Array(cols['scenario_id']!.buffer);
    const weight = cols['weight'] as Float64Array;
    for (let row = 0; row < count; row++) {
      const id = firstId + row;
      if (id === faults.throwAtScenarioId)
        throw new RunError(`scenario ${id}: injected failure (test hook)`);
      if (id === faults.crashAtScenarioId) process.exit(70);
      setInt64(idWords, row, id);
      weight[row] = 1;
    }
    return batch;
  }

  return { groups, specs, runBatch };
}
