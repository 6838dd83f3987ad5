/**
 * Validation of a raw case at the boundary: the zod schema first (types, ranges, unknown keys),
 * each issue mapped to a `CaseProblem` with a JSON-pointer-like path (`/sources/2/droopPu`) and a
 * message "expected ..., got ..."; then, once the shapes are right, the cross-field rules of
 * rules.ts. Every problem of a phase is reported at once; `validateCase` throws one CaseError.
 */
import type { z } from 'zod';
import { CaseError, type CaseProblem, describeFound } from '../errors.js';
import { crossFieldProblems } from './rules.js';
import { type Case, caseSchema } from './schema.js';
import { allowedKeys, nearest, schemaAt } from './schema-paths.js';

type Issue = z.core.$ZodIssue;
type Key = string | number;

const isContainer = (v: unknown): v is Record<Key, unknown> => typeof v === 'object' && v !== null;

function valueAt(raw: unknown, path: readonly PropertyKey[]): unknown {
  let v = raw;
  for (const k of path) {
    if (!isContainer(v)) return undefined;
    v = (v as Record<PropertyKey, unknown>)[k];
  }
  return v;
}

/** `['sources', 2, 'droopPu']` -> `/sources/2/droopPu` (RFC 6901 escapes). */
export function toPointer(path: readonly PropertyKey[]): string {
  return path.map((k) => `/${String(k).replace(/~/g, '~0').replace(/\//g, '~1')}`).join('');
}

const typeWords: Record<string, string> = {
  string: 'text',
  number: 'a number',
  int: 'a whole number',
  boolean: 'true or false',
  object: 'a mapping of keys',
  array: 'a list',
};

function bound(issue: Issue & { code: 'too_small' | 'too_big' }): string {
  const limit = issue.code === 'too_small' ? issue.minimum : issue.maximum;
  const small = issue.code === 'too_small';
  const sign = small ? (issue.inclusive ? '>=' : '>') : issue.inclusive ? '<=' : '<';
  switch (issue.origin) {
    case 'array':
    case 'set':
      if (issue.exact) return `exactly ${limit} items`;
      return `${small ? 'at least' : 'at most'} ${limit} items`;
    case 'string':
      return Number(limit) === 1 && small
        ? 'non-empty text'
        : `text of ${sign} ${limit} characters`;
    default:
      if (small && Number(limit) === 0 && !issue.inclusive) return 'a positive number (> 0)';
      if (small && Number(limit) === 0 && issue.inclusive) return 'a number >= 0';
      return `a number ${sign} ${limit}`;
  }
}

function issueProblems(issue: Issue, raw: unknown): CaseProblem[] {
  const path = issue.path as Key[];
  const found = valueAt(raw, path);
  const got = `got ${describeFound(found)}`;
  const at = toPointer(path);
  switch (issue.code) {
    case 'invalid_type': {
      const expected = typeWords[issue.expected] ?? issue.expected;
      if (found === undefined)
        return [{ path: at, message: `expected ${expected} (required), got nothing` }];
      return [{ path: at, message: `expected ${expected}, ${got}` }];
    }
    case 'too_small':
    case 'too_big':
      return [{ path: at, message: `expected ${bound(issue)}, ${got}` }];
    case 'invalid_format':
      // the schema's own message says what an id looks like
      return [
        { path: at, message: `expected ${issue.message.replace(/^Invalid.*?: /, '')}, ${got}` },
      ];
    case 'invalid_value':
      return [
        {
          path: at,
          message: `expected one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}, ${got}`,
        },
      ];
    case 'unrecognized_keys': {
      const allowed = allowedKeys(schemaAt(path, raw), found);
      return issue.keys.map((key) => ({
        path: toPointer([...path, key]),
        message: `expected one of the keys ${nearest(key, allowed, 3).join(', ')} (or another of ${allowed.length} allowed), got unknown key ${JSON.stringify(key)}`,
      }));
    }
    case 'invalid_union': {
      const u = issue as Issue & { discriminator?: string; options?: unknown[] };
      if (u.discriminator && Array.isArray(u.options)) {
        // zod puts the discriminator in the path already when the key is present
        const onKey = path[path.length - 1] === u.discriminator;
        const keyPath = onKey ? path : [...path, u.discriminator];
        const value = valueAt(raw, keyPath);
        return [
          {
            path: toPointer(keyPath),
            message: `expected ${u.discriminator} to be one of ${u.options.map((o) => JSON.stringify(o)).join(', ')}, got ${describeFound(value)}`,
          },
        ];
      }
      const alternatives = issue.errors.flatMap((branch) =>
        branch
          .filter((b) => b.code === 'invalid_value')
          .flatMap((b) => (b as Issue & { values: unknown[] }).values),
      );
      if (alternatives.length > 0)
        return [
          {
            path: at,
            message: `expected one of ${alternatives.map((v) => JSON.stringify(v)).join(', ')}, ${got}`,
          },
        ];
      // a plain union: report the branch that came closest (fewest issues)
      const best = [...issue.errors].sort((a, b) => a.length - b.length)[0] ?? [];
      const inner = best.flatMap((b) =>
        issueProblems({ ...b, path: [...path, ...b.path] } as Issue, raw),
      );
      return inner.length > 0
        ? inner
        : [{ path: at, message: `expected one of the allowed forms, ${got}` }];
    }
    default:
      return [{ path: at, message: `expected ${issue.message}, ${got}` }];
  }
}

/** Schema problems of raw input (empty when it parses). */
export function schemaProblems(raw: unknown): { problems: CaseProblem[]; parsed?: Case } {
  const result = caseSchema.safeParse(raw);
  if (result.success) return { problems: [], parsed: result.data };
  return { problems: result.error.issues.flatMap((i) => issueProblems(i, raw)) };
}

/** Every problem of a raw case: schema problems, or (when the shapes are right) rule problems. */
export function caseProblems(raw: unknown): CaseProblem[] {
  const { problems, parsed } = schemaProblems(raw);
  if (!parsed) return problems;
  return crossFieldProblems(parsed);
}

/** Validates raw input into a `Case` with defaults filled in; throws CaseError with every problem. */
export function validateCase(raw: unknown): Case {
  const { problems, parsed } = schemaProblems(raw);
  if (!parsed) throw new CaseError(problems);
  const rules = crossFieldProblems(parsed);
  if (rules.length > 0) throw new CaseError(rules);
  return parsed;
}
