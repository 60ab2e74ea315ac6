// Small dense symmetric linear algebra for the GLS fits (matrices of a few dozen rows).
//
// Method: Cholesky factorisation A = L L' (Golub & Van Loan, Matrix Computations, 4th ed., alg.
// 4.2.1), forward/back substitution, inverse column by column. Row-major Float64Array storage.
// Cost O(d^3). Example: choleskyInverse([4, 2, 2, 3], 2) = [0.375, -0.25, -0.25, 0.5].

/** Lower Cholesky factor of a symmetric positive-definite d x d matrix; throws `field: ...`. */
export function cholesky(a: ArrayLike<number>, d: number, field = "matrix"): Float64Array {
  const l = new Float64Array(d * d);
  for (let j = 0; j < d; j++) {
    let s = a[j * d + j];
    for (let k = 0; k < j; k++) s -= l[j * d + k] * l[j * d + k];
    if (!(s > 0)) throw new Error(`${field}: not positive definite (pivot ${j} = ${s})`);
    const ljj = Math.sqrt(s);
    l[j * d + j] = ljj;
    for (let i = j + 1; i < d; i++) {
      let t = a[i * d + j];
      for (let k = 0; k < j; k++) t -= l[i * d + k] * l[j * d + k];
      l[i * d + j] = t / ljj;
    }
  }
  return l;
}

/** Solves L L' x = b given the Cholesky factor L. */
export function choleskySolve(l: Float64Array, d: number, b: ArrayLike<number>): Float64Array {
  const y = new Float64Array(d);
  for (let i = 0; i < d; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * d + k] * y[k];
    y[i] = s / l[i * d + i];
  }
  const x = new Float64Array(d);
  for (let i = d - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < d; k++) s -= l[k * d + i] * x[k];
    x[i] = s / l[i * d + i];
  }
  return x;
}

/** Inverse of a symmetric positive-definite matrix. */
export function choleskyInverse(a: ArrayLike<number>, d: number, field = "matrix"): Float64Array {
  const l = cholesky(a, d, field);
  const inv = new Float64Array(d * d);
  const e = new Float64Array(d);
  for (let j = 0; j < d; j++) {
    e.fill(0);
    e[j] = 1;
    const col = choleskySolve(l, d, e);
    for (let i = 0; i < d; i++) inv[i * d + j] = col[i];
  }
  for (let i = 0; i < d; i++)
    for (let j = i + 1; j < d; j++) {
      const m = 0.5 * (inv[i * d + j] + inv[j * d + i]);
      inv[i * d + j] = m;
      inv[j * d + i] = m;
    }
  return inv;
}

/** x' A y for a d x d matrix A. */
export function quadForm(a: ArrayLike<number>, d: number, x: ArrayLike<number>, y: ArrayLike<number> = x): number {
  let s = 0;
  for (let i = 0; i < d; i++) {
    let t = 0;
    for (let j = 0; j < d; j++) t += a[i * d + j] * y[j];
    s += x[i] * t;
  }
  return s;
}

/**
 * Eigen-decomposition of the symmetric 2x2 matrix [[a, b], [b, d]] (closed form; common practice):
 * eigenvalues in descending order and orthonormal eigenvectors (the second is the first turned by
 * +90 degrees).
 */
export function symmetricEigen2(a: number, b: number, d: number): { values: [number, number]; vectors: [[number, number], [number, number]] } {
  const tr = a + d;
  const disc = Math.sqrt(Math.max(0, ((a - d) / 2) ** 2 + b * b));
  const values: [number, number] = [tr / 2 + disc, tr / 2 - disc];
  let first: [number, number] = b !== 0 ? [values[0] - d, b] : a >= d ? [1, 0] : [0, 1];
  const norm = Math.hypot(first[0], first[1]);
  first = [first[0] / norm, first[1] / norm];
  return { values, vectors: [first, [-first[1], first[0]]] };
}

