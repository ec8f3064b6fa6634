/**
 * DATA.COMPARE: method comparison, y (candidate method) against x (comparative method), by a
 * straight line y = a + b·x with confidence intervals for a and b, and the bias a + (b − 1)·X at
 * a medical decision level X. Three published estimators:
 *
 * - Passing–Bablok (Passing H, Bablok W. A new biometrical procedure for testing the equality of
 *   measurements from two different analytical methods. J Clin Chem Clin Biochem 1983;21:709–20):
 *   the shifted median of the pairwise slopes, rank-based confidence interval; no distributional
 *   assumption, errors in both methods.
 * - Deming regression with a known ratio of error variances, jackknife confidence intervals
 *   (Linnet K. Estimation of the linear relationship between the measurements of two methods
 *   with proportional errors. Stat Med 1990;9:1463–73; Linnet K. Evaluation of regression
 *   procedures for methods comparison studies. Clin Chem 1993;39:424–32; the 1990 citation is from
 *   memory).
 * - Ordinary least squares of y on x (x without error), t-based confidence intervals
 *   (any regression text; NIST StRD Norris certifies the estimates).
 *
 * Units: slope is unitless, intercept and bias in the unit of the results, bias % in percent of
 * the level. Domain (all methods): x and y paired, at least 3 pairs (#NUM!), x not all equal
 * (#DIV/0!). The confidence level is a parameter here (the worksheet function uses 0.95).
 *
 * Range: any finite doubles. Deming and OLS work on x·2^-kx and y·2^-ky, each scaled by the power
 * of two that brings its largest magnitude to 0.5 … 1 when that lies outside 2^-400 … 2^400
 * (scaleData in describe.ts; exact), with the error-variance ratio carried as λ·2^(2kx − 2ky) in
 * scaled arithmetic (scaled.ts); slopes are scaled back by 2^(ky − kx), intercepts by 2^ky, once.
 * Passing–Bablok takes the differences of the data as they are (scaling could merge tiny values),
 * halving one that would overflow, and holds each slope as dy/dx·2^(kx − ky) (the same exponents),
 * so the slopes and the residuals y − b·x are right when the slope itself is beyond the double
 * range. An estimate beyond ±1.8e308 is #NUM!; an interval bound beyond it is not given (its
 * cell says why).
 */
import { LeewayError, divError, numError, valueError } from '../errors';
import { nonNegative, openProbability, positive, show } from '../guards';
import { makeWordReader } from '../words';
import { normalQuantile } from '../normal';
import { bandExponent, mean, scaleData } from './describe';
import { Scaled, compare, hypotenuse, ldexp, minus, over, plus, root, scaled, times, timesPow2, toDouble } from '../scaled';
import { tQuantile } from './studentT';

export type CompareMethod = 'passing-bablok' | 'deming' | 'ols';

export const DEFAULT_COMPARE_METHOD: CompareMethod = 'passing-bablok';

/** The method word: "passing-bablok" (default), "deming" or "ols", any case, with aliases. */
export const readCompareMethod = makeWordReader<CompareMethod>('method', {
  'passing-bablok': ['pb', 'passing_bablok', 'passing bablok', 'passingbablok', 'passing–bablok'],
  deming: [],
  ols: ['least-squares', 'least_squares', 'least squares'],
});

/** Passing–Bablok stores every pairwise slope; beyond this many pairs the memory is too much. */
export const MAX_PASSING_BABLOK_PAIRS = 5000;

export interface LineFit {
  readonly method: CompareMethod;
  /** Pairs used. */
  readonly n: number;
  /** Two-sided confidence level of the intervals, e.g. 0.95. */
  readonly confidence: number;
  readonly slope: number;
  readonly intercept: number;
  /** Interval bounds; null where the data do not define one (intervalNote says why). */
  readonly slopeLow: number | null;
  readonly slopeHigh: number | null;
  readonly interceptLow: number | null;
  readonly interceptHigh: number | null;
  readonly intervalNote?: string;
}

function checkPairs(x: ArrayLike<number>, y: ArrayLike<number>, confidence: number): number {
  const n = x.length;
  if (y.length !== n) throw valueError(`x and y do not pair up (${n} x values, ${y.length} y values)`);
  if (n < 3) throw numError(`a method comparison needs at least 3 pairs of numbers (got ${n})`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) throw numError(`pair ${i + 1} is not a pair of finite numbers`);
  }
  let allEqual = true;
  for (let i = 1; i < n && allEqual; i++) allEqual = x[i] === x[0];
  if (allEqual) throw divError(`all x values are equal (${show(x[0])}): a slope divides by the spread of x`);
  openProbability(confidence, 'confidence');
  return n;
}

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

/** (a + b)/2, halving first when the sum would overflow. */
function midpoint(a: number, b: number): number {
  const s = 0.5 * (a + b);
  return s - s === 0 ? s : 0.5 * a + 0.5 * b;
}

/** Median of a typed array, sorted in place. */
function medianInPlace(a: Float64Array): number {
  a.sort();
  const n = a.length;
  const h = n >> 1;
  return n % 2 ? a[h] : midpoint(a[h - 1], a[h]);
}

/** y − b·x; when b·x overflows, 2·(y/2 − b·x/2) with the larger factor halved (exact for it). Infinite only beyond ±1.8e308. */
function residual(x: number, y: number, b: number): number {
  const r = y - b * x;
  if (r - r === 0) return r;
  return 2 * (0.5 * y - (Math.abs(b) >= Math.abs(x) ? 0.5 * b * x : b * (0.5 * x)));
}

/**
 * median(y − B·x) for the slope B = b·2^-shift; with shift ≠ 0 each residual is taken on scaled
 * numbers (B may lie outside the double range) and rounded once.
 */
function medianResidual(x: ArrayLike<number>, y: ArrayLike<number>, b: number, shift = 0): number {
  const r = new Float64Array(x.length);
  if (shift === 0) {
    for (let i = 0; i < x.length; i++) r[i] = residual(x[i], y[i], b);
  } else {
    const B = timesPow2(scaled(b), -shift);
    for (let i = 0; i < x.length; i++) r[i] = toDouble(minus(scaled(y[i]), times(B, scaled(x[i]))));
  }
  return medianInPlace(r);
}

const MINUS_ONE = scaled(-1);

/** The largest magnitude among numbers (for messages). */
function largest(xs: ArrayLike<number>): number {
  let top = 0;
  for (let i = 0; i < xs.length; i++) top = Math.max(top, Math.abs(xs[i]));
  return top;
}

/** #NUM! for an estimate beyond the double range, naming the data's sizes. */
function beyondRange(what: string, x: ArrayLike<number>, y: ArrayLike<number>): LeewayError {
  return numError(`the ${what} exceeds the largest number Excel can hold (about 1.8e308): x reaches ${show(largest(x))} and y ${show(largest(y))}`);
}

const BOUND_BEYOND_RANGE = 'an interval bound exceeds the largest number Excel can hold (about 1.8e308), so the interval is not given';

/**
 * Passing–Bablok (1983). For every pair i < j: Sᵢⱼ = (yⱼ − yᵢ)/(xⱼ − xᵢ); a pair of identical
 * points gives no slope (0/0) and is left out; a slope of exactly −1 is left out; a pair with
 * equal x and different y has an infinite slope (each pair is taken in increasing x, ties in
 * increasing y, so that slope is +∞ and the result does not depend on the order of the rows).
 * With N slopes left, sorted, and K = the number of slopes below −1, the slope is the median
 * shifted by K: b = S₍(N+1)/2+K₎ (N odd) or ½(S₍N/2+K₎ + S₍N/2+1+K₎) (N even), 1-based ranks;
 * intercept a = median(yᵢ − b·xᵢ).
 * Confidence interval: C = z₍1−α/2₎·√(n(n − 1)(2n + 5)/18), M₁ = (N − C)/2 rounded to the nearest
 * whole number, M₂ = N − M₁ + 1; b_L = S₍M₁+K₎, b_U = S₍M₂+K₎; a_L = median(y − b_U·x),
 * a_U = median(y − b_L·x) (taken in increasing order). Defined when 1 ≤ M₁ + K and M₂ + K ≤ N;
 * otherwise (fewer than 5 pairs, say) the interval is not given.
 * Performance: the slopes live in one Float64Array sorted in place (about 500,000 for 1,000 pairs).
 */
export function passingBablok(x: ArrayLike<number>, y: ArrayLike<number>, confidence = 0.95): LineFit {
  const n = checkPairs(x, y, confidence);
  if (n > MAX_PASSING_BABLOK_PAIRS) {
    throw numError(`Passing–Bablok is limited to ${MAX_PASSING_BABLOK_PAIRS} pairs here (got ${n}); use "deming" or fewer pairs`);
  }
  // Slopes are held as dy/dx·2^shift, shift = kx − ky (0 for data within 2^±400; scaleData's
  // exponents), so the slopes of data at the edges of the range lie in the middle of it; their
  // order is unchanged, and K and the exclusions are decided exactly on scaled numbers.
  const shift = bandExponent(x) - bandExponent(y);
  const all = new Float64Array((n * (n - 1)) / 2);
  let N = 0;
  let K = 0;
  let equalX = 0;
  for (let i = 0; i < n; i++) {
    const xi = x[i];
    const yi = y[i];
    for (let j = i + 1; j < n; j++) {
      let dx = x[j] - xi;
      let dy = y[j] - yi;
      // A difference beyond the double range is held as its half (exact for values that large).
      const halfX = dx - dx !== 0;
      const halfY = dy - dy !== 0;
      if (halfX) dx = 0.5 * x[j] - 0.5 * xi;
      if (halfY) dy = 0.5 * y[j] - 0.5 * yi;
      if (dx < 0 || (dx === 0 && dy < 0)) {
        dx = -dx;
        dy = -dy;
      }
      if (dx === 0) {
        if (dy === 0) continue; // identical points: no slope
        all[N++] = Infinity;
        equalX++;
        continue;
      }
      if (halfX === halfY && dy === -dx) continue; // a slope of exactly −1 is left out
      if (shift === 0 && halfX === halfY) {
        const s = dy / dx;
        if (s < -1) K++;
        all[N++] = s;
      } else {
        const r = timesPow2(over(scaled(dy), scaled(dx)), halfX === halfY ? 0 : halfY ? 1 : -1);
        if (compare(r, MINUS_ONE) < 0) K++;
        all[N++] = toDouble(timesPow2(r, shift));
      }
    }
  }
  if (N === 0) throw numError('no pairwise slope is usable (all points identical or on a line of slope −1)');
  const S = all.subarray(0, N);
  S.sort();
  const at = (rank: number): number => S[rank - 1]; // 1-based rank
  const mid = N % 2 ? (N + 1) / 2 + K : N / 2 + K;
  if (mid + (N % 2 ? 0 : 1) > N) {
    throw numError(
      `Passing–Bablok needs a positive relation between the methods: ${K} of ${N} slopes are below −1`,
    );
  }
  const b = N % 2 ? at(mid) : midpoint(at(mid), at(mid + 1));
  const slope = ldexp(b, -shift);
  if (!Number.isFinite(slope)) {
    // +∞ from pairs with equal x (the top equalX ranks), else a ratio beyond the double range.
    if (b === Infinity && mid + (N % 2 ? 0 : 1) > N - equalX) throw numError('the Passing–Bablok slope is infinite: too many pairs with equal x');
    throw beyondRange('Passing–Bablok slope', x, y);
  }
  const intercept = medianResidual(x, y, b, shift);
  if (!Number.isFinite(intercept)) throw beyondRange('Passing–Bablok intercept', x, y);

  const C = normalQuantile((1 + confidence) / 2) * Math.sqrt((n * (n - 1) * (2 * n + 5)) / 18);
  const M1 = Math.round((N - C) / 2);
  const M2 = N - M1 + 1;
  let slopeLow: number | null = null;
  let slopeHigh: number | null = null;
  let interceptLow: number | null = null;
  let interceptHigh: number | null = null;
  let intervalNote: string | undefined;
  if (M1 < 1 || M1 + K < 1 || M2 + K > N) {
    intervalNote = `too few pairs for a ${show(100 * confidence)}% Passing–Bablok interval (the rank M₁ + K or M₂ + K falls outside the ${N} slopes)`;
  } else {
    const bL = at(M1 + K);
    const bU = at(M2 + K);
    slopeLow = finiteOrNull(ldexp(bL, -shift));
    slopeHigh = finiteOrNull(ldexp(bU, -shift));
    if (slopeLow !== null && slopeHigh !== null) {
      const a1 = medianResidual(x, y, bU, shift);
      const a2 = medianResidual(x, y, bL, shift);
      interceptLow = finiteOrNull(Math.min(a1, a2));
      interceptHigh = finiteOrNull(Math.max(a1, a2));
      if (interceptLow === null || interceptHigh === null) intervalNote = BOUND_BEYOND_RANGE;
    } else {
      intervalNote = 'an interval bound of the slope is infinite or exceeds the largest number Excel can hold (pairs with equal or nearly equal x), so the interval is not given';
    }
  }
  return {
    method: 'passing-bablok',
    n,
    confidence,
    slope,
    intercept,
    slopeLow,
    slopeHigh,
    interceptLow,
    interceptHigh,
    intervalNote,
  };
}

interface Moments {
  n: number;
  mx: number;
  my: number;
  sxx: number;
  syy: number;
  sxy: number;
}

/** Means and centred sums of squares and products, corrected two-pass (Chan, Golub & LeVeque 1983). */
function moments(x: ArrayLike<number>, y: ArrayLike<number>, skip = -1): Moments {
  let xs: ArrayLike<number> = x;
  let ys: ArrayLike<number> = y;
  if (skip >= 0) {
    const a = new Float64Array(x.length - 1);
    const b = new Float64Array(x.length - 1);
    for (let i = 0, j = 0; i < x.length; i++) {
      if (i === skip) continue;
      a[j] = x[i];
      b[j++] = y[i];
    }
    xs = a;
    ys = b;
  }
  const n = xs.length;
  const mx = mean(xs);
  const my = mean(ys);
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  let su = 0;
  let sv = 0;
  for (let i = 0; i < n; i++) {
    const u = xs[i] - mx;
    const v = ys[i] - my;
    sxx += u * u;
    syy += v * v;
    sxy += u * v;
    su += u;
    sv += v;
  }
  return { n, mx, my, sxx: Math.max(0, sxx - (su * su) / n), syy: Math.max(0, syy - (sv * sv) / n), sxy: sxy - (su * sv) / n };
}

const TWO = scaled(2);

/**
 * Deming slope for error-variance ratio λ = var(error of y)/var(error of x):
 * b = [(Syy − λSxx) + √((Syy − λSxx)² + 4λSxy²)] / (2Sxy), evaluated in the form that avoids
 * cancellation (2λSxy / [√(…) − (Syy − λSxx)] when Syy − λSxx < 0), on scaled numbers (λ may lie
 * far outside the double range after the data are scaled). Returns NaN when the line is undefined
 * (Sxy = 0 with Syy ≥ λSxx, or Sxx = 0), ±Infinity when the slope is beyond the double range.
 */
function demingSlope(m: Moments, ratio: Scaled): number {
  if (m.sxx === 0) return NaN;
  const sxy = scaled(m.sxy);
  const D = minus(scaled(m.syy), times(ratio, scaled(m.sxx)));
  const R = hypotenuse(D, times(times(TWO, root(ratio)), sxy));
  if (D.m < 0) return toDouble(over(times(times(TWO, ratio), sxy), minus(R, D)));
  if (m.sxy === 0) return NaN;
  return toDouble(over(plus(D, R), times(TWO, sxy)));
}

/** Data scaled for Deming and OLS: x·2^-kx, y·2^-ky (kx = ky = 0 for ordinary data). */
interface ScaledPairs {
  readonly x: ArrayLike<number>;
  readonly y: ArrayLike<number>;
  readonly kx: number;
  readonly ky: number;
}

function scalePairs(x: ArrayLike<number>, y: ArrayLike<number>): ScaledPairs {
  const sx = scaleData(x);
  const sy = scaleData(y);
  return { x: sx.values, y: sy.values, kx: sx.k, ky: sy.k };
}

/**
 * A fit on scaled data in the units of the data: slopes × 2^(ky − kx), intercepts × 2^ky, each
 * rounded once. An estimate beyond ±1.8e308 is #NUM!; an interval bound beyond it is left out.
 */
function unscaleFit(fit: LineFit, d: ScaledPairs, x: ArrayLike<number>, y: ArrayLike<number>): LineFit {
  const slope = ldexp(fit.slope, d.ky - d.kx);
  if (!Number.isFinite(slope)) throw beyondRange('slope', x, y);
  const intercept = ldexp(fit.intercept, d.ky);
  if (!Number.isFinite(intercept)) throw beyondRange('intercept', x, y);
  if (fit.slopeLow === null || fit.slopeHigh === null || fit.interceptLow === null || fit.interceptHigh === null) {
    return { ...fit, slope, intercept };
  }
  const slopeLow = finiteOrNull(ldexp(fit.slopeLow, d.ky - d.kx));
  const slopeHigh = finiteOrNull(ldexp(fit.slopeHigh, d.ky - d.kx));
  const interceptLow = finiteOrNull(ldexp(fit.interceptLow, d.ky));
  const interceptHigh = finiteOrNull(ldexp(fit.interceptHigh, d.ky));
  const beyond = slopeLow === null || slopeHigh === null || interceptLow === null || interceptHigh === null;
  return { ...fit, slope, intercept, slopeLow, slopeHigh, interceptLow, interceptHigh, ...(beyond ? { intervalNote: BOUND_BEYOND_RANGE } : {}) };
}

/** mean ± the jackknife SE: √((n − 1)/n · Σ(θ₍₋ᵢ₎ − θ̄₍₋₎)²). */
function jackknifeSe(leaveOut: Float64Array): number {
  const n = leaveOut.length;
  const m = mean(leaveOut);
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (leaveOut[i] - m) ** 2;
  return Math.sqrt(((n - 1) / n) * ss);
}

/**
 * Deming regression (Deming WE, Statistical adjustment of data, 1943, from memory; Linnet 1990, 1993) with a known ratio of error variances
 * `ratio` = var(error of y)/var(error of x) > 0 (1 = equal imprecision; a large ratio tends to
 * OLS of y on x). Slope as in demingSlope, intercept a = ȳ − b·x̄.
 * Confidence intervals by the jackknife (Linnet 1990, 1993): leaving out each pair in turn gives
 * b₍₋ᵢ₎, a₍₋ᵢ₎; SE = √((n − 1)/n · Σ(b₍₋ᵢ₎ − mean)²) (the SD of the pseudo-values
 * n·b − (n − 1)·b₍₋ᵢ₎ over √n); interval estimate ± t₍1−α/2, n−2₎·SE, centred on the estimate.
 * Swapping x and y (with ratio → 1/ratio) gives exactly the reciprocal slope.
 */
export function deming(xData: ArrayLike<number>, yData: ArrayLike<number>, ratio = 1, confidence = 0.95): LineFit {
  checkPairs(xData, yData, confidence);
  positive(ratio, 'ratio');
  const d = scalePairs(xData, yData);
  return unscaleFit(demingScaled(d.x, d.y, timesPow2(scaled(ratio), 2 * (d.kx - d.ky)), confidence), d, xData, yData);
}

/** Deming on data within the band; `ratio` is λ in the units of these data. */
function demingScaled(x: ArrayLike<number>, y: ArrayLike<number>, ratio: Scaled, confidence: number): LineFit {
  const n = x.length;
  const m = moments(x, y);
  const slope = demingSlope(m, ratio);
  if (Number.isNaN(slope)) {
    throw divError('x and y are uncorrelated (their cross-products sum to zero): the Deming line is undefined');
  }
  const intercept = m.my - slope * m.mx; // a slope beyond the range is reported by unscaleFit

  const bs = new Float64Array(n);
  const as = new Float64Array(n);
  let defined = true;
  const c = n / (n - 1);
  for (let i = 0; i < n && defined; i++) {
    const u = x[i] - m.mx;
    const v = y[i] - m.my;
    let mi: Moments = {
      n: n - 1,
      mx: m.mx - u / (n - 1),
      my: m.my - v / (n - 1),
      sxx: m.sxx - c * u * u,
      syy: m.syy - c * v * v,
      sxy: m.sxy - c * u * v,
    };
    // Downdating loses digits when one pair carries most of a sum: recompute those directly.
    if (mi.sxx <= 1e-8 * m.sxx || mi.syy <= 1e-8 * m.syy) mi = moments(x, y, i);
    bs[i] = demingSlope(mi, ratio);
    as[i] = mi.my - bs[i] * mi.mx;
    defined = Number.isFinite(bs[i]) && Number.isFinite(as[i]);
  }
  if (!defined) {
    return {
      method: 'deming',
      n,
      confidence,
      slope,
      intercept,
      slopeLow: null,
      slopeHigh: null,
      interceptLow: null,
      interceptHigh: null,
      intervalNote: 'leaving one pair out leaves x values that are all equal or uncorrelated with y: no jackknife interval',
    };
  }
  return tInterval('deming', n, confidence, slope, intercept, jackknifeSe(bs), jackknifeSe(as));
}

/** A fit with intervals estimate ± t₍1−α/2, n−2₎·SE for slope and intercept. */
function tInterval(method: 'deming' | 'ols', n: number, confidence: number, slope: number, intercept: number, seB: number, seA: number): LineFit {
  const t = tQuantile((1 + confidence) / 2, n - 2);
  return {
    method,
    n,
    confidence,
    slope,
    intercept,
    slopeLow: slope - t * seB,
    slopeHigh: slope + t * seB,
    interceptLow: intercept - t * seA,
    interceptHigh: intercept + t * seA,
  };
}

/**
 * Ordinary least squares of y on x: b = Sxy/Sxx, a = ȳ − b·x̄, s² = Σ(yᵢ − a − b·xᵢ)²/(n − 2),
 * SE(b) = s/√Sxx, SE(a) = s·√(1/n + x̄²/Sxx); intervals ± t₍1−α/2, n−2₎·SE. Centred sums (two-pass),
 * so NIST StRD Norris is reproduced to 12 or more digits.
 */
export function ordinaryLeastSquares(xData: ArrayLike<number>, yData: ArrayLike<number>, confidence = 0.95): LineFit {
  const n = checkPairs(xData, yData, confidence);
  const d = scalePairs(xData, yData);
  const { x, y } = d;
  const m = moments(x, y);
  const slope = m.sxy / m.sxx;
  const intercept = m.my - slope * m.mx;
  let rss = 0;
  let rs = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i] - m.my - slope * (x[i] - m.mx);
    rss += r * r;
    rs += r;
  }
  rss = Math.max(0, rss - (rs * rs) / n);
  const s = Math.sqrt(rss / (n - 2));
  const fit = tInterval('ols', n, confidence, slope, intercept, s / Math.sqrt(m.sxx), s * Math.sqrt(1 / n + (m.mx * m.mx) / m.sxx));
  return unscaleFit(fit, d, xData, yData);
}

/** Runs the chosen estimator; `ratio` is used by Deming only. */
export function compareMethods(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  method: CompareMethod = DEFAULT_COMPARE_METHOD,
  ratio = 1,
  confidence = 0.95,
): LineFit {
  switch (method) {
    case 'passing-bablok':
      return passingBablok(x, y, confidence);
    case 'deming':
      return deming(x, y, ratio, confidence);
    case 'ols':
      return ordinaryLeastSquares(x, y, confidence);
  }
}

/**
 * Bias of y against x at the level X (a medical decision level, in the unit of the results):
 * units = a + (b − 1)·X, percent = 100·units/X. X ≥ 0 (#NUM!); at X = 0 the percent is null
 * (the caller reports #DIV/0! for it). Taken on scaled numbers: a figure beyond ±1.8e308 is
 * ±Infinity here, for the caller to report.
 */
export function biasAtLevel(
  fit: Pick<LineFit, 'slope' | 'intercept'>,
  level: number,
): { units: number; percent: number | null } {
  nonNegative(level, 'level');
  const X = scaled(level);
  const units = plus(scaled(fit.intercept), times(minus(scaled(fit.slope), scaled(1)), X));
  return { units: toDouble(units), percent: level === 0 ? null : toDouble(over(times(scaled(100), units), X)) };
}
