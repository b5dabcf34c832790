/**
 * Correlation matrices: checks, eigenvalues and the Cholesky factor.
 *
 * Funds are correlated by multiplying independent standard normals z by the lower
 * triangular L with L·Lᵀ = C. Positive semidefinite matrices with zero eigenvalues
 * (e.g. two funds perfectly correlated) are accepted: a pivot that is zero within
 * tolerance gives a zero column.
 */

/** Tolerance for symmetry, unit diagonal and the smallest eigenvalue. */
export const CORRELATION_TOLERANCE = 1e-9;

/** One problem found in a correlation matrix. `path` is [row, column], [row] or [] for the whole matrix. */
export interface CorrelationProblem {
  path: number[];
  message: string;
}

/**
 * Eigenvalues of a symmetric matrix by the cyclic Jacobi method, in ascending order.
 * Rotations are applied until every off-diagonal entry is below 1e-15 of the Frobenius
 * norm (at most 100 sweeps).
 */
export function symmetricEigenvalues(matrix: readonly (readonly number[])[]): number[] {
  const n = matrix.length;
  const a = matrix.map((row) => row.slice());
  let norm = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) norm += a[i][j] * a[i][j];
  const threshold = 1e-30 * Math.max(norm, 1e-300);
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) off += a[i][j] * a[i][j];
    if (off <= threshold) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p][q];
        if (apq === 0) continue;
        const theta = (a[q][q] - a[p][p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k][p];
          const akq = a[k][q];
          a[k][p] = c * akp - s * akq;
          a[k][q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p][k];
          const aqk = a[q][k];
          a[p][k] = c * apk - s * aqk;
          a[q][k] = s * apk + c * aqk;
        }
      }
    }
  }
  return a.map((row, i) => row[i]).sort((x, y) => x - y);
}

/**
 * Every problem that stops `matrix` being a correlation matrix: not square, entries not
 * finite or outside [−1, 1], not symmetric (|cᵢⱼ − cⱼᵢ| > 1e-9), diagonal not 1 (±1e-9),
 * or not positive semidefinite (smallest eigenvalue below −1e-9, value reported).
 * An empty array means the matrix is usable.
 */
export function checkCorrelationMatrix(matrix: readonly (readonly number[])[]): CorrelationProblem[] {
  const problems: CorrelationProblem[] = [];
  const n = matrix.length;
  for (let i = 0; i < n; i++) {
    if (matrix[i].length !== n) {
      problems.push({ path: [i], message: `row ${i} has ${matrix[i].length} entries; the matrix must be ${n}×${n}` });
    }
  }
  if (problems.length > 0) return problems;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const v = matrix[i][j];
      if (!Number.isFinite(v)) problems.push({ path: [i, j], message: 'must be a finite number' });
      else if (v < -1 - CORRELATION_TOLERANCE || v > 1 + CORRELATION_TOLERANCE) {
        problems.push({ path: [i, j], message: `correlation ${v} is outside [-1, 1]` });
      }
    }
  }
  if (problems.length > 0) return problems;
  for (let i = 0; i < n; i++) {
    if (Math.abs(matrix[i][i] - 1) > CORRELATION_TOLERANCE) {
      problems.push({ path: [i, i], message: `diagonal entry must be 1 (got ${matrix[i][i]})` });
    }
    for (let j = i + 1; j < n; j++) {
      if (Math.abs(matrix[i][j] - matrix[j][i]) > CORRELATION_TOLERANCE) {
        problems.push({
          path: [i, j],
          message: `matrix is not symmetric: entry [${i}][${j}] = ${matrix[i][j]} but [${j}][${i}] = ${matrix[j][i]}`,
        });
      }
    }
  }
  if (problems.length > 0) return problems;
  const eigenvalues = symmetricEigenvalues(matrix);
  const smallest = eigenvalues[0];
  if (n > 0 && smallest < -CORRELATION_TOLERANCE) {
    problems.push({
      path: [],
      message: `matrix is not positive semidefinite: smallest eigenvalue is ${smallest.toPrecision(6)} (eigenvalues ${eigenvalues
        .map((e) => e.toPrecision(4))
        .join(', ')})`,
    });
  }
  return problems;
}

/**
 * Lower-triangular Cholesky factor L of a symmetric positive semidefinite matrix, L·Lᵀ = A.
 * A pivot below 1e-12 (relative to the diagonal entry) is treated as zero and its column set
 * to zero, so singular correlation matrices work. Throws if a pivot is clearly negative.
 */
export function cholesky(matrix: readonly (readonly number[])[]): number[][] {
  const n = matrix.length;
  const l: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) {
    let d = matrix[j][j];
    for (let k = 0; k < j; k++) d -= l[j][k] * l[j][k];
    const scale = Math.max(Math.abs(matrix[j][j]), 1);
    if (d < -1e-9 * scale) throw new RangeError(`matrix is not positive semidefinite (pivot ${j} is ${d})`);
    if (d <= 1e-12 * scale) {
      continue; // zero column
    }
    const ljj = Math.sqrt(d);
    l[j][j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = matrix[i][j];
      for (let k = 0; k < j; k++) s -= l[i][k] * l[j][k];
      l[i][j] = s / ljj;
    }
  }
  return l;
}
