// Source: none needed: command dispatch and error lines (internal behaviour).
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

  it('exits 2 on a missing or extra argument, every stderr line starting with holdfast:', async () => {
    for (const argv of [['check'], ['check', 'a.yaml', 'b.yaml']]) {
      const io = memoryIo();
      expect(await runCli(argv, io)).toBe(2);
      for (const line of io.err.trimEnd().split('\n')) expect(line).toMatch(/^holdfast: /);
    }
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

  it('collects repeatable options and positional arguments of check', async () => {
    const parsed = await parseCommandLine([
      'check',
      'cases/kestrel-island.yaml',
      '--set',
      'sources.bess.energyKwh=2000',
      '--set',
      'events.islandingRatePerYear=4',
      '--json',
    ]);
    expect(parsed).toEqual({
      command: 'check',
      args: ['cases/kestrel-island.yaml'],
      options: expect.objectContaining({
        set: ['sources.bess.energyKwh=2000', 'events.islandingRatePerYear=4'],
        json: true,
        quiet: false,
      }),
    });
  });

  it('types the common run options (the run command is parsed, not run)', async () => {
    const parsed = await parseCommandLine([
      'run',
      'cases/kestrel-island.yaml',
      '--scenarios',
      '2000',
      '--seed',
      '9',
      '--shard',
      '3/4',
      '--fail-if',
      'p_shutdown>0.01',
      '--quiet',
    ]);
    expect(parsed.command).toBe('run');
    expect(parsed.options).toMatchObject({
      scenarios: 2000,
      seed: 9,
      shard: { index: 3, count: 4 },
      failIf: [{ metric: 'p_shutdown', threshold: 0.01, direction: '>' }],
      quiet: true,
    });
  });

  it('rejects a bad option value with a CaseError naming the option', async () => {
    await expect(parseCommandLine(['run', 'x.yaml', '--scenarios', 'many'])).rejects.toThrow(
      /--scenarios: expected a whole number of at least 1, got "many"/,
    );
  });
});

describe('holdfast check --json', () => {
  it('prints one JSON document with the summary', async () => {
    const io = memoryIo();
    expect(await runCli(['check', 'cases/kestrel-island.yaml', '--json'], io)).toBe(0);
    const doc = JSON.parse(io.out) as {
      valid: boolean;
      sha256: string;
      summary: { peakKw: number };
    };
    expect(doc.valid).toBe(true);
    expect(doc.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(doc.summary.peakKw).toBe(2470);
  });
});
