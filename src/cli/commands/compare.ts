/**
 * `holdfast compare BASE [VARIANT]`: two designs on the same scenarios (src/design/compare.ts).
 * VARIANT is a second case file; without it the variant is BASE with the `--set` overrides.
 * With both, `--set` changes the variant only (the design under test). Two run folders instead
 * of case files are paired as they are (the merged shards of each design, say): nothing runs.
 */
import { existsSync, statSync } from 'node:fs';
import { basename, extname, resolve } from 'node:path';
import type { Command } from 'commander';
import { loadCase } from '../../case/load.js';
import { compareRunFolders, runComparison } from '../../design/compare.js';
import { driversText } from '../../design/designText.js';
import { knownSummaryMetrics } from '../../design/outcomes.js';
import {
  anyGateExceeded,
  checkGateMetrics,
  evaluateRiskGates,
  type GateRow,
  type RiskGate,
} from '../../design/riskGate.js';
import { screeningCaution } from '../../results/manifest.js';
import { type ExitCode, exitCode, usageError } from '../exit.js';
import type { AddCommand } from '../frame.js';
import type { CliIo } from '../io.js';
import { addOptions, commonRunOptions, pairedRunOptions } from '../options.js';
import { stoppedError, untilStopSignal } from '../stop-signal.js';

const stem = (p: string) => basename(p, extname(p));

/** Default output folder: results/<base stem>-vs-<variant stem>/ (variant stem "variant" for --set). */
export function defaultCompareDir(basePath: string, variantPath: string | undefined, cwd: string) {
  return resolve(
    cwd,
    'results',
    `${stem(basePath)}-vs-${variantPath ? stem(variantPath) : 'variant'}`,
  );
}

/** The --fail-if gates on the variant's summary: exit 1 when one is exceeded. */
function judgeGates(summary: readonly GateRow[], gates: readonly RiskGate[], io: CliIo): ExitCode {
  if (gates.length === 0) return exitCode.ok;
  const verdicts = evaluateRiskGates(summary, gates);
  for (const v of verdicts) io.stderr(`holdfast: variant ${v.text}\n`);
  return anyGateExceeded(verdicts) ? exitCode.gateExceeded : exitCode.ok;
}

export const addCompareCommand: AddCommand = (program: Command, frame) => {
  const cmd = program
    .command('compare')
    .argument('<base>', 'case file of the base design')
    .argument('[variant]', 'case file of the variant (omit it and give --set to vary the base)')
    .summary('two designs on the same scenarios: paired differences')
    .description(
      'Runs both designs on the same seed and scenario ids (common random numbers), pairs the ' +
        'scenarios and writes comparison.arrow with every summary metric, its difference and a ' +
        'paired confidence interval, plus base/ and variant/ run folders with drivers.arrow. ' +
        '--set changes the variant. --fail-if gates judge the variant. Given two run folders ' +
        'instead of case files, pairs them as they are (e.g. merged shards) without running. ' +
        'Screening estimates, not engineering approval.',
    );
  addOptions(cmd, commonRunOptions, {
    out: 'output folder (default results/<base>-vs-<variant>/, named after the two case files or run folders)',
  });
  cmd.action(
    frame.action(async ([basePath, variantPath], options, io) => {
      const isDir = (p: string | undefined) =>
        p !== undefined &&
        existsSync(resolve(io.cwd, p)) &&
        statSync(resolve(io.cwd, p)).isDirectory();
      if (isDir(basePath) && isDir(variantPath)) {
        // two finished run folders (e.g. merged shards): pair them, run nothing
        if (options.set.length > 0)
          throw usageError('--set', 'expected no --set when comparing two run folders');
        const outDir = options.out
          ? resolve(io.cwd, options.out)
          : resolve(io.cwd, 'results', `${basename(basePath!)}-vs-${basename(variantPath!)}`);
        const folders = compareRunFolders(
          resolve(io.cwd, basePath!),
          resolve(io.cwd, variantPath!),
          outDir,
          { baseName: basename(basePath!), variantName: basename(variantPath!) },
        );
        if (options.json)
          io.stdout(
            `${JSON.stringify({ comparison: folders.comparison.rows, scenarios: folders.comparison.nPairs, confidenceLevel: folders.confidenceLevel }, null, 2)}\n`,
          );
        else if (!options.quiet) io.stdout(`${folders.text}${screeningCaution}\n`);
        for (const w of folders.comparison.warnings) io.stderr(`holdfast: ${w}\n`);
        return judgeGates(folders.variantSummary, options.failIf, io);
      }
      if (!variantPath && options.set.length === 0)
        throw usageError(
          'VARIANT',
          'expected a variant case file or at least one --set PATH=VALUE to vary the base',
        );
      // check gates and load both cases before running anything: bad input exits 2, nothing written
      checkGateMetrics(options.failIf, knownSummaryMetrics);
      const base = await loadCase(resolve(io.cwd, basePath!));
      const variant = await loadCase(resolve(io.cwd, variantPath ?? basePath!), options.set);
      const outDir = options.out
        ? resolve(io.cwd, options.out)
        : defaultCompareDir(basePath!, variantPath, io.cwd);
      const progress = !options.quiet && !options.json && process.stderr.isTTY === true;
      const outcome = await untilStopSignal(
        (signal) =>
          runComparison(base, variant, {
            ...pairedRunOptions(options, outDir, signal),
            baseName: stem(basePath!),
            variantName: variantPath
              ? stem(variantPath)
              : `${stem(basePath!)} with ${options.set.join(', ')}`,
            onProgress: progress
              ? (design, done, total) => io.stderr(`\rholdfast compare: ${design} ${done}/${total}`)
              : undefined,
          }),
        () => progress && io.stderr('\n'),
      );
      const c = outcome.comparison;
      if (options.json) {
        io.stdout(
          `${JSON.stringify(
            {
              comparison: c?.rows ?? null,
              scenarios: c?.nPairs ?? 0,
              confidenceLevel: outcome.confidenceLevel,
              base: outcome.base.summary,
              variant: outcome.variant?.summary ?? null,
            },
            null,
            2,
          )}\n`,
        );
      } else if (!options.quiet) {
        io.stdout(outcome.text);
        if (outcome.drivers?.variant)
          io.stdout(`Variant: ${driversText(outcome.drivers.variant, 3)}`);
        io.stdout(`${screeningCaution}\n`);
      }
      for (const w of c?.warnings ?? []) io.stderr(`holdfast: ${w}\n`);
      if (!c) throw stoppedError('compare', (outcome.variant ?? outcome.base).stopReason);
      return judgeGates(outcome.variant?.summary ?? [], options.failIf, io);
    }),
  );
};
