/**
 * QC.REVIEW: a period of control results summarised, from the flags of flags.ts.
 *
 * Figures (labels as in the catalogue, in this order):
 *   Results                            results with a number value
 *   Runs                               runs holding at least one such result
 *   Runs flagged                       runs in which at least one result carries a flag
 *   Share of runs flagged              Runs flagged / Runs
 *   Expected false rejection per run   mean over the runs of QC.FALSEREJECT(rule, n_r), n_r the
 *                                      run's number of results: the share of runs a stable
 *                                      method would see flagged when each run is read alone
 *   Mean z                             mean of z = (value − target)/sd
 *   SD of z                            sample SD of z (n − 1); above 1 the method varies more
 *                                      than the SD in use
 *   Results beyond 2 SD                count of |z| > 2
 * A figure that cannot be computed is a LeewayError in its place (the rest still stand): SD of z
 * with fewer than 2 results (#NUM!); the expected false rejection when a run holds more than
 * 100 results (the domain of QC.FALSEREJECT, #NUM!). No result with a number at all: #NUM!.
 *
 * Reading Share of runs flagged against Expected false rejection: the expected figure is the
 * rejection probability of a run read with no earlier runs, the quantity QC.FALSEREJECT
 * designs for. The counting terms also read across runs (4-1s, 10-x) and, with several
 * materials, in two sequences; every result counts, so deep in a long stable series a run is
 * flagged more often than this figure (flags cluster: a streak that has completed 10-x flags every
 * further result that continues it). Stable series, one material, simulated: with
 * 1-3s/2-2s/R-4s/4-1s/10-x and 2 controls per run about 1.6 % of runs are flagged against an
 * expected 0.97 %; with 4 controls 4.0 % against 3.3 %; 10-x with one control per run flags
 * 1/512 of runs against an expected 0 (test/engine/qc/flags-design.test.ts); two materials
 * read in both sequences flag more again. So a stable method's share is usually somewhat above
 * the expected figure: read it with Mean z (near 0) and SD of z (near 1). A share several times
 * the expected figure, or SD of z well above 1, says the method varies more than the SD in use.
 * Source: Westgard JO, Barry PL, Hunt MR, Groth T. Clin Chem 1981;27:493–501.
 */
import { LeewayError, isLeewayError, numError } from '../errors';
import { ControlEvaluation, ControlSeries, evaluateControls } from './flags';
import { MAX_CONTROLS, falseRejectionProbability } from './power';

export interface ControlReview {
  /** Results with a number value. */
  readonly results: number;
  /** Runs with at least one such result. */
  readonly runs: number;
  /** Runs with at least one flag. */
  readonly runsFlagged: number;
  /** runsFlagged / runs, in [0, 1]. */
  readonly shareFlagged: number;
  /** Mean over runs of QC.FALSEREJECT(rule, results in the run), in [0, 1]; or why not. */
  readonly expectedFalseRejection: number | LeewayError;
  /** Mean of z. */
  readonly meanZ: number | LeewayError;
  /** Sample SD of z (n − 1); an error with fewer than 2 results. */
  readonly sdZ: number | LeewayError;
  /** Count of results with |z| > 2. */
  readonly beyond2Sd: number;
}

/** The catalogue's labels of QC.REVIEW with the field that holds each figure, in order. */
export const REVIEW_FIGURES: ReadonlyArray<readonly [string, keyof ControlReview]> = [
  ['Results', 'results'],
  ['Runs', 'runs'],
  ['Runs flagged', 'runsFlagged'],
  ['Share of runs flagged', 'shareFlagged'],
  ['Expected false rejection per run', 'expectedFalseRejection'],
  ['Mean z', 'meanZ'],
  ['SD of z', 'sdZ'],
  ['Results beyond 2 SD', 'beyond2Sd'],
];

function expectedFalseRejection(ev: ControlEvaluation, input: ControlSeries): number | LeewayError {
  let total = 0;
  const byCount = new Map<number, number>();
  for (let r = 0; r < ev.runSizes.length; r++) {
    const n = ev.runSizes[r];
    let p = byCount.get(n);
    if (p === undefined) {
      if (n > MAX_CONTROLS) {
        const name = ev.runLabels[r] === '' ? `run ${r + 1}` : `run "${ev.runLabels[r]}"`;
        return numError(
          `${name} holds ${n} control results: the expected false rejection is computed for runs of at most ${MAX_CONTROLS} results`,
        );
      }
      try {
        p = falseRejectionProbability(input.rule, n, 1);
      } catch (e) {
        if (isLeewayError(e)) return e;
        throw e;
      }
      byCount.set(n, p);
    }
    total += p;
  }
  return total / ev.runSizes.length;
}

/**
 * QC.REVIEW from the series (see the file comment). Throws #NUM! when no entry of values is a
 * number; otherwise the errors of evaluateControls.
 */
export function controlReview(input: ControlSeries): ControlReview {
  return reviewOf(evaluateControls(input), input);
}

/** The review of an evaluation already made (the task pane shows flags and review together). */
export function reviewOf(ev: ControlEvaluation, input: ControlSeries): ControlReview {
  const n = ev.results;
  if (n === 0) throw numError('values hold no numbers: a review needs at least one control result');
  let sum = 0;
  for (const z of ev.z) if (z !== null) sum += z;
  const mean = sum / n;
  let ss = 0;
  for (const z of ev.z) if (z !== null) ss += (z - mean) * (z - mean);
  const sd = Math.sqrt(ss / (n - 1));
  const runs = ev.runSizes.length;
  let runsFlagged = 0;
  for (const f of ev.runFlagged) if (f) runsFlagged++;
  return {
    results: n,
    runs,
    runsFlagged,
    shareFlagged: runsFlagged / runs,
    expectedFalseRejection: expectedFalseRejection(ev, input),
    meanZ: Number.isFinite(mean) ? mean : numError('the mean of z is too large to represent'),
    sdZ:
      n < 2
        ? numError(`SD of z needs at least 2 control results (got ${n})`)
        : Number.isFinite(sd)
          ? sd
          : numError('the SD of z is too large to represent'),
    beyond2Sd: ev.beyond2Sd,
  };
}
