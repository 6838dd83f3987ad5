/**
 * The per-scenario rows of one run as the design questions read them: `scenarios.arrow` turned
 * into plain columns (numbers as Float64Array, booleans as 0/1, text as strings), and the pairing
 * of two runs by `scenario_id` for the paired (common random numbers) comparison.
 *
 * Pairing is strict: both runs must hold exactly the same scenario ids with the same weights.
 * Under common random numbers a design parameter never moves the draws or the weights of a
 * scenario, so a mismatch means the runs were not made on the same seed and scenarios; it is
 * refused rather than silently intersected.
 */
import { Bool, DataType, type Table } from 'apache-arrow';
import { RunError } from '../errors.js';
import { readArrowFile } from './designTable.js';

export class ScenarioFrame {
  /** Number of rows. */
  readonly n: number;
  readonly scenarioId: Float64Array;
  readonly weight: Float64Array;
  private readonly numericCache = new Map<string, Float64Array>();

  constructor(
    readonly table: Table,
    /** Where the rows came from, for error messages. */
    readonly origin: string,
  ) {
    this.n = table.numRows;
    const id = this.numeric('scenario_id');
    if (!id) throw new RunError(`${origin}: no scenario_id column`);
    this.scenarioId = id;
    this.weight = this.numeric('weight') ?? new Float64Array(this.n).fill(1);
  }

  has(name: string): boolean {
    return this.table.schema.fields.some((f) => f.name === name);
  }

  /** A numeric or boolean column as Float64Array (booleans 0/1); undefined when absent or text. */
  numeric(name: string): Float64Array | undefined {
    const cached = this.numericCache.get(name);
    if (cached) return cached;
    const field = this.table.schema.fields.find((f) => f.name === name);
    const column = this.table.getChild(name);
    if (!field || !column) return undefined;
    const out = new Float64Array(this.n);
    if (field.type instanceof Bool) {
      for (let i = 0; i < this.n; i++) out[i] = column.get(i) ? 1 : 0;
    } else if (DataType.isInt(field.type) || DataType.isFloat(field.type)) {
      let i = 0;
      for (const chunk of column.data) {
        const values = chunk.values as ArrayLike<number | bigint>;
        for (let j = 0; j < chunk.length; j++) out[i++] = Number(values[j]);
      }
    } else return undefined;
    this.numericCache.set(name, out);
    return out;
  }

  /** A text or dictionary-of-text column as strings (null as ''); undefined when absent. */
  text(name: string): string[] | undefined {
    const field = this.table.schema.fields.find((f) => f.name === name);
    const column = this.table.getChild(name);
    if (!field || !column) return undefined;
    if (!DataType.isUtf8(field.type) && !DataType.isDictionary(field.type)) return undefined;
    const out: string[] = new Array(this.n);
    for (let i = 0; i < this.n; i++) {
      const v = column.get(i);
      out[i] = v == null ? '' : String(v);
    }
    return out;
  }

  /** Sum of the weights. */
  totalWeight(): number {
    let s = 0;
    for (let i = 0; i < this.n; i++) s += this.weight[i]!;
    return s;
  }
}

/** Reads `scenarios.arrow` of a run folder (or a file path). */
export function readScenarioFrame(path: string): ScenarioFrame {
  return new ScenarioFrame(readArrowFile(path), path);
}

/** Row indices of the two frames in matching order: base row baseRow[k] pairs with variantRow[k]. */
export interface Pairing {
  n: number;
  baseRow: Int32Array;
  variantRow: Int32Array;
  /** The common weight of each pair. */
  weight: Float64Array;
}

/** Pairs two runs' scenario rows by scenario_id; RunError unless ids and weights agree. */
export function pairScenarios(base: ScenarioFrame, variant: ScenarioFrame): Pairing {
  if (base.n !== variant.n)
    throw new RunError(
      `the two runs hold ${base.n} and ${variant.n} scenarios: a paired comparison needs the same seed and scenario ids`,
    );
  const sortedRows = (f: ScenarioFrame): Int32Array => {
    const rows = Int32Array.from({ length: f.n }, (_, i) => i);
    return rows.sort((a, b) => f.scenarioId[a]! - f.scenarioId[b]!);
  };
  const b = sortedRows(base);
  const v = sortedRows(variant);
  const weight = new Float64Array(base.n);
  for (let k = 0; k < base.n; k++) {
    const idB = base.scenarioId[b[k]!]!;
    const idV = variant.scenarioId[v[k]!]!;
    if (idB !== idV)
      throw new RunError(
        `scenario ids differ between the runs (${idB} in ${base.origin} against ${idV} in ${variant.origin}): a paired comparison needs the same seed and scenario ids`,
      );
    if (k > 0 && idB === base.scenarioId[b[k - 1]!])
      throw new RunError(`scenario id ${idB} appears twice in ${base.origin}`);
    const wB = base.weight[b[k]!]!;
    const wV = variant.weight[v[k]!]!;
    if (wB !== wV)
      throw new RunError(
        `scenario ${idB} has weight ${wB} in ${base.origin} and ${wV} in ${variant.origin}: the sampling plans differ, so the scenarios are not common`,
      );
    weight[k] = wB;
  }
  return { n: base.n, baseRow: b, variantRow: v, weight };
}
