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
 * per scenario it allocates nothing (the `sources_out` text is appended as bytes from the
 * source ids encoded once, into a byte buffer that only grows). The batch columns are allocated
 * once per batch: the batch is the task's result, copied to the main thread (worker.ts).
 */
import type { Case } from '../case/schema.js';
import { compileOutage, OutageResult, simulateOutage } from '../energy/outage.js';
import { RunError } from '../errors.js';
import { EventResult } from '../grid/frequency/event-result.js';
import { compileIsland } from '../grid/frequency/island.js';
import { type EventOptions, simulateEvent } from '../grid/frequency/simulate.js';
import { assessIsland, compileNetwork, VoltageResult } from '../grid/voltage/island-voltage.js';
import { resolveLimits } from '../grid/voltage/limit-bands.js';
import { applyRideThrough, compileRideThrough } from '../grid/voltage/ride-through.js';
import {
  allocateBatch,
  type ColumnBatch,
  type ColumnGroup,
  type ColumnSpec,
  columnsOf,
  eventStatuses,
  packUtf8,
  setInt64,
  shutdownCauses,
  voltageStatuses,
} from '../results/columns.js';
import { monthOfHour } from '../sample/calendar.js';
import { compileSampler, sampleScenario } from '../sample/sampler.js';
import { Scenario } from '../sample/scenario.js';

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
  return ['core', 'sample', 'ride-through', 'frequency', 'voltage', 'outage'];
}

/** Indices of the sources of one kind, for the per-kind sums of the sample columns. */
function indicesOf(c: Case, kind: Case['sources'][number]['kind']): Int32Array {
  const out: number[] = [];
  c.sources.forEach((s, i) => {
    if (s.kind === kind) out.push(i);
  });
  return Int32Array.from(out);
}

/** Compiles the case once (per worker) into a kernel. `caseDir` resolves profile files. */
export function compileKernel(c: Case, caseDir: string, opts: KernelOptions): ScenarioKernel {
  const groups = kernelGroups();
  const specs = columnsOf(groups);
  const faults = opts.faults ?? {};
  const seed = opts.seed;
  const sampler = compileSampler(c, caseDir);
  const sc = new Scenario(c.sources.length, c.loads.length);
  const pvIdx = indicesOf(c, 'pv');
  const windIdx = indicesOf(c, 'wind');
  const batteryIdx = indicesOf(c, 'battery');
  const batteryKwh = Float64Array.from(batteryIdx, (i) => {
    const s = c.sources[i]!;
    return s.kind === 'battery' ? s.energyKwh : 0;
  });

  const island = compileIsland(c);
  const ev = new EventResult(c.sources.length, c.loads.length);
  const eventOpts: EventOptions = {
    horizonS: c.monteCarlo.horizonS,
    rocofWindowS: c.monteCarlo.rocofWindowS,
  };
  const rideThrough = compileRideThrough(c);
  const network = compileNetwork(c);
  const vr = new VoltageResult();
  const limits = resolveLimits(c);
  const rocofLimit = c.limits.rocofMaxHzPerS ?? Number.POSITIVE_INFINITY;
  const outage = compileOutage(c, sampler, island);
  const out = new OutageResult(c.sources.length, c.loads.length);
  const voltageCode = new Map(voltageStatuses.map((name, k) => [name, k]));
  const notAssessed = voltageCode.get('not assessed')!;
  const causeCode = new Map(shutdownCauses.map((name, k) => [name, k]));
  const otherCause = causeCode.get('other')!;
  const statusCode = new Map(eventStatuses.map((name, k) => [name, k]));
  const sourcesOut = new SourceSetText(c.sources.map((s) => s.id));

  function runBatch(firstId: number, count: number): ColumnBatch {
    const batch = allocateBatch(specs, firstId, count);
    const col = batch.columns;
    const idWords = new Int32Array(col['scenario_id']!.buffer);
    const weight = col['weight'] as Float64Array;
    const hour = col['hour_of_year'] as Int16Array;
    const month = col['month'] as Int8Array;
    const loadKw = col['load_kw'] as Float64Array;
    const pvKw = col['pv_kw'] as Float64Array;
    const windKw = col['wind_kw'] as Float64Array;
    const soc = col['battery_soc'] as Float64Array;
    const gridKw = col['grid_import_kw'] as Float64Array;
    const nAvailable = col['sources_available'] as Int16Array;
    sourcesOut.start(count);
    const dipPu = col['dip_retained_pu'] as Float64Array;
    const dipS = col['dip_duration_s'] as Float64Array;
    const outageH = col['outage_duration_h'] as Float64Array;
    const deficitKw = col['deficit_kw'] as Float64Array;
    const nadirHz = col['nadir_hz'] as Float64Array;
    const nadirS = col['nadir_time_s'] as Float64Array;
    const zenithHz = col['zenith_hz'] as Float64Array;
    const rocof = col['rocof_max_hz_per_s'] as Float64Array;
    const settledHz = col['f_settled_hz'] as Float64Array;
    const shedKw = col['shed_kw'] as Float64Array;
    const shedStages = col['shed_stages'] as Int8Array;
    const shutdown = col['shutdown'] as Uint8Array;
    const cause = col['shutdown_cause'] as Int8Array;
    const tripped = col['units_tripped'] as Int16Array;
    const status = col['event_status'] as Int8Array;
    const dipTrips = col['units_tripped_by_dip'] as Int16Array;
    const ceased = col['units_in_cessation'] as Int16Array;
    const fViolation = col['frequency_violation'] as Uint8Array;
    const vMin = col['v_min_pu'] as Float64Array;
    const vMinBus = col['v_min_bus'] as Int16Array;
    const vMax = col['v_max_pu'] as Float64Array;
    const vViolation = col['voltage_violation'] as Uint8Array;
    const damping = col['min_damping_ratio'] as Float64Array;
    const margin = col['loading_margin'] as Float64Array;
    const vStatus = col['voltage_status'] as Int8Array;
    const outH = col['outage_h'] as Float64Array;
    const survivedH = col['survived_h'] as Float64Array;
    const unservedKwh = col['unserved_kwh'] as Float64Array;
    const unservedCritKwh = col['unserved_critical_kwh'] as Float64Array;
    const lolH = col['lol_h'] as Float64Array;
    const fuelL = col['fuel_used_l'] as Float64Array;
    const minSoc = col['min_soc'] as Float64Array;
    const contingencies = col['contingencies'] as Int16Array;
    const criticalLost = col['critical_lost'] as Uint8Array;
    const shutdownAny = col['shutdown_any_time'] as Uint8Array;
    for (let row = 0; row < count; row++) {
      const id = firstId + row;
      if (id === faults.throwAtScenarioId)
        throw new RunError(`scenario ${id}: injected failure (test hook)`);
      if (id === faults.crashAtScenarioId) process.exit(70);
      try {
        sampleScenario(sampler, seed, id, sc);
        applyRideThrough(rideThrough, sc);
        simulateEvent(island, sc, eventOpts, ev);
        assessIsland(network, sc, ev, vr);
        simulateOutage(outage, sc, ev, out);
      } catch (err) {
        throw new RunError(`scenario ${id}: ${(err as Error).message}`, { cause: err });
      }
      setInt64(idWords, row, id);
      weight[row] = sc.weight;
      hour[row] = sc.hourOfYear;
      month[row] = monthOfHour(sc.hourOfYear) + 1;
      let sum = 0;
      for (let i = 0; i < sc.loadCount; i++) sum += sc.loadKw[i]!;
      loadKw[row] = sum;
      sum = 0;
      for (let k = 0; k < pvIdx.length; k++) sum += sc.dispatchKw[pvIdx[k]!]!;
      pvKw[row] = sum;
      sum = 0;
      for (let k = 0; k < windIdx.length; k++) sum += sc.dispatchKw[windIdx[k]!]!;
      windKw[row] = sum;
      let kwh = 0;
      sum = 0;
      for (let k = 0; k < batteryIdx.length; k++) {
        const i = batteryIdx[k]!;
        if (sc.available[i] === 0) continue;
        kwh += batteryKwh[k]!;
        sum += batteryKwh[k]! * sc.socFraction[i]!;
      }
      soc[row] = kwh > 0 ? sum / kwh : Number.NaN;
      gridKw[row] = sc.gridImportKw;
      let n = 0;
      for (let i = 0; i < sc.sourceCount; i++) n += sc.available[i]!;
      nAvailable[row] = n;
      sourcesOut.addRow(row, sc.available);
      dipPu[row] = sc.dipRetainedPu;
      dipS[row] = sc.dipDurationS;
      outageH[row] = sc.outageDurationH;
      deficitKw[row] = ev.deficitKw;
      nadirHz[row] = ev.nadirHz;
      nadirS[row] = ev.nadirTimeS;
      zenithHz[row] = ev.zenithHz;
      rocof[row] = ev.rocofMaxHzPerS;
      settledHz[row] = ev.fSettledHz;
      shedKw[row] = ev.shedKw;
      shedStages[row] = ev.shedStages;
      shutdown[row] = ev.shutdown ? 1 : 0;
      cause[row] = ev.shutdown ? (causeCode.get(ev.shutdownCause) ?? otherCause) : 0;
      tripped[row] = ev.unitsTripped;
      status[row] = statusCode.get(ev.status)!;
      let dipTripped = 0;
      let inCessation = 0;
      for (let i = 0; i < sc.sourceCount; i++) {
        dipTripped += sc.trippedAtSeparation[i]!;
        if (sc.cessationS[i]! > 0) inCessation++;
      }
      dipTrips[row] = dipTripped;
      ceased[row] = inCessation;
      fViolation[row] =
        ev.nadirHz < limits.frequencyMinHz ||
        ev.zenithHz > limits.frequencyMaxHz ||
        ev.rocofMaxHzPerS > rocofLimit
          ? 1
          : 0;
      vStatus[row] = vr.assessed ? voltageCode.get(vr.status)! : notAssessed;
      vMin[row] = vr.assessed ? vr.vMinPu : Number.NaN;
      vMinBus[row] = vr.assessed ? vr.vMinBus : -1;
      vMax[row] = vr.assessed ? vr.vMaxPu : Number.NaN;
      vViolation[row] = vr.voltageViolation ? 1 : 0;
      damping[row] = vr.assessed ? vr.minDampingRatio : Number.NaN;
      margin[row] = vr.assessed ? vr.loadingMargin : Number.NaN;
      outH[row] = out.outageH;
      survivedH[row] = out.survivedH;
      unservedKwh[row] = out.unservedKwh;
      unservedCritKwh[row] = out.unservedCriticalKwh;
      lolH[row] = out.lolH;
      fuelL[row] = out.fuelUsedL;
      minSoc[row] = out.minSoc;
      contingencies[row] = out.contingencies;
      criticalLost[row] = out.criticalLost ? 1 : 0;
      shutdownAny[row] = out.shutdown ? 1 : 0;
    }
    col['sources_out'] = sourcesOut.pack(count);
    return batch;
  }

  return { groups, specs, runBatch };
}

const plus = 0x2b; // '+', the separator of source ids in sources_out

/**
 * The `sources_out` text of a batch: per row, the ids of the unavailable sources joined by '+',
 * written as UTF-8 bytes from ids encoded once; offsets and bytes are reused across batches.
 */
class SourceSetText {
  private readonly ids: Uint8Array[];
  private offsets = new Int32Array(1);
  private bytes = new Uint8Array(256);

  constructor(ids: readonly string[]) {
    const encoder = new TextEncoder();
    this.ids = ids.map((id) => encoder.encode(id));
  }

  start(count: number): void {
    if (this.offsets.length < count + 1) this.offsets = new Int32Array(count + 1);
    this.offsets[0] = 0;
  }

  addRow(row: number, available: Uint8Array): void {
    let at = this.offsets[row]!;
    let first = true;
    for (let i = 0; i < this.ids.length; i++) {
      if (available[i] !== 0) continue;
      const id = this.ids[i]!;
      this.reserve(at + id.length + 1);
      if (!first) this.bytes[at++] = plus;
      this.bytes.set(id, at);
      at += id.length;
      first = false;
    }
    this.offsets[row + 1] = at;
  }

  pack(count: number): Uint8Array {
    return packUtf8(this.offsets, this.bytes, count);
  }

  private reserve(size: number): void {
    if (size <= this.bytes.length) return;
    const bigger = new Uint8Array(Math.max(size, 2 * this.bytes.length));
    bigger.set(this.bytes);
    this.bytes = bigger;
  }
}
