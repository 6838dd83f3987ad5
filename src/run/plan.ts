/**
 * Which scenario ids a run computes, in which tasks, and when the stopping rule looks.
 *
 * Ids are cut on a fixed grid of `feedBlockSize` ids. Shards are contiguous runs of whole
 * blocks, task batches are whole multiples of the block, and the summary is fed one block at a
 * time in id order. So the sequence of summary updates, and therefore every summary figure, is
 * the same whatever the worker count, the batch size, the shard split or an interruption.
 */
import { CaseError } from '../errors.js';

/** Granularity of shards, batches and summary updates (ids). */
export const feedBlockSize = 100;

/** Default scenarios per task: 1000 (docs/runner.md, "Batch size"). */
export const defaultBatchSize = 1000;

/** `--shard I/N`: 1-based index of N. */
export interface ShardSpec {
  index: number;
  count: number;
}

/** The ids [start, end) of shard `index` of `count` over `total` scenarios. */
export function shardRange(total: number, shard?: ShardSpec): { start: number; end: number } {
  if (!shard || shard.count === 1) return { start: 0, end: total };
  if (!(shard.index >= 1 && shard.index <= shard.count))
    throw CaseError.single(
      '--shard',
      `expected I/N with 1 <= I <= N, got ${shard.index}/${shard.count}`,
    );
  const blocks = Math.ceil(total / feedBlockSize);
  const b0 = Math.floor(((shard.index - 1) * blocks) / shard.count);
  const b1 = Math.floor((shard.index * blocks) / shard.count);
  return {
    start: Math.min(total, b0 * feedBlockSize),
    end: Math.min(total, b1 * feedBlockSize),
  };
}

/** Rounds a requested batch size to a whole number of feed blocks (at least one). */
export function alignBatchSize(requested: number): number {
  return Math.max(1, Math.round(requested / feedBlockSize)) * feedBlockSize;
}

/**
 * Stopping-rule checkpoints for `--until-rel-error`: the counts at which the rule looks,
 * doubling from `first` up to `cap` (the cap is the last checkpoint). Looking only at counts
 * fixed in advance, a geometric sequence with about log2(cap/first) looks, keeps the number
 * of looks small; the run reports how many it made.
 */
export function checkpoints(first: number, cap: number): number[] {
  const out: number[] = [];
  let n = Math.max(feedBlockSize, Math.ceil(first / feedBlockSize) * feedBlockSize);
  while (n < cap) {
    out.push(n);
    n *= 2;
  }
  out.push(cap);
  return out;
}
