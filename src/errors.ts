/**
 * The one error module. `CaseError` carries every problem found in a case file or an override,
 * each with the JSON-pointer-like path of the field, what was expected and what was found;
 * the CLI prints them as `holdfast: PATH: message` and exits 2. `RunError` is an internal
 * failure with its cause (exit 3).
 */

export interface CaseProblem {
  /** JSON-pointer-like path of the offending field, e.g. `/sources/2/droopPu`; '' for the file. */
  path: string;
  /** What was expected and what was found, phrased so the user can fix it. */
  message: string;
}

export class CaseError extends Error {
  readonly problems: readonly CaseProblem[];
  constructor(problems: readonly CaseProblem[]) {
    super(problems.map((p) => `${p.path || '(file)'}: ${p.message}`).join('\n'));
    this.name = 'CaseError';
    this.problems = problems;
  }
  static single(path: string, message: string): CaseError {
    return new CaseError([{ path, message }]);
  }
}

export class RunError extends Error {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'RunError';
  }
}

/** Formats a found value for an error message without dumping huge inputs. */
export function describeFound(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (typeof value === 'string')
    return JSON.stringify(value.length > 40 ? `${value.slice(0, 40)}...` : value);
  if (typeof value === 'number' || typeof value === 'boolean' || value === null)
    return String(value);
  if (Array.isArray(value)) return `a list of ${value.length}`;
  return 'an object';
}
