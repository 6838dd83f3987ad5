/**
 * The JSON Schema of the case file as written (defaults optional), generated from the zod schema
 * so the two never disagree. zod 4 emits draft 2020-12.
 */
import { z } from 'zod';
import { caseSchema } from './schema.js';

export function caseJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(caseSchema, { io: 'input', target: 'draft-2020-12' }) as Record<
    string,
    unknown
  >;
  return {
    ...schema,
    $id: 'https://holdfast.invalid/case.schema.json',
    title: 'holdfast case file',
    description:
      'One microgrid, its protection, its events and the Monte Carlo settings. Every dimensional ' +
      'key carries its unit in its name.',
  };
}
