// Source: none needed: the malformed-case corpus exercises input validation (internal behaviour); YAML 1.2 alias semantics (yaml.org spec 1.2.2).
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { MAX_CASE_BYTES } from '../../src/case/load.js';
import { memoryIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/program.js';

const dir = 'test/case/malformed';

/**
 * Each malformed file and the start of the path its first error line must name: a field
 * (JSON-pointer-like) or, for problems with the file as a whole, the file itself.
 */
const expectations: Record<string, string> = {
  'a-directory.yaml': `${dir}/a-directory.yaml`,
  'alias-bomb.yaml': `${dir}/alias-bomb.yaml`,
  // four files carry a .txt/.bin extension so the repository's formatter does not try to parse
  // them; the loader reads an unknown extension as JSON when it starts with "{", else YAML
  'bad-syntax.yaml.txt': `${dir}/bad-syntax.yaml.txt:4`,
  'bad-tier.yaml': '/loads/0/tier',
  'binary-garbage.bin': `${dir}/binary-garbage.bin`,
  'branch-both-units.yaml': '/network/branches/0',
  'branch-no-impedance.yaml': '/network/branches/0',
  'comments-only.yaml': `${dir}/comments-only.yaml`,
  'csv-missing.yaml': '/loads/0/profile/file',
  'csv-short.yaml': '/loads/0/profile/file',
  'custom-tag.yaml': `${dir}/custom-tag.yaml:2`,
  'dangling-bus.yaml': '/sources/0/bus',
  'deep-nesting.yaml': `${dir}/deep-nesting.yaml`,
  'disconnected.yaml': '/network/buses/1',
  'duplicate-bus.yaml': '/network/buses/2/id',
  'duplicate-key.yaml': `${dir}/duplicate-key.yaml:3`,
  'duplicate-key-json.txt': `${dir}/duplicate-key-json.txt:2`,
  'duplicate-source-ids.yaml': '/sources/1/id',
  'empirical-weights.yaml': '/events/outageDurationH/weights',
  'empty.yaml': `${dir}/empty.yaml`,
  'frequency-55.yaml': '/system/frequencyHz',
  'fuel-curve.yaml': '/sources/0/fuelFullLoadLPerH',
  'invalid-utf8.txt': `${dir}/invalid-utf8.txt`,
  'missing-rating.yaml': '/sources/0/ratingKw',
  'missing-sources.yaml': '/sources',
  'missing-system.yaml': '/system',
  'negative-event-rate.yaml': '/events/islandingRatePerYear',
  'negative-rating.yaml': '/sources/0/ratingKw',
  'no-grid-forming.yaml': '/sources',
  'not-a-mapping.yaml': `${dir}/not-a-mapping.yaml`,
  'pcc-missing.yaml': '/network/pccBus',
  'shares-over-100.yaml': '/protection/ufls',
  'soc-order.yaml': '/sources/1/socReserveFraction',
  'soc-over-one.yaml': '/sources/1/socMaxFraction',
  'soc-unbounded.yaml': '/sources/1/socAtEvent/kind',
  'standby-only.yaml': '/sources',
  'syntax-json.txt': `${dir}/syntax-json.txt`,
  'typo-key.yaml': '/sources/0/ratingKw',
  'ufls-above-nominal.yaml': '/protection/ufls/0/thresholdHz',
  'ufls-ascending.yaml': '/protection/ufls/1/thresholdHz',
  'ufls-below-shutdown.yaml': '/protection/ufls/1/thresholdHz',
  'uniform-min-max.yaml': '/events/outageDurationH/min',
  'unknown-kind.yaml': '/sources/0/kind',
  'wind-speeds.yaml': '/sources/2/cutInMPerS',
  'wrong-type-rating.yaml': '/sources/0/ratingKw',
  'zero-scenarios.yaml': '/monteCarlo/scenarios',
};

const stackLine = /^\s+at .+\(.*:\d+:\d+\)$|^\s+at .+:\d+:\d+$/m;

describe('the malformed case corpus', () => {
  const onDisk = readdirSync(dir).filter((f) => !f.endsWith('.csv'));

  it('has at least 25 files and an expectation for each of them', () => {
    expect(onDisk.length).toBeGreaterThanOrEqual(25);
    expect(onDisk.sort()).toEqual(Object.keys(expectations).sort());
  });

  it.each(Object.entries(expectations))(
    '%s gives exit 2 and names %s, without a stack trace',
    async (file, path) => {
      const io = memoryIo();
      const code = await runCli(['check', `${dir}/${file}`], io);
      expect(code).toBe(2);
      expect(io.out).toBe('');
      const lines = io.err.trimEnd().split('\n');
      // "expected ..., got ..." from validation; the CSV reader (src/sample) says "found"
      for (const line of lines) expect(line).toMatch(/^holdfast: \S+: .*expected .+/);
      expect(lines.some((l) => l.startsWith(`holdfast: ${path}`))).toBe(true);
      expect(io.err).not.toMatch(stackLine);
    },
  );

  it('reports a misspelt key with the nearest allowed key', async () => {
    const io = memoryIo();
    await runCli(['check', `${dir}/typo-key.yaml`], io);
    expect(io.err).toContain('holdfast: /sources/0/ratingKW: expected one of the keys ratingKw');
  });

  it('prints the stack trace only with --debug', async () => {
    const io = memoryIo();
    expect(await runCli(['check', `${dir}/dangling-bus.yaml`, '--debug'], io)).toBe(2);
    expect(io.err).toMatch(stackLine);
  });
});

describe('generated malformed files', () => {
  const tmp = mkdtempSync(join(tmpdir(), 'holdfast-malformed-'));
  afterAll(() => rmSync(tmp, { recursive: true, force: true }));

  it('refuses a file over the size limit before parsing it', async () => {
    const file = join(tmp, 'huge.yaml');
    // a valid-looking YAML comment block just over the limit
    writeFileSync(file, `# padding\n${'#'.repeat(MAX_CASE_BYTES)}\nname: x\n`);
    const io = memoryIo();
    expect(await runCli(['check', file], io)).toBe(2);
    expect(io.err).toContain(
      `holdfast: ${file}: expected a case file of at most ${MAX_CASE_BYTES} bytes`,
    );
  });

  it('refuses absurd bracket nesting before parsing, and comment-only files quickly', async () => {
    const deep = join(tmp, 'brackets.json');
    writeFileSync(deep, `{"name": ${'['.repeat(100_000)}${']'.repeat(100_000)}}`);
    const io = memoryIo();
    expect(await runCli(['check', deep], io)).toBe(2);
    expect(io.err).toContain('nested brackets');
    // 100k comment lines then a word: a backtracking comment regex would never finish here
    const comments = join(tmp, 'comments.yaml');
    writeFileSync(comments, `${'# c\n'.repeat(100_000)}name: x\n`);
    const io2 = memoryIo();
    expect(await runCli(['check', comments], io2)).toBe(2);
    expect(io2.err).toContain('/system: expected a mapping of keys (required)');
  });

  it('refuses deep block nesting that brackets do not show', async () => {
    const file = join(tmp, 'deep-block.yaml');
    let text = '';
    for (let i = 0; i < 60; i++) text += `${' '.repeat(i)}k${i}:\n`;
    writeFileSync(file, `${text}${' '.repeat(60)}v\n`);
    const io = memoryIo();
    expect(await runCli(['check', file], io)).toBe(2);
    expect(io.err).toContain(`holdfast: ${file}: expected nesting at most`);
  });

  it('names a file that does not exist', async () => {
    const io = memoryIo();
    expect(await runCli(['check', join(tmp, 'absent.yaml')], io)).toBe(2);
    expect(io.err).toContain('expected a readable case file, got no such file');
  });
});

describe('the real process', () => {
  // two subprocess runs through tsx: the shebang entry, process exit code and stderr as a user sees them
  const run = (args: string[]) =>
    spawnSync(process.execPath, ['--import', 'tsx', 'src/cli/main.ts', ...args], {
      encoding: 'utf8',
      timeout: 60_000,
    });

  it('exits 2 with holdfast: lines on stderr for a malformed case', () => {
    const r = run(['check', `${dir}/duplicate-source-ids.yaml`]);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('holdfast: /sources/1/id: expected a source id not used before');
    expect(r.stderr).not.toMatch(stackLine);
  });

  it('exits 0 and prints the summary for the default demo', () => {
    const r = run(['check', 'cases/kestrel-island.yaml']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('Kestrel Island community grid');
  });
});
