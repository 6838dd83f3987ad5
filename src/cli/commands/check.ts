/**
 * `holdfast check CASE`: validates a case file (with `--set` overrides) and prints the one-screen
 * summary, or every problem on stderr with exit 2 (the thrown CaseError, mapped in exit.ts).
 */
import { loadCase } from '../../case/load.js';
import { formatSummary, summarizeCase } from '../../case/summary.js';
import { exitCode } from '../exit.js';
import type { AddCommand } from '../frame.js';
import { addOptions } from '../options.js';

export const addCheckCommand: AddCommand = (program, frame) => {
  const cmd = program
    .command('check')
    .argument('<case>', 'case file (YAML or JSON)')
    .summary('validate a case file and print a one-screen summary')
    .description(
      'Validates a case file and prints its sources, peak load by tier, spinning reserve, battery ' +
        'energy, inertia, shedding stages, shutdown limits and event rates. An invalid file gives ' +
        'every problem, one `holdfast: PATH: message` line each, and exit code 2.',
    );
  addOptions(cmd, ['set', 'json', 'debug']);
  cmd.action(
    frame.action(async ([casePath], options, io) => {
      const file = casePath ?? '';
      const loaded = await loadCase(file, options.set, { cwd: io.cwd });
      const summary = summarizeCase(loaded.case);
      if (options.json)
        io.stdout(
          `${JSON.stringify({ file, sha256: loaded.sha256, valid: true, summary }, null, 2)}\n`,
        );
      else io.stdout(formatSummary(summary, file));
      return exitCode.ok;
    }),
  );
};
