// Source: none needed: signal handling (internal behaviour).
/**
 * The shared plumbing of the long commands: the stop signal is handed to the work and its
 * listeners are gone afterwards (also when the work throws), a partial run maps to exit 130 or
 * 3 (CONTRACT.md "Exit codes"), and a paired study gets the run options the command line set.
 */
import { describe, expect, it } from 'vitest';
import { InterruptedError } from '../../src/cli/exit.js';
import { pairedRunOptions, parseOptions } from '../../src/cli/options.js';
import { stoppedError, untilStopSignal } from '../../src/cli/stop-signal.js';
import { RunError } from '../../src/errors.js';

describe('untilStopSignal', () => {
  it('passes an unaborted signal and removes its listeners, also after a throw', async () => {
    const before = [process.listenerCount('SIGINT'), process.listenerCount('SIGTERM')];
    let finished = 0;
    const value = await untilStopSignal(
      async (signal) => {
        expect(signal.aborted).toBe(false);
        expect(process.listenerCount('SIGINT')).toBe(before[0]! + 1);
        return 42;
      },
      () => finished++,
    );
    expect(value).toBe(42);
    await expect(
      untilStopSignal(
        async () => {
          throw new Error('boom');
        },
        () => finished++,
      ),
    ).rejects.toThrow('boom');
    expect(finished).toBe(2);
    expect([process.listenerCount('SIGINT'), process.listenerCount('SIGTERM')]).toEqual(before);
  });

  it('maps a stopped study to interrupted (130) or a run failure (3)', () => {
    expect(stoppedError('sweep', 'interrupted')).toBeInstanceOf(InterruptedError);
    const failed = stoppedError('compare', 'worker died');
    expect(failed).toBeInstanceOf(RunError);
    expect(failed.message).toBe('compare stopped: worker died');
    expect(stoppedError('compare', null).message).toBe('compare stopped: a run ended partial');
  });
});

describe('pairedRunOptions', () => {
  it('carries scenarios, seed, workers, shard and parquet of the command line', () => {
    const options = parseOptions({
      scenarios: '300',
      seed: 'kestrel',
      workers: '1',
      shard: '2/3',
      parquet: true,
    });
    const signal = new AbortController().signal;
    expect(pairedRunOptions(options, '/tmp/out', signal)).toEqual({
      outDir: '/tmp/out',
      scenarios: 300,
      seed: 'kestrel',
      workers: 1,
      shard: { index: 2, count: 3 },
      parquet: true,
      signal,
    });
  });
});
