/**
 * Rejection probabilities of control rules (QC.DETECT, QC.FALSEREJECT) and power curves.
 *
 * Model (SPEC.md section 4; Westgard JO, Groth T. Clin Chem 1979;25:863–9): each control
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

function rangeNodes(m: RuleMachine, shift: number, range: number, q: Quadrature): RangeNodes {
  const lo = shift - q.below;
  const hi = shift + q.above;
  const cuts = new Set<number>([lo, hi]);
  for (const b of m.bounds) {
    for (const c of [b, b - range]) if (c > lo && c < hi) cuts.add(c);
  }
  const edges = [...cuts].sort((a, b) => a - b);
  const gl = glNodes(q.points);
  const as: number[] = [];
  const ws: number[] = [];
  for (let e = 0; e + 1 < edges.length; e++) {
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
  const K = m.classes;
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
      const p = intervalProbability(Math.max(clo, a) - shift, Math.min(chi, a + range) - shift);
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

function sum(v: Float64Array): number {
  let t = 0;
  for (let i = 0; i < v.length; i++) t += v[i];
  return t;
}

/**
 * P(no term fires in `runs` runs of n observations at shift Δ), by the machine. Exported for
 * tests (it must reproduce the closed form on single-limit rules); callers use
 * detectionProbability.
 */
export function chainSurvival(m: RuleMachine, n: number, shift: number, runs: number, q: Quadrature = DEFAULT_QUADRATURE): number {
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
  const nodes = useRange ? rangeNodes(m, d, m.rangeLimit as number, q) : undefined;
  const work = [0, 1, 2, 3].map(() => new Float64Array(S));
  let v = new Float64Array(S);
  v[0] = 1;
  let mass = 1;
  let prev: Float64Array | undefined;
  let prevMass = 1;
  for (let r = 1; r <= runs; r++) {
    let w: Float64Array;
    if (nodes) {
      w = rangeRun(m, n, v, nodes, work);
    } else {
      w = v;
      for (let i = 0; i < n; i++) {
        const out = new Float64Array(S);
        observe(m, w, p, out);
        w = out;
      }
    }
    const wMass = sum(w);
    if (!(wMass > 1e-300)) return 0;
    // Normalised distribution: once it repeats, every further run keeps the same share λ.
    const u = new Float64Array(S);
    for (let s = 0; s < S; s++) u[s] = w[s] / wMass;
    mass *= wMass;
    if (mass < 1e-18) return mass;
    if (prev && r < runs) {
      let diff = 0;
      for (let s = 0; s < S; s++) diff = Math.max(diff, Math.abs(u[s] - prev[s]));
      if (diff < 1e-14 && Math.abs(wMass - prevMass) < 1e-14) {
        return mass * Math.pow(wMass, runs - r);
      }
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

function checkCounts(n: number, runs: number): void {
  wholeNumber(n, 'n', 1);
  if (n > MAX_CONTROLS) throw numError(`n must be at most ${MAX_CONTROLS} controls per run (got ${show(n)})`);
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

/** Empties every QC cache (parsed rules, machines, probabilities), for cold-start benchmarks. */
export function clearQcCaches(): void {
  PROBABILITIES.clear();
  clearMachineCache();
  clearRuleCache();
}
