// Standard normal distribution: CDF, upper tail and quantile, accurate far into the tails.

// W. J. Cody's near-minimax rational approximations for Φ (ANORM in SPECFUN, ACM TOMS
// Algorithm 715, 1993; coefficients from Cody, "Rational Chebyshev approximations for the error
// function", Math. Comp. 23, 1969, 631–637, rescaled to Φ). Three intervals of |z|.
const SMALL_NUM = [2.2352520354606839287, 161.02823106855587881, 1067.6894854603709582, 18154.981253343561249, 0.065682337918207449113];
const SMALL_DEN = [47.20258190468824187, 976.09855173777669322, 10260.932208618978205, 45507.789335026729956];
const MIDDLE_NUM = [
  0.39894151208813466764, 8.8831497943883759412, 93.506656132177855979, 597.27027639480026226, 2494.5375852903726711,
  6848.1904505362823326, 11602.651437647350124, 9842.7148383839780218, 1.0765576773720192317e-8,
];
const MIDDLE_DEN = [
  22.266688044328115691, 235.38790178262499861, 1519.377599407554805, 6485.558298266760755, 18615.571640885098091,
  34900.952721145977266, 38912.003286093271411, 19685.429676859990727,
];
const TAIL_NUM = [0.21589853405795699, 0.1274011611602473639, 0.022235277870649807, 0.001421619193227893466, 2.9112874951168792e-5, 0.02307344176494017303];
const TAIL_DEN = [1.28426009614491121, 0.468238212480865118, 0.0659881378689285515, 0.00378239633202758244, 7.29751555083966205e-5];
const ONE_OVER_SQRT_2PI = 0.3989422804014327;
/** Φ(z) = 0.75 here: below it the central approximation is used. */
const SMALL_LIMIT = 0.66291;
const MIDDLE_LIMIT = Math.sqrt(32);
/** Below this Φ(z) underflows to 0 in double precision (Cody's XLOW). */
const UNDERFLOW_Z = -37.519;

/**
 * Lower-tail probability for z <= 0 (so the result never suffers 1 - x cancellation), or the
 * central value for |z| <= 0.66291 where both tails are >= 0.25.
 */
function lowerTail(z: number): number {
  const y = Math.abs(z);
  if (y <= SMALL_LIMIT) {
    const zsq = z * z;
    let num = SMALL_NUM[4] * zsq;
    let den = zsq;
    for (let i = 0; i < 3; i++) {
      num = (num + SMALL_NUM[i]) * zsq;
      den = (den + SMALL_DEN[i]) * zsq;
    }
    return 0.5 + (z * (num + SMALL_NUM[3])) / (den + SMALL_DEN[3]);
  }
  let ratio: number;
  if (y <= MIDDLE_LIMIT) {
    let num = MIDDLE_NUM[8] * y;
    let den = y;
    for (let i = 0; i < 7; i++) {
      num = (num + MIDDLE_NUM[i]) * y;
      den = (den + MIDDLE_DEN[i]) * y;
    }
    ratio = (num + MIDDLE_NUM[7]) / (den + MIDDLE_DEN[7]);
  } else {
    if (z < UNDERFLOW_Z) return 0;
    const inv = 1 / (z * z);
    let num = TAIL_NUM[5] * inv;
    let den = inv;
    for (let i = 0; i < 4; i++) {
      num = (num + TAIL_NUM[i]) * inv;
      den = (den + TAIL_DEN[i]) * inv;
    }
    ratio = (ONE_OVER_SQRT_2PI - (inv * (num + TAIL_NUM[4])) / (den + TAIL_DEN[4])) / y;
  }
  // exp(-y²/2) split as exp(-t²/2)·exp(-(y-t)(y+t)/2) with t = y rounded down to 1/16, so the
  // square is exact and the relative error stays at a few ulp even where the density is 1e-300.
  const t = Math.trunc(y * 16) / 16;
  const del = (y - t) * (y + t);
  return Math.exp(-t * t * 0.5) * Math.exp(-del * 0.5) * ratio;
}

/**
 * Standard normal cumulative distribution function Φ(z) = P(Z <= z).
 *
 * Method: W. J. Cody's rational Chebyshev approximations (ACM TOMS Algorithm 715, ANORM),
 * relative error about 1e-15 in each tail for the smaller of Φ(z) and 1 - Φ(z); Φ(z) underflows
 * to 0 below z = -37.519.
 *
 * O(1). NaN for NaN; 0 and 1 at -∞ and +∞.
 *
 * @example normalCdf(1.96) // => 0.9750021048517795
 */
export function normalCdf(z: number): number {
  if (Number.isNaN(z)) return NaN;
  if (z > SMALL_LIMIT) return 1 - lowerTail(-z);
  return lowerTail(z);
}

/**
 * Standard normal upper tail (survival function) Q(z) = 1 - Φ(z) = Φ(-z), computed directly so
 * that tiny tail probabilities keep their relative accuracy (normalSurvival(8) ≈ 6.2e-16, where
 * 1 - normalCdf(8) would give 0 or garbage). Same method as `normalCdf`.
 *
 * O(1). NaN for NaN.
 */
export function normalSurvival(z: number): number {
  return normalCdf(-z);
}

// M. J. Wichura, "Algorithm AS 241: The percentage points of the normal distribution",
// Applied Statistics 37(3), 1988, 477–484: PPND16, relative accuracy about 1e-16.
const CENTRAL_NUM = [3.387132872796366608, 133.14166789178437745, 1971.5909503065514427, 13731.693765509461125, 45921.953931549871457, 67265.770927008700853, 33430.575583588128105, 2509.0809287301226727];
const CENTRAL_DEN = [1, 42.313330701600911252, 687.1870074920579083, 5394.1960214247511077, 21213.794301586595867, 39307.89580009271061, 28729.085735721942674, 5226.495278852854561];
const INTERMEDIATE_NUM = [1.42343711074968357734, 4.6303378461565452959, 5.7694972214606914055, 3.64784832476320460504, 1.27045825245236838258, 0.24178072517745061177, 0.0227238449892691845833, 7.7454501427834140764e-4];
const INTERMEDIATE_DEN = [1, 2.05319162663775882187, 1.6763848301838038494, 0.68976733498510000455, 0.14810397642748007459, 0.0151986665636164571966, 5.475938084995344946e-4, 1.05075007164441684324e-9];
const FAR_NUM = [6.6579046435011037772, 5.4637849111641143699, 1.7848265399172913358, 0.29656057182850489123, 0.026532189526576123093, 0.0012426609473880784386, 2.71155556874348757815e-5, 2.01033439929228813265e-7];
const FAR_DEN = [1, 0.59983220655588793769, 0.13692988092273580531, 0.0148753612908506148525, 7.868691311456132591e-4, 1.8463183175100546818e-5, 1.4215117583164458887e-7, 2.04426310338993978564e-15];

function horner(coefficients: readonly number[], x: number): number {
  let value = 0;
  for (let i = coefficients.length - 1; i >= 0; i--) value = value * x + coefficients[i];
  return value;
}

/**
 * Standard normal quantile Φ⁻¹(p): the z with Φ(z) = p.
 *
 * Method: Wichura's Algorithm AS 241 (PPND16), relative accuracy about 1e-16. For p near 1 the
 * result is limited by how well 1 - p is represented; use -normalQuantile(1 - p) with an
 * accurately known small 1 - p instead.
 *
 * O(1).
 *
 * @throws RangeError when p is not a number between 0 and 1.
 * @returns -Infinity at p = 0, +Infinity at p = 1.
 * @example normalQuantile(0.975) // => 1.959963984540054
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) {
    throw new RangeError(`normalQuantile requires a probability between 0 and 1 inclusive, but got ${p}.`);
  }
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (q * horner(CENTRAL_NUM, r)) / horner(CENTRAL_DEN, r);
  }
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  let z: number;
  if (r <= 5) {
    r -= 1.6;
    z = horner(INTERMEDIATE_NUM, r) / horner(INTERMEDIATE_DEN, r);
  } else {
    r -= 5;
    z = horner(FAR_NUM, r) / horner(FAR_DEN, r);
  }
  return q < 0 ? -z : z;
}
