/**
 * `--set PATH=VALUE` overrides, applied to the raw case input before validation so the result
 * is validated as a whole (an override can never smuggle in an invalid value).
 *
 * PATH is dotted with optional brackets: `sources.bess.energyKwh`, `loads[0].peakKw`,
 * `protection.ufls.1.thresholdHz`, `sources[g1.a].ratingKw` (brackets for ids containing dots);
 * a JSON pointer (`/sources/2/droopPu`) works too. A list element is addressed by its `id` or by
 * its 0-based index; index = length appends. VALUE is read as YAML (`2000`, `true`, `grid-forming`,
 * `[0.1, 0.2]`, `{kind: fixed, value: 4}`). An unknown key is a CaseError naming the nearest
 * allowed paths.
 */
import YAML from 'yaml';
import { CaseError, type CaseProblem, describeFound } from '../errors.js';
import {
  allowedKeys,
  caseSchemaRoot,
  childSchema,
  isArraySchema,
  type JsonSchemaNode,
  nearest,
} from './schema-paths.js';

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v);

/** Splits an override path into segments; undefined when malformed. */
export function splitOverridePath(text: string): string[] | undefined {
  if (text.startsWith('/')) {
    const parts = text
      .slice(1)
      .split('/')
      .map((p) => p.replace(/~1/g, '/').replace(/~0/g, '~'));
    return parts.every((p) => p.length > 0) ? parts : undefined;
  }
  const segments: string[] = [];
  const re = /([^.[\]]+)|\[([^\]]+)\]/gy;
  let expectDot = false;
  let at = 0;
  while (at < text.length) {
    if (expectDot) {
      if (text[at] === '.') at += 1;
      else if (text[at] !== '[') return undefined;
    }
    re.lastIndex = at;
    const m = re.exec(text);
    if (!m) return undefined;
    segments.push((m[1] ?? m[2] ?? '').trim());
    at = re.lastIndex;
    expectDot = true;
  }
  return segments.length > 0 && segments.every((s) => s.length > 0) ? segments : undefined;
}

/** Reads an override value as YAML (numbers, booleans, words, flow lists and maps). */
function parseValue(text: string): { value: unknown } | { error: string } {
  if (text.trim() === '') return { error: 'expected a value after "=", got nothing' };
  try {
    const doc = YAML.parseDocument(text, { schema: 'core', uniqueKeys: true });
    if (doc.errors.length > 0)
      return {
        error: `expected a YAML value, got ${describeFound(text)} (${doc.errors[0]?.message.split('\n')[0]})`,
      };
    return { value: doc.toJS({ maxAliasCount: 0 }) };
  } catch (err) {
    return {
      error: `expected a YAML value, got ${describeFound(text)} (${(err as Error).message})`,
    };
  }
}

function elementIndex(list: unknown[], segment: string): number {
  const byId = list.findIndex((e) => isObject(e) && e.id === segment);
  if (byId >= 0) return byId;
  return /^\d+$/.test(segment) ? Number(segment) : -1;
}

function listIds(list: unknown[]): string {
  const ids = list
    .filter(isObject)
    .map((e) => e.id)
    .filter((v) => typeof v === 'string');
  const range = list.length > 0 ? `an index 0-${list.length - 1}` : 'no elements yet';
  return ids.length > 0 ? `one of the ids ${ids.join(', ')} or ${range}` : range;
}

function applyOne(root: Record<string, unknown>, override: string): CaseProblem | undefined {
  const eq = override.indexOf('=');
  const pathText = eq > 0 ? override.slice(0, eq).trim() : '';
  const where = `--set ${pathText || override}`;
  if (eq <= 0)
    return { path: where, message: `expected PATH=VALUE, got ${describeFound(override)}` };
  const segments = splitOverridePath(pathText);
  if (!segments)
    return {
      path: where,
      message: 'expected a path like sources.bess.energyKwh or loads[0].peakKw',
    };
  const parsed = parseValue(override.slice(eq + 1));
  if ('error' in parsed) return { path: where, message: parsed.error };

  let container: Record<string, unknown> | unknown[] = root;
  let schema: JsonSchemaNode | undefined = caseSchemaRoot();
  const walked: string[] = [];
  for (let i = 0; i < segments.length; i++) {
    const segment = segments[i]!;
    const last = i === segments.length - 1;
    const here = walked.length > 0 ? walked.join('.') : 'the top level';
    if (Array.isArray(container)) {
      let index = elementIndex(container, segment);
      if (last && index === -1 && /^\d+$/.test(segment)) index = Number(segment);
      if (index < 0 || index > container.length || (!last && index === container.length))
        return {
          path: where,
          message: `expected ${listIds(container)} in ${here}, got ${describeFound(segment)}`,
        };
      schema = childSchema(schema, index, container);
      if (last) {
        container[index] = parsed.value;
        return undefined;
      }
      const next: unknown = container[index];
      if (!isObject(next) && !Array.isArray(next))
        return {
          path: where,
          message: `expected ${here}[${index}] to be an object, got ${describeFound(next)}`,
        };
      container = next;
    } else {
      const allowed = allowedKeys(schema, container);
      if (!allowed.includes(segment)) {
        const prefix = walked.length > 0 ? `${walked.join('.')}.` : '';
        const near = nearest(segment, allowed).map((k) => prefix + k);
        return {
          path: where,
          message: `expected a key of ${here}, got ${describeFound(segment)}; nearest: ${near.join(', ')}`,
        };
      }
      const childNode = childSchema(schema, segment, container);
      if (last) {
        container[segment] = parsed.value;
        return undefined;
      }
      let next = container[segment];
      if (next === undefined) {
        next = isArraySchema(childNode) ? [] : {};
        container[segment] = next;
      }
      if (!isObject(next) && !Array.isArray(next))
        return {
          path: where,
          message: `expected ${[...walked, segment].join('.')} to be an object or a list, got ${describeFound(next)}`,
        };
      schema = childNode;
      container = next as Record<string, unknown> | unknown[];
    }
    walked.push(segment);
  }
  return undefined;
}

/**
 * Returns a copy of `raw` with every override applied (the input is not changed). Throws one
 * CaseError listing every bad override.
 */
export function applyOverrides(raw: unknown, overrides: readonly string[]): unknown {
  if (overrides.length === 0) return raw;
  if (!isObject(raw))
    throw CaseError.single(
      '',
      `expected the case file to hold a mapping of sections, got ${describeFound(raw)}`,
    );
  const copy = structuredClone(raw);
  const problems: CaseProblem[] = [];
  for (const o of overrides) {
    const problem = applyOne(copy, o);
    if (problem) problems.push(problem);
  }
  if (problems.length > 0) throw new CaseError(problems);
  return copy;
}
