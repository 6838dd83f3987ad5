// Source: none needed: the starter case validates (internal behaviour).
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { memoryIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/program.js';

describe('holdfast init', () => {
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-init-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('writes a commented starter case that passes holdfast check', async () => {
    const io = memoryIo(dir);
    expect(await runCli(['init'], io)).toBe(0);
    const text = readFileSync(join(dir, 'case.yaml'), 'utf8');
    expect(text.split('\n')[0]).toMatch(/^# .*INVENTED/);
    expect(text.match(/^\s*#/gm)?.length).toBeGreaterThan(10);
    const check = memoryIo(dir);
    expect(await runCli(['check', 'case.yaml'], check)).toBe(0);
    expect(readdirSync(dir)).toEqual(['case.yaml']); // no temporary file left behind
  });

  it('refuses to overwrite an existing file without --force', async () => {
    const file = join(dir, 'mine.yaml');
    writeFileSync(file, 'name: keep me\n');
    const io = memoryIo(dir);
    expect(await runCli(['init', 'mine.yaml'], io)).toBe(2);
    expect(io.err).toContain(
      'holdfast: mine.yaml: expected a new file, got an existing one; add --force',
    );
    expect(readFileSync(file, 'utf8')).toBe('name: keep me\n');
    expect(await runCli(['init', 'mine.yaml', '--force'], memoryIo(dir))).toBe(0);
    expect(readFileSync(file, 'utf8')).toContain('Starter island');
  });

  it('exits 2 when the folder does not exist', async () => {
    const io = memoryIo(dir);
    expect(await runCli(['init', 'no/such/folder/case.yaml'], io)).toBe(2);
    expect(io.err).toMatch(/^holdfast: no\/such\/folder\/case\.yaml: expected a writable place/);
    expect(existsSync(join(dir, 'no'))).toBe(false);
  });
});
