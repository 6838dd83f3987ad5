/**
 * The piscina worker: a task is a batch of consecutive scenario ids. The case is compiled once
 * per worker (from `workerData`) and cached; each task samples and simulates its scenarios and
 * returns the columns as transferred typed arrays (zero copy, no per-row objects).
 */
import { move, transferableSymbol, valueSymbol, workerData } from 'piscina';
import type { Case } from '../case/schema.js';
import { batchBuffers, type ColumnBatch } from '../results/columns.js';
import { compileKernel, type KernelFaults, type ScenarioKernel } from './kernel.js';

/** What the pool hands every worker once, at start. */
export interface WorkerSetup {
  case: Case;
  caseDir: string;
  seed: number | string;
  faults?: KernelFaults;
}

export interface BatchTask {
  firstId: number;
  count: number;
}

let kernel: ScenarioKernel | undefined;

/** Prefix of a compile failure, which names no scenario (the pool does not bisect it). */
export const compileFailurePrefix = 'compiling the case in a worker';

function kernelOf(setup: WorkerSetup): ScenarioKernel {
  if (kernel) return kernel;
  try {
    kernel = compileKernel(setup.case, setup.caseDir, { seed: setup.seed, faults: setup.faults });
  } catch (err) {
    throw new Error(`${compileFailurePrefix}: ${(err as Error).message}`, { cause: err });
  }
  return kernel;
}

export default function runBatchTask(task: BatchTask): unknown {
  const batch: ColumnBatch = kernelOf(workerData as WorkerSetup).runBatch(task.firstId, task.count);
  const buffers = batchBuffers(batch);
  // TOOLCHAIN.md 2: move() an object through a wrapper naming its transferables
  return move({
    get [transferableSymbol]() {
      return buffers;
    },
    get [valueSymbol]() {
      return batch;
    },
  } as never);
}
