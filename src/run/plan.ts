/**
 * Which scenario ids a run computes, in which tasks, and the stages of the stopping rule's pilot.
 *
 * Ids are cut on a fixed grid of `block` ids. Shards are contiguous runs of whole
 * blocks, task batches are whole multiples of the block, and the summary is fed one block at a
 * time in id order. So the sequence of summary updates, and therefore every summary figure, is
 * the same whatever the worker count, the batch size, the shard split or an interruption.
 */
import { CaseError } from '../errors.js';
import { type PlanKind, planBlockSize } from '../sample/plan.js';

/** Smallest granularity of shards, batches and summary updates (ids). */
const minFeedBlock = 100;

/**
 * The feed block of a case: the smallest multiple of the sampling plan's block (plan.ts in
 * src/sample: 1, 12, 288 or 256 ids) that is at least 100 ids. Whole plan blocks keep the
 * weighted estimators unbiased at every shard boundary and pilot stage.
 */
export function feedBlockOf(plan: PlanKind): number {
  const b = planBlockSize[plan];
  return b * Math.ceil(minFeedBlock / b);
}

/**
 * Default scenarios per task: 1000 (docs/runner.md, "Batch size"), fewer for small runs so each
 * worker gets at least 16 tasks (the last task of a worker is its idle tail).
 */
export const defaultBatchSize = 1000;

/** `--shard I/N`: 1-based index of N. */
export interface ShardSpec {
  index: number;
  count: number;
}

/** The ids [start, end) of shard `index` of `count` over `total` scenarios. */
export function shardRange(
  total: number,
  block: number,
  shard?: ShardSpec,
): { start: number; end: number } {
  if (!shard || shard.count === 1) return { start: 0, end: total };
  if (!(shard.index >= 1 && shard.index <= shard.count))
    throw CaseError.single(
      '--shard',
      `expected I/N with 1 <= I <= N, got ${shard.index}/${shard.count}`,
    );
  const blocks = Math.ceil(total / block);
  const b0 = Math.floor(((shard.index - 1) * blocks) / shard.count);
  const b1 = Math.floor((shard.index * blocks) / shard.count);
  return {
    start: Math.min(total, b0 * block),
    end: Math.min(total, b1 * block),
  };
}

/** Rounds a requested batch size to a whole number of feed blocks (at least one). */
export function alignBatchSize(requested: number, block: number): number {
  return Math.max(1, Math.round(requested / block)) * block;
}

/**
 * Counts doubling from `first` (rounded up to whole blocks) up to `cap` (the last count): the
 * stages of the `--until-rel-error` pilot (stopping-rule.ts). Whole blocks keep every stage a
 * valid design of the sampling plan.
 */
export function doublingCounts(first: number, cap: number, block: number): number[] {
  const out: number[] = [];
  let n = Math.max(block, Math.ceil(first / block) * block);
  while (n < cap) {
    out.push(n);
    n *= 2;
  }
  out.push(cap);
  return out;
}
