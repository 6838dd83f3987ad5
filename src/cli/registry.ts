/**
 * The command table: one `AddCommand` per file in src/cli/commands/. To add a command, write
 * src/cli/commands/<name>.ts and add one import and one entry here (docs/cli.md).
 */
import { addCheckCommand } from './commands/check.js';
import { addCompareCommand } from './commands/compare.js';
import { addFlowCommand } from './commands/flow.js';
import { addInitCommand } from './commands/init.js';
import { addMergeCommand } from './commands/merge.js';
import { addReplayCommand } from './commands/replay.js';
import { addRunCommand } from './commands/run.js';
import { addSchemaCommand } from './commands/schema.js';
import { addSweepCommand } from './commands/sweep.js';
import type { AddCommand } from './frame.js';

export const addCommands: readonly AddCommand[] = [
  addCheckCommand,
  addRunCommand,
  addReplayCommand,
  addMergeCommand,
  addSchemaCommand,
  addInitCommand,
  addCompareCommand,
  addSweepCommand,
  addFlowCommand,
];
