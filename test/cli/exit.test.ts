// Source: none needed: exit codes of CONTRACT.md (internal behaviour).
import { describe, expect, it } from 'vitest';
import { exitCode, InterruptedError, reportError } from '../../src/cli/exit.js';
import { memoryIo } from '../../src/cli/io.js';
import { CaseError, RunError } from '../../src/errors.js';

describe('reportError maps outcomes to the exit codes of CONTRACT.md', () => {
  it('prints one holdfast: PATH: message line per case problem and returns 2', () => {
    const io = memoryIo();
    const err = new CaseError([
      { path: '/sources/2/droopPu', message: 'expected a number, got "five"' },
      { path: '/loads/0/bus', message: 'expected a bus id, got "x"' },
    ]);
    expect(reportError(err, io, false)).toBe(exitCode.badInput);
    expect(io.err).toBe(
      'holdfast: /sources/2/droopPu: expected a number, got "five"\nholdfast: /loads/0/bus: expected a bus id, got "x"\n',
    );
  });

  it('returns 3 for an internal failure, with the stack only under --debug', () => {
    const quiet = memoryIo();
    expect(
      reportError(new RunError('worker died', { cause: new Error('oom') }), quiet, false),
    ).toBe(3);
    expect(quiet.err).toContain('holdfast: run failed: worker died');
    expect(quiet.err).not.toMatch(/\n\s+at /);
    const loud = memoryIo();
    expect(reportError(new TypeError('x is undefined'), loud, true)).toBe(3);
    expect(loud.err).toContain('holdfast: internal error: x is undefined');
    expect(loud.err).toMatch(/\n\s+at /);
  });

  it('returns 130 for an interruption', () => {
    const io = memoryIo();
    expect(reportError(new InterruptedError(), io, false)).toBe(exitCode.interrupted);
    expect(exitCode.interrupted).toBe(130);
    expect(io.err).toMatch(/^holdfast: interrupted/);
  });
});
