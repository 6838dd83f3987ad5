/**
 * The one place that turns an outcome into an exit code and an error into stderr lines
 * (CONTRACT.md "Exit codes"): 0 done, 1 a risk gate exceeded, 2 bad input, 3 internal failure,
 * 130 interrupted. Errors print as `holdfast: PATH: message`, with a stack trace only under
 * `--debug`.
 */
import { CommanderError } from 'commander';
import { CaseError, RunError } from '../errors.js';
import type { CliIo } from './io.js';

export const exitCode = {
  ok: 0,
  gateExceeded: 1,
  badInput: 2,
  failed: 3,
  interrupted: 130,
} as const;
export type ExitCode = (typeof exitCode)[keyof typeof exitCode];

/** Thrown by a command interrupted by SIGINT after it wrote valid, partial output. */
export class InterruptedError extends Error {
  constructor(message = 'interrupted; the output is marked partial, --resume continues it') {
    super(message);
    this.name = 'InterruptedError';
  }
}

/** A usage problem found outside commander (a bad option value, a missing file argument). */
export function usageError(option: string, message: string): CaseError {
  return CaseError.single(option, message);
}

/** Prints `err` on stderr in the contract's format and returns the exit code it maps to. */
export function reportError(err: unknown, io: CliIo, debug: boolean): ExitCode {
  if (err instanceof CommanderError) {
    // commander already printed its message through outputError (see program.ts)
    return err.exitCode === 0 ? exitCode.ok : exitCode.badInput;
  }
  if (err instanceof CaseError) {
    for (const p of err.problems) io.stderr(`holdfast: ${p.path || '(file)'}: ${p.message}\n`);
    if (debug && err.stack) io.stderr(`${err.stack}\n`);
    return exitCode.badInput;
  }
  if (err instanceof InterruptedError) {
    io.stderr(`holdfast: ${err.message}\n`);
    return exitCode.interrupted;
  }
  const message = err instanceof Error ? err.message : String(err);
  const kind = err instanceof RunError ? 'run failed' : 'internal error';
  io.stderr(`holdfast: ${kind}: ${message}\n`);
  if (debug) {
    if (err instanceof Error && err.stack) io.stderr(`${err.stack}\n`);
    if (err instanceof Error && err.cause instanceof Error && err.cause.stack)
      io.stderr(`caused by: ${err.cause.stack}\n`);
  } else {
    io.stderr('holdfast: rerun with --debug for the stack trace\n');
  }
  return exitCode.failed;
}
