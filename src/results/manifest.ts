/**
 * `run.json`: the manifest of an output folder (CONTRACT.md): what was run, on what, how far it
 * got, and enough to resume or merge it (case SHA-256, seed, shard, id range, plan, column groups).
 */
import {
  closeSync,
  existsSync,
  fsyncSync,
  openSync,
  readFileSync,
  renameSync,
  writeSync,
} from 'node:fs';
import { CaseError } from '../errors.js';
import type { StoppingRecord } from '../run/stopping-rule.js';
import type { ColumnGroup } from './columns.js';

export interface RunManifest {
  tool: 'holdfast';
  toolVersion: string;
  caseName: string;
  /** SHA-256 of the case file's bytes (before --set overrides). */
  caseSha256: string;
  /** SHA-256 of the validated case after overrides (resume and merge compare this one). */
  caseContentSha256: string;
  seed: number | string;
  /** Scenarios asked for (the whole study, all shards); the cap under --until-rel-error. */
  scenariosRequested: number;
  /** Rows in scenarios.arrow. */
  scenarioCount: number;
  /** The ids of this output: [idStart, idStart + scenarioCount) of the planned [idStart, idEnd). */
  idStart: number;
  idEnd: number;
  shard: { index: number; count: number } | null;
  workers: number;
  batchSize: number;
  /** Ids per summary update, shard boundary unit (whole sampling-plan blocks). */
  feedBlock: number;
  wallSeconds: number;
  scenariosPerSecond: number;
  status: 'complete' | 'partial';
  /** Why a partial run stopped: 'interrupted' or 'failed: <message>'. */
  stopReason: string | null;
  confidenceLevel: number;
  failureDefinition: string;
  islandingRatePerYear: number;
  nominalFrequencyHz: number;
  plan: string;
  columnGroups: ColumnGroup[];
  /** The `--until-rel-error` pilot and plan (src/run/stopping-rule.ts), or null. */
  untilRelError: StoppingRecord | null;
  /** Shards merged into this folder (merge only). */
  mergedFrom?: string[];
  caution: string;
}

export const screeningCaution =
  'Screening estimates only: protection settings and interconnection are decided under local codes by licensed engineers.';

export function toolVersion(): string {
  // the package root is two levels above both src/results and dist/results
  const text = readFileSync(new URL('../../package.json', import.meta.url), 'utf8');
  return (JSON.parse(text) as { version: string }).version;
}

/** Writes a file under a temporary name, fsyncs and renames it into place. */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const tmp = `${path}.tmp-${process.pid}`;
  const fd = openSync(tmp, 'w');
  writeSync(fd, typeof data === 'string' ? Buffer.from(data) : data);
  fsyncSync(fd);
  closeSync(fd);
  renameSync(tmp, path);
}

export function writeManifest(path: string, m: RunManifest): void {
  writeFileAtomic(path, `${JSON.stringify(m, null, 2)}\n`);
}

export function readManifest(path: string): RunManifest {
  if (!existsSync(path))
    throw CaseError.single(path, 'expected a run.json manifest from an earlier run, found none');
  try {
    return JSON.parse(readFileSync(path, 'utf8')) as RunManifest;
  } catch (err) {
    throw CaseError.single(path, `expected a JSON manifest, could not parse it (${String(err)})`);
  }
}
