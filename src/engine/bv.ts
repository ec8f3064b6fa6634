/**
 * Other uses of biological variation (BV family). CVs are percent numbers.
 */
import { divisor, nonNegative } from './guards';
import { makeWordReader } from './words';

/**
 * BV.RCV: reference change value, RCV = √2·z·√(CV_A² + CVI²), the percent difference between two
 * consecutive results of one person that is unlikely (at the z chosen) to be analytical and
 * within-person noise alone. Harris EK, Yasaka T. Clin Chem 1983;29:25–30. cv, cvi, z ≥ 0.
 */
export function referenceChangeValue(cv: number, cvi: number, z: number): number {
  nonNegative(cv, 'cv');
  nonNegative(cvi, 'cvi');
  nonNegative(z, 'z');
  return Math.SQRT2 * z * Math.hypot(cv, cvi);
}

export type Direction = 'up' | 'down';

export const readDirection = makeWordReader<Direction>('direction', { up: ['rise', 'increase'], down: ['fall', 'decrease'] });

/**
 * BV.RCVLOG: log-normal (asymmetric) RCV, Fokkema MR et al. Clin Chem 2006;52:1602–3.
 * σ = √ln(1 + (√(CV_A² + CVI²)/100)²); up = (e^{z√2σ} − 1)·100, down = (e^{−z√2σ} − 1)·100.
 * Not linear: inputs must be percent numbers. cv, cvi, z ≥ 0.
 */
export function logNormalRcv(cv: number, cvi: number, z: number, direction: Direction): number {
  nonNegative(cv, 'cv');
  nonNegative(cvi, 'cvi');
  nonNegative(z, 'z');
  const c = Math.hypot(cv, cvi) / 100;
  const sigma = Math.sqrt(Math.log1p(c * c));
  const e = Math.SQRT2 * z * sigma;
  return 100 * Math.expm1(direction === 'up' ? e : -e);
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
  return Math.hypot(cvi, cv) / cvg;
}

/**
 * BV.SETPOINT: specimens needed to estimate a person's homeostatic set point within ±closeness %,
 * n = ⌈(z·√(CV_A² + CVI²)/closeness)²⌉ (Harris EK, Clin Chem 1974;20:1535–42; from memory).
 * The square is rounded to 12 significant digits before the ceiling, so a result that is a whole
 * number in exact arithmetic is not pushed up by binary rounding; at least one specimen.
 * closeness > 0, cv, cvi, z ≥ 0.
 */
export function setPointSpecimens(cv: number, cvi: number, closeness: number, z: number): number {
  nonNegative(cv, 'cv');
  nonNegative(cvi, 'cvi');
  divisor(closeness, 'closeness');
  nonNegative(z, 'z');
  const ratio = (z * Math.hypot(cv, cvi)) / closeness;
  const square = ratio * ratio;
  if (!Number.isFinite(square)) return Infinity;
  return Math.max(1, Math.ceil(Number(square.toPrecision(12))));
}
