// Source: none needed: option parsing (internal behaviour; exit codes of CONTRACT.md).
import { describe, expect, it } from 'vitest';
import { optionTable, parseOptions } from '../../src/cli/options.js';
import { CaseError } from '../../src/errors.js';

describe('option table', () => {
  it('puts a unit or a value shape in every placeholder', () => {
    for (const spec of Object.values(optionTable)) {
      const placeholder = /<([^>]+(?:>[^>]+)?)>/.exec(spec.flags);
      if (spec.kind === 'flag') expect(placeholder).toBeNull();
      else expect(placeholder?.[1]?.length).toBeGreaterThan(0);
    }
  });
});

describe('parseOptions', () => {
  it('converts commander strings into typed values', () => {
    const o = parseOptions({
      scenarios: '5000',
      seed: '42',
      workers: '2',
      out: 'results/x',
      set: ['sources.bess.energyKwh=2000', 'events.islandingRatePerYear=4'],
      shard: '2/8',
      json: true,
      untilRelError: '0.1',
      failIf: ['p_shutdown>0.01', 'failures_per_year>0.5'],
      horizon: '30',
      hour: '8759',
      scenario: '0',
    });
    expect(o.scenarios).toBe(5000);
    expect(o.seed).toBe(42);
    expect(o.workers).toBe(2);
    expect(o.out).toBe('results/x');
    expect(o.set).toEqual(['sources.bess.energyKwh=2000', 'events.islandingRatePerYear=4']);
    expect(o.shard).toEqual({ index: 2, count: 8 });
    expect(o.json).toBe(true);
    expect(o.quiet).toBe(false);
    expect(o.untilRelError).toBe(0.1);
    expect(o.failIf).toEqual([
      { metric: 'p_shutdown', threshold: 0.01, direction: '>' },
      { metric: 'failures_per_year', threshold: 0.5, direction: '>' },
    ]);
    expect(o.horizonS).toBe(30);
    expect(o.hour).toBe(8759);
    expect(o.scenario).toBe(0);
  });

  it('keeps a word seed as a string', () => {
    expect(parseOptions({ seed: 'storm-2026' }).seed).toBe('storm-2026');
  });

  it('reports every bad option at once, each naming the option', () => {
    let caught: unknown;
    try {
      parseOptions({ scenarios: '1.5', shard: '9/8', failIf: ['p_shutdown=1'], hour: '9000' });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(CaseError);
    const paths = (caught as CaseError).problems.map((p) => p.path).sort();
    expect(paths).toEqual(['--fail-if', '--hour', '--scenarios', '--shard']);
    for (const p of (caught as CaseError).problems) expect(p.message).toMatch(/^expected .*, got /);
  });
});
