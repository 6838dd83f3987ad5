/**
 * The piscina worker: a task is a batch of consecutive scenario ids. The case is compiled once
 * per worker (from `workerData`) and cached; each task samples and simulates its scenarios and
 * returns the columns as typed arrays (no per-row objects).
 *
 * The columns live in one SharedArrayBuffer per batch (results/columns.ts allocateBatch), so the
 * return value crosses to the main thread by reference: no copy and no transfer. A transfer would
 * detach the worker's ArrayBuffers, and the first detached ArrayBuffer in a V8 isolate makes
 * every later typed-array access in that isolate check for detachment (V8's ArrayBuffer
 * detaching protector, from memory): the kernel then ran 12-20 % slower in the worker
 * (docs/runner.md, Measurements). The worker never touches a batch after returning it.
 */
import { workerData } from 'piscina';
import type { Case } from '../case/schema.js';
import type { ColumnBatch } from '../results/columns.js';
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

export default function runBatchTask(task: BatchTask): ColumnBatch {
  // returned as is: piscina copies it (no transfer list, so nothing in this isolate is detached)
  return kernelOf(workerData as WorkerSetup).runBatch(task.firstId, task.count);
}
