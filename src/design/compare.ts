/**
 * `holdfast compare` as a library function: runs both designs with the runner on the same seed
 * and scenario ids (common random numbers: the sampler draws every random number of scenario k
 * from streams of (seed, k), and a design parameter never changes which draws are made, so the
 * two designs see the same weather, loads, outages and faults), pairs the rows by scenario_id
 * and writes the paired differences, the drivers of each design and the plain-words table.
 *
 * Folder: <outDir>/base/ and <outDir>/variant/ (each a complete run folder), and
 * <outDir>/comparison.arrow. `compareRunFolders` pairs two existing run folders instead (the
 * merged shards of each design, say). The seed and scenario count are the base's (or the options'), for
 * both designs, whatever the variant file says.
 */
import { join } from 'node:path';
import type { LoadedCase } from '../case/load.js';
import type { Case } from '../case/schema.js';
import { CaseError, type CaseProblem, RunError } from '../errors.js';
import { readManifest } from '../results/manifest.js';
import { copyArrowToParquet } from '../results/parquet.js';
import type { RunOutcome } from '../run/run.js';
import { type ComparisonResult, compareDesigns, type SummaryLike } from './comparison.js';
import { writeComparisonArrow } from './designOutputs.js';
import { readArrowFile } from './designTable.js';
import { comparisonText } from './designText.js';
import type { DriversResult } from './drivers.js';
import type { OutcomeContext } from './outcomes.js';
import { compareSides, type PairedRunOptions, runStudyDesign } from './pairedRuns.js';
import { analyseRunDrivers } from './runDrivers.js';
import { readScenarioFrame } from './scenarioFrame.js';

export interface CompareOptions extends PairedRunOptions {
  onProgress?: (design: 'base' | 'variant', done: number, total: number) => void;
  /** Names for the table ("kestrel-island", "kestrel-island with x=1"). */
  baseName: string;
  variantName: string;
}

export interface CompareOutcome {
  base: RunOutcome;
  /** Undefined when the base run stopped early and the variant was not run. */
  variant: RunOutcome | undefined;
  /** Undefined when a run stopped early (partial): nothing is paired then. */
  comparison: ComparisonResult | undefined;
  drivers: { base: DriversResult | undefined; variant: DriversResult | undefined } | undefined;
  comparisonPath: string | undefined;
  confidenceLevel: number;
  text: string;
}

/** The design content of a case: everything but its name and description. */
function designOf(c: Case): unknown {
  const { name: _n, description: _d, invented: _i, ...rest } = c;
  return rest;
}

/** Same design: equal resolved content and the same folder (so the same profile files). */
export function sameDesign(a: LoadedCase, b: LoadedCase): boolean {
  return a.dir === b.dir && JSON.stringify(designOf(a.case)) === JSON.stringify(designOf(b.case));
}

export async function runComparison(
  base: LoadedCase,
  variant: LoadedCase,
  opts: CompareOptions,
): Promise<CompareOutcome> {
  const progress = (design: 'base' | 'variant') =>
    opts.onProgress && ((d: number, t: number) => opts.onProgress?.(design, d, t));
  const baseRun = await runStudyDesign(base, base, opts, 'base', progress('base'));
  const level = baseRun.manifest.confidenceLevel;
  if (baseRun.status === 'partial')
    return stopped(baseRun, undefined, level, 'the base run stopped early');
  const variantRun = await runStudyDesign(variant, base, opts, 'variant', progress('variant'));
  if (variantRun.status === 'partial')
    return stopped(baseRun, variantRun, level, 'the variant run stopped early');
  const baseFrame = readScenarioFrame(baseRun.paths.scenarios);
  const variantFrame = readScenarioFrame(variantRun.paths.scenarios);
  const comparison = compareSides(
    { loaded: base, frame: baseFrame, summary: baseRun.summary },
    { loaded: variant, frame: variantFrame, summary: variantRun.summary },
    level,
    sameDesign(base, variant),
  );
  const comparisonPath = writeComparisonArrow(opts.outDir, comparison.rows, level);
  const drivers = {
    base: analyseRunDrivers(baseFrame, join(opts.outDir, 'base'), level),
    variant: analyseRunDrivers(variantFrame, join(opts.outDir, 'variant'), level),
  };
  if (opts.parquet) {
    await copyArrowToParquet(comparisonPath, join(opts.outDir, 'comparison.parquet'));
    for (const [d, result] of Object.entries(drivers))
      if (result)
        await copyArrowToParquet(
          join(opts.outDir, d, 'drivers.arrow'),
          join(opts.outDir, d, 'drivers.parquet'),
        );
  }
  const text = comparisonText(comparison.rows, {
    nPairs: comparison.nPairs,
    level,
    baseName: opts.baseName,
    variantName: opts.variantName,
    dir: opts.outDir,
  });
  return {
    base: baseRun,
    variant: variantRun,
    comparison,
    drivers,
    comparisonPath,
    confidenceLevel: level,
    text,
  };
}

function stopped(
  base: RunOutcome,
  variant: RunOutcome | undefined,
  level: number,
  why: string,
): CompareOutcome {
  return {
    base,
    variant,
    comparison: undefined,
    drivers: undefined,
    comparisonPath: undefined,
    confidenceLevel: level,
    text: `Not compared: ${why}; the run folders are marked partial.\n`,
  };
}

/** A summary.arrow file as rows (metric, estimate, ci_low, ci_high, unit). */
function readSummaryRows(path: string): SummaryLike[] {
  const t = readArrowFile(path);
  const col = (name: string) => {
    const c = t.getChild(name);
    if (!c) throw new RunError(`${path}: no ${name} column`);
    return c;
  };
  const [metric, estimate, low, high, unit] = [
    'metric',
    'estimate',
    'ci_low',
    'ci_high',
    'unit',
  ].map(col);
  return Array.from({ length: t.numRows }, (_, i) => ({
    metric: String(metric!.get(i)),
    estimate: Number(estimate!.get(i)),
    ciLow: Number(low!.get(i)),
    ciHigh: Number(high!.get(i)),
    unit: String(unit!.get(i)),
  }));
}

/**
 * Compares two finished run folders (e.g. the merged shards of each design) without running
 * anything: both must be complete runs of the same seed and scenario ids. Writes
 * `<outDir>/comparison.arrow`.
 */
export function compareRunFolders(
  baseDir: string,
  variantDir: string,
  outDir: string,
  names: { baseName: string; variantName: string },
): {
  comparison: ComparisonResult;
  comparisonPath: string;
  confidenceLevel: number;
  variantSummary: SummaryLike[];
  text: string;
} {
  const mb = readManifest(join(baseDir, 'run.json'));
  const mv = readManifest(join(variantDir, 'run.json'));
  const problems: CaseProblem[] = [];
  for (const [dir, m] of [
    [baseDir, mb],
    [variantDir, mv],
  ] as const)
    if (m.status !== 'complete')
      problems.push({ path: dir, message: 'expected a complete run folder, got a partial one' });
  if (String(mb.seed) !== String(mv.seed))
    problems.push({
      path: variantDir,
      message: `expected the base's seed ${mb.seed} (common random numbers), got ${mv.seed}`,
    });
  if (mb.confidenceLevel !== mv.confidenceLevel)
    problems.push({
      path: variantDir,
      message: `expected the base's confidence level ${mb.confidenceLevel}, got ${mv.confidenceLevel}`,
    });
  if (problems.length > 0) throw new CaseError(problems);
  const level = mb.confidenceLevel;
  const definition = (d: string): OutcomeContext['failureDefinition'] =>
    d === 'shutdown-only' ? 'shutdown-only' : 'shutdown-or-critical-loss';
  const variantSummary = readSummaryRows(join(variantDir, 'summary.arrow'));
  const comparison = compareDesigns({
    base: readScenarioFrame(join(baseDir, 'scenarios.arrow')),
    variant: readScenarioFrame(join(variantDir, 'scenarios.arrow')),
    baseSummary: readSummaryRows(join(baseDir, 'summary.arrow')),
    variantSummary,
    baseFailureDefinition: definition(mb.failureDefinition),
    variantFailureDefinition: definition(mv.failureDefinition),
    baseRatePerYear: mb.islandingRatePerYear,
    variantRatePerYear: mv.islandingRatePerYear,
    confidenceLevel: level,
    identicalDesigns: mb.caseContentSha256 === mv.caseContentSha256,
  });
  const comparisonPath = writeComparisonArrow(outDir, comparison.rows, level);
  const text = comparisonText(comparison.rows, {
    nPairs: comparison.nPairs,
    level,
    ...names,
    dir: outDir,
  });
  return { comparison, comparisonPath, confidenceLevel: level, variantSummary, text };
}
