/** `holdfast run CASE`: the Monte Carlo assessment (src/run/run.ts) with progress and signals. */
import { basename, extname, resolve } from 'node:path';
import { SingleBar } from 'cli-progress';
import type { Command } from 'commander';
import { loadCase } from '../../case/load.js';
import { driversText } from '../../design/designText.js';
import { anyGateExceeded, checkGateMetrics, evaluateRiskGates } from '../../design/riskGate.js';
import { writeRunDrivers } from '../../design/runDrivers.js';
import { columnsOf } from '../../results/columns.js';
import { headlineText } from '../../run/headline.js';
import { kernelGroups } from '../../run/kernel.js';
import { runAssessment } from '../../run/run.js';
import { summaryMetricNames, summarySettings } from '../../run/summary-feed.js';
import { exitCode, InterruptedError } from '../exit.js';
import type { AddCommand } from '../frame.js';
import { addOptions, commonRunOptions } from '../options.js';

/** Default output folder: results/<case file stem>/ (CONTRACT.md). */
export function defaultOutDir(casePath: string, cwd: string): string {
  return resolve(cwd, 'results', basename(casePath, extname(casePath)));
}

export const addRunCommand: AddCommand = (program: Command, frame) => {
  const cmd = program
    .command('run')
    .argument('<case>', 'case file (YAML or JSON)')
    .summary('the Monte Carlo assessment')
    .description(
      'Samples grid-separation scenarios of the case, simulates each, and writes scenarios.arrow, ' +
        'summary.arrow and run.json to the output folder (default results/<case stem>/). ' +
        'Ctrl-C finishes the batches in flight and writes valid partial files; --resume continues. ' +
        'The figures are screening estimates, not engineering approval.',
    );
  addOptions(cmd, [...commonRunOptions, 'resume', 'untilRelError'], {
    out: 'output folder (default results/<case file stem>/)',
  });
  cmd.action(
    frame.action(async ([casePath], options, io) => {
      const loaded = await loadCase(resolve(io.cwd, casePath!), options.set);
      // a gate naming an unknown metric is bad input: say so before anything is written
      checkGateMetrics(
        options.failIf,
        summaryMetricNames(summarySettings(loaded.case), columnsOf(kernelGroups())),
      );
      // shards default to their own folders under the case's, ready for `holdfast merge`
      const shardDir = options.shard
        ? `shard-${options.shard.index}-of-${options.shard.count}`
        : '';
      const outDir = options.out
        ? resolve(io.cwd, options.out)
        : resolve(defaultOutDir(casePath!, io.cwd), shardDir);
      const showBar = !options.quiet && !options.json && process.stderr.isTTY === true;
      const bar = showBar
        ? new SingleBar({
            format:
              'holdfast run [{bar}] {value}/{total} scenarios | {rate}/s | {eta_formatted} left',
            hideCursor: true,
          })
        : undefined;
      const controller = new AbortController();
      const stop = () => controller.abort();
      process.once('SIGINT', stop);
      process.once('SIGTERM', stop);
      const t0 = Date.now();
      let outcome: Awaited<ReturnType<typeof runAssessment>>;
      try {
        outcome = await runAssessment(loaded, {
          outDir,
          scenarios: options.scenarios,
          seed: options.seed,
          workers: options.workers,
          shard: options.shard,
          resume: options.resume,
          untilRelError: options.untilRelError,
          parquet: options.parquet,
          signal: controller.signal,
          onProgress: bar
            ? (done, total) => {
                if (done === 0 || bar.getTotal() !== total) bar.start(total, done, { rate: 0 });
                const rate = Math.round(done / Math.max((Date.now() - t0) / 1000, 1e-3));
                bar.update(done, { rate });
              }
            : undefined,
        });
      } finally {
        bar?.stop();
        process.removeListener('SIGINT', stop);
        process.removeListener('SIGTERM', stop);
      }
      // what drives the risk: drivers.arrow beside the summary, once the run is complete
      const drivers =
        outcome.status === 'complete'
          ? writeRunDrivers(outDir, outcome.manifest.confidenceLevel)
          : undefined;
      if (options.json)
        io.stdout(
          `${JSON.stringify({ manifest: outcome.manifest, summary: outcome.summary }, null, 2)}\n`,
        );
      else if (!options.quiet)
        io.stdout(
          headlineText(outcome.summary, {
            scenarios: outcome.manifest.scenarioCount,
            confidenceLevel: outcome.manifest.confidenceLevel,
            failureDefinition: outcome.manifest.failureDefinition,
            stoppingRule: outcome.manifest.untilRelError,
            status: outcome.status,
            dir: outDir,
          }),
        );
      if (drivers && !options.quiet && !options.json) io.stdout(driversText(drivers, 3));
      if (outcome.status === 'partial' && outcome.stopReason === 'interrupted')
        throw new InterruptedError();
      if (options.failIf.length > 0) {
        const verdicts = evaluateRiskGates(outcome.summary, options.failIf);
        for (const v of verdicts) io.stderr(`holdfast: ${v.text}\n`);
        if (anyGateExceeded(verdicts)) return exitCode.gateExceeded;
      }
      return exitCode.ok;
    }),
  );
};
