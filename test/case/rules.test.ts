// Source: UFLS ordering rules as in common UFLS plans (REFERENCES.md 4.1-4.5; common practice, no source).
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import YAML from 'yaml';
import { caseProblems, validateCase } from '../../src/case/validate.js';
import { CaseError } from '../../src/errors.js';

const base = () =>
  YAML.parse(readFileSync('test/case/fixtures/valid-base.yaml', 'utf8')) as {
    sources: Record<string, unknown>[];
    loads: Record<string, unknown>[];
    network: { buses: Record<string, unknown>[]; branches: Record<string, unknown>[] };
    protection: { ufls: Record<string, unknown>[] };
  };

describe('cross-field rules', () => {
  it('find nothing wrong with the valid base case', () => {
    expect(caseProblems(base())).toEqual([]);
    expect(validateCase(base()).sources).toHaveLength(2);
  });

  it('report every problem at once', () => {
    const c = base();
    c.sources[1]!.id = 'gen1';
    c.loads[0]!.bus = 'nowhere';
    c.protection.ufls[1]!.thresholdHz = 59.9;
    c.network.branches[0]!.rPu = 0.1;
    const paths = caseProblems(c).map((p) => p.path);
    expect(paths).toEqual(
      expect.arrayContaining([
        '/sources/1/id',
        '/loads/0/bus',
        '/protection/ufls/1/thresholdHz',
        '/network/branches/0',
      ]),
    );
    let thrown: unknown;
    try {
      validateCase(c);
    } catch (err) {
      thrown = err;
    }
    expect(thrown).toBeInstanceOf(CaseError);
    expect((thrown as CaseError).problems.length).toBe(paths.length);
  });

  it('treat an open branch as no connection', () => {
    const c = base();
    c.network.branches[0]!.closed = false;
    expect(caseProblems(c).map((p) => p.path)).toEqual(['/network/buses/1']);
  });

  it('accept any UFLS plan with descending thresholds below nominal and shares summing to <= 1', () => {
    // property test (fast-check, fixed seed): the rules accept exactly the plans they should
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            drop: fc.integer({ min: 1, max: 50 }),
            share: fc.integer({ min: 0, max: 40 }),
          }),
          {
            minLength: 1,
            maxLength: 6,
          },
        ),
        (steps) => {
          const c = base();
          let f = 60;
          c.protection.ufls = steps.map((s) => {
            f -= s.drop / 100;
            return { thresholdHz: Number(f.toFixed(2)), shareOfLoad: s.share / 100 };
          });
          const total = steps.reduce((a, s) => a + s.share, 0);
          const problems = caseProblems(c).filter((p) => p.path.startsWith('/protection'));
          expect(problems.length === 0).toBe(total <= 100);
        },
      ),
      { seed: 20261201, numRuns: 200 },
    );
  });
});
