/**
 * Replays one scenario exactly: the same kernel as the run computes its row (so the printed
 * metrics equal row K of scenarios.arrow bit for bit), then the frequency event is simulated
 * again with a trace sink that records the time series into trajectory.arrow
 * (t_s, f_hz, rocof_hz_per_s, one p_<source id>_kw per source, load_kw, shed_kw).
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { LoadedCase } from '../case/load.js';
import { CaseError } from '../errors.js';
import { EventResult } from '../grid/frequency/event-result.js';
import { compileIsland } from '../grid/frequency/island.js';
import { simulateEvent, type TraceSink } from '../grid/frequency/simulate.js';
import { applyRideThrough, compileRideThrough } from '../grid/voltage/ride-through.js';
import { ArrowFileSink, BatchEncoder } from '../results/arrow-writer.js';
import { type ColumnBatch, type ColumnSpec, utf8At } from '../results/columns.js';
import { compileSampler, sampleScenario } from '../sample/sampler.js';
import { Scenario } from '../sample/scenario.js';
import { compileKernel } from './kernel.js';

/** Trace sample spacing, s: 10 ms resolves UFLS relay pickup (0.1 s) and RoCoF windows. */
export const defaultTraceIntervalS = 0.01;

export interface ReplayOptions {
  scenarioId: number;
  seed?: number | string;
  outDir: string;
  traceIntervalS?: number;
}

export interface ReplayOutcome {
  /** The scenario's row, as in scenarios.arrow (category columns as text, bools as booleans). */
  row: Record<string, number | string | boolean>;
  trajectoryPath: string;
  samples: number;
}

/** Growable column storage of the trace (replay is not a hot path). */
class TraceColumns implements TraceSink {
  rows = 0;
  private capacity = 1024;
  cols: Float64Array[];
  constructor(
    readonly intervalS: number,
    readonly sourceCount: number,
  ) {
    this.cols = Array.from({ length: 5 + sourceCount }, () => new Float64Array(this.capacity));
  }
  record(
    tS: number,
    fHz: number,
    rocofHzPerS: number,
    pKw: Float64Array,
    loadKw: number,
    shedKw: number,
  ) {
    if (this.rows === this.capacity) {
      this.capacity *= 2;
      this.cols = this.cols.map((c) => {
        const bigger = new Float64Array(this.capacity);
        bigger.set(c);
        return bigger;
      });
    }
    const r = this.rows++;
    const c = this.cols;
    c[0]![r] = tS;
    c[1]![r] = fHz;
    c[2]![r] = rocofHzPerS;
    for (let i = 0; i < this.sourceCount; i++) c[3 + i]![r] = pKw[i]!;
    c[3 + this.sourceCount]![r] = loadKw;
    c[4 + this.sourceCount]![r] = shedKw;
  }
}

function rowOf(
  specs: readonly ColumnSpec[],
  b: ColumnBatch,
): Record<string, number | string | boolean> {
  const row: Record<string, number | string | boolean> = {};
  for (const s of specs) {
    if (s.kind === 'utf8') {
      row[s.name] = utf8At(b.columns[s.name] as Uint8Array, b.count, 0);
      continue;
    }
    const v = b.columns[s.name]![0]!;
    if (s.kind === 'int64') row[s.name] = Number(v);
    else if (s.kind === 'bool') row[s.name] = v === 1;
    else if (s.kind === 'category') row[s.name] = s.categories![Number(v)]!;
    else row[s.name] = Number(v);
  }
  return row;
}

export async function replayScenario(
  loaded: LoadedCase,
  opts: ReplayOptions,
): Promise<ReplayOutcome> {
  const c = loaded.case;
  const seed = opts.seed ?? c.monteCarlo.seed;
  if (!(Number.isInteger(opts.scenarioId) && opts.scenarioId >= 0))
    throw CaseError.single('--scenario', `expected a scenario id >= 0, got ${opts.scenarioId}`);
  const kernel = compileKernel(c, loaded.dir, { seed });
  const row = rowOf(kernel.specs, kernel.runBatch(opts.scenarioId, 1));

  // the frequency event again, traced: the same operating point, so the same trajectory
  const sampler = compileSampler(c, loaded.dir);
  const sc = new Scenario(c.sources.length, c.loads.length);
  sampleScenario(sampler, seed, opts.scenarioId, sc);
  applyRideThrough(compileRideThrough(c), sc);
  const trace = new TraceColumns(opts.traceIntervalS ?? defaultTraceIntervalS, c.sources.length);
  simulateEvent(
    compileIsland(c),
    sc,
    { horizonS: c.monteCarlo.horizonS, rocofWindowS: c.monteCarlo.rocofWindowS },
    new EventResult(c.sources.length, c.loads.length),
    trace,
  );

  const specs: ColumnSpec[] = [
    {
      name: 't_s',
      kind: 'float64',
      unit: 's',
      description: 'time since separation',
      group: 'core',
    },
    { name: 'f_hz', kind: 'float64', unit: 'Hz', description: 'island frequency', group: 'core' },
    {
      name: 'rocof_hz_per_s',
      kind: 'float64',
      unit: 'Hz/s',
      description: 'instantaneous rate of change of frequency',
      group: 'core',
    },
    ...c.sources.map(
      (s): ColumnSpec => ({
        name: `p_${s.id}_kw`,
        kind: 'float64',
        unit: 'kW',
        description: `active power output of ${s.kind} ${s.id}`,
        group: 'core',
      }),
    ),
    {
      name: 'load_kw',
      kind: 'float64',
      unit: 'kW',
      description: 'load served (after shedding)',
      group: 'core',
    },
    {
      name: 'shed_kw',
      kind: 'float64',
      unit: 'kW',
      description: 'load shed so far by UFLS',
      group: 'core',
    },
  ];
  const columns: ColumnBatch['columns'] = {};
  specs.forEach((s, k) => {
    columns[s.name] = trace.cols[k]!.subarray(0, trace.rows);
  });
  mkdirSync(opts.outDir, { recursive: true });
  const trajectoryPath = join(opts.outDir, 'trajectory.arrow');
  const enc = new BatchEncoder(specs);
  const sink = new ArrowFileSink(trajectoryPath, enc.schema);
  await sink.write(enc.encode({ firstId: 0, count: trace.rows, columns }));
  await sink.close();
  return { row, trajectoryPath, samples: trace.rows };
}
