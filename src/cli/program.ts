/**
 * Builds the holdfast program from the command table and runs a command line in-process:
 * `runCli(argv, io)` returns the exit code instead of exiting, so tests call it directly and
 * main.ts only binds it to the process. `parseCommandLine(argv)` parses without running.
 */
import { readFileSync } from 'node:fs';
import { Command, CommanderError } from 'commander';
import { exitCode, reportError } from './exit.js';
import { createFrame, type FrameState, type ParsedCommandLine } from './frame.js';
import { type CliIo, memoryIo } from './io.js';
import { addCommands } from './registry.js';

function toolVersion(): string {
  // package.json sits two levels up from both src/cli/ and dist/cli/
  const text = readFileSync(new URL('../../package.json', import.meta.url), 'utf8');
  const parsed = JSON.parse(text) as { version?: unknown };
  return typeof parsed.version === 'string' ? parsed.version : '0.0.0';
}

export function buildProgram(
  io: CliIo,
  mode: 'execute' | 'parse-only',
  state: FrameState,
): Command {
  const program = new Command('holdfast')
    .description(
      'Monte Carlo screening of islanded-microgrid risk: load shedding, shutdown, frequency and ' +
        'voltage limits.\nScreening estimates only; protection settings and interconnection are ' +
        'decided under local codes by licensed engineers.',
    )
    .version(toolVersion(), '-V, --version')
    .showHelpAfterError('holdfast: add --help for usage')
    .configureOutput({
      writeOut: (text) => io.stdout(text),
      writeErr: (text) => io.stderr(text),
      outputError: (text, write) => write(`holdfast: ${text.replace(/^error: /, '')}`),
    })
    .exitOverride();
  const frame = createFrame(io, mode, state);
  for (const add of addCommands) add(program, frame);
  for (const cmd of program.commands) {
    cmd.exitOverride();
    cmd.configureOutput(program.configureOutput());
    cmd.showHelpAfterError('holdfast: add --help for usage');
  }
  return program;
}

/** Runs one command line (without the `node script` prefix) and returns its exit code. */
export async function runCli(argv: readonly string[], io: CliIo): Promise<number> {
  const state: FrameState = { exitCode: undefined, parsed: undefined };
  const debug = argv.includes('--debug');
  try {
    const program = buildProgram(io, 'execute', state);
    if (argv.length === 0) {
      program.outputHelp({ error: true });
      return exitCode.badInput;
    }
    await program.parseAsync([...argv], { from: 'user' });
    return state.exitCode ?? exitCode.ok;
  } catch (err) {
    return reportError(err, io, debug);
  }
}

/**
 * Parses a command line into the command name, its positional arguments and typed options,
 * without running anything. Throws `CaseError` (bad option value) or `CommanderError` (usage).
 */
export async function parseCommandLine(argv: readonly string[]): Promise<ParsedCommandLine> {
  const state: FrameState = { exitCode: undefined, parsed: undefined };
  const program = buildProgram(memoryIo(), 'parse-only', state);
  await program.parseAsync([...argv], { from: 'user' });
  if (!state.parsed)
    throw new CommanderError(exitCode.badInput, 'holdfast.noCommand', 'no command given');
  return state.parsed;
}
