import { StatsInputError } from "./errors";

/**
 * Cholesky factor L (row-major, lower triangle) of a symmetric positive definite matrix.
 * A pivot that vanishes relative to the diagonal means the matrix is singular: for the
 * blocked analysis that is a design whose treatments are not linked through shared blocks.
 */
export function cholesky(matrix: Float64Array, size: number): Float64Array {
  const lower = new Float64Array(size * size);
  let largestDiagonal = 0;
  for (let i = 0; i < size; i++) largestDiagonal = Math.max(largestDiagonal, matrix[i * size + i]);
  const tolerance = 1e-12 * largestDiagonal;
  for (let j = 0; j < size; j++) {
    let diagonal = matrix[j * size + j];
    for (let k = 0; k < j; k++) diagonal -= lower[j * size + k] * lower[j * size + k];
    if (!(diagonal > tolerance)) {
      throw new StatsInputError(
        "not_estimable",
        "Some treatments never share a block (farm) with the others, so they cannot be compared with blocks taken into account; make sure each farm runs at least two of the strains and the farms' strains overlap.",
      );
    }
    const root = Math.sqrt(diagonal);
    lower[j * size + j] = root;
    for (let i = j + 1; i < size; i++) {
      let sum = matrix[i * size + j];
      for (let k = 0; k < j; k++) sum -= lower[i * size + k] * lower[j * size + k];
      lower[i * size + j] = sum / root;
    }
  }
  return lower;
}

/** Solves L Lᵀ x = b for x given the Cholesky factor L. */
export function choleskySolve(lower: Float64Array, size: number, b: ArrayLike<number>): Float64Array {
  const y = new Float64Array(size);
  for (let i = 0; i < size; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= lower[i * size + k] * y[k];
    y[i] = sum / lower[i * size + i];
  }
  const x = new Float64Array(size);
  for (let i = size - 1; i >= 0; i--) {
    let sum = y[i];
    for (let k = i + 1; k < size; k++) sum -= lower[k * size + i] * x[k];
    x[i] = sum / lower[i * size + i];
  }
  return x;
}
