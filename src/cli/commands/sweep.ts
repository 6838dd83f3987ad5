/**
 * `holdfast sweep CASE --set PATH=V1,V2,...` or `--set PATH=START:STOP:STEP`: one design
 * parameter over several values on common random numbers (src/design/sweep.ts). Other `--set`
 * entries with a single value are applied to every value. `--fail-if` gates judge every value.
 */
import { basename, extname, resolve } from 'node:path';
import type { Command } from 'commander';
import { knownSummaryMetrics } from '../../design/outcomes.js';
import { anyGateExceeded, checkGateMetrics, evaluateRiskGates } from '../../design/riskGate.js';
import { loadSweepCases, runSweep } from '../../design/sweep.js';
import { parseSweepSets } from '../../design/sweepValues.js';
import { screeningCaution } from '../../results/manifest.js';
import { exitCode } from '../exit.js';
import type { AddCommand } from '../frame.js';
import { addOptions, commonRunOptions, pairedRunOptions } from '../options.js';
import { stoppedError, untilStopSignal } from '../stop-signal.js';

/** Default output folder: results/<case stem>-sweep-<last segment of the path>/. */
export function defaultSweepDir(casePath: string, path: string, cwd: string): string {
  const last = path.split('.').pop() ?? 'value';
  const name = `${basename(casePath, extname(casePath))}-sweep-${last.replace(/[^A-Za-z0-9_-]+/g, '_')}`;
  return resolve(cwd, 'results', name);
}

export const addSweepCommand: AddCommand = (program: Command, frame) => {
  const cmd = program
    .command('sweep')
    .argument('<case>', 'case file (YAML or JSON)')
    .summary('one design parameter over several values, common random numbers across them')
    .description(
      'Runs the case once per value of one field, given as --set PATH=V1,V2,... or ' +
        '--set PATH=START:STOP:STEP (STOP included when on the grid), all on the same seed and ' +
        'scenario ids, and writes sweep.arrow (one row per value, every summary metric with its ' +
        'interval) and one run folder per value. The table points out the knee of the risk ' +
        'curve where there is one. Screening estimates, not engineering approval.',
    );
  addOptions(cmd, commonRunOptions, {
    out: 'output folder (default results/<case stem>-sweep-<last part of PATH>/, one run per value)',
  });
  cmd.action(
    frame.action(async ([casePath], options, io) => {
      const spec = parseSweepSets(options.set);
      checkGateMetrics(options.failIf, knownSummaryMetrics);
      // every value is loaded and validated first: a bad value exits 2 with nothing written
      const cases = await loadSweepCases(resolve(io.cwd, casePath!), spec);
      const outDir = options.out
        ? resolve(io.cwd, options.out)
        : defaultSweepDir(casePath!, spec.path, io.cwd);
      const progress = !options.quiet && !options.json && process.stderr.isTTY === true;
      const outcome = await untilStopSignal(
        (signal) =>
          runSweep(spec.path, cases, {
            ...pairedRunOptions(options, outDir, signal),
            onProgress: progress
              ? (k, done, total) =>
                  io.stderr(`\rholdfast sweep: value ${k + 1}/${cases.length} ${done}/${total}`)
              : undefined,
          }),
        () => progress && io.stderr('\n'),
      );
      if (options.json)
        io.stdout(
          `${JSON.stringify(
            {
              parameter: spec.path,
              points: outcome.points,
              knees: outcome.knees.map((k) => ({
                metric: k.metric,
                knee: k.knee ?? null,
                trend: k.trend,
                endToEnd: k.endToEnd ?? null,
              })),
              steps: outcome.steps,
              confidenceLevel: outcome.confidenceLevel,
            },
            null,
            2,
          )}\n`,
        );
      else if (!options.quiet) io.stdout(`${outcome.text}${screeningCaution}\n`);
      if (!outcome.sweepPath)
        throw stoppedError('sweep', outcome.runs[outcome.runs.length - 1]?.stopReason);
      if (options.failIf.length > 0) {
        let exceeded = false;
        for (const p of outcome.points) {
          const verdicts = evaluateRiskGates(p.rows, options.failIf);
          for (const v of verdicts) io.stderr(`holdfast: ${spec.path}=${p.valueText}: ${v.text}\n`);
          exceeded ||= anyGateExceeded(verdicts);
        }
        if (exceeded) return exitCode.gateExceeded;
      }
      return exitCode.ok;
    }),
  );
};
