/**
 * QC.FLAGS against the design model of QC.DETECT / QC.FALSEREJECT (power.ts) on simulated
 * control series (seeded mulberry32 + Box–Muller; one material, n controls per run, z ~ N(Δ, 1)).
 *
 * What must agree, and why:
 * - The first run of a series has no earlier results, so it is flagged exactly when the rule
 *   rejects a single run: P = QC.DETECT(rule, n, Δ, 1). And a series of R runs carries at least
 *   one flag exactly when the rule rejects somewhere in R runs: P = QC.DETECT(rule, n, Δ, R)
 *   (before the first flag the flags and the design model read the same sequence; after it
 *   nothing matters for "at least one"). Both are identities, checked within 4 binomial SE.
 * - Deep inside a long series, the share of runs flagged is the STATIONARY probability that a
 *   run is flagged: every result counts, flagged or not, so the count terms see the previous
 *   runs' results whatever happened to them. This is neither QC.FALSEREJECT(rule, n, 1) (a run
 *   with no past) nor the per-run hazard 1 − λ = 1 − (1 − P_R+1)/(1 − P_R) of the design model
 *   for large R (the chance that a run is the FIRST rejection, given none before — a series that
 *   stops, or forgets, at each rejection). Flagged runs come in clusters (a streak of 10 results
 *   above the mean flags every further result above it), so the stationary share is the larger:
 *   for 10-x with one control per run it is exactly 2·2⁻¹⁰ = 1/512 (ten fair coin flips alike,
 *   common practice, no source), the hazard about 1/1023, and QC.FALSEREJECT(10-x, 1, 1) is 0.
 *   The stationary share is computed exactly below by an independent chain (the state of each
 *   counting term is a function of the last k − 1 results only, so its distribution after
 *   k − 1 results is already the stationary one), and the long-series share is compared with it.
 *   Rules without across-run memory (1-Ls, R-Ls) have stationary share = QC.FALSEREJECT(rule, n, 1).
 */
import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { evaluateControls } from '../../../src/engine/qc/flags';
import { detectionProbability, falseRejectionProbability } from '../../../src/engine/qc/power';
import { parseRule } from '../../../src/engine/qc/rules';
import { mulberry32 } from '../../support/prng';

const Phi = (x: number): number => cdf(x, 0, 1);
// Local bindings: under jest's sandbox a property read on the global Math is slow in hot loops.
const { cos, log, sin, sqrt, PI } = Math;

function gaussian(seed: number): () => number {
  const rand = mulberry32(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = rand();
    while (u === 0) u = rand();
    const r = sqrt(-2 * log(u));
    const t = 2 * PI * rand();
    spare = r * sin(t);
    return r * cos(t);
  };
}

/** Flags per run of one series of `runs` runs of n results at shift Δ (single material). */
function runFlags(rule: string, n: number, runs: number, shift: number, g: () => number): boolean[] {
  const N = n * runs;
  const values: number[] = new Array(N);
  const labels: number[] = new Array(N);
  for (let i = 0; i < N; i++) {
    values[i] = shift + g();
    labels[i] = Math.floor(i / n);
  }
  const ev = evaluateControls({ values, target: new Array(N).fill(0), sd: new Array(N).fill(1), rule: parseRule(rule), runs: labels });
  return ev.runFlagged.slice();
}

/** Binomial standard error at the exact p, never below that of one event in `trials`. */
function se(p: number, trials: number): number {
  return Math.sqrt(Math.max(p * (1 - p), 1 / trials) / trials);
}

describe('the first run of a series: QC.DETECT(rule, n, Δ, 1); any flag in R runs: QC.DETECT(rule, n, Δ, R)', () => {
  const cases: Array<[string, number]> = [
    ['1-3s/2-2s/R-4s', 2],
    ['1-3s/2-2s/R-4s/4-1s/10-x', 2],
    ['1-3s/2-2s/R-4s/4-1s/10-x', 4],
    ['1-3s/2of3-2s/R-4s/3-1s/6-x', 3],
    ['1-2.5s', 3],
  ];
  const R = 4;
  const trials = 8000;
  test.each(cases.flatMap(([rule, n], c) => [0, 1, 2].map((shift) => [rule, n, shift, c] as const)))(
    '%s, n = %p, shift %p SD: within 4 SE',
    (rule, n, shift, c) => {
      const g = gaussian(1981 * 1000 + c * 10 + shift);
      let first = 0;
      let any = 0;
      for (let t = 0; t < trials; t++) {
        const flags = runFlags(rule, n, R, shift, g);
        if (flags[0]) first++;
        if (flags.some((f) => f)) any++;
      }
      const p1 = detectionProbability(rule, n, shift, 1);
      const pR = detectionProbability(rule, n, shift, R);
      expect(Math.abs(first / trials - p1)).toBeLessThanOrEqual(4 * se(p1, trials));
      expect(Math.abs(any / trials - pR)).toBeLessThanOrEqual(4 * se(pR, trials));
    },
  );
});

/** Terms this file's exact chain handles: 1-Ls, k-Ls and k-x (no window, no range). */
interface SimpleTerm {
  readonly count: number;
  /** The limit in SD; 0 for a side-of-the-mean term. */
  readonly limit: number;
}

function simpleTerms(rule: string): SimpleTerm[] {
  return rule.split('/').map((t) => {
    let m: RegExpExecArray | null;
    if ((m = /^(\d+)-x$/.exec(t))) return { count: Number(m[1]), limit: 0 };
    if ((m = /^(\d+)-([\d.]+)s$/.exec(t))) return { count: Number(m[1]), limit: Number(m[2]) };
    throw new Error(`the exact chain does not handle ${t}`);
  });
}

/**
 * The exact stationary probability that a run of n results is flagged, deep in a long series of
 * independent N(0, 1) results (rules of 1-Ls, k-Ls, k-x only). State: per term, the signed
 * length of the trailing streak beyond the term's limit, capped at k − 1 (a longer streak acts
 * the same). Class probabilities from the @stdlib normal CDF.
 */
function stationaryRunFlag(rule: string, n: number): number {
  const terms = simpleTerms(rule);
  const cuts = [...new Set(terms.flatMap((t) => (t.limit === 0 ? [0] : [t.limit, -t.limit])))].sort((a, b) => a - b);
  const classes = cuts.length + 1;
  const prob: number[] = [];
  const point: number[] = [];
  for (let c = 0; c < classes; c++) {
    const lo = c === 0 ? -Infinity : cuts[c - 1];
    const hi = c === classes - 1 ? Infinity : cuts[c];
    prob.push(Phi(hi) - Phi(lo));
    point.push(c === 0 ? hi - 1 : c === classes - 1 ? lo + 1 : (lo + hi) / 2);
  }
  const step = (state: number[], x: number): { next: number[]; fires: boolean } => {
    let fires = false;
    const next = terms.map((t, j) => {
      const s = x > t.limit ? 1 : x < -t.limit ? -1 : 0;
      const prev = state[j];
      const len = s === 0 ? 0 : Math.sign(prev) === s ? prev + s : s;
      if (Math.abs(len) >= t.count) fires = true;
      return Math.sign(len) * Math.min(Math.abs(len), t.count - 1);
    });
    return { next, fires };
  };
  const push = (dist: Map<string, number>, kill: boolean): Map<string, number> => {
    const out = new Map<string, number>();
    for (const [k, p] of dist) {
      const state = k === '' ? terms.map(() => 0) : k.split(',').map(Number);
      for (let c = 0; c < classes; c++) {
        const { next, fires } = step(state, point[c]);
        if (kill && fires) continue;
        const key = next.join(',');
        out.set(key, (out.get(key) ?? 0) + p * prob[c]);
      }
    }
    return out;
  };
  const warm = Math.max(...terms.map((t) => t.count)) - 1;
  let dist = new Map<string, number>([['', 1]]);
  for (let i = 0; i < warm; i++) dist = push(dist, false);
  for (let i = 0; i < n; i++) dist = push(dist, true);
  let alive = 0;
  for (const p of dist.values()) alive += p;
  return 1 - alive;
}

/** The design model's per-run hazard after many runs: 1 − (1 − P(R+1))/(1 − P(R)). */
function hazard(rule: string, n: number, runs: number): number {
  return 1 - (1 - falseRejectionProbability(rule, n, runs + 1)) / (1 - falseRejectionProbability(rule, n, runs));
}

/** Share of runs flagged in `reps` independent long series; SE from the spread between series. */
function longShare(rule: string, n: number, runs: number, reps: number, seed: number): { share: number; se: number } {
  const g = gaussian(seed);
  const shares: number[] = [];
  for (let r = 0; r < reps; r++) {
    const flags = runFlags(rule, n, runs, 0, g);
    // Leave out the first 12 runs: their past is shorter than the longest window.
    let k = 0;
    for (let i = 12; i < flags.length; i++) if (flags[i]) k++;
    shares.push(k / (flags.length - 12));
  }
  const mean = shares.reduce((a, b) => a + b, 0) / reps;
  const sd = Math.sqrt(shares.reduce((a, b) => a + (b - mean) ** 2, 0) / (reps - 1));
  return { share: mean, se: sd / Math.sqrt(reps) };
}

describe('deep in a long stable series: the share of runs flagged is the stationary probability', () => {
  test('the exact chain of this file: 10-x, n = 1 gives 2·2⁻¹⁰ = 1/512 (ten fair coin flips alike)', () => {
    expect(Math.abs(stationaryRunFlag('10-x', 1) - 1 / 512)).toBeLessThan(1e-15);
    // 2-2s with one control: both of the last two beyond the same 2 SD limit, 2·Φ(−2)².
    expect(Math.abs(stationaryRunFlag('2-2s', 1) - 2 * Phi(-2) ** 2)).toBeLessThan(1e-15);
  });

  test('rules without across-run memory: long-series share = QC.FALSEREJECT(rule, n, 1), within 4 SE', () => {
    for (const [rule, n, seed] of [
      ['1-3s/R-4s', 2, 11],
      ['1-2.5s', 3, 12],
    ] as const) {
      const { share, se: s } = longShare(rule, n, 15000, 10, seed);
      const p = falseRejectionProbability(rule, n, 1);
      expect(Math.abs(share - p)).toBeLessThanOrEqual(4 * s);
      // Independent runs: the spread between series is binomial (guards the SE used above).
      expect(s).toBeGreaterThan(0.5 * se(p, 150000 - 120));
      expect(s).toBeLessThan(2 * se(p, 150000 - 120));
    }
  });

  test.each([
    ['1-3s/2-2s/4-1s/10-x', 2, 15000, 22],
    ['2-2s/4-1s', 1, 20000, 23],
    ['1-3s/2-2s/4-1s/10-x', 4, 8000, 24],
  ] as const)('%s, n = %p: long-series share = the exact stationary probability, within 4 SE', (rule, n, runs, seed) => {
    const { share, se: s } = longShare(rule, n, runs, 20, seed);
    expect(Math.abs(share - stationaryRunFlag(rule, n))).toBeLessThanOrEqual(4 * s);
  });

  test('10-x, n = 1: the long-series share is 1/512 (the stationary probability), not the first-rejection hazard (about 1/1023) nor QC.FALSEREJECT (0)', () => {
    const { share, se: s } = longShare('10-x', 1, 40000, 20, 21);
    const h = hazard('10-x', 1, 400);
    // The hazard: the expected wait for a first streak of ten alike is 1023 results (1 + the
    // wait for nine "same as before" in a row, (2⁹ − 1)/(1/2) = 1022, the waiting time for a
    // run of successes, from memory), so the hazard is near 1/1023.
    expect(Math.abs(h - 1 / 1023)).toBeLessThan(2e-5);
    expect(falseRejectionProbability('10-x', 1, 1)).toBe(0);
    expect(Math.abs(share - 1 / 512)).toBeLessThanOrEqual(4 * s);
    expect(share - h).toBeGreaterThan(8 * s);
  });
});
