/** `holdfast schema`: prints the JSON Schema of the case file, for editors and other validators. */
import type { Command } from 'commander';
import { caseJsonSchema } from '../../case/json-schema.js';
import { caseReferenceMarkdown } from '../../case/reference-doc.js';
import { exitCode } from '../exit.js';
import type { AddCommand } from '../frame.js';
import { addOptions } from '../options.js';

export const addSchemaCommand: AddCommand = (program: Command, frame) => {
  const cmd = program
    .command('schema')
    .summary('print the JSON Schema of the case file')
    .description(
      'Prints the JSON Schema (draft 2020-12) of the case file on stdout, with a description of ' +
        'every key, for editor completion and for checking case files with other validators.',
    );
  addOptions(cmd, ['markdown', 'debug']);
  cmd.action(
    frame.action(async (_args, options, io) => {
      if (options.markdown) io.stdout(caseReferenceMarkdown());
      else io.stdout(`${JSON.stringify(caseJsonSchema(), null, 2)}\n`);
      return exitCode.ok;
    }),
  );
};
