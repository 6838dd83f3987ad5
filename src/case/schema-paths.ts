/**
 * Walks the case's JSON Schema alongside raw input: which keys are allowed at a place, what the
 * schema of a child is, and which allowed key is nearest to a mistyped one. Used by overrides
 * (`--set`, unknown paths) and by validation messages (unknown keys). The JSON Schema is derived
 * from the zod schema (json-schema.ts), so both always agree; zod emits it without `$ref`s.
 */
import { caseJsonSchema } from './json-schema.js';

export type JsonSchemaNode = Readonly<Record<string, unknown>>;

let rootCache: JsonSchemaNode | undefined;
export function caseSchemaRoot(): JsonSchemaNode {
  rootCache ??= caseJsonSchema();
  return rootCache;
}

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v);

/** The alternatives of a union node, flattened; the node itself when it is not a union. */
function branches(node: JsonSchemaNode): JsonSchemaNode[] {
  const alternatives = (node.anyOf ?? node.oneOf) as JsonSchemaNode[] | undefined;
  if (!Array.isArray(alternatives)) return [node];
  return alternatives.flatMap(branches);
}

/** The object branches of `node` that fit `raw`: the discriminator (a `const` property) decides. */
function objectBranches(node: JsonSchemaNode, raw: unknown): JsonSchemaNode[] {
  const objects = branches(node).filter((b) => isObject(b.properties));
  if (!isObject(raw) || objects.length <= 1) return objects;
  const matching = objects.filter((b) => {
    const props = b.properties as Record<string, JsonSchemaNode>;
    for (const [key, prop] of Object.entries(props)) {
      if ('const' in prop && key in raw && raw[key] !== prop.const) return false;
    }
    return true;
  });
  return matching.length > 0 ? matching : objects;
}

/** Keys allowed in an object at this place (all union branches that fit `raw`). */
export function allowedKeys(node: JsonSchemaNode | undefined, raw: unknown): string[] {
  if (!node) return [];
  const keys = new Set<string>();
  for (const b of objectBranches(node, raw))
    for (const k of Object.keys(b.properties as object)) keys.add(k);
  return [...keys];
}

/** True when the schema at this place describes a list. */
export function isArraySchema(node: JsonSchemaNode | undefined): boolean {
  return node !== undefined && branches(node).some((b) => b.type === 'array');
}

/** The schema of `raw[key]` (an object property or a list element), undefined if not allowed. */
export function childSchema(
  node: JsonSchemaNode | undefined,
  key: string | number,
  raw: unknown,
): JsonSchemaNode | undefined {
  if (!node) return undefined;
  if (typeof key === 'number') {
    const list = branches(node).find((b) => b.type === 'array');
    return list?.items as JsonSchemaNode | undefined;
  }
  const found = objectBranches(node, raw)
    .map((b) => (b.properties as Record<string, JsonSchemaNode>)[key])
    .filter((p): p is JsonSchemaNode => p !== undefined);
  if (found.length === 0) return undefined;
  if (found.length === 1) return found[0];
  return { anyOf: found };
}

/** The schema at a path of raw input (`['sources', 2, 'droopPu']`). */
export function schemaAt(
  path: readonly (string | number)[],
  raw: unknown,
): JsonSchemaNode | undefined {
  let node: JsonSchemaNode | undefined = caseSchemaRoot();
  let value: unknown = raw;
  for (const key of path) {
    node = childSchema(node, key, value);
    value =
      isObject(value) || Array.isArray(value) ? (value as Record<string, unknown>)[key] : undefined;
    if (!node) return undefined;
  }
  return node;
}

/** Levenshtein edit distance, case-insensitive (typos like `energyKWh`). */
export function editDistance(a: string, b: string): number {
  const s = a.toLowerCase();
  const t = b.toLowerCase();
  let previous = Array.from({ length: t.length + 1 }, (_, j) => j);
  for (let i = 1; i <= s.length; i++) {
    const current = [i];
    for (let j = 1; j <= t.length; j++) {
      const cost = s[i - 1] === t[j - 1] ? 0 : 1;
      current.push(Math.min(current[j - 1]! + 1, previous[j]! + 1, previous[j - 1]! + cost));
    }
    previous = current;
  }
  return previous[t.length]!;
}

/** How far a candidate is from a word: one containing the other counts as a single edit. */
function closeness(word: string, candidate: string): number {
  const w = word.toLowerCase();
  const c = candidate.toLowerCase();
  if (w === c) return 0;
  if (c.includes(w) || w.includes(c)) return 1;
  return editDistance(w, c) + 1;
}

/** The `count` candidates nearest to `word`, nearest first. */
export function nearest(word: string, candidates: readonly string[], count = 3): string[] {
  return [...candidates]
    .map((c) => ({ c, d: closeness(word, c) }))
    .sort((x, y) => x.d - y.d || x.c.localeCompare(y.c))
    .slice(0, count)
    .map((x) => x.c);
}
