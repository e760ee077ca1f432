// The odex package ships TypeScript source rather than declarations; this is the part we use.
declare module 'odex' {
  export type Derivative = (x: number, y: number[]) => number[];
  export type OutputFunction = (nr: number, xold: number, x: number, y: number[], dense?: (c: number, x: number) => number) => boolean | void;
  export class Solver {
    constructor(n: number);
    absoluteTolerance: number;
    relativeTolerance: number;
    maxSteps: number;
    initialStepSize: number;
    denseOutput: boolean;
    solve(
      f: Derivative,
      x: number,
      y0: number[],
      xEnd: number,
      solOut?: OutputFunction,
    ): { y: number[]; outcome: number; nStep: number; xEnd: number; nAccept: number; nReject: number; nEval: number };
  }
}
