/**
 * Test islands built in code (invented data, labelled `invented: true`): a case parsed by the real
 * schema, and an operating point filled by hand. Not a test file itself.
 */
import { type Case, type CaseInput, caseSchema } from '../../../src/case/schema.js';
import { Scenario } from '../../../src/sample/scenario.js';

type SourceInput = CaseInput['sources'][number];
type LoadInput = CaseInput['loads'][number];

export function genset(
  id: string,
  ratingKw: number,
  extra: Record<string, unknown> = {},
): SourceInput {
  return {
    id,
    bus: 'b1',
    kind: 'genset',
    ratingKw,
    ratingKva: ratingKw,
    inertiaS: 2,
    ...extra,
  } as SourceInput;
}

export function battery(
  id: string,
  ratingKw: number,
  extra: Record<string, unknown> = {},
): SourceInput {
  return { id, bus: 'b1', kind: 'battery', ratingKw, energyKwh: ratingKw, ...extra } as SourceInput;
}

export function pv(id: string, ratingKw: number, extra: Record<string, unknown> = {}): SourceInput {
  return {
    id,
    bus: 'b1',
    kind: 'pv',
    ratingKw,
    resource: { kind: 'parametric', latitudeDeg: 40 },
    ...extra,
  } as SourceInput;
}

export function wind(
  id: string,
  ratingKw: number,
  extra: Record<string, unknown> = {},
): SourceInput {
  return {
    id,
    bus: 'b1',
    kind: 'wind',
    ratingKw,
    resource: { kind: 'parametric', weibullScaleMPerSByMonth: Array(12).fill(7) },
    ...extra,
  } as SourceInput;
}

export function fuelCell(
  id: string,
  ratingKw: number,
  extra: Record<string, unknown> = {},
): SourceInput {
  return { id, bus: 'b1', kind: 'fuelcell', ratingKw, ...extra } as SourceInput;
}

export function load(
  id: string,
  tier: 'critical' | 'essential' | 'sheddable',
  peakKw: number,
  d = 1,
): LoadInput {
  return { id, bus: 'b1', tier, peakKw, frequencySensitivityPu: d };
}

export function makeCase(
  sources: SourceInput[],
  loads: LoadInput[],
  opts: { frequencyHz?: 50 | 60; baseKva?: number; protection?: CaseInput['protection'] } = {},
): Case {
  return caseSchema.parse({
    name: 'invented test island',
    invented: true,
    system: { frequencyHz: opts.frequencyHz ?? 60, voltageKv: 0.48, baseKva: opts.baseKva ?? 1000 },
    sources,
    loads,
    network: { buses: [{ id: 'b1' }], pccBus: 'b1' },
    protection: opts.protection ?? { ufls: [], shutdownDelayS: 0.5 },
    events: { islandingRatePerYear: 1, outageDurationH: { kind: 'fixed', value: 4 } },
  });
}

/**
 * An operating point: every non-standby source running at `dispatchKw` (default 0), loads at
 * `loadKw` (default their peak), grid import = load - dispatch.
 */
export function makeScenario(
  c: Case,
  o: {
    dispatchKw?: number[];
    availableKw?: number[];
    loadKw?: number[];
    soc?: number;
    tripped?: number[];
    cessationS?: number[];
    failsToStart?: number[];
  } = {},
): Scenario {
  const s = new Scenario(c.sources.length, c.loads.length);
  c.sources.forEach((src, i) => {
    s.available[i] = 1;
    s.running[i] = src.kind === 'genset' && src.operation === 'standby' ? 0 : 1;
    s.dispatchKw[i] = o.dispatchKw?.[i] ?? 0;
    s.availableKw[i] = o.availableKw?.[i] ?? src.ratingKw;
    s.socFraction[i] = src.kind === 'battery' ? (o.soc ?? 0.6) : 0;
    s.trippedAtSeparation[i] = o.tripped?.[i] ?? 0;
    s.cessationS[i] = o.cessationS?.[i] ?? 0;
    s.failsToStart[i] = o.failsToStart?.[i] ?? 0;
    s.timeToFailureH[i] = Number.POSITIVE_INFINITY;
  });
  let loadKw = 0;
  c.loads.forEach((l, j) => {
    s.loadKw[j] = o.loadKw?.[j] ?? l.peakKw;
    loadKw += s.loadKw[j]!;
  });
  let gen = 0;
  for (let i = 0; i < c.sources.length; i++) gen += s.running[i] ? s.dispatchKw[i]! : 0;
  s.gridImportKw = loadKw - gen;
  return s;
}

/** A trace sink that keeps every sample (tests only). */
export class RecordingTrace {
  readonly t: number[] = [];
  readonly f: number[] = [];
  readonly rocof: number[] = [];
  readonly p: number[][] = [];
  readonly load: number[] = [];
  readonly shed: number[] = [];
  constructor(readonly intervalS: number) {}
  record(
    tS: number,
    fHz: number,
    rocofHzPerS: number,
    pKw: Float64Array,
    loadKw: number,
    shedKw: number,
  ): void {
    this.t.push(tS);
    this.f.push(fHz);
    this.rocof.push(rocofHzPerS);
    this.p.push(Array.from(pKw));
    this.load.push(loadKw);
    this.shed.push(shedKw);
  }
}
