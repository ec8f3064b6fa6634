/**
 * VERIFY.TRUENESS: trueness verified against a material with an assigned value (a reference
 * material, EQA or PT material, or a manufacturer's target), from the same kind of replication
 * study as VERIFY.PRECISION (CLSI EP15-A3, 2014: estimation of bias; uncertainty combined as in
 * JCGM 100:2008, GUM).
 *
 * From DATA.PRECISION's one-way ANOVA (k groups, N results, nᵢ per group, MS_B, MS_W, n₀,
 * s_r² = MS_W, s_b² floored at 0):
 *   mean x̄ of all N results; bias = x̄ − assigned; bias % = 100·bias/assigned
 *   SE² = s_b²·Σnᵢ²/N² + s_r²/N                  (= MS_B/N in a balanced design with MS_B ≥ MS_W)
 *   ν_SE: when s_b² > 0, SE² = a·MS_B + c·MS_W with a = Σnᵢ²/(N²·n₀), c = 1/N − a
 *         (= (N² − k·Σnᵢ²)/((k − 1)·N²·n₀) ≤ 0, zero when balanced), and Satterthwaite's
 *         ν_SE = SE⁴ / [ (a·MS_B)²/(k − 1) + (c·MS_W)²/(N − k) ]; else ν_SE = N − k
 *   u_c² = SE² + u_assigned²,  ν_c = u_c⁴ / (SE⁴/ν_SE)   (u_assigned taken with infinite df)
 *   verification interval = assigned ± t_{1−α/(2L)}(ν_c)·u_c,  α = 0.05, L = samples
 * Verified "yes" when x̄ lies in the interval (ends included), "no" otherwise: the study shows a
 * bias larger than the uncertainties explain at this α — a matter for investigation.
 *
 * When all results are equal, SE = 0 and ν_c is infinite: the normal quantile replaces t, and
 * the interval is assigned ± z·u_assigned (the single point `assigned` when u_assigned = 0, so
 * "yes" only when the mean equals it). The `df` figure is then an error (#NUM!: infinite df), as
 * it is when ν_c exceeds double range (SE negligible beside u_assigned); t is then the normal
 * quantile to all digits.
 *
 * Units: those of the results (bias % in percent). Domain: as DATA.PRECISION; assigned finite;
 * u_assigned ≥ 0; samples whole ≥ 1. Bias % is an error of its own (#DIV/0!) when assigned = 0,
 * so the other figures still stand.
 *
 * Method (numerical): when the results, assigned value and u_assigned are extremely large or
 * small, all are scaled by one power of two (exact) before squaring; Satterthwaite's df is formed
 * from shares of SE², so nothing overflows; u_c = hypot(SE, u_assigned).
 */
import { divError, LeewayError, numError } from '../errors';
import { finite, nonNegative } from '../guards';
import { normalQuantile } from '../normal';
import { satterthwaiteDf } from '../data/precision';
import { tQuantile } from '../data/studentT';
import { finiteResults, inRange, maxAbs, powerOfTwoScale, readSamples, scaledPrecision, VERIFY_ALPHA } from './common';
import { Verdict } from './precision';

export interface TruenessVerification {
  readonly mean: number;
  readonly assigned: number;
  readonly bias: number;
  /** 100·bias/assigned, or the error for this figure alone (#DIV/0! when assigned = 0). */
  readonly biasPercent: number | LeewayError;
  readonly standardError: number;
  readonly verificationLow: number;
  readonly verificationHigh: number;
  readonly verified: Verdict;
  /** ν_c, or #NUM! when it is infinite (SE = 0) or beyond double range. */
  readonly df: number | LeewayError;
}

export function verifyTrueness(
  values: ArrayLike<number>,
  groups: ArrayLike<string | number>,
  assigned: number,
  uAssigned: number,
  samples = 1,
): TruenessVerification {
  finite(assigned, 'assigned');
  nonNegative(uAssigned, 'u_assigned');
  const L = readSamples(samples);
  finiteResults(values, 'value');
  const f = powerOfTwoScale(Math.max(maxAbs(values), Math.abs(assigned), uAssigned));
  const p = scaledPrecision(values, groups, f);
  const N = p.results;
  const k = p.groups;

  let se2: number;
  let dfSe: number;
  if (p.betweenVariance > 0) {
    se2 = (p.betweenVariance * p.sumSquaredCounts) / (N * N) + p.msWithin / N;
    const a = p.sumSquaredCounts / (N * N * p.n0);
    const c = (N * N - k * p.sumSquaredCounts) / ((k - 1) * N * N * p.n0);
    dfSe = satterthwaiteDf(a * p.msBetween, k - 1, c * p.msWithin, N - k);
  } else {
    se2 = p.msWithin / N;
    dfSe = N - k;
  }
  const se = Math.sqrt(se2);
  const uA = uAssigned * f;
  const uc = Math.hypot(se, uA);
  let dfC: number;
  if (se === 0) dfC = Infinity;
  else {
    const r = uA / se;
    dfC = dfSe * (1 + r * r) * (1 + r * r);
  }
  const tail = VERIFY_ALPHA / (2 * L);
  const t = Number.isFinite(dfC) ? -tQuantile(tail, dfC) : -normalQuantile(tail);
  const half = inRange((t * uc) / f, 'the half-width of the verification interval');
  const mean = p.mean / f;
  const low = inRange(assigned - half, 'the low end of the verification interval');
  const high = inRange(assigned + half, 'the high end of the verification interval');
  const bias = inRange(mean - assigned, 'the bias');

  let biasPercent: number | LeewayError;
  if (assigned === 0) biasPercent = divError('assigned is zero: the bias in percent divides by the assigned value');
  else {
    const v = (100 * bias) / assigned;
    biasPercent = Number.isFinite(v) ? v : numError('the bias in percent is beyond the range of double precision (about 1.8e308)');
  }
  let df: number | LeewayError;
  if (se === 0) df = numError('the results are all equal, so the standard error is 0 and the df is infinite (the normal quantile was used)');
  else if (!Number.isFinite(dfC)) df = numError('the df is beyond the range of double precision: the standard error is negligible beside u_assigned (the normal quantile was used)');
  else df = dfC;

  return {
    mean,
    assigned,
    bias,
    biasPercent,
    standardError: se / f,
    verificationLow: low,
    verificationHigh: high,
    verified: mean >= low && mean <= high ? 'yes' : 'no',
    df,
  };
}
