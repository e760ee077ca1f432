declare module 'js-quantities' {
  interface Qty {
    to(unit: string): Qty;
    scalar: number;
  }
  function Qty(value: number | string, unit?: string): Qty;
  export default Qty;
}
declare module 'numeric' {
  const numeric: { dopri(x0: number, x1: number, y0: number[], f: (t: number, y: number[]) => number[], tol?: number, maxit?: number): { at(x: number): number[] } };
  export default numeric;
}
