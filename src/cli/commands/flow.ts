/**
 * `holdfast flow CASE [--hour H] [--json]`: the island power flow, loading margin and damping of
 * one operating point (src/grid/voltage/flow-report.ts documents the point chosen).
 */
import { loadCase } from '../../case/load.js';
import { flowReport, formatFlowReport } from '../../grid/voltage/flow-report.js';
import { exitCode } from '../exit.js';
import type { AddCommand } from '../frame.js';
import { addOptions } from '../options.js';

export const addFlowCommand: AddCommand = (program, frame) => {
  const cmd = program
    .command('flow')
    .argument('<case>', 'case file (YAML or JSON)')
    .summary('the island power flow, loadability margin and damping of one operating point')
    .description(
      'Solves the island power flow at hour H (default: the hour of the largest expected demand) ' +
        'with every source running and a droop-shared dispatch, and prints the bus voltages, ' +
        'losses, the loading margin (load factor at the nose point) and the small-signal modes. ' +
        '--json prints one object with v_min_pu, v_min_bus, v_max_pu, losses_kw, ' +
        'loading_margin, min_damping_ratio and buses [{id, v_pu, angle_deg}].',
    );
  addOptions(cmd, ['hour', 'set', 'json', 'debug']);
  cmd.action(
    frame.action(async ([casePath], options, io) => {
      const loaded = await loadCase(casePath ?? '', options.set, { cwd: io.cwd });
      const report = flowReport(loaded.case, loaded.dir, options.hour);
      if (options.json) io.stdout(`${JSON.stringify(report, null, 2)}\n`);
      else io.stdout(formatFlowReport(report));
      return exitCode.ok;
    }),
  );
};
