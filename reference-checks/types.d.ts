declare module 'js-quantities' {
  interface Qty {
    to(unit: string): Qty;
    add(other: Qty): Qty;
    sub(other: Qty): Qty;
    /** -1, 0 or 1. */
    compareTo(other: Qty): number;
    scalar: number;
  }
  function Qty(value: number | string, unit?: string): Qty;
  export default Qty;
}
declare module 'numeric' {
  /** numeric 1.2.6's Dormand–Prince solver; with `event`, it stops where an event value crosses zero upwards. */
  interface DopriSolution {
    x: number[];
    y: number[][];
    at(x: number): number[];
  }
  const numeric: {
    dopri(
      x0: number,
      x1: number,
      y0: number[],
      f: (t: number, y: number[]) => number[],
      tol?: number,
      maxit?: number,
      event?: (t: number, y: number[]) => number[],
    ): DopriSolution;
  };
  export default numeric;
}
