/**
 * DATA.PRECISION: precision from replicates grouped by run or day, by one-way analysis of
 * variance (random-effects model), as in ISO 5725-2 and CLSI EP15-A3 precision designs.
 *
 *   SS_within  = Σᵢ Σⱼ (xᵢⱼ − x̄ᵢ)²,  MS_within  = SS_within / (N − k)
 *   SS_between = Σᵢ nᵢ (x̄ᵢ − x̄)²,   MS_between = SS_between / (k − 1)
 *   n₀ = (N − Σ nᵢ²/N) / (k − 1)     (= n for k groups of n results each)
 *   repeatability SD  s_r = √MS_within
 *   between-group SD  s_b = √max(0, (MS_between − MS_within) / n₀)
 *   within-lab SD     s_WL = √(s_r² + s_b²)
 *   repeatability df  ν_r = N − k
 *   within-lab df     ν_WL = s_WL⁴ / [ (MS_between/n₀)²/(k − 1) + ((1 − 1/n₀)·MS_within)²/(N − k) ]
 *                     when s_b² > 0 (then s_WL² = MS_between/n₀ + (1 − 1/n₀)·MS_within, a linear
 *                     combination of the two mean squares), else ν_WL = N − k (s_WL = s_r)
 *
 * The within-lab df is Satterthwaite's approximation for a linear combination of mean squares
 * (Satterthwaite FE. An approximate distribution of estimates of variance components. Biometrics
 * Bulletin 1946;2:110–4), as CLSI EP15-A3 uses it for the within-laboratory SD; it may be
 * fractional and lies between min(k − 1, N − k) and (k − 1) + (N − k). n₀ ≥ 1 whenever N > k.
 *
 * k groups, N results, nᵢ results in group i; a group of one result counts in k, N and n₀.
 * Units: SDs in the unit of the results, CVs in percent of the grand mean x̄ (mean of all N).
 * Domain: N ≥ 2, k ≥ 2 and N > k (some group has two results), else #NUM!.
 *
 * Method (numerical): every value is first shifted by the first result (exact when the data share
 * leading digits); group and grand means are corrected two-pass means, and both sums of squares
 * are taken about them (Chan, Golub & LeVeque, Am Stat 1983;37:242–7). No one-pass sums of
 * squares: NIST StRD SmLs07–09 (13 constant leading digits) keep as many digits as a double can
 * hold of their deviations.
 *
 * Range: results whose largest magnitude lies outside 2^-400 … 2^400 are first multiplied by the
 * power of two 2^-scale that brings the largest to 0.5 … 1 (exact; scaleData in describe.ts), so
 * no square or sum leaves the double range. The sums of squares and mean squares are reported in
 * those scaled units (multiply by 2^(2·scale) for the unit of the results squared; scale = 0 for
 * ordinary data), so ratios of them (F, degrees of freedom) are right at any scale; the mean and
 * SDs are scaled back once (an SD beyond 1.8e308 is Infinity here, for the caller to report).
 */
import { numError, valueError } from '../errors';
import { Scaled, ldexp, scaled, timesPow2, toDouble } from '../scaled';
import { meanScaled, scaleData } from './describe';

export interface PrecisionResult {
  /** Grand mean of all results. */
  readonly mean: number;
  readonly repeatabilitySd: number;
  readonly betweenSd: number;
  readonly withinLabSd: number;
  /** k, groups with at least one result. */
  readonly groups: number;
  /** N, results. */
  readonly results: number;
  /** Sums of squares and mean squares, in units of 2^(2·scale) × the unit of the results squared. */
  readonly ssBetween: number;
  readonly ssWithin: number;
  readonly msBetween: number;
  readonly msWithin: number;
  readonly n0: number;
  /** Σnᵢ², the sum of the squared group sizes. */
  readonly sumSquaredCounts: number;
  /** s_b² = max(0, (MS_between − MS_within)/n₀), the between-group variance (floored at 0), in the units of the mean squares. */
  readonly betweenVariance: number;
  /** ν_r = N − k, degrees of freedom of the repeatability variance. */
  readonly repeatabilityDf: number;
  /** ν_WL, Satterthwaite's degrees of freedom of the within-lab variance (N − k when s_b² = 0). */
  readonly withinLabDf: number;
  /** The results were multiplied by 2^-scale before the sums of squares (0 for ordinary data). */
  readonly scale: number;
  /** The mean and SDs as scaled numbers (never out of range, not rounded into it): CVs are taken on these. */
  readonly scaled: { readonly mean: Scaled; readonly repeatabilitySd: Scaled; readonly withinLabSd: Scaled };
}

/**
 * Satterthwaite's degrees of freedom of v₁ + v₂, each vᵢ an independent variance estimate (a
 * multiple of a mean square) with νᵢ degrees of freedom: (v₁ + v₂)² / (v₁²/ν₁ + v₂²/ν₂).
 * The terms may be negative (a difference of mean squares) as long as v₁ + v₂ > 0. Formed from
 * the shares vᵢ/(v₁ + v₂), so no square overflows or underflows. Satterthwaite FE, Biometrics
 * Bulletin 1946;2:110–4.
 */
export function satterthwaiteDf(v1: number, nu1: number, v2: number, nu2: number): number {
  const total = v1 + v2;
  const s1 = v1 / total;
  const s2 = v2 / total;
  return 1 / ((s1 * s1) / nu1 + (s2 * s2) / nu2);
}

/**
 * One-way ANOVA of `values` by the group key of each (`groups[i]` is the run or day of
 * `values[i]`; keys compare with ===, so the caller normalises labels).
 */
export function oneWayPrecision(data: ArrayLike<number>, groups: ArrayLike<string | number>): PrecisionResult {
  const N = data.length;
  if (groups.length !== N) {
    throw valueError(`values and groups do not pair up (${N} values, ${groups.length} group labels)`);
  }
  if (N < 2) throw numError(`a precision study needs at least 2 results (got ${N})`);

  const index = new Map<string | number, number>();
  const member = new Int32Array(N);
  for (let i = 0; i < N; i++) {
    let g = index.get(groups[i]);
    if (g === undefined) {
      g = index.size;
      index.set(groups[i], g);
    }
    member[i] = g;
  }
  const k = index.size;
  if (k < 2) throw numError(`a precision study needs results from at least 2 groups (runs or days) (got ${k})`);
  if (N === k) {
    throw numError('every group has a single result: at least one group needs 2 or more results for the repeatability SD');
  }

  const { values, k: scale } = scaleData(data);
  const shift = values[0];
  const count = new Float64Array(k);
  const sum = new Float64Array(k);
  let total = 0;
  for (let i = 0; i < N; i++) {
    const d = values[i] - shift;
    count[member[i]] += 1;
    sum[member[i]] += d;
    total += d;
  }
  const gm = new Float64Array(k);
  for (let g = 0; g < k; g++) gm[g] = sum[g] / count[g];
  let m = total / N;

  // Second pass: correct the means by the mean residual.
  const corr = new Float64Array(k);
  let corrTotal = 0;
  for (let i = 0; i < N; i++) {
    const d = values[i] - shift;
    corr[member[i]] += d - gm[member[i]];
    corrTotal += d - m;
  }
  for (let g = 0; g < k; g++) gm[g] += corr[g] / count[g];
  m += corrTotal / N;

  // Third pass: sums of squares about the corrected means.
  const resid = new Float64Array(k);
  let ssWithin = 0;
  for (let i = 0; i < N; i++) {
    const e = values[i] - shift - gm[member[i]];
    ssWithin += e * e;
    resid[member[i]] += e;
  }
  let ssBetween = 0;
  let sumSqCounts = 0;
  for (let g = 0; g < k; g++) {
    ssWithin -= (resid[g] * resid[g]) / count[g];
    const e = gm[g] - m;
    ssBetween += count[g] * e * e;
    sumSqCounts += count[g] * count[g];
  }
  ssWithin = Math.max(0, ssWithin);

  const msWithin = ssWithin / (N - k);
  const msBetween = ssBetween / (k - 1);
  const n0 = (N - sumSqCounts / N) / (k - 1);
  const betweenVar = Math.max(0, (msBetween - msWithin) / n0);
  const withinLabDf = betweenVar > 0 ? satterthwaiteDf(msBetween / n0, k - 1, (1 - 1 / n0) * msWithin, N - k) : N - k;
  const grandMean = meanScaled(data); // correctly rounded sum: keeps its digits when results cancel
  const repeatabilitySd = timesPow2(scaled(Math.sqrt(msWithin)), scale);
  const withinLabSd = timesPow2(scaled(Math.sqrt(msWithin + betweenVar)), scale);
  return {
    mean: toDouble(grandMean),
    repeatabilitySd: toDouble(repeatabilitySd),
    betweenSd: ldexp(Math.sqrt(betweenVar), scale),
    withinLabSd: toDouble(withinLabSd),
    groups: k,
    results: N,
    ssBetween,
    ssWithin,
    msBetween,
    msWithin,
    n0,
    sumSquaredCounts: sumSqCounts,
    betweenVariance: betweenVar,
    repeatabilityDf: N - k,
    withinLabDf,
    scale,
    scaled: { mean: grandMean, repeatabilitySd, withinLabSd },
  };
}
