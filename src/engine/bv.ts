/**
 * Other uses of biological variation (BV family). CVs are percent numbers.
 */
import { divisor, fits, nonNegative } from './guards';
import { makeWordReader } from './words';
import { Scaled, hypotenuse, inBand, over, scaled, times, toDouble } from './scaled';

/*
 * Range: any finite doubles. Inputs within 2^-400 … 2^400 (or 0) take the plain formula (the
 * same bits); others take √(CV² + CVI²) as hypot on scaled numbers and the products on scaled
 * numbers (scaled.ts), rounded once into the double range; a result beyond ±1.8e308 is #NUM!
 * naming the inputs.
 */

const SQRT2 = scaled(Math.SQRT2);
const HUNDRED = scaled(100);

/**
 * BV.RCV: reference change value, RCV = √2·z·√(CV_A² + CVI²), the percent difference between two
 * consecutive results of one person that is unlikely (at the z chosen) to be analytical and
 * within-person noise alone. Harris EK, Yasaka T. Clin Chem 1983;29:25–30. cv, cvi, z ≥ 0.
 */
export function referenceChangeValue(cv: number, cvi: number, z: number): number {
  nonNegative(cv, 'cv');
  nonNegative(cvi, 'cvi');
  nonNegative(z, 'z');
  if (inBand(cv) && inBand(cvi) && inBand(z)) return Math.SQRT2 * z * Math.hypot(cv, cvi);
  return fits(toDouble(times(times(SQRT2, scaled(z)), hypotenuse(scaled(cv), scaled(cvi)))), { cv, cvi, z });
}

export type Direction = 'up' | 'down';

export const readDirection = makeWordReader<Direction>('direction', { up: ['rise', 'increase'], down: ['fall', 'decrease'] });

/**
 * BV.RCVLOG: log-normal (asymmetric) RCV, Fokkema MR et al. Clin Chem 2006;52:1602–3.
 * σ = √ln(1 + (√(CV_A² + CVI²)/100)²); up = (e^{z√2σ} − 1)·100, down = (e^{−z√2σ} − 1)·100.
 * Not linear: inputs must be percent numbers. cv, cvi, z ≥ 0.
 * Method: c = √(CV² + CVI²)/100 is a scaled number; σ = c when c < 2^-30 (√ln(1 + c²) = c·(1 − c²/4 + …)),
 * σ = √(2·ln c) when c > 2^30 (ln(1 + c²) = 2·ln c + ln(1 + c⁻²)), else √log1p(c²); the exponent
 * t = √2·z·σ is a scaled number and 100·(e^t − 1) = 100·t when t < 2^-60. A fall is never below
 * −100 %; a rise beyond 1.8e308 % is #NUM!. Accuracy: the relative error of the result is about
 * t times that of t, i.e. a few units in the last place times t (up to about 705 before a rise overflows).
 */
export function logNormalRcv(cv: number, cvi: number, z: number, direction: Direction): number {
  nonNegative(cv, 'cv');
  nonNegative(cvi, 'cvi');
  nonNegative(z, 'z');
  const sign = direction === 'up' ? 1 : -1;
  if (inBand(cv) && inBand(cvi) && inBand(z)) {
    // c² and the exponent stay in range here; expm1 keeps a small exponent's digits.
    const cd = Math.hypot(cv, cvi) / 100;
    return fits(100 * Math.expm1(sign * Math.SQRT2 * z * Math.sqrt(Math.log1p(cd * cd))), { cv, cvi, z });
  }
  const c = over(hypotenuse(scaled(cv), scaled(cvi)), HUNDRED);
  let sigma: Scaled;
  if (c.m === 0 || c.e <= -30) sigma = c;
  else if (c.e > 30) sigma = scaled(Math.sqrt(2 * (Math.log(c.m) + c.e * Math.LN2)));
  else {
    const cd = toDouble(c);
    sigma = scaled(Math.sqrt(Math.log1p(cd * cd)));
  }
  const t = times(times(SQRT2, scaled(z)), sigma);
  if (t.e <= -60) return toDouble(times(HUNDRED, { m: sign * t.m, e: t.e }));
  return fits(100 * Math.expm1(sign * toDouble(t)), { cv, cvi, z });
}

/**
 * BV.INDIVIDUALITY: index of individuality II = √(CVI² + CV_A²)/CVG (CV_A defaults to 0).
 * Below about 0.6 population reference intervals are of little use for one person.
 * Harris EK. Clin Chem 1974;20:1535–42. cvg > 0.
 */
export function individualityIndex(cvi: number, cvg: number, cv: number): number {
  nonNegative(cvi, 'cvi');
  divisor(cvg, 'cvg');
  nonNegative(cv, 'cv');
  if (inBand(cvi) && inBand(cvg) && inBand(cv)) return Math.hypot(cvi, cv) / cvg;
  return fits(toDouble(over(hypotenuse(scaled(cvi), scaled(cv)), scaled(cvg))), { cvi, cvg, cv });
}

/**
 * BV.SETPOINT: specimens needed to estimate a person's homeostatic set point within ±closeness %,
 * n = ⌈(z·√(CV_A² + CVI²)/closeness)²⌉ (Harris EK, Clin Chem 1974;20:1535–42; from memory).
 * A square within 1e-12 (relative) of a whole number is taken as that whole number before the
 * ceiling, so a result that is a whole number in exact arithmetic is not pushed up by binary
 * rounding; at least one specimen. The square is taken on scaled numbers; beyond 1.8e308 it is
 * #NUM!. closeness > 0, cv, cvi, z ≥ 0.
 */
export function setPointSpecimens(cv: number, cvi: number, closeness: number, z: number): number {
  nonNegative(cv, 'cv');
  nonNegative(cvi, 'cvi');
  divisor(closeness, 'closeness');
  nonNegative(z, 'z');
  let square = Infinity;
  if (inBand(cv) && inBand(cvi) && inBand(closeness) && inBand(z)) {
    const r = (z * Math.hypot(cv, cvi)) / closeness;
    square = r * r; // a square that overflows here is taken again on scaled numbers
  }
  if (square === Infinity) {
    const ratio = over(times(scaled(z), hypotenuse(scaled(cv), scaled(cvi))), scaled(closeness));
    square = fits(toDouble(times(ratio, ratio)), { cv, cvi, closeness, z }, 'the number of specimens');
  }
  const whole = Math.round(square);
  return Math.max(1, Math.abs(square - whole) <= 1e-12 * square ? whole : Math.ceil(square));
}
