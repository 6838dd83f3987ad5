// Source: JSON Schema draft 2020-12 (json-schema.org) for the printed schema.
import { Ajv2020 } from 'ajv/dist/2020.js';
import { describe, expect, it } from 'vitest';
import { memoryIo } from '../../src/cli/io.js';
import { buildProgram, runCli } from '../../src/cli/program.js';

describe('holdfast schema', () => {
  it('prints a draft 2020-12 JSON Schema that ajv compiles, with descriptions', async () => {
    const io = memoryIo();
    expect(await runCli(['schema'], io)).toBe(0);
    const schema = JSON.parse(io.out) as Record<string, unknown>;
    expect(schema.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    // ajv in strict mode on the meta-schema: the document itself must be a valid schema
    const ajv = new Ajv2020({ strict: false });
    expect(ajv.validateSchema(schema)).toBe(true);
    expect(io.out).toContain('inertia constant H');
    expect(io.out.match(/"description"/g)?.length).toBeGreaterThan(50);
  });

  it('has --help for every registered command', async () => {
    const names = buildProgram(memoryIo(), 'parse-only', {
      exitCode: undefined,
      parsed: undefined,
    }).commands.map((c) => c.name());
    expect(names).toEqual(expect.arrayContaining(['check', 'schema', 'init']));
    for (const command of names) {
      const io = memoryIo();
      expect(await runCli([command, '--help'], io)).toBe(0);
      expect(io.out).toContain(`Usage: holdfast ${command}`);
    }
  });
});
