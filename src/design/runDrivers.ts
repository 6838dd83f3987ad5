/**
 * The drivers of one run folder: computed from its scenarios.arrow and written beside it as
 * drivers.arrow. `run` (src/cli/commands/run.ts) and `compare` call it after the run.
 * A build whose scenario table has no shutdown or shedding columns yet gets no drivers
 * (undefined), never a table of placeholders.
 */
import { join } from 'node:path';
import { writeDriversArrow } from './designOutputs.js';
import { computeDrivers, type DriversResult } from './drivers.js';
import { readScenarioFrame, type ScenarioFrame } from './scenarioFrame.js';

export function analyseRunDrivers(
  frame: ScenarioFrame,
  runDir: string,
  confidenceLevel: number,
): DriversResult | undefined {
  if (
    frame.n === 0 ||
    !frame.has('shutdown') ||
    !(frame.has('shed_kw') || frame.has('shed_stages'))
  )
    return undefined;
  const result = computeDrivers(frame, { confidenceLevel });
  writeDriversArrow(runDir, result);
  return result;
}

/** Reads `<runDir>/scenarios.arrow`, writes `<runDir>/drivers.arrow`; undefined when not possible. */
export function writeRunDrivers(
  runDir: string,
  confidenceLevel: number,
): DriversResult | undefined {
  return analyseRunDrivers(
    readScenarioFrame(join(runDir, 'scenarios.arrow')),
    runDir,
    confidenceLevel,
  );
}
