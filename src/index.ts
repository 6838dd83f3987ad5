/** holdfast as a library: the case schema and types. More exports land with the runner. */

export type { Case, CaseInput, Load, Source } from './case/schema.js';
export { caseSchema } from './case/schema.js';
export { CaseError, RunError } from './errors.js';
export { Scenario } from './sample/scenario.js';
