import { describe, expect, it } from 'vitest';
import { memoryIo } from '../../src/cli/io.js';
import { parseCommandLine, runCli } from '../../src/cli/program.js';

describe('runCli', () => {
  it('prints help for --help and exits 0', async () => {
    const io = memoryIo();
    expect(await runCli(['--help'], io)).toBe(0);
    expect(io.out).toContain('Usage: holdfast');
    expect(io.out).toContain('schema');
  });

  it('exits 2 with a holdfast: line and no stack trace on an unknown command', async () => {
    const io = memoryIo();
    expect(await runCli(['frobnicate'], io)).toBe(2);
    expect(io.err).toMatch(/^holdfast: unknown command 'frobnicate'/);
    expect(io.err).not.toMatch(/\n\s+at /);
  });

  it('exits 2 on an unknown option', async () => {
    const io = memoryIo();
    expect(await runCli(['schema', '--nope'], io)).toBe(2);
    expect(io.err).toContain("holdfast: unknown option '--nope'");
  });

  it('exits 2 and prints usage when no command is given', async () => {
    const io = memoryIo();
    expect(await runCli([], io)).toBe(2);
    expect(io.err).toContain('Usage: holdfast');
  });

  it('prints the version', async () => {
    const io = memoryIo();
    expect(await runCli(['--version'], io)).toBe(0);
    expect(io.out.trim()).toMatch(/^\d+\.\d+\.\d+/);
  });
});

describe('parseCommandLine', () => {
  it('returns the command, its arguments and typed options without running it', async () => {
    const parsed = await parseCommandLine(['schema', '--debug']);
    expect(parsed.command).toBe('schema');
    expect(parsed.args).toEqual([]);
    expect(parsed.options.debug).toBe(true);
  });
});
