/**
 * Review of control results: which control-rule terms each result completes (QC.FLAGS) and a
 * period summarised (QC.REVIEW, in review.ts). The catalogue's section on reviewing control
 * results fixes the meaning; this file is the one evaluator of it.
 *
 * Each result i with a number value gets z_i = (value_i − target_i)/sd_i (SD units; target and sd
 * are the result's own, so levels and lots may differ). Terms of the control-rule syntax
 * (rules.ts) fire at a result as follows:
 *   1-Ls       |z| > L.
 *   R-Ls       the run's highest z minus its lowest z > L; reported on the run's last result
 *              (in the range's order), only for runs of two or more results. Never across runs.
 *   k-Ls       the k results ending at this one are all above +L or all below −L.
 *   k-x        the k results ending at this one are all above the mean (z > 0) or all below
 *              (z < 0). z = 0 is on neither side and breaks the run of one side (common
 *              practice, no source: a result on the target is not "on one side of the mean").
 *   a of b-Ls  (2of3-2s) this result is beyond +L (or −L) and, counting it, at least a of the b
 *              results ending at it are beyond the same limit; near the start of a sequence the
 *              window holds what there is (at the second result of 2of3-2s: the one before it).
 * The count terms (k-Ls, k-x, a of b-Ls) read windows of consecutive results in two sequences and
 * fire if either does: (i) this material's results in run order, (ii) all results in run order.
 * Run order: runs in the order their labels first appear in the range (blank values included,
 * so a sheet sorted by material and then by date keeps its dates' order), a run's results in
 * the range's order; a label seen again joins its earlier run. With no run labels every result
 * is its own run; with no material labels there is one material and both sequences coincide,
 * which is the model of QC.DETECT (power.ts). Every result counts, flagged or not: nothing is
 * dropped from a sequence after a flag. Entries that are not numbers are skipped: no z, no flag
 * (""), and they enter no sequence.
 * Labels are compared trimmed and in any case for text; the number 1 and the text "1" are the
 * same label (as DATA.PRECISION reads group labels).
 *
 * Method. One pass over the results in run order keeps, per sequence and per counting term,
 * the signed length of the trailing run of results above +L / below −L (or above / below the
 * mean), and for a of b terms the status of the last b − 1 results; per run the lowest and
 * highest z. Time and memory are linear in the number of results times the number of terms.
 * Comparisons allow for rounding: z carries a floating-point error of at most
 * e = 8ε(|value| + |target|)/sd (ε = 2⁻⁵², the inputs themselves rounded to binary), so a z is
 * beyond a limit L only when z − L > e + εL; a result exactly 2 SD away in decimal (value 1.6,
 * target 1, sd 0.3, computed z 2.0000000000000004) is on the limit, not beyond it. The z
 * reported is the computed one.
 * Source of the rules: Westgard JO, Barry PL, Hunt MR, Groth T. A multi-rule Shewhart chart for
 * quality control in clinical chemistry. Clin Chem 1981;27:493–501.
 */
import { naError, numError, valueError } from '../errors';
import { show } from '../guards';
import { ControlRule, RuleTerm, termText } from './rules';
import { labelKey } from '../labels';
import type { Label } from '../labels';

export { labelKey };
export type { Label };

/** One entry of the values, target or sd column: a number, a text that is not a number, or blank (null). */
export type Entry = number | string | null;


/** The control results to review, one entry per result, all arrays of the same length. */
export interface ControlSeries {
  /** The control results in time order; a text or blank entry is skipped. */
  readonly values: readonly Entry[];
  /** The target (mean) in use for each result. */
  readonly target: readonly Entry[];
  /** The SD in use for each result, > 0. */
  readonly sd: readonly Entry[];
  /** The parsed control rule (parseRule). */
  readonly rule: ControlRule;
  /** Each result's run label; omitted: every result is its own run. */
  readonly runs?: readonly Label[];
  /** Each result's control material (level) label; omitted: one material. */
  readonly levels?: readonly Label[];
}

/** Everything the evaluation of a series yields, per result and per run. */
export interface ControlEvaluation {
  /** z per result; null where the value is not a number. */
  readonly z: readonly (number | null)[];
  /** The terms fired at each result, in the rule's order, joined by "/"; "" for none. */
  readonly flags: readonly string[];
  /** Each result's run, numbered 0, 1, … in run order (runs with a number only); −1 where skipped. */
  readonly run: Int32Array;
  /** Each result's material, numbered 0, 1, … in order of first appearance; −1 where skipped. */
  readonly level: Int32Array;
  /** Each result's position in the sequence of all results in run order (0-based); −1 where skipped. */
  readonly position: Int32Array;
  /** The label of each run as first written (trimmed), in run order; "" without run labels. */
  readonly runLabels: readonly string[];
  /** The label of each material as first written (trimmed); [""] without material labels. */
  readonly levelLabels: readonly string[];
  /** Number of results (with a number) in each run. */
  readonly runSizes: Int32Array;
  /** Whether any result of each run carries a flag. */
  readonly runFlagged: readonly boolean[];
  /** Count of results with a number. */
  readonly results: number;
  /** Count of results with |z| > 2, read as the flags read a limit (allowing for rounding). */
  readonly beyond2Sd: number;
}

const EPS = Number.EPSILON;

/** The position of result i (0-based) as a user counts it. */
function where(i: number): string {
  return `result ${i + 1}`;
}

function showEntry(v: Entry): string {
  return typeof v === 'string' ? `text "${v}"` : show(v as number);
}

function labelText(v: Label): string {
  return typeof v === 'string' ? v.trim() : String(v);
}

function checkLength(name: string, a: readonly unknown[] | undefined, n: number): void {
  if (a !== undefined && a.length !== n) {
    throw valueError(`${name} and values do not pair up: values has ${n} entries but ${name} has ${a.length} (give ranges of the same size)`);
  }
}

/** A number entry that must be there: blank → #N/A, text → #VALUE!, not finite → #NUM!. */
function required(v: Entry, name: string, i: number): number {
  if (v === null || v === undefined) throw naError(`${where(i)}: ${name} is missing (a blank cell): every control result needs its ${name}`);
  if (typeof v !== 'number') throw valueError(`${where(i)}: ${name} must be a number (got ${showEntry(v)})`);
  if (!Number.isFinite(v)) throw numError(`${where(i)}: ${name} must be a finite number (got ${show(v)})`);
  return v;
}

interface Labels {
  /** Group of each entry; −1 for a skipped entry. */
  readonly of: Int32Array;
  readonly labels: string[];
}

/**
 * Numbers the labels of the entries that have a number value, in order of the label's first
 * appearance anywhere in the column (also beside a skipped value).
 */
function groupLabels(labels: readonly Label[], numeric: Uint8Array, what: string): Labels {
  const n = numeric.length;
  const index = new Map<string, number>();
  const first: string[] = [];
  const rank = new Int32Array(n).fill(-1);
  for (let i = 0; i < n; i++) {
    const key = labelKey(labels[i]);
    if (key === undefined) {
      if (numeric[i]) throw naError(`${where(i)}: its ${what} label is missing (a blank cell): give every control result its ${what}`);
      continue;
    }
    let g = index.get(key);
    if (g === undefined) {
      g = first.length;
      index.set(key, g);
      first.push(labelText(labels[i]));
    }
    rank[i] = g;
  }
  // Keep only groups holding a number, renumbered in the same order.
  const used = new Uint8Array(first.length);
  for (let i = 0; i < n; i++) if (numeric[i]) used[rank[i]] = 1;
  const renumber = new Int32Array(first.length).fill(-1);
  const kept: string[] = [];
  for (let g = 0; g < first.length; g++) {
    if (used[g]) {
      renumber[g] = kept.length;
      kept.push(first[g]);
    }
  }
  const of = new Int32Array(n).fill(-1);
  for (let i = 0; i < n; i++) if (numeric[i]) of[i] = renumber[rank[i]];
  return { of, labels: kept };
}

/** Per-term constants of the one pass. */
interface TermPlan {
  readonly kind: RuleTerm['kind'];
  readonly limit: number;
  /** k of k-Ls / k-x; a of a-of-b. */
  readonly count: number;
  /** b − 1 of a-of-b (history kept), 0 otherwise. */
  readonly keep: number;
  /** Offset of this term's history in a sequence's history block. */
  readonly hist: number;
}

function planTerms(rule: ControlRule): { plans: TermPlan[]; histSize: number } {
  let histSize = 0;
  const plans = rule.terms.map((t): TermPlan => {
    switch (t.kind) {
      case 'limit':
      case 'range':
        return { kind: t.kind, limit: t.limit, count: 1, keep: 0, hist: 0 };
      case 'count':
        return { kind: t.kind, limit: t.limit, count: t.count, keep: 0, hist: 0 };
      case 'side':
        return { kind: t.kind, limit: 0, count: t.count, keep: 0, hist: 0 };
      case 'window': {
        const p: TermPlan = { kind: t.kind, limit: t.limit, count: t.of, keep: t.window - 1, hist: histSize };
        histSize += t.window - 1;
        return p;
      }
    }
  });
  return { plans, histSize };
}

/** +1 above +L, −1 below −L, 0 otherwise, allowing for the rounding e of z. */
function status(z: number, e: number, limit: number): number {
  const slack = e + EPS * limit;
  if (z - limit > slack) return 1;
  if (-z - limit > slack) return -1;
  return 0;
}

/** The signed length of a trailing run after one more result of status s. */
function extend(t: number, s: number): number {
  if (s === 0) return 0;
  if (s > 0) return t > 0 ? t + 1 : 1;
  return t < 0 ? t - 1 : -1;
}

/**
 * Counts the statuses equal to s in a sequence's a-of-b history (ring of `keep` slots starting at
 * `base`, filled `filled` times), then writes s into the next slot.
 */
function windowStep(hist: Int8Array, base: number, keep: number, filled: number, s: number): number {
  let same = 0;
  const m = filled < keep ? filled : keep;
  for (let j = 0; j < m; j++) if (hist[base + j] === s) same++;
  hist[base + (filled % keep)] = s;
  return same;
}

/**
 * Evaluates a series of control results: z, the flags of each result and the run structure.
 * Throws a LeewayError naming the result for a number value whose target or sd is missing, not a
 * number or (sd) not > 0, and for ranges that do not pair up.
 */
export function evaluateControls(input: ControlSeries): ControlEvaluation {
  const { values, target, sd, rule, runs, levels } = input;
  const n = values.length;
  checkLength('target', target, n);
  checkLength('sd', sd, n);
  checkLength('runs', runs, n);
  checkLength('levels', levels, n);

  // z and its rounding allowance e for every number value.
  const numeric = new Uint8Array(n);
  const zs = new Float64Array(n);
  const es = new Float64Array(n);
  let results = 0;
  let beyond2Sd = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (typeof v !== 'number') continue;
    if (!Number.isFinite(v)) throw numError(`${where(i)}: value must be a finite number (got ${show(v)})`);
    const t = required(target[i], 'target', i);
    const s = required(sd[i], 'sd', i);
    if (!(s > 0)) throw numError(`${where(i)}: sd must be > 0 (got ${show(s)})`);
    const z = (v - t) / s;
    if (!Number.isFinite(z)) {
      throw numError(`${where(i)}: z = (value − target)/sd is too large to represent (value ${show(v)}, target ${show(t)}, sd ${show(s)})`);
    }
    numeric[i] = 1;
    zs[i] = z;
    es[i] = (8 * EPS * (Math.abs(v) + Math.abs(t))) / s;
    results++;
    if (status(z, es[i], 2) !== 0) beyond2Sd++;
  }

  // Runs and materials.
  let run: Int32Array;
  let runLabels: string[];
  if (runs) {
    const g = groupLabels(runs, numeric, 'run');
    run = g.of;
    runLabels = g.labels;
  } else {
    run = new Int32Array(n).fill(-1);
    runLabels = [];
    for (let i = 0; i < n; i++) {
      if (numeric[i]) {
        run[i] = runLabels.length;
        runLabels.push('');
      }
    }
  }
  let level: Int32Array;
  let levelLabels: string[];
  if (levels) {
    const g = groupLabels(levels, numeric, 'level');
    level = g.of;
    levelLabels = g.labels;
  } else {
    level = new Int32Array(n);
    for (let i = 0; i < n; i++) if (!numeric[i]) level[i] = -1;
    levelLabels = [''];
  }
  const R = runLabels.length;
  const M = Math.max(1, levelLabels.length);

  // Run order: a counting sort of the results by run, stable in the range's order.
  const runSizes = new Int32Array(R);
  for (let i = 0; i < n; i++) if (numeric[i]) runSizes[run[i]]++;
  const runStart = new Int32Array(R + 1);
  for (let r = 0; r < R; r++) runStart[r + 1] = runStart[r] + runSizes[r];
  const order = new Int32Array(results);
  const fill = runStart.slice(0, R);
  const position = new Int32Array(n).fill(-1);
  for (let i = 0; i < n; i++) {
    if (!numeric[i]) continue;
    const p = fill[run[i]]++;
    order[p] = i;
    position[i] = p;
  }

  // The one pass.
  const { plans, histSize } = planTerms(rule);
  const T = plans.length;
  const fired = new Uint8Array(n * T);
  const allTrail = new Int32Array(T);
  const levelTrail = new Int32Array(M * T);
  const allHist = new Int8Array(Math.max(1, histSize));
  const levelHist = new Int8Array(Math.max(1, M * histSize));
  let allSeen = 0;
  const levelSeen = new Int32Array(M);
  for (let p = 0; p < results; p++) {
    const i = order[p];
    const z = zs[i];
    const e = es[i];
    const m = level[i];
    const lt = m * T;
    const lh = m * histSize;
    for (let j = 0; j < T; j++) {
      const t = plans[j];
      let hit = false;
      switch (t.kind) {
        case 'limit':
          hit = status(z, e, t.limit) !== 0;
          break;
        case 'count':
        case 'side': {
          const s = status(z, e, t.limit);
          const a = extend(allTrail[j], s);
          const b = extend(levelTrail[lt + j], s);
          allTrail[j] = a;
          levelTrail[lt + j] = b;
          hit = a >= t.count || -a >= t.count || b >= t.count || -b >= t.count;
          break;
        }
        case 'window': {
          const s = status(z, e, t.limit);
          const a = windowStep(allHist, t.hist, t.keep, allSeen, s);
          const b = windowStep(levelHist, lh + t.hist, t.keep, levelSeen[m], s);
          hit = s !== 0 && (a + 1 >= t.count || b + 1 >= t.count);
          break;
        }
        case 'range':
          break;
      }
      if (hit) fired[i * T + j] = 1;
    }
    allSeen++;
    levelSeen[m]++;
  }

  // Range terms: one run at a time, on the run's last result.
  for (let j = 0; j < T; j++) {
    const t = plans[j];
    if (t.kind !== 'range') continue;
    for (let r = 0; r < R; r++) {
      const a = runStart[r];
      const b = runStart[r + 1];
      if (b - a < 2) continue;
      let lo = a;
      let hi = a;
      for (let p = a + 1; p < b; p++) {
        const i = order[p];
        if (zs[i] < zs[order[lo]]) lo = p;
        if (zs[i] > zs[order[hi]]) hi = p;
      }
      const il = order[lo];
      const ih = order[hi];
      if (zs[ih] - zs[il] - t.limit > es[ih] + es[il] + EPS * t.limit) fired[order[b - 1] * T + j] = 1;
    }
  }

  // Flags as text, and which runs carry one.
  const names = rule.terms.map(termText);
  const flags: string[] = new Array(n).fill('');
  const runFlagged: boolean[] = new Array(R).fill(false);
  const parts: string[] = [];
  for (let i = 0; i < n; i++) {
    if (!numeric[i]) continue;
    parts.length = 0;
    for (let j = 0; j < T; j++) if (fired[i * T + j]) parts.push(names[j]);
    if (parts.length) {
      flags[i] = parts.join('/');
      runFlagged[run[i]] = true;
    }
  }
  const z: (number | null)[] = new Array(n);
  for (let i = 0; i < n; i++) z[i] = numeric[i] ? zs[i] : null;
  return { z, flags, run, level, position, runLabels, levelLabels, runSizes, runFlagged, results, beyond2Sd };
}

/**
 * QC.FLAGS: per result, the control-rule terms it completes, in the rule's order joined by "/"
 * (e.g. "2-2s/R-4s"), or "" (also for entries that are not numbers). See the file comment for
 * the definitions; errors as evaluateControls.
 */
export function controlFlags(input: ControlSeries): string[] {
  return evaluateControls(input).flags.slice();
}
