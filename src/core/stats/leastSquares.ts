// Linear least squares by Householder QR: straight lines, polynomials and multiple regression.
import { isFiniteNumber, type NumericInput } from './finite';
import { compensatedSum, mean } from './mean';
import { requireSameLength } from './pearson';

export interface LeastSquaresOptions {
  /** Fit a constant term as well (default true). */
  intercept?: boolean;
}

export interface LeastSquaresFit {
  /** Estimates, intercept first when one is fitted, then one per column in the given order. */
  coefficients: number[];
  /** Standard deviation of each estimate, same order as `coefficients`. */
  standardErrors: number[];
  /** Residual standard deviation √(RSS / dof). */
  residualSd: number;
  /**
   * 1 - RSS/TSS, with TSS about the mean when an intercept is fitted and about zero otherwise
   * (R's convention for models without intercept). NaN when TSS is 0.
   */
  rSquared: number;
  /** Complete rows used (y and every column finite). */
  n: number;
  /** Residual degrees of freedom, n minus the number of coefficients. */
  dof: number;
}

/**
 * Multiple linear least squares y ≈ b₀ + Σ bⱼ xⱼ over the complete rows (y and every column
 * finite), with standard errors of the estimates.
 *
 * Method: Householder QR of the design matrix (A. S. Householder, "Unitary triangularization of
 * a nonsymmetric matrix", J. ACM 5(4), 1958, 339–342; G. H. Golub and C. F. Van Loan, Matrix
 * Computations, 4th ed., 2013, §5.2 and §5.3), never the normal equations, whose condition
 * number is the square of the design's. With an intercept every column is first centred on its
 * (compensated) mean, and every column is scaled to unit length: centring removes the
 * near-collinearity of a column with the constant (Longley's year column), scaling makes the
 * rank test meaningful. Estimates and their covariance σ²(XᵀX)⁻¹ = σ²R⁻¹R⁻ᵀ are mapped back to
 * the original columns; the intercept's variance is σ²(1/n + x̄ᵀ Cov x̄ / σ²). Reproduces the NIST
 * StRD Norris, Pontius and Longley certified values to 12 or more digits.
 *
 * O(n p²) time for p coefficients; one n × p copy of the design.
 *
 * @throws RangeError when a column's length differs from y's, or there is nothing to fit.
 * @returns undefined when there are not more complete rows than coefficients (no residual
 *   degree of freedom) or the columns are linearly dependent (for example a constant column
 *   together with the intercept).
 */
export function leastSquares(
  columns: ArrayLike<NumericInput>,
  y: NumericInput,
  options: LeastSquaresOptions = {},
): LeastSquaresFit | undefined {
  const intercept = options.intercept ?? true;
  const m = columns.length;
  const parameters = m + (intercept ? 1 : 0);
  if (parameters === 0) throw new RangeError('leastSquares needs at least one column or an intercept to fit.');
  for (let j = 0; j < m; j++) requireSameLength(columns[j], y, 'leastSquares');

  const complete = new Uint8Array(y.length);
  let n = 0;
  for (let i = 0; i < y.length; i++) {
    let ok = isFiniteNumber(y[i]);
    for (let j = 0; ok && j < m; j++) ok = isFiniteNumber(columns[j][i]);
    if (ok) {
      complete[i] = 1;
      n++;
    }
  }
  if (n <= parameters) return undefined;

  // Column-major copy: column j occupies design[j*n .. j*n + n - 1].
  const design = new Float64Array(n * m);
  const response = new Float64Array(n);
  for (let i = 0, row = 0; i < y.length; i++) {
    if (!complete[i]) continue;
    response[row] = y[i] as number;
    for (let j = 0; j < m; j++) design[j * n + row] = columns[j][i] as number;
    row++;
  }

  // Largest magnitude per column before centring: a centred column no longer than its rounding
  // noise is constant in disguise, and scaling would otherwise blow that noise up to unit length.
  const magnitudes = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    for (let i = j * n; i < (j + 1) * n; i++) magnitudes[j] = Math.max(magnitudes[j], Math.abs(design[i]));
  }
  const centres = new Float64Array(m);
  let responseCentre = 0;
  if (intercept) {
    responseCentre = mean(response) as number;
    for (let i = 0; i < n; i++) response[i] -= responseCentre;
    for (let j = 0; j < m; j++) {
      const column = design.subarray(j * n, (j + 1) * n);
      const c = mean(column) as number;
      centres[j] = c;
      for (let i = 0; i < n; i++) column[i] -= c;
    }
  }
  let totalSquares = 0;
  for (let i = 0; i < n; i++) totalSquares += response[i] * response[i];

  const scales = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    const column = design.subarray(j * n, (j + 1) * n);
    const length = euclideanLength(column, 0);
    if (!(length > n * Number.EPSILON * magnitudes[j])) return undefined;
    scales[j] = length;
    for (let i = 0; i < n; i++) column[i] /= length;
  }

  const diagonal = householderTriangularize(design, response, n, m);
  if (!diagonal) return undefined;

  // Back substitution R b = (Qᵀy)[0..m-1]; R's entry (k, j), j > k, is design[j*n + k].
  const scaledCoefficients = new Float64Array(m);
  for (let k = m - 1; k >= 0; k--) {
    let s = response[k];
    for (let j = k + 1; j < m; j++) s -= design[j * n + k] * scaledCoefficients[j];
    scaledCoefficients[k] = s / diagonal[k];
  }
  let residualSquares = 0;
  for (let i = m; i < n; i++) residualSquares += response[i] * response[i];
  const dof = n - parameters;
  const residualSd = Math.sqrt(residualSquares / dof);

  // R⁻¹ (upper triangular, row-major m × m), for the covariance R⁻¹R⁻ᵀ of the scaled estimates.
  const inverse = new Float64Array(m * m);
  for (let c = 0; c < m; c++) {
    inverse[c * m + c] = 1 / diagonal[c];
    for (let k = c - 1; k >= 0; k--) {
      let s = 0;
      for (let j = k + 1; j <= c; j++) s += design[j * n + k] * inverse[j * m + c];
      inverse[k * m + c] = -s / diagonal[k];
    }
  }

  const slopes: number[] = [];
  const slopeErrors: number[] = [];
  for (let j = 0; j < m; j++) {
    let rowSquares = 0;
    for (let c = j; c < m; c++) rowSquares += inverse[j * m + c] * inverse[j * m + c];
    slopes.push(scaledCoefficients[j] / scales[j]);
    slopeErrors.push((residualSd * Math.sqrt(rowSquares)) / scales[j]);
  }
  const rSquared = totalSquares > 0 ? 1 - residualSquares / totalSquares : NaN;
  if (!intercept) {
    return { coefficients: slopes, standardErrors: slopeErrors, residualSd, rSquared, n, dof };
  }

  // b₀ = ȳ - Σ bⱼ x̄ⱼ; Var(b₀) = σ²(1/n + ‖R⁻ᵀ u‖²) with uⱼ = x̄ⱼ / scaleⱼ.
  const terms = new Float64Array(m + 1);
  terms[0] = responseCentre;
  let spread = 0;
  for (let c = 0; c < m; c++) {
    terms[c + 1] = -slopes[c] * centres[c];
    let w = 0;
    for (let j = 0; j <= c; j++) w += inverse[j * m + c] * (centres[j] / scales[j]);
    spread += w * w;
  }
  const constant = compensatedSum(terms);
  const constantError = residualSd * Math.sqrt(1 / n + spread);
  return {
    coefficients: [constant, ...slopes],
    standardErrors: [constantError, ...slopeErrors],
    residualSd,
    rSquared,
    n,
    dof,
  };
}

/**
 * In-place Householder QR of the column-major n × m `design`, applying the same reflections to
 * `response` (which becomes Qᵀy). Afterwards the strict upper triangle of R sits in the design's
 * upper rows, the reflection vectors below the diagonal. Returns R's diagonal, or undefined when
 * a diagonal entry is negligible (rank-deficient design).
 */
function householderTriangularize(design: Float64Array, response: Float64Array, n: number, m: number): Float64Array | undefined {
  const diagonal = new Float64Array(m);
  let largest = 0;
  for (let k = 0; k < m; k++) {
    const col = k * n;
    const length = euclideanLength(design, col + k, col + n);
    if (!(length > 0)) return undefined;
    const head = design[col + k];
    // beta = -sign(head)·length avoids cancellation in head - beta.
    const beta = head > 0 ? -length : length;
    const tau = (beta - head) / beta;
    const scale = 1 / (head - beta);
    for (let i = k + 1; i < n; i++) design[col + i] *= scale;
    design[col + k] = beta;
    diagonal[k] = beta;
    // Reflection H = I - tau v vᵀ with v = (1, design[col+k+1 .. col+n-1]).
    for (let j = k + 1; j < m; j++) reflect(design, col, k, n, tau, design, j * n);
    reflect(design, col, k, n, tau, response, 0);
    largest = Math.max(largest, Math.abs(beta));
  }
  const tolerance = Math.max(n, m) * Number.EPSILON * largest;
  for (let k = 0; k < m; k++) if (Math.abs(diagonal[k]) <= tolerance) return undefined;
  return diagonal;
}

function reflect(vectors: Float64Array, col: number, k: number, n: number, tau: number, target: Float64Array, offset: number): void {
  let s = target[offset + k];
  for (let i = k + 1; i < n; i++) s += vectors[col + i] * target[offset + i];
  s *= tau;
  target[offset + k] -= s;
  for (let i = k + 1; i < n; i++) target[offset + i] -= s * vectors[col + i];
}

/** √Σ v² over array[from..to-1], scaled by the largest magnitude so it cannot overflow. */
function euclideanLength(array: Float64Array, from: number, to = array.length): number {
  let largest = 0;
  for (let i = from; i < to; i++) largest = Math.max(largest, Math.abs(array[i]));
  if (largest === 0 || !Number.isFinite(largest)) return largest;
  let sum = 0;
  for (let i = from; i < to; i++) {
    const r = array[i] / largest;
    sum += r * r;
  }
  return largest * Math.sqrt(sum);
}

export interface LinearFit {
  slope: number;
  intercept: number;
  rSquared: number;
  residualSd: number;
  /** Complete pairs used. */
  n: number;
}

/**
 * Straight line y ≈ intercept + slope·x by least squares over the complete pairs; see
 * `leastSquares` for the method (Householder QR on centred data).
 *
 * O(n) time.
 *
 * @throws RangeError when x and y differ in length.
 * @returns undefined when fewer than 3 complete pairs remain or x is constant.
 * @example linearFit([0, 1, 2], [1, 3, 5]) // => { slope: 2, intercept: 1, rSquared: 1, ... }
 */
export function linearFit(x: NumericInput, y: NumericInput): LinearFit | undefined {
  requireSameLength(x, y, 'linearFit');
  const fit = leastSquares([x], y);
  if (!fit) return undefined;
  return { slope: fit.coefficients[1], intercept: fit.coefficients[0], rSquared: fit.rSquared, residualSd: fit.residualSd, n: fit.n };
}

/**
 * Polynomial y ≈ b₀ + b₁x + … + b_d x^d by least squares over the complete pairs; columns are
 * the raw powers of x, centred and scaled inside `leastSquares`, so the coefficients refer to x
 * itself (NIST Pontius, degree 2, is reproduced to 12 or more digits).
 *
 * O(n d²) time; one column per power.
 *
 * @param degree a whole number >= 0 (0 fits the mean).
 * @throws RangeError when x and y differ in length or the degree is not a whole number >= 0.
 * @returns undefined when there are no more than degree + 1 complete pairs, or fewer than
 *   degree + 1 distinct x values.
 */
export function polynomialFit(x: NumericInput, y: NumericInput, degree: number): LeastSquaresFit | undefined {
  requireSameLength(x, y, 'polynomialFit');
  if (!Number.isInteger(degree) || degree < 0) {
    throw new RangeError(`polynomialFit requires a whole-number degree >= 0, but got ${degree}.`);
  }
  const columns: Float64Array[] = [];
  let previous: ArrayLike<number | null | undefined> = x;
  for (let d = 1; d <= degree; d++) {
    const power = new Float64Array(x.length);
    for (let i = 0; i < x.length; i++) {
      const v = x[i];
      power[i] = isFiniteNumber(v) ? (d === 1 ? v : (previous[i] as number) * v) : NaN;
    }
    columns.push(power);
    previous = power;
  }
  return leastSquares(columns, y);
}
