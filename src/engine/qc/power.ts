/**
 * Rejection probabilities of control rules (QC.DETECT, QC.FALSEREJECT) and power curves.
 *
 * Model (docs/reference/control-rules.md; Westgard JO, Groth T. Clin Chem 1979;25:863–9): each control
 * observation is x = Δ + Z in SD units, Z standard normal and independent, Δ ≥ 0 the systematic
 * shift carried by every run. There are n observations per run, taken in order, over `runs`
 * runs. Consecutive-count terms read the whole sequence across runs; the range term R-Ls reads
 * one run at a time. The result is P(some term fires somewhere in the runs).
 *
 * Method.
 * - Single-limit rules (every term 1-Ls, the smallest L decides): exact closed form
 *   P = 1 − [Φ(L−Δ) − Φ(−L−Δ)]^(n·runs), computed as −expm1(n·runs·log1p(−q)),
 *   q = Φ(−L−Δ) + Φ(Δ−L), so small probabilities keep their digits.
 * - Multirules: an exact Markov chain (machine.ts) over interval classes. Without a range term
 *   (or with n = 1) the state distribution is pushed through the n·runs observations with the
 *   exact class probabilities Φ(b_k − Δ) − Φ(b_{k−1} − Δ). With a range term and n ≥ 2, each
 *   run is integrated over its lowest observation a: for the joint probability H(a, b) that all
 *   n observations lie in [a, b] and the chain survives, P(survive, max − min ≤ R) =
 *   ∫ −∂H/∂a (a, a + R) da; −∂H/∂a is a sum over which observation is the lowest, computed by
 *   the same chain with one extra bit ("the lowest has been placed"). The integrand is smooth
 *   between the points a ∈ {b_k} ∪ {b_k − R}; it is integrated by 8-point Gauss–Legendre on
 *   pieces at most 0.75 SD wide over a ∈ [Δ − 7.5, Δ + 5] (the mass left out is below
 *   n·Φ(−7.5) + Φ(−5)² < 4e-12 for n ≤ 100).
 *   Accuracy: agreement with a 24-point, 0.2 SD rule to about 1e-12 (test/engine/qc/power.test.ts);
 *   far inside the required ±0.005. Deterministic: no random numbers.
 * - Many runs: after each run the surviving state distribution is normalised; once it stops
 *   changing (to 1e-14) the survival of each further run is the same factor λ, and the rest is
 *   λ^(runs left). Exact to rounding.
 * - The survival sequence after a shift (survivalSequence, for risk-based QC frequency): the
 *   same chain, one run per QC event, each event's survival kept; with a range term and small n
 *   the run step is tabulated by class sequences (see RunTable), which sums the same integral in
 *   another order (agreement with the run-by-run integral about 1e-15 per event).
 * Results are cached by (rule, n, runs, shift) with the shift exact: a hit is the same number.
 */
import { numError } from '../errors';
import { nonNegative, wholeNumber, show } from '../guards';
import { normalCdf } from '../normal';
import { BoundedCache } from './cache';
import { clearMachineCache, machineOf, RuleMachine } from './machine';
import { clearRuleCache, ControlRule, isSingleLimit, parseRule } from './rules';

/** Domain of the counts: a run with more controls, or a longer series, is outside QC design. */
export const MAX_CONTROLS = 100;
export const MAX_RUNS = 10000;

/** One point of a power curve: P(rejection) at a shift in SD. */
export interface PowerPoint {
  readonly shift: number;
  readonly p: number;
}

const SQRT_2PI = Math.sqrt(2 * Math.PI);

function density(x: number): number {
  return Math.exp(-0.5 * x * x) / SQRT_2PI;
}

/** P(lo < Z < hi) for a standard normal Z, taken from the nearer tail to keep digits. */
function intervalProbability(lo: number, hi: number): number {
  if (!(hi > lo)) return 0;
  if (lo >= 0) return normalCdf(-lo) - normalCdf(-hi);
  return normalCdf(hi) - normalCdf(lo);
}

/** Gauss–Legendre nodes and weights on [−1, 1] (Newton on the Legendre recurrence). */
export function gaussLegendre(m: number): { x: Float64Array; w: Float64Array } {
  const x = new Float64Array(m);
  const w = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (m + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1;
      let p1 = z;
      for (let j = 2; j <= m; j++) {
        const p2 = ((2 * j - 1) * z * p1 - (j - 1) * p0) / j;
        p0 = p1;
        p1 = p2;
      }
      const pm = m === 1 ? z : p1;
      const pm1 = m === 1 ? 1 : p0;
      dp = (m * (z * pm - pm1)) / (z * z - 1);
      const dz = pm / dp;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    x[i] = z;
    w[i] = 2 / ((1 - z * z) * dp * dp);
  }
  return { x, w };
}

/** The quadrature used for the range integral (exported for the accuracy test). */
export interface Quadrature {
  readonly points: number;
  readonly maxWidth: number;
  readonly below: number;
  readonly above: number;
}

export const DEFAULT_QUADRATURE: Quadrature = { points: 8, maxWidth: 0.75, below: 7.5, above: 5 };

const GL_CACHE = new Map<number, { x: Float64Array; w: Float64Array }>();
function glNodes(m: number): { x: Float64Array; w: Float64Array } {
  let g = GL_CACHE.get(m);
  if (!g) {
    g = gaussLegendre(m);
    GL_CACHE.set(m, g);
  }
  return g;
}

/** Per-node data of the range integral for one shift. */
interface RangeNodes {
  readonly count: number;
  /** weight × density of the lowest observation at node j. */
  readonly lowest: Float64Array;
  /** class of the lowest observation at node j. */
  readonly lowestClass: Int32Array;
  /** classes meeting the window [a, a + R] at node j: offsets into cls/prob. */
  readonly start: Int32Array;
  readonly cls: Int32Array;
  readonly prob: Float64Array;
}

/** Classes in which an observation fires some term from every state (e.g. beyond ±L of a 1-Ls term). */
function deadClasses(m: RuleMachine): boolean[] {
  const K = m.classes;
  const dead: boolean[] = [];
  for (let k = 0; k < K; k++) {
    let all = true;
    for (let s = 0; s < m.states && all; s++) if (m.next[s * K + k] >= 0) all = false;
    dead.push(all);
  }
  return dead;
}

function rangeNodes(m: RuleMachine, shift: number, range: number, q: Quadrature): RangeNodes {
  const lo = shift - q.below;
  const hi = shift + q.above;
  const cuts = new Set<number>([lo, hi]);
  for (const b of m.bounds) {
    for (const c of [b, b - range]) if (c > lo && c < hi) cuts.add(c);
  }
  const edges = [...cuts].sort((a, b) => a - b);
  const gl = glNodes(q.points);
  const K = m.classes;
  const dead = deadClasses(m);
  const classOf = (x: number): number => {
    let k = 0;
    while (k < K - 1 && m.bounds[k] < x) k++;
    return k;
  };
  const as: number[] = [];
  const ws: number[] = [];
  for (let e = 0; e + 1 < edges.length; e++) {
    // A piece lies inside one class (every boundary is a cut). When an observation in that class
    // fires a term from every state, a run whose lowest observation is there never passes: the
    // piece adds exactly 0 and is left out.
    if (dead[classOf(0.5 * (edges[e] + edges[e + 1]))]) continue;
    const width = edges[e + 1] - edges[e];
    const parts = Math.max(1, Math.ceil(width / q.maxWidth));
    const h = width / parts;
    for (let p = 0; p < parts; p++) {
      const mid = edges[e] + (p + 0.5) * h;
      for (let i = 0; i < q.points; i++) {
        as.push(mid + 0.5 * h * gl.x[i]);
        ws.push(0.5 * h * gl.w[i]);
      }
    }
  }
  const count = as.length;
  const lowest = new Float64Array(count);
  const lowestClass = new Int32Array(count);
  const start = new Int32Array(count + 1);
  const cls: number[] = [];
  const prob: number[] = [];
  for (let j = 0; j < count; j++) {
    const a = as[j];
    lowest[j] = ws[j] * density(a - shift);
    let k = 0;
    while (k < K - 1 && m.bounds[k] < a) k++;
    lowestClass[j] = k;
    start[j] = cls.length;
    for (let c = 0; c < K; c++) {
      const clo = c === 0 ? -Infinity : m.bounds[c - 1];
      const chi = c === K - 1 ? Infinity : m.bounds[c];
      const p = dead[c] ? 0 : intervalProbability(Math.max(clo, a) - shift, Math.min(chi, a + range) - shift);
      if (p > 0) {
        cls.push(c);
        prob.push(p);
      }
    }
  }
  start[count] = cls.length;
  return { count, lowest, lowestClass, start, cls: Int32Array.from(cls), prob: Float64Array.from(prob) };
}

/** Pushes the state distribution through one observation of class probabilities p. */
function observe(m: RuleMachine, v: Float64Array, p: Float64Array, out: Float64Array): void {
  const K = m.classes;
  const next = m.next;
  out.fill(0);
  for (let s = 0; s < m.states; s++) {
    const vs = v[s];
    if (vs === 0) continue;
    const base = s * K;
    for (let k = 0; k < K; k++) {
      const t = next[base + k];
      if (t >= 0) out[t] += vs * p[k];
    }
  }
}

/** One run with a range term: the integral over the run's lowest observation. */
function rangeRun(m: RuleMachine, n: number, v: Float64Array, nodes: RangeNodes, work: Float64Array[]): Float64Array {
  const S = m.states;
  const K = m.classes;
  const next = m.next;
  const acc = new Float64Array(S);
  let [a, b, a2, b2] = work;
  for (let j = 0; j < nodes.count; j++) {
    a.set(v);
    b.fill(0);
    const f = nodes.lowest[j];
    const kLow = nodes.lowestClass[j];
    const c0 = nodes.start[j];
    const c1 = nodes.start[j + 1];
    for (let i = 0; i < n; i++) {
      a2.fill(0);
      b2.fill(0);
      for (let s = 0; s < S; s++) {
        const as = a[s];
        const bs = b[s];
        if (as === 0 && bs === 0) continue;
        const base = s * K;
        for (let c = c0; c < c1; c++) {
          const t = next[base + nodes.cls[c]];
          if (t < 0) continue;
          const pk = nodes.prob[c];
          a2[t] += as * pk;
          b2[t] += bs * pk;
        }
        if (as !== 0) {
          const t = next[base + kLow];
          if (t >= 0) b2[t] += as * f;
        }
      }
      let tmp = a;
      a = a2;
      a2 = tmp;
      tmp = b;
      b = b2;
      b2 = tmp;
    }
    for (let s = 0; s < S; s++) acc[s] += b[s];
  }
  return acc;
}

/**
 * One run with a range term, tabulated by class sequences (for small n). The run's n
 * observations fall in a sequence c of classes; the machine takes state s to δ(s, c) (or fires),
 * and the probability of c together with "range ≤ R" depends only on the multiset of classes in
 * c (the observations are independent and identically distributed):
 *   P_c = ∫ m_j·f_j(a)·w_j(a)^(m_j − 1)·Π_{k≠j} w_k(a)^(m_k) da,
 * a the lowest observation, j its class, m_k how often class k occurs in c, f_j the density in
 * class j and w_k(a) = P(X in class k and in [a, a + R]). So the run's transition matrix is
 * T[s][t] = Σ_c P_c·[δ(s, c) = t] = Σ_M P_M·N(s, t, M) with N the number of orderings of the
 * multiset M that take s to t: N is built once per rule and n, P_M per shift with the nodes of
 * the range integral (the same integral as rangeRun, summed in another order). Only classes in
 * which an observation can pass are enumerated.
 */
interface RunTable {
  /** The classes enumerated (an observation in any other class fires from every state). */
  readonly alive: Int32Array;
  /** Multiplicities of multiset M over the alive classes: mult[M·A + k]. */
  readonly mult: Int32Array;
  readonly multisets: number;
  /** Entries (from s, to t, multiset M, N orderings). */
  readonly from: Int32Array;
  readonly to: Int32Array;
  readonly multiset: Int32Array;
  readonly ways: Float64Array;
}

/** The most entries of the dense matrix a run table is summed into (states²). */
const MAX_DENSE = 4_000_000;

/** The most class sequences × states a run table may enumerate. */
const MAX_TABLE_WORK = 2_000_000;

function buildRunTable(m: RuleMachine, n: number): RunTable | undefined {
  const K = m.classes;
  const S = m.states;
  const dead = deadClasses(m);
  const alive: number[] = [];
  for (let k = 0; k < K; k++) if (!dead[k]) alive.push(k);
  const A = alive.length;
  if (A === 0 || Math.pow(A, n) * S > MAX_TABLE_WORK) return undefined;
  // A multiset is coded by its multiplicities written in base n + 1; codes are numbered as met.
  const radix = n + 1;
  const place: number[] = [];
  for (let k = 0, f = 1; k < A; k++, f *= radix) place.push(f);
  const dense = Math.pow(radix, A) <= 1 << 20 ? new Int32Array(Math.pow(radix, A)).fill(-1) : undefined;
  const sparse = new Map<number, number>();
  const mult: number[] = [];
  const counts = new Int32Array(A);
  let multisets = 0;
  const indexOf = (code: number): number => {
    let j = dense ? dense[code] : (sparse.get(code) ?? -1);
    if (j < 0) {
      j = multisets++;
      if (dense) dense[code] = j;
      else sparse.set(code, j);
      for (let k = 0; k < A; k++) mult.push(counts[k]);
    }
    return j;
  };
  // Orderings from one state, gathered by (to, multiset); there are C(A + n − 1, n) multisets.
  let width = 1;
  for (let i = 1; i <= n; i++) width = (width * (A - 1 + i)) / i;
  width = Math.round(width);
  const row = new Float64Array(S * width);
  const touched: number[] = [];
  const from: number[] = [];
  const to: number[] = [];
  const multiset: number[] = [];
  const ways: number[] = [];
  const visit = (state: number, depth: number, code: number): void => {
    if (depth === n) {
      const at = state * width + indexOf(code);
      if (row[at] === 0) touched.push(at);
      row[at]++;
      return;
    }
    for (let k = 0; k < A; k++) {
      const t = m.next[state * K + alive[k]];
      if (t < 0) continue;
      counts[k]++;
      visit(t, depth + 1, code + place[k]);
      counts[k]--;
    }
  };
  for (let s = 0; s < S; s++) {
    visit(s, 0, 0);
    for (const at of touched) {
      const j = at % width;
      const t = (at - j) / width;
      from.push(s);
      to.push(t);
      multiset.push(j);
      ways.push(row[at]);
      row[at] = 0;
    }
    touched.length = 0;
  }
  return {
    alive: Int32Array.from(alive),
    mult: Int32Array.from(mult),
    multisets,
    from: Int32Array.from(from),
    to: Int32Array.from(to),
    multiset: Int32Array.from(multiset),
    ways: Float64Array.from(ways),
  };
}

const RUN_TABLES = new WeakMap<RuleMachine, Map<number, RunTable | null>>();

function runTableOf(m: RuleMachine, n: number): RunTable | undefined {
  let byN = RUN_TABLES.get(m);
  if (!byN) {
    byN = new Map();
    RUN_TABLES.set(m, byN);
  }
  let t = byN.get(n);
  if (t === undefined) {
    t = buildRunTable(m, n) ?? null;
    byN.set(n, t);
  }
  return t ?? undefined;
}

/** The run's transition matrix T (states × states, row = from) at one shift, from a run table. */
function tableMatrix(m: RuleMachine, n: number, table: RunTable, nodes: RangeNodes): Float64Array {
  const S = m.states;
  const A = table.alive.length;
  const K = m.classes;
  const slot = new Int32Array(K).fill(-1);
  for (let k = 0; k < A; k++) slot[table.alive[k]] = k;
  const M = table.multisets;
  const prob = new Float64Array(M);
  const powers = new Float64Array(A * (n + 1));
  for (let j = 0; j < nodes.count; j++) {
    const low = slot[nodes.lowestClass[j]];
    if (low < 0) continue;
    for (let k = 0; k < A; k++) {
      powers[k * (n + 1)] = 1;
      for (let e = 1; e <= n; e++) powers[k * (n + 1) + e] = 0;
    }
    for (let c = nodes.start[j]; c < nodes.start[j + 1]; c++) {
      const k = slot[nodes.cls[c]];
      if (k < 0) continue;
      const w = nodes.prob[c];
      for (let e = 1; e <= n; e++) powers[k * (n + 1) + e] = powers[k * (n + 1) + e - 1] * w;
    }
    const f = nodes.lowest[j];
    for (let i = 0; i < M; i++) {
      const base = i * A;
      const ml = table.mult[base + low];
      if (ml === 0) continue;
      let x = ml * f * powers[low * (n + 1) + ml - 1];
      for (let k = 0; k < A && x !== 0; k++) if (k !== low) x *= powers[k * (n + 1) + table.mult[base + k]];
      prob[i] += x;
    }
  }
  const T = new Float64Array(S * S);
  for (let e = 0; e < table.ways.length; e++) {
    T[table.from[e] * S + table.to[e]] += table.ways[e] * prob[table.multiset[e]];
  }
  return T;
}

function sum(v: Float64Array): number {
  let t = 0;
  for (let i = 0; i < v.length; i++) t += v[i];
  return t;
}

/**
 * The chain's step over one run (QC event) at shift Δ: from the state distribution before the
 * run to the unnormalised distribution of the states that pass it (its sum is P(pass)).
 */
/** A run of the chain as a function of the state distribution, and its cost in multiply-adds. */
interface RunStep {
  readonly step: (v: Float64Array) => Float64Array;
  readonly cost: number;
}

/**
 * The most multiply-adds one evaluation of the chain may take (0.5–1.3 ns each measured on the
 * build machine, so at most about 0.2 s): beyond it the rule, n and runs together are refused with a message rather than let one
 * cell compute for seconds. The published multirules need well under 1 % of it (the five-term
 * multirule with n = 100 over 10,000 runs: 4e7).
 */
export const MAX_CHAIN_WORK = 150_000_000;

/**
 * Work left for a computation made of many chain evaluations (QC.RISK's search over the shift):
 * while withChainBudget runs, every run of the chain is charged to one budget of MAX_CHAIN_WORK.
 */
let shared: { left: number } | undefined;

export function withChainBudget<T>(fn: () => T): T {
  if (shared) return fn();
  shared = { left: MAX_CHAIN_WORK };
  try {
    return fn();
  } finally {
    shared = undefined;
  }
}

/** Charges one run of the chain; refuses when this evaluation, or the computation it is part of, has spent its budget. */
function charge(m: RuleMachine, n: number, runs: number | undefined, spent: number, cost: number): void {
  if (spent > MAX_CHAIN_WORK) tooCostly(m, n, runs);
  if (shared) {
    shared.left -= cost;
    if (shared.left < 0) tooCostly(m, n, runs);
  }
}

function tooCostly(m: RuleMachine, n: number, runs: number | undefined): never {
  const what = runs === undefined ? `n = ${n}` : `n = ${n} over ${runs} runs`;
  throw numError(
    `rule with ${m.states} states and ${what} is too costly to evaluate in a cell (more than ${MAX_CHAIN_WORK / 1e6} million steps): use fewer controls per run, fewer runs, or smaller counts in the rule`,
  );
}

function runStepper(m: RuleMachine, n: number, shift: number, q: Quadrature, tabled = false): RunStep {
  const top = m.bounds.length ? m.bounds[m.bounds.length - 1] : 0;
  // Beyond the top boundary + 40 SD every observation is in the top class with probability 1 in
  // double precision, and the range of a run does not depend on the shift: the answer is the same.
  const d = Math.min(shift, top + 40);
  const K = m.classes;
  const S = m.states;
  const p = new Float64Array(K);
  for (let k = 0; k < K; k++) {
    const lo = k === 0 ? -Infinity : m.bounds[k - 1];
    const hi = k === K - 1 ? Infinity : m.bounds[k];
    p[k] = intervalProbability(lo - d, hi - d);
  }
  const useRange = m.rangeLimit !== undefined && n >= 2;
  if (useRange) {
    const nodes = rangeNodes(m, d, m.rangeLimit as number, q);
    // The tabulated run is a dense states × states matrix while it is built: only for machines
    // small enough that it is (MAX_DENSE entries, 32 MB); larger ones take the run step by step.
    const table = tabled && S * S <= MAX_DENSE ? runTableOf(m, n) : undefined;
    if (table) {
      // The matrix is sparse (a run leads from a state to few others): kept by rows.
      const T = tableMatrix(m, n, table, nodes);
      const rowStart = new Int32Array(S + 1);
      const cols: number[] = [];
      const vals: number[] = [];
      for (let s = 0; s < S; s++) {
        for (let t = 0; t < S; t++) {
          const x = T[s * S + t];
          if (x !== 0) {
            cols.push(t);
            vals.push(x);
          }
        }
        rowStart[s + 1] = cols.length;
      }
      const col = Int32Array.from(cols);
      const val = Float64Array.from(vals);
      const step = (v: Float64Array): Float64Array => {
        const w = new Float64Array(S);
        for (let s = 0; s < S; s++) {
          const vs = v[s];
          if (vs === 0) continue;
          for (let e = rowStart[s]; e < rowStart[s + 1]; e++) w[col[e]] += vs * val[e];
        }
        return w;
      };
      return { step, cost: S + val.length };
    }
    const work = [0, 1, 2, 3].map(() => new Float64Array(S));
    return { step: (v) => rangeRun(m, n, v, nodes, work), cost: n * S * (nodes.cls.length + nodes.count) * 2 };
  }
  const step = (v: Float64Array): Float64Array => {
    let w = v;
    for (let i = 0; i < n; i++) {
      const out = new Float64Array(S);
      observe(m, w, p, out);
      w = out;
    }
    return w;
  };
  return { step, cost: n * S * K };
}

/** The normalised state distribution has stopped changing when no entry moves by more than this. */
const SETTLED = 1e-14;

function settled(u: Float64Array, prev: Float64Array, uMass: number, prevMass: number): boolean {
  let diff = 0;
  for (let s = 0; s < u.length; s++) diff = Math.max(diff, Math.abs(u[s] - prev[s]));
  return diff < SETTLED && Math.abs(uMass - prevMass) < SETTLED;
}

/**
 * P(no term fires in `runs` runs of n observations at shift Δ), by the machine. Exported for
 * tests (it must reproduce the closed form on single-limit rules); callers use
 * detectionProbability.
 */
export function chainSurvival(m: RuleMachine, n: number, shift: number, runs: number, q: Quadrature = DEFAULT_QUADRATURE): number {
  const S = m.states;
  const { step, cost } = runStepper(m, n, shift, q);
  let v = new Float64Array(S);
  v[0] = 1;
  let mass = 1;
  let prev: Float64Array | undefined;
  let prevMass = 1;
  for (let r = 1; r <= runs; r++) {
    charge(m, n, runs, r * cost, cost);
    const w = step(v);
    const wMass = sum(w);
    if (!(wMass > 1e-300)) return 0;
    // Normalised distribution: once it repeats, every further run keeps the same share λ.
    const u = new Float64Array(S);
    for (let s = 0; s < S; s++) u[s] = w[s] / wMass;
    mass *= wMass;
    if (mass < 1e-18) return mass;
    if (prev && r < runs && settled(u, prev, wMass, prevMass)) {
      return mass * Math.pow(wMass, runs - r);
    }
    prev = u;
    prevMass = wMass;
    v = u;
  }
  return mass;
}

/** The closed form for single-limit rules: 1 − [Φ(L−Δ) − Φ(−L−Δ)]^(n·runs). */
export function singleLimitRejection(limit: number, n: number, shift: number, runs: number): number {
  const q = normalCdf(-limit - shift) + normalCdf(shift - limit);
  if (q >= 1) return 1;
  return -Math.expm1(n * runs * Math.log1p(-q));
}

/** n, the controls per run (per QC event): whole, 1 … 100. */
export function checkControls(n: number): number {
  wholeNumber(n, 'n', 1);
  if (n > MAX_CONTROLS) throw numError(`n must be at most ${MAX_CONTROLS} controls per run (got ${show(n)})`);
  return n;
}

function checkCounts(n: number, runs: number): void {
  checkControls(n);
  wholeNumber(runs, 'runs', 1);
  if (runs > MAX_RUNS) throw numError(`runs must be at most ${MAX_RUNS} (got ${show(runs)})`);
}

const PROBABILITIES = new BoundedCache<string, number>(100000);

function ruleOf(rule: ControlRule | string): ControlRule {
  return typeof rule === 'string' ? parseRule(rule) : rule;
}

/**
 * QC.DETECT: the probability that `rule` rejects at least once over `runs` runs of n controls
 * each, when every run carries a systematic shift of `shift` SD. n whole 1…100, runs whole
 * 1…10000, shift finite ≥ 0 (the rules are symmetric, so a downward shift of the same size gives
 * the same probability). Exact (see Method above). Source of the model: Westgard and Groth 1979;
 * the multirule: Westgard et al. 1981.
 */
export function detectionProbability(rule: ControlRule | string, n: number, shift: number, runs = 1): number {
  const r = ruleOf(rule);
  checkCounts(n, runs);
  nonNegative(shift, 'shift');
  const key = `${r.key}|${n}|${runs}|${shift}`;
  const hit = PROBABILITIES.get(key);
  if (hit !== undefined) return hit;
  let p: number;
  if (isSingleLimit(r)) {
    const limit = Math.min(...r.terms.map((t) => (t.kind === 'limit' ? t.limit : Infinity)));
    p = singleLimitRejection(limit, n, shift, runs);
  } else {
    p = 1 - chainSurvival(machineOf(r), n, shift, runs);
  }
  p = Math.min(1, Math.max(0, p));
  PROBABILITIES.set(key, p);
  return p;
}

/** QC.FALSEREJECT: the rejection probability with no shift, P(reject | Δ = 0). */
export function falseRejectionProbability(rule: ControlRule | string, n: number, runs = 1): number {
  return detectionProbability(rule, n, 0, runs);
}

/**
 * A whole power curve: P(rejection) against the shift for one rule, n and runs, in the order of
 * `shifts` (each finite ≥ 0, SD). For the task pane's QC view.
 */
export function powerCurve(rule: ControlRule | string, n: number, runs: number, shifts: readonly number[]): PowerPoint[] {
  const r = ruleOf(rule);
  return shifts.map((shift) => ({ shift, p: detectionProbability(r, n, shift, runs) }));
}

/** Evenly spaced shifts 0, step, 2·step, … up to `max` SD: a default axis for a power curve. */
export function shiftAxis(max = 6, step = 0.1): number[] {
  nonNegative(max, 'max');
  if (!(step > 0) || !Number.isFinite(step)) throw numError(`step must be a finite number > 0 (got ${show(step)})`);
  const count = Math.floor(max / step + 1e-9);
  if (count > 10000) throw numError(`a power curve has at most 10000 points (got ${count + 1})`);
  const out: number[] = [];
  for (let i = 0; i <= count; i++) out.push(Number((i * step).toPrecision(12)));
  return out;
}

/**
 * Survival over the QC events that follow a shift: S_k = P(none of the first k events after the
 * shift began rejects) = 1 − QC.DETECT(rule, n, Δ, k), the rule's memory empty at the shift.
 * The list S_1 … S_K ends where the rest is known in closed form: from event K on, each further
 * event is passed with the same probability λ (`factor`), so S_{K+j} = S_K·λ^j and
 * Σ_{k>K} S_k = S_K·λ/(1 − λ) (`tail`; Infinity when λ = 1, a rule that cannot reject).
 */
export interface SurvivalSequence {
  /** S_1 … S_K. */
  readonly survival: readonly number[];
  /** λ, the probability of passing each event after the K-th. */
  readonly factor: number;
  /** 1 − λ (for single-limit rules without cancellation). */
  readonly rejection: number;
  /** Σ_{k>K} S_k. */
  readonly tail: number;
  /**
   * true: the tail is exact (closed form, or the normalised state distribution had stopped
   * changing). false: the list ended because the rest had become negligible (below 1e-15 of the
   * sum so far by a bound that holds from every state, or starting below 1e-250), and the tail
   * is the geometric estimate.
   */
  readonly exact: boolean;
}

/** A rest below this share of the sum is left to the geometric estimate. */
const NEGLIGIBLE = 1e-15;
const TINY = 1e-250;

/**
 * P(a < Z < b) for 1 ≤ a < b, by 10-point Gauss–Legendre on pieces at most 0.125 SD wide: full
 * relative precision far in the tail, where a difference of two tail values of Φ keeps only its
 * absolute accuracy (about 1e-15).
 */
function tailMass(a: number, b: number): number {
  // Beyond a + 40 the density is below φ(a)·e^(−40a): nothing in double precision.
  const hi = Math.min(b, a + 40);
  const pieces = Math.ceil((hi - a) / 0.125);
  const h = (hi - a) / pieces;
  const gl = glNodes(10);
  let total = 0;
  for (let p = 0; p < pieces; p++) {
    const mid = a + (p + 0.5) * h;
    let part = 0;
    for (let i = 0; i < 10; i++) part += gl.w[i] * density(mid + 0.5 * h * gl.x[i]);
    total += 0.5 * h * part;
  }
  return total;
}

/** ln P(−L < Z + Δ < L) for one observation, kept accurate whether it is near 0 or near 1. */
function logInside(limit: number, shift: number): number {
  const out = normalCdf(-limit - shift) + normalCdf(shift - limit);
  if (out < 0.5) return Math.log1p(-out);
  const inside = shift - limit > 1 ? tailMass(shift - limit, shift + limit) : intervalProbability(-limit - shift, limit - shift);
  return inside > 0 ? Math.log(inside) : -Infinity;
}

function geometric(survival: number[], factor: number, rejection: number, exact: boolean): SurvivalSequence {
  const last = survival[survival.length - 1];
  let tail: number;
  if (last === 0 || factor === 0) tail = 0;
  else if (!(rejection > 0)) tail = Infinity;
  else tail = (last * factor) / rejection;
  return { survival, factor, rejection, tail, exact };
}

/**
 * The survival sequence by one pass of the chain (machine.ts): the state distribution is pushed
 * through one run at a time, the running product of the per-run pass probabilities is S_k, and
 * the pass stops when the normalised distribution stops changing (to 1e-14; λ is then the last
 * pass probability) or when a bound shows the rest negligible: `bound` is a probability of
 * passing one run that holds from every state (P(|Z + Δ| ≤ L)^n for a 1-Ls term of the rule),
 * so Σ_{k>K} S_k ≤ S_K·bound/(1 − bound); without a bound, when S_K falls below 1e-250 and
 * 1e-15 of the sum. undefined when none of these happens within 10000 events.
 * Exported for tests.
 */
export function chainSequence(
  m: RuleMachine,
  n: number,
  shift: number,
  bound = 1,
  q: Quadrature = DEFAULT_QUADRATURE,
  tabled = true,
): SurvivalSequence | undefined {
  const S = m.states;
  const { step, cost } = runStepper(m, n, shift, q, tabled);
  let v = new Float64Array(S);
  v[0] = 1;
  const survival: number[] = [];
  let mass = 1;
  let total = 0;
  let prev: Float64Array | undefined;
  let prevMass = 1;
  for (let k = 1; k <= MAX_RUNS; k++) {
    charge(m, n, undefined, k * cost, cost);
    const w = step(v);
    const wMass = Math.min(1, sum(w));
    mass *= wMass;
    survival.push(mass);
    if (!(mass > 0)) return geometric(survival, 0, 1, true);
    total += mass;
    const u = new Float64Array(S);
    for (let s = 0; s < S; s++) u[s] = w[s] / wMass;
    if (prev && settled(u, prev, wMass, prevMass)) return geometric(survival, wMass, 1 - wMass, true);
    if (bound < 1 && (mass * bound) / (1 - bound) <= NEGLIGIBLE * total) return geometric(survival, wMass, 1 - wMass, false);
    // Without such a bound (no 1-Ls term): a rest that starts below 1e-250 is nothing in any
    // count of results (it is at most 1e-250/(1 − λ) for the λ the chain settles at).
    if (mass < TINY && mass < NEGLIGIBLE * total) return geometric(survival, wMass, 1 - wMass, false);
    prev = u;
    prevMass = wMass;
    v = u;
  }
  return undefined;
}

/**
 * The survival sequence S_1, S_2, … of `rule` with n controls per QC event after a shift of
 * `shift` SD (see SurvivalSequence). n whole 1…100, shift finite ≥ 0.
 * Method: single-limit rules in closed form, S_k = r^k with r = P(|Z + Δ| ≤ L)^n (L the smallest
 * limit), so K = 1, λ = r, 1 − λ = −expm1(n·ln P(|Z + Δ| ≤ L)), exact. Multirules by one pass of
 * the exact chain (chainSequence): each event costs one run of the chain, and the tail is exact
 * once the normalised state distribution stops changing; its relative accuracy is about
 * 1e-16/(1 − λ) (the pass probabilities are sums of probabilities near 1). Not cached: callers
 * that need a sum cache it.
 */
export function survivalSequence(rule: ControlRule | string, n: number, shift: number): SurvivalSequence {
  const r = ruleOf(rule);
  checkControls(n);
  nonNegative(shift, 'shift');
  const limits = r.terms.flatMap((t) => (t.kind === 'limit' ? [t.limit] : []));
  const limit = limits.length ? Math.min(...limits) : Infinity;
  const logPass = limits.length ? n * logInside(limit, shift) : 0;
  if (isSingleLimit(r)) {
    const pass = Math.exp(logPass);
    return geometric([pass], pass, -Math.expm1(logPass), true);
  }
  const seq = chainSequence(machineOf(r), n, shift, Math.exp(logPass));
  if (!seq) {
    throw numError(
      `rule "${r.text}" with n = ${n}: the chance of passing QC after a shift of ${show(shift)} SD did not settle within ${MAX_RUNS} QC events`,
    );
  }
  return seq;
}

/** Empties every QC cache (parsed rules, machines, probabilities), for cold-start benchmarks. */
export function clearQcCaches(): void {
  PROBABILITIES.clear();
  clearMachineCache();
  clearRuleCache();
}
