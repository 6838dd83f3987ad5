/** `holdfast merge OUT DIR...`: combines shard output folders exactly (src/run/merge.ts). */
import { resolve } from 'node:path';
import type { Command } from 'commander';
import { headlineText } from '../../run/headline.js';
import { mergeShards } from '../../run/merge.js';
import { exitCode } from '../exit.js';
import type { AddCommand } from '../frame.js';
import { addOptions } from '../options.js';

export const addMergeCommand: AddCommand = (program: Command, frame) => {
  const cmd = program
    .command('merge')
    .argument('<out>', 'output folder to write')
    .argument('<dirs...>', 'output folders of the shards (holdfast run --shard I/N)')
    .summary('combine the outputs of shards into one output folder')
    .description(
      'Copies the rows of every shard in scenario-id order and recomputes the summary from them, ' +
        'so merging all N shards equals the unsharded run. Refuses shards of different cases, ' +
        'seeds or scenario counts, and overlapping scenario ids.',
    );
  addOptions(cmd, ['json', 'quiet', 'debug']);
  cmd.action(
    frame.action(async ([out, ...dirs], options, io) => {
      const outDir = resolve(io.cwd, out!);
      const merged = await mergeShards(
        outDir,
        dirs.map((d) => resolve(io.cwd, d)),
      );
      if (options.json)
        io.stdout(
          `${JSON.stringify({ manifest: merged.manifest, summary: merged.summary }, null, 2)}\n`,
        );
      else if (!options.quiet)
        io.stdout(
          headlineText(merged.summary, {
            scenarios: merged.manifest.scenarioCount,
            confidenceLevel: merged.manifest.confidenceLevel,
            failureDefinition: merged.manifest.failureDefinition,
            status: merged.status,
            dir: outDir,
          }),
        );
      return exitCode.ok;
    }),
  );
};
