/**
 * Dense LU factorisation with partial pivoting (Doolittle, row exchanges), for the nodal equations of a
 * network cell: complex for the steady state, scans and harmonic flows, real for switching transients.
 * Matrices are row-major Float64Arrays (a complex one as two, real and imaginary parts), factorised in
 * place. A pivot that is zero or negligible against the largest entry of the matrix (relative 1e-13) means
 * the network has no unique solution: `unknown` says which unknown (column) had no pivot left, so the
 * caller can name the node or element.
 *
 * The algorithm is the textbook one (Golub and Van Loan, Matrix Computations, 3.4, Gaussian elimination
 * with partial pivoting; from memory).
 */
import { checkDeadline } from '../language/deadline';

export class SingularMatrixError extends Error {
  constructor(readonly unknown: number) {
    super(`the matrix is singular in unknown ${unknown}`);
  }
}

const TINY = 1e-13;

export interface ComplexLu {
  n: number;
  re: Float64Array;
  im: Float64Array;
  perm: Int32Array;
}

/** Factorises the n×n complex matrix (re, im) in place. */
export function complexLu(n: number, re: Float64Array, im: Float64Array): ComplexLu {
  const perm = new Int32Array(n);
  let scale = 0;
  for (let k = 0; k < n * n; k++) scale = Math.max(scale, Math.hypot(re[k], im[k]));
  const floor = scale * TINY;
  for (let i = 0; i < n; i++) perm[i] = i;
  for (let k = 0; k < n; k++) {
    if ((k & 63) === 63) checkDeadline(true);
    let p = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      const m = Math.abs(re[i * n + k]) + Math.abs(im[i * n + k]);
      if (m > best) {
        best = m;
        p = i;
      }
    }
    if (!(Math.hypot(re[p * n + k], im[p * n + k]) > floor)) throw new SingularMatrixError(k);
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const a = k * n + j;
        const b = p * n + j;
        let t = re[a];
        re[a] = re[b];
        re[b] = t;
        t = im[a];
        im[a] = im[b];
        im[b] = t;
      }
      const t = perm[k];
      perm[k] = perm[p];
      perm[p] = t;
    }
    const pr = re[k * n + k];
    const pi = im[k * n + k];
    const d = pr * pr + pi * pi;
    // 1 / pivot
    const ir = pr / d;
    const ii = -pi / d;
    for (let i = k + 1; i < n; i++) {
      const ik = i * n + k;
      const ar = re[ik];
      const ai = im[ik];
      if (ar === 0 && ai === 0) continue;
      const lr = ar * ir - ai * ii;
      const li = ar * ii + ai * ir;
      re[ik] = lr;
      im[ik] = li;
      const rowI = i * n;
      const rowK = k * n;
      for (let j = k + 1; j < n; j++) {
        const ur = re[rowK + j];
        const ui = im[rowK + j];
        if (ur === 0 && ui === 0) continue;
        re[rowI + j] -= lr * ur - li * ui;
        im[rowI + j] -= lr * ui + li * ur;
      }
    }
  }
  return { n, re, im, perm };
}

/** Solves A x = b with a factorisation from `complexLu`; b is not changed. */
export function complexSolve(lu: ComplexLu, bRe: Float64Array, bIm: Float64Array): { re: Float64Array; im: Float64Array } {
  const { n, re, im, perm } = lu;
  const xr = new Float64Array(n);
  const xi = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sr = bRe[perm[i]];
    let si = bIm[perm[i]];
    const row = i * n;
    for (let j = 0; j < i; j++) {
      const lr = re[row + j];
      const li = im[row + j];
      sr -= lr * xr[j] - li * xi[j];
      si -= lr * xi[j] + li * xr[j];
    }
    xr[i] = sr;
    xi[i] = si;
  }
  for (let i = n - 1; i >= 0; i--) {
    let sr = xr[i];
    let si = xi[i];
    const row = i * n;
    for (let j = i + 1; j < n; j++) {
      const ur = re[row + j];
      const ui = im[row + j];
      sr -= ur * xr[j] - ui * xi[j];
      si -= ur * xi[j] + ui * xr[j];
    }
    const pr = re[row + i];
    const pi = im[row + i];
    const d = pr * pr + pi * pi;
    xr[i] = (sr * pr + si * pi) / d;
    xi[i] = (si * pr - sr * pi) / d;
  }
  return { re: xr, im: xi };
}

export interface RealLu {
  n: number;
  a: Float64Array;
  perm: Int32Array;
}

/** Factorises the n×n real matrix in place. */
export function realLu(n: number, a: Float64Array): RealLu {
  const perm = new Int32Array(n);
  let scale = 0;
  for (let k = 0; k < n * n; k++) scale = Math.max(scale, Math.abs(a[k]));
  const floor = scale * TINY;
  for (let i = 0; i < n; i++) perm[i] = i;
  for (let k = 0; k < n; k++) {
    if ((k & 63) === 63) checkDeadline(true);
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i * n + k]) > Math.abs(a[p * n + k])) p = i;
    if (!(Math.abs(a[p * n + k]) > floor)) throw new SingularMatrixError(k);
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = a[k * n + j];
        a[k * n + j] = a[p * n + j];
        a[p * n + j] = t;
      }
      const t = perm[k];
      perm[k] = perm[p];
      perm[p] = t;
    }
    const pivot = a[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const l = a[i * n + k] / pivot;
      if (l === 0) continue;
      a[i * n + k] = l;
      for (let j = k + 1; j < n; j++) a[i * n + j] -= l * a[k * n + j];
    }
  }
  return { n, a, perm };
}

/** Solves A x = b with a factorisation from `realLu`, into `x` (which may not be b). */
export function realSolve(lu: RealLu, b: ArrayLike<number>, x: Float64Array): Float64Array {
  const { n, a, perm } = lu;
  for (let i = 0; i < n; i++) {
    let s = b[perm[i]];
    for (let j = 0; j < i; j++) s -= a[i * n + j] * x[j];
    x[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    for (let j = i + 1; j < n; j++) s -= a[i * n + j] * x[j];
    x[i] = s / a[i * n + i];
  }
  return x;
}
