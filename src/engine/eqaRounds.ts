/**
 * EQA across rounds: one analyte's results in successive proficiency-testing rounds, each scored
 * and judged, with the running picture of its deviation from the assigned values. Computed once
 * here and read by the EQA sheet writer and its chart; nothing here formats or rounds for display.
 *
 * Per round, in the order given (the results file's order, which the importer keeps):
 *   deviation % = 100·(result − assigned)/assigned
 *   score       = z = (result − assigned)/sd_pt when the assigned value's uncertainty is negligible,
 *                 u_assigned ≤ 0.3·sd_pt (0 or absent included); else
 *                 z′ = (result − assigned)/√(sd_pt² + u_assigned²)
 *                 (ISO 13528:2015 9.2.1, 9.4, 9.5; clause numbers from memory)
 *   ζ           = (result − assigned)/√(u_result² + u_assigned²), only when the laboratory states
 *                 its own standard uncertainty u_result for the round (9.6). It is shown beside
 *                 z or z′ and never replaces it: z and z′ judge the result against the scheme's
 *                 fitness-for-purpose spread, ζ judges the result and the laboratory's stated
 *                 uncertainty together.
 *   band        = scoreBand of the score as reported (rounded half away from zero to
 *                 `bandDecimals`, 2 by default): |s| ≤ 2 satisfactory, 2 < |s| < 3 questionable,
 *                 |s| ≥ 3 unsatisfactory
 *   running mean % = mean of the deviations % of this round and every earlier one
 *   running RMS %  = √(mean of their squares): bias and scatter together
 *                 (a round whose deviation is an error is left out of later running figures)
 *   EQA limit % = SPEC.FIXED(assigned, absolute, percent or 0) when the limit has an absolute
 *                 part (it is judged at the round's assigned value), the percent alone otherwise
 *   within limit = |deviation %| ≤ EQA limit %
 *
 * Every figure is a Fig (src/engine/assess.ts): a value, the engine's error (code and message)
 * or an absence with its reason. The EQA provider's own evaluation is the one of record; these
 * figures are the laboratory's own reading of its results.
 */
import { absent, step, then, value } from './assess';
import type { Fig } from './assess';
import { consensus, eqaZeta, eqaZScore, scoreBand } from './eqa';
import type { Consensus, ScoreBand } from './eqa';
import { divError, numError } from './errors';
import { finite, nonNegative, show } from './guards';
import { fixedLimitPercent } from './spec';

/** u_assigned at or below this share of sd_pt is negligible: the plain z is used (ISO 13528:2015 9.2.1, from memory). */
export const NEGLIGIBLE_U_SHARE = 0.3;

/** Decimals the band is taken at by default: scores are reported to two decimals. */
export const BAND_DECIMALS = 2;

/** z: the plain score; z′: with the assigned value's uncertainty. */
export type ScoreKind = 'z' | 'z′';

/** One round of one analyte, as read from an EQA results file. */
export interface EqaRoundInput {
  /** The scheme's round or sample label. */
  readonly round: string;
  readonly result: number;
  readonly assigned: number;
  /** Standard deviation for proficiency assessment, > 0. */
  readonly sdPt: number;
  /** Standard uncertainty of the assigned value, ≥ 0 (0 when not given). */
  readonly uAssigned: number;
  /** The laboratory's own standard uncertainty of its result (same unit); absent: no ζ. */
  readonly uResult?: number | null;
  readonly date?: string | null;
}

/** An EQA limit "± absolute units or ± percent, whichever is greater"; either part may be absent. */
export interface EqaLimit {
  readonly absolute?: number | null;
  readonly percent?: number | null;
}

export interface EqaRoundFigures {
  readonly input: EqaRoundInput;
  /** 100·(result − assigned)/assigned. */
  readonly deviation: Fig<number>;
  readonly scoreKind: ScoreKind;
  /** z or z′ by scoreKind. */
  readonly score: Fig<number>;
  readonly band: Fig<ScoreBand>;
  /** Absent unless the round gives u_result. */
  readonly zeta: Fig<number>;
  readonly zetaBand: Fig<ScoreBand>;
  /** Mean deviation % over this and earlier rounds. */
  readonly runningMean: Fig<number>;
  /** RMS deviation % over this and earlier rounds. */
  readonly runningRms: Fig<number>;
  /** How many rounds the running figures cover. */
  readonly counted: number;
  /** The EQA limit in percent at this round's assigned value. */
  readonly limit: Fig<number>;
  readonly withinLimit: Fig<boolean>;
}

export interface EqaRoundsSummary {
  readonly rounds: number;
  readonly satisfactory: number;
  readonly questionable: number;
  readonly unsatisfactory: number;
  /** Rounds whose limit verdict could be taken, and how many were within it. */
  readonly judged: number;
  readonly within: number;
  /** The running figures after the last round (absent with no deviation at all). */
  readonly mean: Fig<number>;
  readonly rms: Fig<number>;
}

export interface EqaAnalyteRounds {
  readonly analyte: string;
  readonly rounds: readonly EqaRoundFigures[];
  readonly summary: EqaRoundsSummary;
}

export interface EqaRoundsOptions {
  readonly limit?: EqaLimit | null;
  /** Decimals the band is taken at (0…15); default BAND_DECIMALS. */
  readonly bandDecimals?: number;
}

/** z when u_assigned ≤ 0.3·sd_pt (negligible), else z′. */
export function scoreKindOf(sdPt: number, uAssigned: number): ScoreKind {
  return uAssigned <= NEGLIGIBLE_U_SHARE * sdPt ? 'z' : 'z′';
}

/** 100·(result − assigned)/assigned, percent. assigned 0 is #DIV/0!; a result beyond the largest double is #NUM!. */
export function deviationPercent(result: number, assigned: number): number {
  finite(result, 'result');
  finite(assigned, 'assigned');
  if (assigned === 0) throw divError('assigned is zero: the deviation in percent divides by it');
  const diff = result - assigned;
  // Both near the largest double with opposite signs: the difference overflows, their ratio does not.
  const out = 100 * (Number.isFinite(diff) ? diff / assigned : result / assigned - 1);
  if (!Number.isFinite(out)) {
    throw numError(`the deviation of result ${show(result)} from assigned ${show(assigned)} is beyond the largest number a cell holds`);
  }
  return out === 0 ? 0 : out;
}

/** The EQA limit in percent at `level` (the round's assigned value), by the fixed-limit rule of SPEC.FIXED. */
export function eqaLimitPercent(limit: EqaLimit | null | undefined, level: number): Fig<number> {
  const abs = limit?.absolute ?? null;
  const pct = limit?.percent ?? null;
  if (abs !== null) return step(() => fixedLimitPercent(level, abs, pct ?? 0));
  if (pct !== null) return step(() => nonNegative(pct, 'percent'));
  return absent('no EQA limit given');
}

/**
 * Running mean and RMS of a list of deviations (at least one). Plain sums; when a sum of squares
 * overflows, the squares are taken of the deviations divided by the largest one.
 */
function running(devs: readonly number[]): { mean: number; rms: number } {
  const n = devs.length;
  let sum = 0;
  let sq = 0;
  for (const d of devs) {
    sum += d;
    sq += d * d;
  }
  let mean = sum / n;
  let rms = Math.sqrt(sq / n);
  if (!Number.isFinite(mean) || !Number.isFinite(rms)) {
    const big = Math.max(...devs.map(Math.abs));
    let s1 = 0;
    let s2 = 0;
    for (const d of devs) {
      s1 += d / big;
      s2 += (d / big) ** 2;
    }
    mean = (s1 / n) * big;
    rms = Math.sqrt(s2 / n) * big;
  }
  if (!Number.isFinite(mean) || !Number.isFinite(rms)) throw numError('the running mean of the deviations is beyond the largest number a cell holds');
  return { mean, rms };
}

/** One analyte's rounds, in the order given, scored and judged. */
export function eqaRounds(analyte: string, rounds: readonly EqaRoundInput[], options: EqaRoundsOptions = {}): EqaAnalyteRounds {
  const decimals = options.bandDecimals ?? BAND_DECIMALS;
  const devs: number[] = [];
  const out: EqaRoundFigures[] = rounds.map((r) => {
    const deviation = step(() => deviationPercent(r.result, r.assigned));
    const kind = scoreKindOf(r.sdPt, r.uAssigned);
    const score = step(() => (kind === 'z' ? eqaZScore(r.result, r.assigned, r.sdPt) : eqaZScore(r.result, r.assigned, r.sdPt, r.uAssigned)));
    const band = then(score, (s) => scoreBand(s, decimals));
    const uResult = r.uResult ?? null;
    const zeta: Fig<number> = uResult === null ? absent('no laboratory uncertainty given') : step(() => eqaZeta(r.result, r.assigned, uResult, r.uAssigned));
    const zetaBand = then(zeta, (s) => scoreBand(s, decimals));
    let runningMean: Fig<number>;
    let runningRms: Fig<number>;
    if (deviation.ok) {
      devs.push(deviation.value);
      const run = step(() => running(devs));
      runningMean = then(run, (x) => x.mean);
      runningRms = then(run, (x) => x.rms);
    } else {
      runningMean = deviation;
      runningRms = deviation;
    }
    const limit = eqaLimitPercent(options.limit, r.assigned);
    const withinLimit: Fig<boolean> = deviation.ok && limit.ok ? value(Math.abs(deviation.value) <= limit.value) : deviation.ok ? (limit as Fig<never>) : (deviation as Fig<never>);
    return { input: r, deviation, scoreKind: kind, score, band, zeta, zetaBand, runningMean, runningRms, counted: devs.length, limit, withinLimit };
  });
  const count = (b: ScoreBand): number => out.filter((r) => r.band.ok && r.band.value === b).length;
  const last = [...out].reverse().find((r) => r.deviation.ok);
  const none = absent<number>('no round with a deviation');
  return {
    analyte,
    rounds: out,
    summary: {
      rounds: out.length,
      satisfactory: count('satisfactory'),
      questionable: count('questionable'),
      unsatisfactory: count('unsatisfactory'),
      judged: out.filter((r) => r.withinLimit.ok).length,
      within: out.filter((r) => r.withinLimit.ok && r.withinLimit.value).length,
      mean: last ? last.runningMean : none,
      rms: last ? last.runningRms : none,
    },
  };
}

/** One participant of a comparison round (an analyser or a site). */
export interface PeerResult {
  readonly name: string;
  readonly result: number;
}

export interface PeerScore {
  readonly name: string;
  readonly result: number;
  /** 100·(result − x*)/x*. */
  readonly deviation: Fig<number>;
  readonly score: Fig<number>;
  readonly band: Fig<ScoreBand>;
}

export interface PeerRound {
  /** Algorithm A's x*, s*, p and u(x*). */
  readonly consensus: Fig<Consensus>;
  /** z when u(x*) ≤ 0.3·s*, else z′ (u(x*) / s* = 1.25/√p, so z from 18 participants on). */
  readonly scoreKind: Fig<ScoreKind>;
  readonly scores: readonly PeerScore[];
}

/**
 * A comparison round among the laboratory's own analysers or sites, scored against their
 * consensus: the assigned value is Algorithm A's robust mean x*, sd_pt its robust SD s*, and
 * u_assigned = 1.25·s* / √p (ISO 13528:2015 annex C and 7.7.3, from memory); each result's score is
 * z or z′ by the same negligibility rule as a scheme's round. With s* = 0 every score is #DIV/0!.
 */
export function scorePeerRound(results: readonly PeerResult[], bandDecimals = BAND_DECIMALS): PeerRound {
  const c = step(() => consensus(results.map((r) => r.result)));
  const kind = then(c, (x) => scoreKindOf(x.robustSd, x.uncertainty));
  const scores = results.map((r) => {
    const deviation = then(c, (x) => deviationPercent(r.result, x.robustMean));
    const score = c.ok && kind.ok ? step(() => (kind.value === 'z' ? eqaZScore(r.result, c.value.robustMean, c.value.robustSd) : eqaZScore(r.result, c.value.robustMean, c.value.robustSd, c.value.uncertainty))) : (c as Fig<never>);
    return { name: r.name, result: r.result, deviation, score, band: then(score, (s) => scoreBand(s, bandDecimals)) };
  });
  return { consensus: c, scoreKind: kind, scores };
}
