/**
 * The plumbing between commander and the command functions. A command file exports an
 * `AddCommand` that declares its command on the program and wraps its work with `frame.action`;
 * the frame turns commander's raw values into typed `CliOptions` (options.ts) and records the
 * exit code. The same command declarations serve two modes: `execute` runs the work,
 * `parse-only` just records what would run (for in-process tests of the parsing).
 */
import type { Command } from 'commander';
import type { ExitCode } from './exit.js';
import type { CliIo } from './io.js';
import { type CliOptions, parseOptions } from './options.js';

/** The work of one command: positional arguments and typed options in, an exit code out. */
export type CommandAction = (args: string[], options: CliOptions, io: CliIo) => Promise<ExitCode>;

/** What a command line was parsed into. */
export interface ParsedCommandLine {
  command: string;
  args: string[];
  options: CliOptions;
}

export interface CliFrame {
  readonly io: CliIo;
  /** Wraps a command's work into a commander action handler. */
  action(run: CommandAction): (...commanderArgs: unknown[]) => Promise<void>;
}

/** Declares one command on the program. One per file in src/cli/commands/. */
export type AddCommand = (program: Command, frame: CliFrame) => void;

export interface FrameState {
  exitCode: ExitCode | undefined;
  parsed: ParsedCommandLine | undefined;
}

export function createFrame(
  io: CliIo,
  mode: 'execute' | 'parse-only',
  state: FrameState,
): CliFrame {
  return {
    io,
    action(run) {
      return async (...commanderArgs: unknown[]) => {
        // commander passes (...positionals, options, command)
        const command = commanderArgs[commanderArgs.length - 1] as Command;
        const positionals = commanderArgs.slice(0, -2);
        const args: string[] = [];
        for (const p of positionals) {
          if (Array.isArray(p)) for (const q of p) args.push(String(q));
          else if (p !== undefined) args.push(String(p));
        }
        const options = parseOptions(command.opts());
        if (mode === 'parse-only') {
          state.parsed = { command: command.name(), args, options };
          return;
        }
        state.exitCode = await run(args, options, io);
      };
    },
  };
}
