/**
 * Reading 8760-hour profiles from CSV files next to the case.
 *
 * Format: one row per hour of the model year (hour 0 first), comma-separated fields. An optional
 * header row comes first; it is required when the column is given by name, and otherwise
 * recognised because the selected field is not a number. Blank lines after the last row are
 * ignored; anything else that is not exactly 8760 non-negative finite numbers is a CaseError
 * naming the file, the line and the column.
 */
import { readFileSync } from 'node:fs';
import { isAbsolute, resolve } from 'node:path';
import { CaseError, describeFound } from '../errors.js';
import { hoursPerYear } from './calendar.js';

/** Which CSV column to read, and the case field that named it (for error paths). */
export interface CsvProfileRef {
  file: string;
  column: string | number;
  /** JSON-pointer-like path of the profile object in the case, e.g. `/loads/0/profile`. */
  path: string;
}

/** Cache of file contents split into lines, shared by the profiles of one compile. */
export type CsvCache = Map<string, string[]>;

function splitFields(line: string): string[] {
  return line.split(',').map((f) => f.trim().replace(/^"(.*)"$/, '$1'));
}

const numberPattern = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Reads one 8760-value column; throws CaseError naming file, line and column on bad input. */
export function readCsvProfile(ref: CsvProfileRef, caseDir: string, cache: CsvCache): Float64Array {
  const fullPath = isAbsolute(ref.file) ? ref.file : resolve(caseDir, ref.file);
  let lines = cache.get(fullPath);
  if (!lines) {
    let text: string;
    try {
      text = readFileSync(fullPath, 'utf8');
    } catch (err) {
      const reason = err instanceof Error ? err.message : String(err);
      throw CaseError.single(`${ref.path}/file`, `cannot read CSV profile ${ref.file}: ${reason}`);
    }
    lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
    while (lines.length > 0 && lines[lines.length - 1]!.trim() === '') lines.pop();
    cache.set(fullPath, lines);
  }
  const where = (line: number, col: number) => `${ref.file} line ${line} column ${col + 1}`;
  if (lines.length === 0) {
    throw CaseError.single(`${ref.path}/file`, `${ref.file} is empty; expected 8760 hourly rows`);
  }
  const first = splitFields(lines[0]!);
  let columnIndex: number;
  let hasHeader: boolean;
  if (typeof ref.column === 'string') {
    columnIndex = first.indexOf(ref.column);
    if (columnIndex < 0) {
      throw CaseError.single(
        `${ref.path}/column`,
        `${ref.file} line 1: expected a header with a column named ${JSON.stringify(ref.column)}, found ${first.map((f) => JSON.stringify(f)).join(', ')}`,
      );
    }
    hasHeader = true;
  } else {
    columnIndex = ref.column;
    hasHeader = !numberPattern.test(first[columnIndex] ?? '');
  }
  const start = hasHeader ? 1 : 0;
  const rows = lines.length - start;
  if (rows !== hoursPerYear) {
    throw CaseError.single(
      `${ref.path}/file`,
      `${ref.file}: expected ${hoursPerYear} hourly rows${hasHeader ? ' after the header' : ''}, found ${rows}`,
    );
  }
  const out = new Float64Array(hoursPerYear);
  for (let i = 0; i < hoursPerYear; i++) {
    const lineNo = start + i + 1;
    const line = lines[start + i]!;
    if (line.trim() === '') {
      throw CaseError.single(
        `${ref.path}/file`,
        `${ref.file} line ${lineNo}: empty line (a gap); expected one row per hour`,
      );
    }
    const fields = splitFields(line);
    const field = fields[columnIndex];
    if (field === undefined || field === '') {
      throw CaseError.single(
        `${ref.path}/file`,
        `${where(lineNo, columnIndex)}: missing value (a gap); expected a non-negative number`,
      );
    }
    if (!numberPattern.test(field)) {
      throw CaseError.single(
        `${ref.path}/file`,
        `${where(lineNo, columnIndex)}: expected a non-negative number, found ${describeFound(field)}`,
      );
    }
    const v = Number(field);
    if (!Number.isFinite(v) || v < 0) {
      throw CaseError.single(
        `${ref.path}/file`,
        `${where(lineNo, columnIndex)}: expected a non-negative number, found ${field}`,
      );
    }
    out[i] = v;
  }
  return out;
}
