/** `holdfast replay CASE --scenario K`: re-simulates scenario K and writes its time series. */
import { basename, extname, resolve } from 'node:path';
import type { Command } from 'commander';
import { loadCase } from '../../case/load.js';
import { replayScenario } from '../../run/replay.js';
import { exitCode, usageError } from '../exit.js';
import type { AddCommand } from '../frame.js';
import { addOptions } from '../options.js';

export const addReplayCommand: AddCommand = (program: Command, frame) => {
  const cmd = program
    .command('replay')
    .argument('<case>', 'case file (YAML or JSON)')
    .summary('re-simulate one scenario exactly and write its time series')
    .description(
      'Re-simulates scenario K of the case and seed, prints the same figures as row K of ' +
        'scenarios.arrow and writes trajectory.arrow (t_s, f_hz, rocof_hz_per_s, p_<source>_kw, ' +
        'load_kw, shed_kw) to --out (default results/<case stem>/replay-<K>/).',
    );
  addOptions(cmd, ['scenario', 'seed', 'out', 'set', 'json', 'debug'], {
    out: 'output folder (default results/<case stem>/replay-<K>/)',
  });
  cmd.action(
    frame.action(async ([casePath], options, io) => {
      if (options.scenario === undefined)
        throw usageError('--scenario', 'expected --scenario <k>, the id of the scenario to replay');
      const loaded = await loadCase(resolve(io.cwd, casePath!), options.set);
      const stem = basename(casePath!, extname(casePath!));
      const outDir = options.out
        ? resolve(io.cwd, options.out)
        : resolve(io.cwd, 'results', stem, `replay-${options.scenario}`);
      const r = await replayScenario(loaded, {
        scenarioId: options.scenario,
        seed: options.seed,
        outDir,
      });
      if (options.json)
        io.stdout(`${JSON.stringify({ ...r.row, trajectory: r.trajectoryPath }, null, 2)}\n`);
      else {
        const width = Math.max(...Object.keys(r.row).map((k) => k.length));
        for (const [k, v] of Object.entries(r.row)) io.stdout(`${k.padEnd(width)}  ${String(v)}\n`);
        io.stdout(`trajectory: ${r.trajectoryPath} (${r.samples} samples)\n`);
      }
      return exitCode.ok;
    }),
  );
};
