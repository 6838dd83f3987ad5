/**
 * Graceful stop of the long commands (`run`, `compare`, `sweep`): SIGINT or SIGTERM aborts the
 * signal the runner watches, so it finishes the batch in hand, writes valid output marked
 * partial and returns; the command then exits 130 (CONTRACT.md "Exit codes").
 */
import { RunError } from '../errors.js';
import { InterruptedError } from './exit.js';

/**
 * Runs `work` with a signal that SIGINT or SIGTERM aborts; the listeners are removed afterwards
 * and `finish` (ending a progress line or bar) runs whether `work` resolves or throws.
 */
export async function untilStopSignal<T>(
  work: (signal: AbortSignal) => Promise<T>,
  finish: () => void = () => undefined,
): Promise<T> {
  const controller = new AbortController();
  const stop = () => controller.abort();
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
  try {
    return await work(controller.signal);
  } finally {
    finish();
    process.removeListener('SIGINT', stop);
    process.removeListener('SIGTERM', stop);
  }
}

/** The error of a study whose run stopped partial: interrupted (exit 130) or failed (exit 3). */
export function stoppedError(command: string, reason: string | null | undefined): Error {
  if (reason === 'interrupted') return new InterruptedError();
  return new RunError(`${command} stopped: ${reason ?? 'a run ended partial'}`);
}
