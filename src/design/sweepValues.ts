/**
 * The swept parameter of `holdfast sweep CASE --set PATH=V1,V2,...` or `--set PATH=START:STOP:STEP`.
 * Exactly one `--set` of a sweep holds a list or a range; the others are fixed overrides applied
 * to every value (so is a YAML list or mapping value such as `[0.1, 0.2]`). The range includes STOP when it falls on the grid (within a millionth of a
 * step, so 0:1:0.1 gives 11 values), and each value is rounded to 12 significant digits so that
 * 0.1 + 0.2 reads as 0.3 in the tables and in the override.
 */
import { CaseError, describeFound } from '../errors.js';

/** At most this many values in one sweep (each value is a whole run). */
export const maxSweepValues = 200;

export interface SweepSpec {
  /** The override path as written (e.g. `sources.bess.energyKwh`). */
  path: string;
  /** The values as override texts, in the order given. */
  texts: string[];
  /** The same values as numbers when all are numeric (for the knee and the table); else undefined. */
  numbers: number[] | undefined;
  /** The other `--set` entries, applied unchanged to every value. */
  fixed: string[];
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

const round12 = (x: number): number => Number(x.toPrecision(12));

function parseRange(text: string): number[] | undefined {
  const parts = text.split(':');
  if (parts.length !== 3 || !parts.every((p) => NUMBER.test(p.trim()))) return undefined;
  const [start, stop, step] = parts.map((p) => Number(p.trim())) as [number, number, number];
  if (step === 0 || Math.sign(stop - start) * Math.sign(step) < 0) return undefined;
  const count = Math.floor((stop - start) / step + 1e-6) + 1;
  if (!(count >= 1) || count > maxSweepValues) return undefined;
  return Array.from({ length: count }, (_, i) => round12(start + i * step));
}

/** Splits the `--set` list of a sweep into the swept parameter and the fixed overrides. */
export function parseSweepSets(sets: readonly string[]): SweepSpec {
  const swept: { path: string; value: string }[] = [];
  const fixed: string[] = [];
  for (const s of sets) {
    const at = s.indexOf('=');
    const path = s.slice(0, at).trim();
    const value = s.slice(at + 1).trim();
    // a YAML list or mapping ([0.1, 0.2], {kind: fixed, value: 4}) is one fixed value
    const structured = value.startsWith('[') || value.startsWith('{');
    if (!structured && (value.includes(',') || /^[^:]+:[^:]+:[^:]+$/.test(value)))
      swept.push({ path, value });
    else fixed.push(s);
  }
  if (swept.length !== 1)
    throw CaseError.single(
      '--set',
      swept.length === 0
        ? 'a sweep needs one --set PATH=V1,V2,... or PATH=START:STOP:STEP, got only single values'
        : `a sweep varies one parameter, got lists for ${swept.map((s) => s.path).join(', ')}`,
    );
  const { path, value } = swept[0]!;
  if (value.includes(',')) {
    const texts = value.split(',').map((v) => v.trim());
    if (texts.some((t) => t === ''))
      throw CaseError.single(
        `--set ${path}`,
        `expected V1,V2,... without empty items, got ${describeFound(value)}`,
      );
    if (texts.length > maxSweepValues)
      throw CaseError.single(
        `--set ${path}`,
        `expected at most ${maxSweepValues} values, got ${texts.length}`,
      );
    const numeric = texts.every((t) => NUMBER.test(t));
    return { path, texts, numbers: numeric ? texts.map(Number) : undefined, fixed };
  }
  const numbers = parseRange(value);
  if (!numbers)
    throw CaseError.single(
      `--set ${path}`,
      `expected START:STOP:STEP with a non-zero STEP towards STOP and at most ${maxSweepValues} values, e.g. 500:2000:250, got ${describeFound(value)}`,
    );
  return { path, texts: numbers.map(String), numbers, fixed };
}
