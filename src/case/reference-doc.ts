/**
 * Generates the case file reference (docs/case-file.md) from the JSON Schema, so the reference
 * always lists exactly the keys, units, defaults and descriptions the validator uses. Printed by
 * `holdfast schema --markdown`; a test fails when the committed docs/case-file.md is stale.
 */
import { caseJsonSchema } from './json-schema.js';

type Node = Readonly<Record<string, unknown>>;

/** Unit suffixes of key names, longest first (STYLE.md: the unit is in the name). */
const unitSuffixes: readonly [string, string][] = [
  ['PuPerHzPerS', 'pu per Hz/s'],
  ['PuPerHz', 'pu per Hz'],
  ['PuPerS', 'pu/s'],
  ['KwPerS', 'kW/s'],
  ['RadPerS', 'rad/s'],
  ['HzPerS', 'Hz/s'],
  ['MPerS', 'm/s'],
  ['LPerH', 'L/h (m³/h for gas)'],
  ['PerYear', '1/year'],
  ['PerHour', '1/h'],
  ['PerC', '1/°C'],
  ['Kwh', 'kWh'],
  ['Kva', 'kVA'],
  ['Kvar', 'kvar'],
  ['KvarMax', 'kvar'],
  ['Kw', 'kW'],
  ['Kv', 'kV'],
  ['Hz', 'Hz'],
  ['Ohm', 'Ω'],
  ['Pu', 'pu'],
  ['Fraction', 'fraction 0-1'],
  ['Deg', 'degrees'],
  ['Hours', 'h'],
  ['Hour', 'hour of year'],
  ['L', 'L (m³ for gas)'],
  ['S', 's'],
  ['H', 'h'],
  ['M', 'm'],
  ['A', 'A'],
];

export function unitOfKey(key: string): string {
  for (const [suffix, unit] of unitSuffixes) {
    if (key.endsWith(suffix) && key.length > suffix.length) {
      const before = key[key.length - suffix.length - 1] ?? '';
      // the suffix must start a new word: energyKwh yes, class no
      if (/[a-z0-9]/.test(before)) return unit;
    }
  }
  return '';
}

const alternativesOf = (n: Node): Node[] | undefined => (n.oneOf ?? n.anyOf) as Node[] | undefined;

function discriminated(n: Node): { key: string; values: string[] } | undefined {
  const alts = alternativesOf(n);
  if (!alts?.every((a) => a.properties)) return undefined;
  const first = alts[0]?.properties as Record<string, Node> | undefined;
  if (!first) return undefined;
  const key = Object.keys(first).find((k) => 'const' in (first[k] ?? {}));
  if (!key) return undefined;
  return {
    key,
    values: alts.map((a) => String((a.properties as Record<string, Node>)[key]?.const)),
  };
}

function typeText(n: Node): string {
  if ('const' in n) return `\`${JSON.stringify(n.const)}\``;
  if (Array.isArray(n.enum)) return n.enum.map((v) => `\`${v}\``).join(' | ');
  const d = discriminated(n);
  if (d) return `one of ${d.key}: ${d.values.map((v) => `\`${v}\``).join(', ')}`;
  const alts = alternativesOf(n);
  if (alts) return alts.map(typeText).join(' or ');
  const range: string[] = [];
  if (n.minimum !== undefined) range.push(`>= ${n.minimum}`);
  if (n.exclusiveMinimum !== undefined) range.push(`> ${n.exclusiveMinimum}`);
  if (n.maximum !== undefined && Math.abs(Number(n.maximum)) < 1e15) range.push(`<= ${n.maximum}`);
  if (n.exclusiveMaximum !== undefined) range.push(`< ${n.exclusiveMaximum}`);
  if (n.type === 'array') {
    const items = (n.items ?? {}) as Node;
    const count =
      n.minItems !== undefined && n.minItems === n.maxItems
        ? `${n.minItems} `
        : n.minItems
          ? `>= ${n.minItems} `
          : '';
    return `list of ${count}${items.properties ? 'entries' : typeText(items)}`;
  }
  if (n.type === 'string' && n.pattern) return 'id';
  const base = n.type === 'integer' ? 'integer' : String(n.type ?? 'value');
  return range.length > 0 ? `${base} ${range.join(', ')}` : base;
}

function defaultText(n: Node, required: boolean): string {
  if ('default' in n) {
    const v = n.default;
    if (typeof v === 'object' && v !== null)
      return Array.isArray(v) && v.length === 0 ? '`[]`' : 'see below';
    return `\`${JSON.stringify(v)}\``;
  }
  return required ? '**required**' : 'optional';
}

const cell = (s: string) => s.replace(/\|/g, '\\|').replace(/\n/g, ' ');

function table(node: Node, prefix: string, out: string[], nested: [string, Node][]): void {
  const props = (node.properties ?? {}) as Record<string, Node>;
  const required = new Set((node.required as string[] | undefined) ?? []);
  for (const [key, p] of Object.entries(props)) {
    const name = `${prefix}${key}`;
    const desc = typeof p.description === 'string' ? p.description : '';
    out.push(
      `| \`${name}\` | ${cell(typeText(p))} | ${unitOfKey(key)} | ${defaultText(p, required.has(key))} | ${cell(desc)} |`,
    );
    if (p.type === 'object' && p.properties) nested.push([name, p]);
    const items = p.items as Node | undefined;
    if (p.type === 'array' && items?.properties) nested.push([`${name}[]`, items]);
    if (
      alternativesOf(p) &&
      discriminated(p) &&
      !key.toLowerCase().includes('duration') &&
      !key.startsWith('dip') &&
      key !== 'socAtEvent'
    )
      nested.push([name, p]);
  }
}

function section(title: string, node: Node, level: number, out: string[]): void {
  const d = discriminated(node);
  if (d) {
    for (const alt of alternativesOf(node) ?? []) {
      const value = String((alt.properties as Record<string, Node>)[d.key]?.const);
      section(`${title} (${d.key}: ${value})`, alt, level, out);
    }
    return;
  }
  out.push(`${'#'.repeat(level)} \`${title}\``, '');
  if (typeof node.description === 'string') out.push(node.description, '');
  out.push('| key | type | unit | default | description |', '| --- | --- | --- | --- | --- |');
  const nested: [string, Node][] = [];
  table(node, '', out, nested);
  out.push('');
  for (const [name, child] of nested)
    section(`${title}.${name}`, child, Math.min(level + 1, 4), out);
}

export function caseReferenceMarkdown(): string {
  const schema = caseJsonSchema();
  const out: string[] = [
    '# The holdfast case file',
    '',
    '<!-- Generated from src/case/schema.ts; do not edit by hand. Regenerate after a schema change:',
    '     npx tsx src/cli/main.ts schema --markdown > docs/case-file.md -->',
    '',
    'A case file describes one microgrid: its system base, sources, loads, network, protection,',
    'the separation events it faces and the Monte Carlo settings. It is YAML (JSON is accepted',
    'too); `holdfast init` writes a commented starter, `holdfast check CASE` validates one and',
    'prints a summary, `holdfast schema` prints the JSON Schema for editors. Every dimensional key',
    'carries its unit in its name (`ratingKw`, `inertiaS`, `droopPu`, `delayS`); the unit column',
    'below spells it out. Unknown keys are errors (they are usually typos). Defaults name their',
    'source in the description; "from memory" marks a value recalled but not confirmed against',
    'the source (see ../shared/REFERENCES.md for provenance).',
    '',
    'Besides the per-key rules below, a case must satisfy cross-field rules (src/case/rules.ts):',
    'ids unique among sources, loads, buses and branches; every referenced bus exists, the pcc',
    'bus too; every bus reachable from the pcc over closed branches; each branch has its',
    'impedance in ohms (`rOhm`, `xOhm`) or in pu (`rPu`, `xPu`), not both and not neither, and not',
    'zero; battery `socMinFraction < socReserveFraction <= socMaxFraction`; UFLS thresholds',
    'strictly descending, below nominal and above the shutdown limit, shares summing to at most',
    '1; at least one grid-forming source (a genset, or a battery with `control: grid-forming`),',
    'and a grid-forming battery when every genset is on standby (the island would start with no',
    'inertia); wind `cutInMPerS < ratedMPerS < cutOutMPerS`; distribution parameters sane',
    '(uniform `min <= max`, one empirical weight per value, state of charge within 0-1, outage',
    'durations non-negative); genset fuel `fuelFullLoadLPerH > fuelNoLoadLPerH`, and a full-load',
    'figure whenever a tank is given; trip and limit frequencies on the right side of nominal;',
    '`ratingKva >= ratingKw`. CSV profiles must exist next to the case and hold 8760 rows.',
    '',
    '`--set PATH=VALUE` overrides any key on the command line before validation, e.g.',
    '`--set sources.bess.energyKwh=2000` (a list element by its `id` or index), `--set',
    'loads[0].peakKw=300`, `--set /protection/ufls/1/thresholdHz=58.8`; VALUE is read as YAML.',
    '',
    'Demo cases (invented): `cases/kestrel-island.yaml`, `cases/ridgeway-hospital.yaml`,',
    '`cases/tern-atoll/tern-atoll.yaml` (CSV profiles).',
    '',
    '## Distributions',
    '',
    'Keys holding a distribution (`events.outageDurationH`, `events.dipRetainedPu`,',
    '`events.dipDurationS`, battery `socAtEvent`) take one of these; the unit is that of the key.',
    '',
    '| kind | parameters |',
    '| --- | --- |',
  ];
  const events = (schema.properties as Record<string, Node>).events;
  const dist = ((events?.properties as Record<string, Node> | undefined)?.outageDurationH ??
    {}) as Node;
  for (const alt of alternativesOf(dist) ?? []) {
    const props = alt.properties as Record<string, Node>;
    const kind = String(props.kind?.const);
    const params = Object.entries(props)
      .filter(([k]) => k !== 'kind')
      .map(
        ([k, p]) =>
          `\`${k}\` (${typeText(p)}${typeof p.description === 'string' ? `: ${p.description}` : ''}${'default' in p ? `, default ${JSON.stringify(p.default)}` : ''})`,
      )
      .join('; ');
    out.push(`| \`${kind}\` | ${cell(params)} |`);
  }
  out.push('', '## Sections', '');
  const top = schema.properties as Record<string, Node>;
  out.push('| key | type | unit | default | description |', '| --- | --- | --- | --- | --- |');
  const nestedTop: [string, Node][] = [];
  table(schema, '', out, nestedTop);
  out.push('');
  for (const key of Object.keys(top)) {
    const p = top[key]!;
    if (p.type === 'object' && p.properties) section(key, p, 3, out);
    const items = p.items as Node | undefined;
    if (p.type === 'array' && items) {
      if (items.properties || discriminated(items)) section(`${key}[]`, items, 3, out);
    }
  }
  out.push(
    '## Cautions',
    '',
    'holdfast gives screening estimates from reduced-order models. Protection settings,',
    'interconnection and safety decisions belong to licensed engineers under local codes and the',
    "utility's interconnection rules (e.g. IEEE 1547-2018 where it applies).",
    '',
  );
  return out.join('\n');
}
