/**
 * VERIFY.PRECISION: a manufacturer's (or a specification's) precision claim verified from the
 * laboratory's own replication study (CLSI EP15-A3, 2014: user verification of precision).
 *
 * The observed CVs are DATA.PRECISION's (one-way ANOVA by run or day): repeatability CV % =
 * 100·s_r/x̄ with ν_r = N − k degrees of freedom, within-lab CV % = 100·s_WL/x̄ with Satterthwaite's
 * ν_WL. An observed CV above its claim may still be consistent with it, since a CV from a small
 * study scatters; the verification limit is the largest CV the study could show with probability
 * 1 − α/L if the claim were true:
 *
 *   verification limit = claim·√(χ²_{1−α/L}(ν)/ν),  α = 0.05, L = samples
 *
 * (the upper confidence bound of a normal SD read the other way round; the form of EP15-A3's upper
 * verification limit, recalled from memory). Verified "yes" when the observed CV ≤ the limit, "no" otherwise. "no" says the study
 * shows more imprecision than the claim allows at this α: a matter for the laboratory to
 * investigate, not a conclusion on its own. L (whole, ≥ 1) is the number of materials in the
 * same study; each is tested at α/L so that the study as a whole keeps α.
 *
 * Units: claims and CVs in percent. Domain: as DATA.PRECISION (≥ 2 groups, some group with ≥ 2
 * results, values and groups paired); claims > 0 (#NUM!: 0 is out of range, a claim is not a
 * divisor here); samples a whole number ≥ 1 (#NUM!); the grand mean must be > 0 for a CV
 * (0 → #DIV/0!, negative → #NUM!).
 */
import { divError, numError } from '../errors';
import { positive, show } from '../guards';
import { chiSquareUpperQuantile } from '../data/chiSquare';
import { finiteResults, inRange, maxAbs, powerOfTwoScale, readSamples, scaledPrecision, VERIFY_ALPHA } from './common';

export type Verdict = 'yes' | 'no';

export interface PrecisionVerification {
  readonly repeatabilityCv: number;
  readonly repeatabilityClaim: number;
  readonly repeatabilityLimit: number;
  readonly repeatabilityVerified: Verdict;
  readonly withinLabCv: number;
  readonly withinLabClaim: number;
  readonly withinLabLimit: number;
  readonly withinLabVerified: Verdict;
  readonly repeatabilityDf: number;
  readonly withinLabDf: number;
}

/**
 * claim·√(χ²_{1−α/L}(ν)/ν): the largest CV consistent with the claim at α/L with ν degrees of
 * freedom. claim > 0, df > 0, samples whole ≥ 1 (#NUM!).
 */
export function verificationLimit(claim: number, df: number, samples = 1): number {
  positive(claim, 'claim');
  positive(df, 'df');
  const L = readSamples(samples);
  return claim * Math.sqrt(chiSquareUpperQuantile(VERIFY_ALPHA / L, df) / df);
}

export function verifyPrecision(
  values: ArrayLike<number>,
  groups: ArrayLike<string | number>,
  claimRepeatability: number,
  claimWithinLab: number,
  samples = 1,
): PrecisionVerification {
  positive(claimRepeatability, 'claim_repeatability');
  positive(claimWithinLab, 'claim_withinlab');
  const L = readSamples(samples);
  finiteResults(values, 'value');
  const f = powerOfTwoScale(maxAbs(values));
  const p = scaledPrecision(values, groups, f);
  if (p.mean === 0) throw divError('the mean of the results is zero: a CV divides by the mean');
  if (p.mean < 0) {
    throw numError(`the mean of the results must be > 0 for a CV (got ${show(p.mean / f)})`);
  }
  const repeatabilityCv = inRange((100 * p.repeatabilitySd) / p.mean, 'the repeatability CV');
  const withinLabCv = inRange((100 * p.withinLabSd) / p.mean, 'the within-lab CV');
  const repeatabilityLimit = inRange(verificationLimit(claimRepeatability, p.repeatabilityDf, L), 'the repeatability limit');
  const withinLabLimit = inRange(verificationLimit(claimWithinLab, p.withinLabDf, L), 'the within-lab limit');
  return {
    repeatabilityCv,
    repeatabilityClaim: claimRepeatability,
    repeatabilityLimit,
    repeatabilityVerified: repeatabilityCv <= repeatabilityLimit ? 'yes' : 'no',
    withinLabCv,
    withinLabClaim: claimWithinLab,
    withinLabLimit,
    withinLabVerified: withinLabCv <= withinLabLimit ? 'yes' : 'no',
    repeatabilityDf: p.repeatabilityDf,
    withinLabDf: p.withinLabDf,
  };
}
