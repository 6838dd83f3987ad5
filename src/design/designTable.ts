/**
 * Writing and reading the small tables of the design questions (`comparison.arrow`,
 * `sweep.arrow`, `drivers.arrow`): a few columns of a few hundred rows at most, built whole in
 * memory. Every field carries `unit` and `description` metadata (CONTRACT.md "Every Arrow field
 * carries metadata"), and the file is written to a temporary name and renamed when complete, so a
 * reader never sees half a file.
 */
import { mkdirSync, readFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { type Table, tableFromIPC, tableToIPC } from 'apache-arrow';
import { writeFileAtomic } from '../results/manifest.js';
import { columnTable, type TableColumn } from '../results/small-table.js';

export type DesignColumn = TableColumn;

/** Builds an Arrow table from equal-length columns, each field with its metadata. */
export const designTable: (columns: readonly DesignColumn[]) => Table = columnTable;

/** Writes the table as an Arrow IPC file, atomically (the results' writeFileAtomic: temp, fsync, rename). */
export function writeDesignTable(path: string, table: Table): void {
  mkdirSync(dirname(path), { recursive: true });
  writeFileAtomic(path, tableToIPC(table, 'file'));
}

/** Reads an Arrow IPC file whole (the design tables and test fixtures are small). */
export function readArrowFile(path: string): Table {
  return tableFromIPC(readFileSync(path));
}
