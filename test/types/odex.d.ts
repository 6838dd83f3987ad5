/**
 * Type declarations for the odex package (Hairer's ODEX extrapolation solver), used by the tests as
 * an independent ODE oracle. The package ships its TypeScript source rather than declarations, and
 * that source does not compile under this project's strict settings, so tsconfig maps `odex` here.
 */
declare module 'odex' {
  export type Derivative = (x: number, y: number[]) => number[];
  export type OutputFunction = (
    nr: number,
    xOld: number,
    x: number,
    y: number[],
    dense?: (c: number, x: number) => number,
  ) => boolean | undefined;
  export enum Outcome {
    Converged = 0,
    MaxStepsExceeded = 1,
    EarlyReturn = 2,
  }
  export class Solver {
    constructor(n: number);
    n: number;
    maxSteps: number;
    initialStepSize: number;
    maxStepSize: number;
    denseOutput: boolean;
    relativeTolerance: number | number[];
    absoluteTolerance: number | number[];
    solve(
      f: Derivative,
      x: number,
      y0: number[],
      xEnd: number,
      solOut?: OutputFunction,
    ): {
      y: number[];
      outcome: Outcome;
      nStep: number;
      xEnd: number;
      nAccept: number;
      nReject: number;
      nEval: number;
    };
  }
}
