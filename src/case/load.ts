/**
 * Reading a case file: bytes from disk with safety limits, YAML or JSON into raw input, `--set`
 * overrides applied to the raw input, then validation of the whole (validate.ts). Everything a
 * user can get wrong ends as one CaseError (exit 2) naming the file or the field, never a stack
 * trace.
 *
 * YAML is parsed with the `yaml` package under the core schema (no custom tags, no code), with
 * a cap on alias expansions (against "billion laughs" alias bombs), duplicate keys rejected,
 * warnings treated as errors, a size limit, NUL/invalid UTF-8 detection (binary files) and a
 * nesting-depth limit.
 */
import { createHash } from 'node:crypto';
import { existsSync, statSync } from 'node:fs';
import { readFile, stat } from 'node:fs/promises';
import { dirname, extname, resolve } from 'node:path';
import YAML from 'yaml';
import { CaseError, type CaseProblem, describeFound } from '../errors.js';
import { type CsvCache, type CsvProfileRef, readCsvProfile } from '../sample/csv-profile.js';
import { applyOverrides } from './overrides.js';
import type { Case } from './schema.js';
import { validateCase } from './validate.js';

export interface LoadedCase {
  /** The validated case with every default filled in. */
  case: Case;
  /** Absolute path of the case file. */
  path: string;
  /** Directory of the case file (CSV profiles are relative to it). */
  dir: string;
  /** SHA-256 (hex) of the file's bytes, as read (before overrides). */
  sha256: string;
  /** The parsed input after overrides, before defaults (what was validated). */
  raw: unknown;
}

/** 8 MiB: far above any hand-written case (a 8760-value inline profile is ~100 kB). */
export const MAX_CASE_BYTES = 8 * 1024 * 1024;
/** Alias expansions allowed while building the data; YAML anchors in a case are rare. */
export const MAX_ALIAS_COUNT = 100;
/** Deepest nesting of mappings and lists; the schema itself needs 6. */
export const MAX_DEPTH = 32;
/**
 * Bracket depth refused before parsing, to spare the parser absurd input. Higher than MAX_DEPTH
 * because unclosed brackets inside strings and comments also count here; the exact depth check
 * runs on the parsed data.
 */
export const MAX_FLOW_DEPTH = 256;

/** The deepest nesting of objects and lists in `value` (iterative, so no stack overflow). */
export function nestingDepth(value: unknown): number {
  let deepest = 0;
  const stack: [unknown, number][] = [[value, 0]];
  while (stack.length > 0) {
    const [v, depth] = stack.pop()!;
    if (typeof v !== 'object' || v === null) continue;
    if (depth + 1 > deepest) deepest = depth + 1;
    if (deepest > MAX_DEPTH) return deepest;
    for (const child of Object.values(v)) stack.push([child, depth + 1]);
  }
  return deepest;
}

/** The deepest bracket nesting of flow syntax in the text (`[[[...`), before any parser sees it. */
function flowDepth(text: string): number {
  let depth = 0;
  let deepest = 0;
  for (let i = 0; i < text.length; i++) {
    const ch = text.charCodeAt(i);
    if (ch === 0x5b || ch === 0x7b) {
      depth += 1;
      if (depth > deepest) deepest = depth;
    } else if ((ch === 0x5d || ch === 0x7d) && depth > 0) depth -= 1;
  }
  return deepest;
}

/** A problem with the file as a whole: its path stands where a field path would. */
function fileProblem(path: string, message: string): CaseError {
  return CaseError.single(path, message);
}

/** Decodes the file as UTF-8 text; throws CaseError for binary data. */
export function decodeCaseText(bytes: Uint8Array, path: string): string {
  if (bytes.length === 0)
    throw fileProblem(path, 'expected a case file (YAML or JSON), got an empty file');
  if (bytes.includes(0))
    throw fileProblem(path, 'expected a text file (YAML or JSON), got binary data (NUL bytes)');
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    // the decoder's only failure is malformed UTF-8, reported as such
    throw fileProblem(
      path,
      'expected UTF-8 text (YAML or JSON), got bytes that are not valid UTF-8',
    );
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.split('\n').every((line) => line.trim() === '' || line.trimStart().startsWith('#')))
    throw fileProblem(
      path,
      'expected a case file (YAML or JSON), got an empty file (only blanks or comments)',
    );
  return text;
}

function looksLikeJson(path: string, text: string): boolean {
  const ext = extname(path).toLowerCase();
  if (ext === '.json') return true;
  if (ext === '.yaml' || ext === '.yml') return false;
  return /^\s*\{/.test(text);
}

/** Parses case text (YAML or JSON) into raw input; throws CaseError on syntax or safety problems. */
export function parseCaseText(text: string, path: string): unknown {
  if (flowDepth(text) > MAX_FLOW_DEPTH)
    throw fileProblem(
      path,
      `expected nesting at most ${MAX_DEPTH} levels deep, got more than ${MAX_FLOW_DEPTH} nested brackets`,
    );
  let raw: unknown;
  if (looksLikeJson(path, text)) {
    try {
      raw = JSON.parse(text);
    } catch (err) {
      throw fileProblem(path, `expected valid JSON, got a syntax error: ${(err as Error).message}`);
    }
    // JSON.parse keeps the last of two equal keys silently; YAML 1.2 reads JSON and reports them
    const duplicates = YAML.parseDocument(text, { uniqueKeys: true }).errors.filter(
      (e) => e.code === 'DUPLICATE_KEY',
    );
    if (duplicates.length > 0)
      throw new CaseError(
        duplicates.slice(0, 20).map((e) => ({
          path: `${path}:${e.linePos?.[0]?.line ?? '?'}:${e.linePos?.[0]?.col ?? '?'}`,
          message: 'expected each key once in its object, got a key given twice',
        })),
      );
  } else {
    const doc = YAML.parseDocument(text, {
      schema: 'core',
      uniqueKeys: true,
      prettyErrors: true,
      strict: true,
      merge: false,
    });
    const trouble = [...doc.errors, ...doc.warnings];
    if (trouble.length > 0) {
      throw new CaseError(
        trouble.slice(0, 20).map((e) => ({
          path: `${path}:${e.linePos?.[0]?.line ?? '?'}:${e.linePos?.[0]?.col ?? '?'}`,
          message: `expected valid YAML, got ${(e.message.split('\n')[0] ?? '').replace(/ at line \d+, column \d+:?$/, '')}`,
        })),
      );
    }
    try {
      raw = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
    } catch (err) {
      if (err instanceof ReferenceError && /alias/i.test(err.message))
        throw fileProblem(
          path,
          `expected at most ${MAX_ALIAS_COUNT} alias expansions, got more (an alias bomb?); write the values out`,
        );
      throw err;
    }
  }
  if (nestingDepth(raw) > MAX_DEPTH)
    throw fileProblem(path, `expected nesting at most ${MAX_DEPTH} levels deep, got deeper`);
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw))
    throw fileProblem(
      path,
      `expected a mapping of sections (name, system, sources, ...), got ${describeFound(raw)}`,
    );
  return raw;
}

/**
 * Problems with the CSV profiles of a case: each one is read with the sampler's own reader
 * (src/sample/csv-profile.ts: 8760 non-negative rows), and every failure is collected.
 */
function profileProblems(c: Case, dir: string): CaseProblem[] {
  const refs: CsvProfileRef[] = [];
  c.loads.forEach((l, i) => {
    if (l.profile.kind === 'csv')
      refs.push({ file: l.profile.file, column: l.profile.column, path: `/loads/${i}/profile` });
  });
  c.sources.forEach((s, i) => {
    if ((s.kind === 'pv' || s.kind === 'wind') && s.resource.kind === 'csv')
      refs.push({
        file: s.resource.file,
        column: s.resource.column,
        path: `/sources/${i}/resource`,
      });
  });
  const cache: CsvCache = new Map();
  const problems: CaseProblem[] = [];
  for (const ref of refs) {
    const full = resolve(dir, ref.file);
    if (!existsSync(full) || !statSync(full).isFile()) {
      problems.push({
        path: `${ref.path}/file`,
        message: `expected a CSV file next to the case (relative to ${dir}), got ${JSON.stringify(ref.file)}, which ${existsSync(full) ? 'is not a file' : 'does not exist'}`,
      });
      continue;
    }
    try {
      readCsvProfile(ref, dir, cache);
    } catch (err) {
      if (!(err instanceof CaseError)) throw err;
      problems.push(...err.problems);
    }
  }
  return problems;
}

/**
 * Reads, parses, overrides and validates a case file. Throws CaseError for every user mistake;
 * messages name the file as given. A relative `path` is resolved against `options.cwd`
 * (default: the process's working directory).
 */
export async function loadCase(
  path: string,
  overrides: readonly string[] = [],
  options: { cwd?: string } = {},
): Promise<LoadedCase> {
  const full = resolve(options.cwd ?? process.cwd(), path);
  const info = await stat(full).catch((err: NodeJS.ErrnoException) => err);
  if (info instanceof Error) {
    const why =
      info.code === 'ENOENT'
        ? 'no such file'
        : info.code === 'EACCES'
          ? 'permission denied'
          : info.message;
    throw fileProblem(path, `expected a readable case file, got ${why}`);
  }
  if (info.isDirectory()) throw fileProblem(path, 'expected a case file, got a directory');
  if (!info.isFile()) throw fileProblem(path, 'expected a regular case file, got a special file');
  if (info.size > MAX_CASE_BYTES)
    throw fileProblem(
      path,
      `expected a case file of at most ${MAX_CASE_BYTES} bytes, got ${info.size}`,
    );
  const bytes = await readFile(full);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const raw = applyOverrides(parseCaseText(decodeCaseText(bytes, path), path), overrides);
  const validated = validateCase(raw);
  const dir = dirname(full);
  const missing = profileProblems(validated, dir);
  if (missing.length > 0) throw new CaseError(missing);
  return { case: validated, path: full, dir, sha256, raw };
}
