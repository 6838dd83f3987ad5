/**
 * Every command-line option of holdfast, declared once as a typed table (units in the
 * placeholders), and the pure function that turns commander's raw strings into a typed
 * `CliOptions` object. A command picks the rows it takes with `addOptions(cmd, [...keys])`;
 * `parseOptions(raw)` then checks and converts every value at once and throws one `CaseError`
 * listing every bad option (exit 2). No side effects: tested in-process.
 */
import type { Command } from 'commander';
import type { PairedRunOptions } from '../design/pairedRuns.js';
import { parseRiskGate, type RiskGate } from '../design/riskGate.js';
import { CaseError, type CaseProblem, describeFound } from '../errors.js';

export type { RiskGate };

/** `--shard I/N`: the I-th (1-based) of N disjoint deterministic slices. */
export interface Shard {
  index: number;
  count: number;
}

/** The typed result of parsing; absent keys were not given (the case file's value applies). */
export interface CliOptions {
  scenarios?: number;
  seed?: number | string;
  workers?: number;
  out?: string;
  set: string[];
  shard?: Shard;
  json: boolean;
  quiet: boolean;
  resume: boolean;
  untilRelError?: number;
  parquet: boolean;
  /** `--fail-if METRIC>VALUE` or `METRIC<VALUE` (src/design/riskGate.ts judges them). */
  failIf: Required<RiskGate>[];
  debug: boolean;
  force: boolean;
  markdown: boolean;
  horizonS?: number;
  scenario?: number;
  hour?: number;
}

type Kind =
  | 'flag'
  | 'positiveInt'
  | 'nonNegativeInt'
  | 'seed'
  | 'path'
  | 'list'
  | 'shard'
  | 'gates'
  | 'relError'
  | 'positiveNumber'
  | 'hourOfYear';

export interface OptionSpec {
  /** commander flags with the unit in the placeholder. */
  readonly flags: string;
  /** commander's camel-case attribute name of the raw value. */
  readonly attribute: string;
  readonly kind: Kind;
  readonly description: string;
}

export const optionTable = {
  scenarios: {
    flags: '--scenarios <n>',
    attribute: 'scenarios',
    kind: 'positiveInt',
    description: 'number of separation scenarios (overrides monteCarlo.scenarios)',
  },
  seed: {
    flags: '--seed <s>',
    attribute: 'seed',
    kind: 'seed',
    description: 'random seed, an integer or a word (overrides monteCarlo.seed)',
  },
  workers: {
    flags: '--workers <n>',
    attribute: 'workers',
    kind: 'positiveInt',
    description: 'worker threads (default: cores - 1, at least 1)',
  },
  out: {
    flags: '--out <dir>',
    attribute: 'out',
    kind: 'path',
    // neutral: each command names its own default through `addOptions(cmd, keys, wording)`
    description: 'output folder (default: a folder under results/ named after the input)',
  },
  set: {
    flags: '--set <path=value>',
    attribute: 'set',
    kind: 'list',
    description: 'override a case field, e.g. sources.bess.energyKwh=2000 (repeatable)',
  },
  shard: {
    flags: '--shard <i/n>',
    attribute: 'shard',
    kind: 'shard',
    description: 'run only the i-th of n disjoint deterministic slices (1-based)',
  },
  json: {
    flags: '--json',
    attribute: 'json',
    kind: 'flag',
    description: 'print the summary as JSON on stdout',
  },
  quiet: { flags: '--quiet', attribute: 'quiet', kind: 'flag', description: 'no progress output' },
  resume: {
    flags: '--resume',
    attribute: 'resume',
    kind: 'flag',
    description: 'continue a partial output folder',
  },
  untilRelError: {
    flags: '--until-rel-error <x>',
    attribute: 'untilRelError',
    kind: 'relError',
    description:
      'size the run for a relative CI half-width < x of the failure probability: an independent pilot sets the count (capped at --scenarios); the estimate stays unbiased',
  },
  parquet: {
    flags: '--parquet',
    attribute: 'parquet',
    kind: 'flag',
    description: 'also write the tables as Parquet',
  },
  failIf: {
    flags: '--fail-if <metric>value>',
    attribute: 'failIf',
    kind: 'gates',
    description:
      'exit 1 unless the confidence bound is on the safe side: metric>value fails when the ' +
      'upper bound is above value, metric<value when the lower bound is below it, ' +
      'e.g. p_shutdown>0.01 or loading_margin<1.2 (repeatable)',
  },
  debug: {
    flags: '--debug',
    attribute: 'debug',
    kind: 'flag',
    description: 'print stack traces on errors',
  },
  markdown: {
    flags: '--markdown',
    attribute: 'markdown',
    kind: 'flag',
    description: 'print the case file reference as Markdown instead',
  },
  force: {
    flags: '--force',
    attribute: 'force',
    kind: 'flag',
    description: 'overwrite an existing file',
  },
  horizonS: {
    flags: '--horizon <s>',
    attribute: 'horizon',
    kind: 'positiveNumber',
    description: 'frequency-event horizon, s (overrides monteCarlo.horizonS)',
  },
  scenario: {
    flags: '--scenario <k>',
    attribute: 'scenario',
    kind: 'nonNegativeInt',
    description: 'scenario id',
  },
  hour: {
    flags: '--hour <h>',
    attribute: 'hour',
    kind: 'hourOfYear',
    description: 'hour of the year, 0-8759 (0 = 1 January 00:00)',
  },
} as const satisfies Record<keyof CliOptions, OptionSpec>;

export type OptionKey = keyof typeof optionTable;

/** The options `run`, `compare` and `sweep` share (CONTRACT.md "Common options"). */
export const commonRunOptions = [
  'scenarios',
  'seed',
  'workers',
  'out',
  'set',
  'shard',
  'json',
  'quiet',
  'parquet',
  'failIf',
  'debug',
] as const satisfies readonly OptionKey[];

const collect = (value: string, previous: string[] | undefined): string[] =>
  (previous ?? []).concat(value);

/**
 * Adds the given rows of the option table to a commander command. `wording` replaces the help
 * text of a row for this command only (e.g. where `--out` defaults to for it); the parsing stays
 * the table's.
 */
export function addOptions(
  cmd: Command,
  keys: readonly OptionKey[],
  wording: Partial<Record<OptionKey, string>> = {},
): Command {
  for (const key of keys) {
    const spec: OptionSpec = optionTable[key];
    const description = wording[key] ?? spec.description;
    if (spec.kind === 'list' || spec.kind === 'gates') cmd.option(spec.flags, description, collect);
    else cmd.option(spec.flags, description);
  }
  return cmd;
}

const INT = /^[+]?\d+$/;
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Converts commander's raw option values (strings, booleans, string lists) into `CliOptions`.
 * Only keys present in `raw` are read; every bad value is reported in one `CaseError` whose
 * paths are the option names (`--scenarios`).
 */
export function parseOptions(raw: Readonly<Record<string, unknown>>): CliOptions {
  const problems: CaseProblem[] = [];
  const options: CliOptions = {
    set: [],
    json: false,
    quiet: false,
    resume: false,
    parquet: false,
    failIf: [],
    debug: false,
    force: false,
    markdown: false,
  };
  const target = options as unknown as Record<string, unknown>;
  for (const key of Object.keys(optionTable) as OptionKey[]) {
    const spec: OptionSpec = optionTable[key];
    const value = raw[spec.attribute];
    if (value === undefined) continue;
    const name = spec.flags.split(' ')[0] ?? spec.flags;
    const fail = (expected: string, found: unknown = value) =>
      problems.push({ path: name, message: `expected ${expected}, got ${describeFound(found)}` });
    if (spec.kind === 'flag') {
      if (typeof value !== 'boolean') fail('no value (a switch)');
      else target[key] = value;
      continue;
    }
    if (spec.kind === 'list' || spec.kind === 'gates') {
      const items = Array.isArray(value) ? value : [value];
      if (spec.kind === 'list') {
        for (const item of items) {
          if (typeof item !== 'string' || !/^[^=]+=/.test(item))
            fail('PATH=VALUE, e.g. sources.bess.energyKwh=2000', item);
          else options.set.push(item);
        }
      } else {
        for (const item of items) {
          const gate = typeof item === 'string' ? parseRiskGate(item) : undefined;
          if (!gate) fail('METRIC>VALUE or METRIC<VALUE, e.g. p_shutdown>0.01', item);
          else options.failIf.push(gate);
        }
      }
      continue;
    }
    if (typeof value !== 'string') {
      fail('a value');
      continue;
    }
    const text = value.trim();
    switch (spec.kind) {
      case 'positiveInt':
      case 'nonNegativeInt': {
        const n = INT.test(text) ? Number(text) : Number.NaN;
        const min = spec.kind === 'positiveInt' ? 1 : 0;
        if (!Number.isSafeInteger(n) || n < min)
          fail(min === 1 ? 'a whole number of at least 1' : 'a whole number of at least 0');
        else target[key] = n;
        break;
      }
      case 'hourOfYear': {
        const n = INT.test(text) ? Number(text) : Number.NaN;
        if (!Number.isInteger(n) || n > 8759) fail('a whole hour of the year from 0 to 8759');
        else target[key] = n;
        break;
      }
      case 'positiveNumber': {
        const n = NUMBER.test(text) ? Number(text) : Number.NaN;
        if (!(n > 0) || !Number.isFinite(n)) fail('a positive number');
        else target[key] = n;
        break;
      }
      case 'relError': {
        const n = NUMBER.test(text) ? Number(text) : Number.NaN;
        if (!(n > 0 && n < 1)) fail('a relative error between 0 and 1 (exclusive), e.g. 0.1');
        else target[key] = n;
        break;
      }
      case 'seed':
        if (text === '') fail('an integer or a non-empty word');
        else
          target[key] =
            /^-?\d+$/.test(text) && Number.isSafeInteger(Number(text)) ? Number(text) : text;
        break;
      case 'path':
        if (text === '') fail('a directory path');
        else target[key] = text;
        break;
      case 'shard': {
        const m = /^(\d+)\/(\d+)$/.exec(text);
        const index = m ? Number(m[1]) : Number.NaN;
        const count = m ? Number(m[2]) : Number.NaN;
        if (!(count >= 1 && index >= 1 && index <= count)) fail('I/N with 1 <= I <= N, e.g. 2/8');
        else options.shard = { index, count };
        break;
      }
    }
  }
  if (problems.length > 0) throw new CaseError(problems);
  return options;
}

/** The run settings a paired study (compare, sweep) passes to every one of its runs. */
export function pairedRunOptions(
  options: CliOptions,
  outDir: string,
  signal: AbortSignal,
): PairedRunOptions {
  const { scenarios, seed, workers, shard, parquet } = options;
  return { outDir, scenarios, seed, workers, shard, parquet, signal };
}
