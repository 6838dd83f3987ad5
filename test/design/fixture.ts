/**
 * An invented toy microgrid for the design tests (invented numbers, no physics claimed): each
 * scenario draws its hour, battery state of charge and deficit from its own stream (seed,
 * scenario id), and the design parameter `batteryKwh` only changes how the same draws play out.
 * That is exactly the common-random-numbers property the paired comparison relies on.
 *
 *   deficit_kw  = 900 u1 - 250 - 200 * noonFactor(hour)      (PV at noon eases the deficit)
 *   support_kw  = min(400, 2 * soc * batteryKwh / 1 h)       (battery power within its energy)
 *   shed        = deficit_kw > support_kw
 *   shutdown    = deficit_kw > support_kw + 150 (the sheddable load)
 */
import { type Table, tableFromArrays } from 'apache-arrow';
import seedrandom from 'seedrandom';

export interface ToyDesign {
  batteryKwh: number;
  seed?: number;
  /** Scenario ids firstId .. firstId + n - 1. */
  n: number;
  firstId?: number;
}

export function toyScenarioTable(d: ToyDesign): Table {
  const seed = d.seed ?? 7;
  const first = d.firstId ?? 0;
  const id = new BigInt64Array(d.n);
  const weight = new Float64Array(d.n).fill(1);
  const hour = new Int16Array(d.n);
  const soc = new Float64Array(d.n);
  const deficit = new Float64Array(d.n);
  const shedKw = new Float64Array(d.n);
  const unserved = new Float64Array(d.n);
  const shutdown: boolean[] = [];
  const cause: string[] = [];
  const sourcesOut: string[] = [];
  const voltage: boolean[] = [];
  for (let k = 0; k < d.n; k++) {
    const rng = seedrandom.alea(`${seed}/${first + k}`);
    const h = Math.floor(rng() * 8760);
    const s = rng();
    const u1 = rng();
    const genOut = rng() < 0.1;
    const noon = Math.max(0, Math.cos(((h % 24) - 12) * (Math.PI / 12)));
    const def = 900 * u1 - 250 - 200 * noon + (genOut ? 200 : 0);
    const support = Math.min(400, 2 * s * d.batteryKwh);
    id[k] = BigInt(first + k);
    hour[k] = h;
    soc[k] = s;
    deficit[k] = def;
    const shed = def > support;
    const down = def > support + 150;
    shedKw[k] = shed ? Math.min(150, def - support) : 0;
    unserved[k] = down ? 10 * (def - support) : shedKw[k]! * 2;
    shutdown.push(down);
    cause.push(down ? (def > 600 ? 'under-frequency' : 'battery exhausted') : '');
    sourcesOut.push(genOut ? 'gen1' : '');
    voltage.push(rng() < 0.05);
  }
  return tableFromArrays({
    scenario_id: id,
    weight,
    hour_of_year: hour,
    battery_soc: soc,
    deficit_kw: deficit,
    shed_kw: shedKw,
    shutdown,
    shutdown_cause: cause,
    voltage_violation: voltage,
    unserved_kwh: unserved,
    sources_out: sourcesOut,
  });
}

/** Reorders the rows of a table (to test that pairing goes by scenario_id, not by position). */
export function reversedRows(t: Table): Table {
  const cols: Record<string, unknown[]> = {};
  for (const f of t.schema.fields) cols[f.name] = [...t.getChild(f.name)!].reverse();
  const typed: Record<string, ArrayLike<unknown>> = {};
  for (const f of t.schema.fields) {
    const v = cols[f.name]!;
    typed[f.name] =
      f.name === 'scenario_id'
        ? BigInt64Array.from(v as bigint[])
        : f.name === 'hour_of_year'
          ? Int16Array.from(v as number[])
          : typeof v[0] === 'number'
            ? Float64Array.from(v as number[])
            : v;
  }
  return tableFromArrays(typed as Parameters<typeof tableFromArrays>[0]);
}
