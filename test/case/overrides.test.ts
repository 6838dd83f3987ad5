// Source: none needed: --set override paths (internal behaviour).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import YAML from 'yaml';
import { loadCase } from '../../src/case/load.js';
import { applyOverrides, splitOverridePath } from '../../src/case/overrides.js';
import { memoryIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/program.js';
import { CaseError } from '../../src/errors.js';

const demo = 'cases/kestrel-island.yaml';
const raw = () => YAML.parse(readFileSync(demo, 'utf8')) as Record<string, unknown>;
type Raw = {
  sources: Record<string, unknown>[];
  loads: Record<string, unknown>[];
  protection: { ufls: Record<string, unknown>[] };
  monteCarlo: Record<string, unknown>;
  events: Record<string, unknown>;
  network: Record<string, unknown>;
};

function problemsOf(fn: () => unknown): { path: string; message: string }[] {
  try {
    fn();
  } catch (err) {
    if (err instanceof CaseError) return [...err.problems];
    throw err;
  }
  return [];
}

describe('splitOverridePath', () => {
  it('reads dotted, bracketed and JSON-pointer paths', () => {
    expect(splitOverridePath('sources.bess.energyKwh')).toEqual(['sources', 'bess', 'energyKwh']);
    expect(splitOverridePath('loads[0].peakKw')).toEqual(['loads', '0', 'peakKw']);
    expect(splitOverridePath('sources[g1.a].ratingKw')).toEqual(['sources', 'g1.a', 'ratingKw']);
    expect(splitOverridePath('/sources/2/droopPu')).toEqual(['sources', '2', 'droopPu']);
    expect(splitOverridePath('sources..x')).toBeUndefined();
    expect(splitOverridePath('')).toBeUndefined();
  });
});

describe('applyOverrides', () => {
  it('sets a field of a list element addressed by its id, and by its index', () => {
    const out = applyOverrides(raw(), ['sources.bess.energyKwh=2000', 'loads.1.peakKw=250']) as Raw;
    expect(out.sources[3]!.energyKwh).toBe(2000);
    expect(out.loads[1]!.peakKw).toBe(250);
  });

  it('reads values as YAML: numbers, booleans, words, lists and mappings', () => {
    const out = applyOverrides(raw(), [
      'sources.bess.control=grid-following',
      'network.branches.0.closed=false',
      'events.monthlyRateWeights=[1,1,1,1,1,1,1,1,1,1,1,1]',
      'events.outageDurationH={kind: fixed, value: 8}',
      'monteCarlo.seed=storm',
    ]) as Raw;
    expect(out.sources[3]!.control).toBe('grid-following');
    expect((out.network.branches as Record<string, unknown>[])[0]!.closed).toBe(false);
    expect(out.events.monthlyRateWeights).toHaveLength(12);
    expect(out.events.outageDurationH).toEqual({ kind: 'fixed', value: 8 });
    expect(out.monteCarlo.seed).toBe('storm');
  });

  it('creates a section the file left to its defaults', () => {
    const input = raw();
    delete input.monteCarlo;
    const out = applyOverrides(input, ['monteCarlo.scenarios=500']) as Raw;
    expect(out.monteCarlo).toEqual({ scenarios: 500 });
  });

  it('appends a list element at index = length', () => {
    const out = applyOverrides(raw(), [
      'protection.ufls.4={thresholdHz: 58.1, shareOfLoad: 0.1}',
    ]) as Raw;
    expect(out.protection.ufls).toHaveLength(5);
  });

  it('leaves its input unchanged', () => {
    const input = raw();
    const before = JSON.stringify(input);
    applyOverrides(input, ['sources.bess.energyKwh=1']);
    expect(JSON.stringify(input)).toBe(before);
  });

  it('names the nearest allowed paths for an unknown key', () => {
    const [p] = problemsOf(() => applyOverrides(raw(), ['sources.bess.energyKWh=1']));
    expect(p?.path).toBe('--set sources.bess.energyKWh');
    expect(p?.message).toContain('nearest: sources.bess.energyKwh');
  });

  it('knows the keys of the kind of source addressed (a battery has no inertiaS)', () => {
    const [p] = problemsOf(() => applyOverrides(raw(), ['sources.bess.inertiaS=1']));
    expect(p?.message).toMatch(/nearest: sources\.bess\.virtualInertiaS/);
    expect(problemsOf(() => applyOverrides(raw(), ['sources.diesel-1.inertiaS=1']))).toEqual([]);
  });

  it('lists the ids when a list element is not found, and reports every bad override', () => {
    const problems = problemsOf(() =>
      applyOverrides(raw(), ['sources.bes.ratingKw=1', 'loads.99.peakKw=1', 'nope=1', 'x']),
    );
    expect(problems).toHaveLength(4);
    expect(problems[0]?.message).toContain('diesel-1, diesel-2, diesel-3, bess');
    expect(problems[1]?.message).toContain('an index 0-5');
    expect(problems[2]?.message).toContain('nearest:');
    expect(problems[3]?.message).toContain('PATH=VALUE');
  });

  it('rejects an empty value', () => {
    const [p] = problemsOf(() => applyOverrides(raw(), ['sources.bess.energyKwh=']));
    expect(p?.message).toContain('expected a value after "="');
  });
});

describe('overrides through loadCase and the CLI', () => {
  it('validates the overridden case as a whole', async () => {
    const loaded = await loadCase(demo, ['sources.bess.energyKwh=2000']);
    const bess = loaded.case.sources.find((s) => s.id === 'bess');
    expect(bess?.kind === 'battery' && bess.energyKwh).toBe(2000);
    await expect(loadCase(demo, ['sources.bess.energyKwh=-5'])).rejects.toThrow(
      /\/sources\/3\/energyKwh: expected a positive number/,
    );
  });

  it('keeps the SHA-256 of the file bytes, whatever the overrides', async () => {
    const a = await loadCase(demo);
    const b = await loadCase(demo, ['monteCarlo.scenarios=10']);
    expect(a.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(b.sha256).toBe(a.sha256);
  });

  it('holdfast check --set applies overrides and reports a bad one with exit 2', async () => {
    const ok = memoryIo();
    expect(await runCli(['check', demo, '--set', 'events.islandingRatePerYear=6'], ok)).toBe(0);
    expect(ok.out).toContain('6 islanding events per year');
    const bad = memoryIo();
    expect(await runCli(['check', demo, '--set', 'events.islandingRatePerYer=6'], bad)).toBe(2);
    expect(bad.err).toMatch(
      /^holdfast: --set events\.islandingRatePerYer: expected a key of events/,
    );
  });
});
