/**
 * External quality assessment (EQA family): the performance scores of a laboratory's result in a
 * proficiency-testing round (z, z′, ζ), the band a score falls in, and a consensus assigned value
 * from participants' results by Algorithm A. Source: ISO 13528:2015, Statistical methods for use
 * in proficiency testing by interlaboratory comparison (clause 9 for the scores, annex C for
 * Algorithm A; clause numbers from memory).
 *
 * Units: result, assigned value, standard deviation for proficiency assessment and standard
 * uncertainties share one unit, any unit; the scores are pure numbers.
 */
import { divError, numError } from './errors';
import { divisor, finite, nonNegative, show, wholeNumber } from './guards';
import { roundHalfUp } from './round';

/**
 * (result − assigned)/√(a² + b²) for a, b ≥ 0 and not both 0, with no overflow or underflow
 * on the way: with m = max(a, b) and q = min(a, b)/m ∈ [0, 1], √(a² + b²) = m·√(1 + q²), so
 * the score is ((result − assigned)/m)/√(1 + q²). When (result − assigned)/m overflows, the
 * division by √(1 + q²) ∈ [1, √2] is done first; when result − assigned itself overflows (both
 * near the largest double, opposite signs), the halves are subtracted (exact halving) and the
 * score doubled. A score that is larger than the largest double is #NUM!, never Infinity.
 *
 * Method: at most four roundings (difference, √(1 + q²), two divisions): relative error below
 * about 4·2⁻⁵³ ≈ 4.4e-16 of the score of the inputs as stored. A score smaller than about 1e-308
 * (a subnormal double) keeps an absolute accuracy of about 5e-324 only; it is 0 for any use.
 */
function scaledScore(result: number, assigned: number, a: number, b: number, tooLarge: () => string): number {
  const m = Math.max(a, b);
  const q = Math.min(a, b) / m;
  const r = Math.sqrt(1 + q * q);
  const quotient = (d: number): number => {
    const t = d / m;
    return Number.isFinite(t) ? t / r : d / r / m;
  };
  const d = result - assigned;
  const score = Number.isFinite(d) ? quotient(d) : 2 * quotient(result / 2 - assigned / 2);
  if (!Number.isFinite(score)) throw numError(tooLarge());
  // −0 (a difference that underflowed) is shown as 0.
  return score === 0 ? 0 : score;
}

/** The message for a score beyond the largest double, naming the inputs as given. */
function tooLargeScore(result: number, assigned: number, spread: string): string {
  return (
    'the score is beyond the largest number a cell holds: ' +
    `result ${show(result)} and assigned ${show(assigned)} differ by more than 1.8e308 times ${spread}`
  );
}

/**
 * EQA.ZSCORE: z = (x − x_pt)/σ_pt, the laboratory's result x against the assigned value x_pt in
 * units of the standard deviation for proficiency assessment σ_pt set by the scheme
 * (ISO 13528:2015 9.4). With u(x_pt) > 0, z′ = (x − x_pt)/√(σ_pt² + u(x_pt)²) (9.5), for when
 * the uncertainty of the assigned value is not negligible (it is negligible when
 * u(x_pt) < 0.3·σ_pt, 9.2.1; clause numbers from memory). u(x_pt) = 0 gives z itself.
 * Domain: result, assigned finite; sd_pt > 0 (0 is #DIV/0!, negative #NUM!); u_assigned ≥ 0.
 */
export function eqaZScore(result: number, assigned: number, sdPt: number, uAssigned = 0): number {
  finite(result, 'result');
  finite(assigned, 'assigned');
  divisor(sdPt, 'sd_pt');
  nonNegative(uAssigned, 'u_assigned');
  return scaledScore(result, assigned, sdPt, uAssigned, () =>
    tooLargeScore(
      result,
      assigned,
      uAssigned > 0
        ? `√(sd_pt² + u_assigned²) (sd_pt ${show(sdPt)}, u_assigned ${show(uAssigned)})`
        : `sd_pt ${show(sdPt)}`,
    ),
  );
}

/**
 * EQA.ZETA: ζ = (x − x_pt)/√(u(x)² + u(x_pt)²), the laboratory's result x against the assigned
 * value x_pt in units of the combined standard uncertainty of the two, u(x) the laboratory's own
 * standard uncertainty of its result (ISO 13528:2015 9.6, from memory). It judges the result and
 * the laboratory's stated uncertainty together.
 * Domain: result, assigned finite; u_result, u_assigned ≥ 0, not both 0 (#DIV/0!).
 */
export function eqaZeta(result: number, assigned: number, uResult: number, uAssigned: number): number {
  finite(result, 'result');
  finite(assigned, 'assigned');
  nonNegative(uResult, 'u_result');
  nonNegative(uAssigned, 'u_assigned');
  if (uResult === 0 && uAssigned === 0) {
    throw divError('u_result and u_assigned are both zero: ζ divides by √(u_result² + u_assigned²)');
  }
  return scaledScore(result, assigned, uResult, uAssigned, () =>
    tooLargeScore(
      result,
      assigned,
      `√(u_result² + u_assigned²) (u_result ${show(uResult)}, u_assigned ${show(uAssigned)})`,
    ),
  );
}

export type ScoreBand = 'satisfactory' | 'questionable' | 'unsatisfactory';

/** The most decimals `scoreBand` rounds to (a double carries about 15–17 significant digits). */
export const BAND_MAX_DECIMALS = 15;

/**
 * The band of a z, z′ or ζ score (ISO 13528:2015 9.4.1, from memory):
 *   |s| ≤ 2        satisfactory   (no signal)
 *   2 < |s| < 3    questionable   (warning signal)
 *   |s| ≥ 3        unsatisfactory (action signal)
 * A score of exactly 3 is unsatisfactory: ISO 13528 gives the action signal at |z| ≥ 3.0, and
 * the two bands must meet somewhere; exactly 2 is satisfactory (|z| ≤ 2.0 in both readings).
 *
 * The band is taken on the number as given. A score computed from decimal inputs can land a
 * hair beside a boundary (10.3 is stored as 10.300000000000000710…): give `decimals` to band
 * the score as it is reported, rounded half away from zero to that many decimals first.
 * Domain: score finite; decimals a whole number 0…15.
 */
export function scoreBand(score: number, decimals?: number): ScoreBand {
  finite(score, 'score');
  let s = score;
  if (decimals !== undefined) {
    wholeNumber(decimals, 'decimals', 0);
    if (decimals > BAND_MAX_DECIMALS) {
      throw numError(`decimals must be at most ${BAND_MAX_DECIMALS} (got ${show(decimals)})`);
    }
    s = roundHalfUp(score, decimals);
  }
  const a = Math.abs(s);
  if (a <= 2) return 'satisfactory';
  if (a < 3) return 'questionable';
  return 'unsatisfactory';
}

/**
 * What EQA.CONSENSUS returns; its labels are `Robust mean`, `Robust SD`, `Participants`,
 * `Uncertainty of the assigned value`.
 */
export interface Consensus {
  /** x*, Algorithm A's robust mean. */
  readonly robustMean: number;
  /** s*, Algorithm A's robust standard deviation. */
  readonly robustSd: number;
  /** p, the number of results. */
  readonly participants: number;
  /** u(x_pt) = 1.25·s* / √p, the standard uncertainty of x* used as an assigned value. */
  readonly uncertainty: number;
  /** Update rounds done (0 when the first s* is 0). */
  readonly rounds: number;
}

/** Relative change below which Algorithm A has settled. */
export const CONSENSUS_TOLERANCE = 1e-12;
/** The most update rounds Algorithm A may take. */
export const CONSENSUS_MAX_ROUNDS = 1000;

/** Median of a sorted array. */
function medianOfSorted(a: Float64Array): number {
  const n = a.length;
  const h = n >> 1;
  if (n % 2) return a[h];
  const s = a[h - 1] + a[h];
  return Number.isFinite(s) ? s / 2 : a[h - 1] / 2 + a[h] / 2;
}

/**
 * EQA.CONSENSUS: robust mean and SD of participants' results by Algorithm A
 * (ISO 13528:2015 annex C.3.1), and the standard uncertainty of the robust mean used as the
 * assigned value, u(x_pt) = 1.25·s* / √p (ISO 13528:2015 7.7.3, from memory).
 *
 *   start:  x* = median(xᵢ), s* = 1.483·median|xᵢ − x*|
 *   round:  δ = 1.5·s*; xᵢ* = xᵢ clipped into [x* − δ, x* + δ];
 *           x* = mean(xᵢ*), s* = 1.134·√(Σ(xᵢ* − x*)²/(p − 1))
 *   stop:   when both x* and s* change by less than 1e-12·s* in a round.
 * When the first s* is 0 (more than half the results equal), x* is the median and s* = 0,
 * with no rounds. The constants 1.483 and 1.134 are the standard's, as printed.
 *
 * Stop rule: each change is measured against the new s*, the scale of the data. Against |x*|
 * the rule would fail when x* = 0 and would stop a mean of 10,000 with an SD of 0.1 while x*
 * still moved by 1e-7 of its SD; against s* it is at least as strict as against
 * max(|x*|, s*). It can always be met because the rounds run on the results centred on their
 * median and scaled by a power of two near median|xᵢ − x*|, where the rounding noise of a
 * round is a few 1e-16 of s*. A set that has not settled after `maxRounds` rounds (1,000) is
 * #NUM!, not a number that might still be moving: Algorithm A creeps when a large share of
 * the results (a quarter or more) lie far out. `maxRounds` is for tests; the worksheet
 * function uses the default.
 *
 * Method: sorting for the medians; each round's mean by the corrected two-pass method and its
 * SD from the deviations divided by δ (every |xᵢ* − x*|/δ ≤ 2, so no square overflows or
 * underflows). When any result is 2¹⁰⁰⁰ (about 1e301) or more in size, all are first scaled
 * by 2⁻⁶⁴ (exact for every result above 1e-288), so no difference or sum can overflow. Settled x* and s* agree with a 60-digit evaluation
 * of the same rounds, run to full settling, within 1e-10 of s* (the stop rule leaves up to a
 * few 1e-11), and x* within its own last bit besides.
 * Domain: at least 3 finite numbers (#NUM!).
 */
export function consensus(values: ArrayLike<number>, maxRounds = CONSENSUS_MAX_ROUNDS): Consensus {
  const p = values.length;
  if (p < 3) throw numError(`a consensus by Algorithm A needs at least 3 results (got ${p})`);
  wholeNumber(maxRounds, 'maxRounds', 1);
  let largest = 0;
  for (let i = 0; i < p; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) throw numError(`value ${i + 1} must be a finite number (got ${show(v)})`);
    largest = Math.max(largest, Math.abs(v));
  }
  // Power-of-two pre-scaling of huge sets, so no difference or sum below can overflow.
  const unscale = largest >= 2 ** 1000 ? 2 ** 64 : 1;
  const x = new Float64Array(p);
  for (let i = 0; i < p; i++) x[i] = values[i] / unscale;

  const sorted = x.slice().sort();
  const median = medianOfSorted(sorted);
  const dev = new Float64Array(p);
  for (let i = 0; i < p; i++) dev[i] = Math.abs(x[i] - median);
  dev.sort();
  const mad = medianOfSorted(dev);
  if (mad === 0) {
    return { robustMean: median * unscale, robustSd: 0, participants: p, uncertainty: 0, rounds: 0 };
  }

  // Work in w = (x − median)/c, c a power of two near the MAD: exact scaling, s* of order 1.
  const c = 2 ** Math.max(-1074, Math.min(1023, Math.floor(Math.log2(mad))));
  const w = new Float64Array(p);
  for (let i = 0; i < p; i++) w[i] = (x[i] - median) / c;
  let xs = 0;
  let ss = 1.483 * (mad / c);
  const clipped = new Float64Array(p);
  let rounds = 0;
  for (;;) {
    if (rounds === maxRounds) {
      throw numError(
        `Algorithm A did not settle within ${maxRounds} rounds (${p} results): ` +
          'the results hold too many far outliers for a robust mean',
      );
    }
    const delta = 1.5 * ss;
    const lo = xs - delta;
    const hi = xs + delta;
    let sum = 0;
    for (let i = 0; i < p; i++) {
      const v = w[i] < lo ? lo : w[i] > hi ? hi : w[i];
      clipped[i] = v;
      sum += v;
    }
    let mean = sum / p;
    let residual = 0;
    for (let i = 0; i < p; i++) residual += clipped[i] - mean;
    mean += residual / p;
    let sq = 0;
    let lin = 0;
    for (let i = 0; i < p; i++) {
      const e = (clipped[i] - mean) / delta;
      sq += e * e;
      lin += e;
    }
    const sNew = 1.134 * delta * Math.sqrt(Math.max(0, sq - (lin * lin) / p) / (p - 1));
    rounds++;
    if (!Number.isFinite(mean) || !Number.isFinite(sNew) || !(sNew > 0)) {
      throw numError(
        `Algorithm A did not settle (${p} results): the robust SD left the range of numbers after ${rounds} rounds`,
      );
    }
    const dx = Math.abs(mean - xs);
    const ds = Math.abs(sNew - ss);
    xs = mean;
    ss = sNew;
    if (dx < CONSENSUS_TOLERANCE * ss && ds < CONSENSUS_TOLERANCE * ss) break;
  }

  const robustMean = (median + c * xs) * unscale;
  const robustSd = c * ss * unscale;
  const uncertainty = 1.25 * (robustSd / Math.sqrt(p));
  if (!Number.isFinite(robustMean) || !Number.isFinite(robustSd)) {
    throw numError(
      `the robust mean or SD of these ${p} results is beyond the largest number a cell holds (about 1.8e308)`,
    );
  }
  return { robustMean, robustSd, participants: p, uncertainty, rounds };
}
