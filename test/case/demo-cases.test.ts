// Source: JSON Schema draft 2020-12 (json-schema.org) through ajv, an independent validator.
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Ajv2020 } from 'ajv/dist/2020.js';
import { describe, expect, it } from 'vitest';
import YAML from 'yaml';
import { caseJsonSchema } from '../../src/case/json-schema.js';
import { starterCaseYaml } from '../../src/case/starter.js';
import { memoryIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/program.js';

/** Every .yaml/.json case file under cases/, recursively. */
function caseFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return caseFiles(path);
    return /\.(ya?ml|json)$/.test(name) ? [path] : [];
  });
}

const files = caseFiles('cases');

describe('the cases in cases/', () => {
  it('include the three demo cases', () => {
    expect(files).toEqual(
      expect.arrayContaining([
        'cases/kestrel-island.yaml',
        'cases/ridgeway-hospital.yaml',
        'cases/tern-atoll/tern-atoll.yaml',
      ]),
    );
  });

  it.each(files)('%s passes holdfast check', async (file) => {
    const io = memoryIo();
    const code = await runCli(['check', file], io);
    expect(io.err).toBe('');
    expect(code).toBe(0);
    expect(io.out).toContain('peak load');
    expect(io.out).toContain('Screening figures');
  });

  it.each(files.filter((f) => !f.includes('/reference/')))(
    '%s is labelled invented, in the data and in a comment at the top',
    (file) => {
      const text = readFileSync(file, 'utf8');
      expect(text.split('\n')[0]).toMatch(/INVENTED/);
      expect((YAML.parse(text) as { invented?: unknown }).invented).toBe(true);
    },
  );
});

describe('JSON case files', () => {
  it('check the same as their YAML source, by extension and by content', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-json-'));
    try {
      const raw = YAML.parse(readFileSync('cases/kestrel-island.yaml', 'utf8')) as unknown;
      writeFileSync(join(dir, 'kestrel.json'), JSON.stringify(raw, null, 2));
      writeFileSync(join(dir, 'kestrel.case'), JSON.stringify(raw));
      const yamlIo = memoryIo();
      await runCli(['check', 'cases/kestrel-island.yaml'], yamlIo);
      for (const name of ['kestrel.json', 'kestrel.case']) {
        const io = memoryIo(dir);
        expect(await runCli(['check', name], io)).toBe(0);
        // same summary apart from the file name in the first line
        expect(io.out.split('\n').slice(1)).toEqual(yamlIo.out.split('\n').slice(1));
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('the JSON Schema checked by a second, independent validator (ajv, draft 2020-12)', () => {
  // ajv implements JSON Schema draft 2020-12 on its own (https://json-schema.org/draft/2020-12);
  // zod only generated the schema, so agreement is a real cross-check of both.
  const ajv = new Ajv2020({ allErrors: true, strict: false });
  const validate = ajv.compile(caseJsonSchema());

  it.each(files)('%s validates against holdfast schema', (file) => {
    const raw = YAML.parse(readFileSync(file, 'utf8')) as unknown;
    const ok = validate(raw);
    expect(validate.errors ?? []).toEqual([]);
    expect(ok).toBe(true);
  });

  it('accepts the starter case of holdfast init', () => {
    expect(validate(YAML.parse(starterCaseYaml()))).toBe(true);
  });

  it('rejects what the zod schema rejects: a misspelt key and a wrong kind', () => {
    const raw = YAML.parse(readFileSync('cases/kestrel-island.yaml', 'utf8')) as {
      sources: Record<string, unknown>[];
      system: Record<string, unknown>;
    };
    raw.system.frequencyHz = 55;
    expect(validate(raw)).toBe(false);
    raw.system.frequencyHz = 60;
    raw.sources[0]!.ratingKW = 3;
    expect(validate(raw)).toBe(false);
  });
});
