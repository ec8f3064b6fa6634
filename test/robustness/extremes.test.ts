/**
 * Every worksheet function at the edges of the double range: inputs of 1e±300, 1e±160,
 * subnormals (down to 4.9e-324), the largest double 1.7976931348623157e308, tiny and huge mixed,
 * and near-cancellations, checked against the function's published formula (as its help states
 * it) evaluated in decimal.js with 80 significant digits (1500 for sums whose terms cancel) on the
 * exact binary values of the inputs (test/support/highprecision.ts). Where the exact answer is beyond the largest double the cell
 * must be #NUM! with a message that says so and names the inputs.
 *
 * The rule for a finite exact answer (agree() in highprecision.ts): relative error within the
 * tolerance stated per function; in the subnormal range within one subnormal step (4.9e-324) on
 * top, and never 0 unless the exact answer is below the smallest subnormal. Where a formula is a
 * difference of larger terms the tolerance is relative to those terms, and the function says why.
 *
 * The functions come from the registry: a function without a reference here fails, so a new one
 * is covered when it is added. Random inputs are seeded (mulberry32, seed 20261207 per function).
 */
import { evaluate, FUNCTIONS } from '../../src/registry';
import type { Arg } from '../../src/registry';
import type { OutCell } from '../../src/registry/types';
import { inputsBeyond, show } from '../../src/engine/guards';
import { normalQuantile } from '../../src/engine/normal';
import { tQuantile } from '../../src/engine/data/studentT';
import { mulberry32 } from '../support/prng';
import { D, DW, Dec, agree, beyondRange, erfc, exact, exactWide, nearLargest, phi, quantile, twoSidedQuantile, upperTail } from '../support/highprecision';

const MAX = Number.MAX_VALUE;
const MIN_SUB = 5e-324;
const MIN_NORMAL = 2.2250738585072014e-308;

/** Named magnitudes, smallest subnormal to largest double. */
const EDGES = [MIN_SUB, 1e-322, 2.5e-320, 1e-310, MIN_NORMAL, 1e-300, 1e-160, 1e-20, 1, 3.7, 1e20, 1e160, 1e300, 1e308, MAX];
/** A shorter list for functions of three or four numbers (every combination is tried). */
const SOME = [MIN_SUB, 1e-310, 1e-300, 1e-160, 1, 1e160, 1e300, MAX];

/** A double of any size, subnormals included: (1 + u)·2^e, e uniform over −1074 … 1023. */
function anySize(rand: () => number): number {
  const e = Math.floor(rand() * 2098) - 1074;
  const m = 1 + rand();
  return e < -1000 ? m * 2 ** (e + 100) * 2 ** -100 : m * 2 ** e;
}

/** All combinations of the lists. */
function combos(lists: number[][]): number[][] {
  return lists.reduce<number[][]>((acc, list) => acc.flatMap((a) => list.map((v) => [...a, v])), [[]]);
}

// ---------------------------------------------------------------------------------------------
// What a cell should hold
// ---------------------------------------------------------------------------------------------

type Expect =
  /** A number: the exact value, the relative tolerance, an absolute floor for cancelling formulas. */
  | { kind: 'number'; exact: Dec; tol: number; floor?: Dec }
  /** One of these texts or logicals. */
  | { kind: 'value'; values: ReadonlyArray<string | number | boolean> }
  /** #NUM! that says the result is beyond the largest number. */
  | { kind: 'beyond' }
  /** #NUM! whose message matches `pattern` (no reliable digit); with `or`, that number is also fair. */
  | { kind: 'error'; pattern: RegExp; or?: Expect }
  /** Not checked here beyond the general rule (finite number, text, logical, or error with a message). */
  | { kind: 'any' };

interface Case {
  readonly label: string;
  readonly args: Arg[];
  /** Expected cells in output order (the value row of a labelled spill; a table row by row). */
  readonly cells: readonly Expect[];
  /** Input names and values the #NUM! message must quote (scalar functions). */
  readonly names?: Readonly<Record<string, number>>;
}

const num = (exactValue: Dec, tol: number, floor?: Dec): Expect => ({ kind: 'number', exact: exactValue, tol, floor });

interface Stats {
  cases: number;
  worst: number;
  beyond: number;
  subnormal: number;
  subnormalRounded: number;
}

const STATS = new Map<string, Stats>();

function stats(name: string): Stats {
  let s = STATS.get(name);
  if (!s) STATS.set(name, (s = { cases: 0, worst: 0, beyond: 0, subnormal: 0, subnormalRounded: 0 }));
  return s;
}

/** The cells of a result in the order the expectations list them. */
function cellsOf(name: string, out: OutCell[][]): OutCell[] {
  if (name === 'SPEC.TIERS') return out.slice(1).flatMap((row) => row.slice(1));
  if (name === 'QC.FLAGS') return out.map((row) => row[0]);
  if (out.length === 2 && out[0].every((c) => typeof c === 'string') && out[0].length > 1) return out[1];
  return [out[0][0]];
}

function isError(c: OutCell): c is { error: '#VALUE!' | '#NUM!' | '#DIV/0!' | '#N/A'; message: string } {
  return typeof c === 'object' && c !== null;
}

/** Checks one cell; returns a failure text or '' (the test collects failures, then asserts none). */
function checkCell(name: string, c: Case, cell: OutCell, e: Expect, s: Stats): string {
  const where = `${name}(${c.label})`;
  if (e.kind === 'any') {
    if (typeof cell === 'number' && !Number.isFinite(cell)) return `${where}: ${cell} reached a cell`;
    if (isError(cell) && !(cell.message.length > 5)) return `${where}: error without a message`;
    return '';
  }
  if (e.kind === 'value') return e.values.includes(cell as never) ? '' : `${where}: got ${JSON.stringify(cell)}, expected one of ${JSON.stringify(e.values)}`;
  if (e.kind === 'error') {
    if (isError(cell) && cell.error === '#NUM!' && e.pattern.test(cell.message)) return '';
    return e.or ? checkCell(name, c, cell, e.or, s) : `${where}: expected #NUM! matching ${e.pattern}, got ${JSON.stringify(cell)}`;
  }
  const beyond = e.kind === 'beyond' || beyondRange(e.exact);
  if (e.kind === 'number' && nearLargest(e.exact, e.tol) && isError(cell)) return ''; // within rounding of the largest double: either answer is fair
  if (beyond) {
    s.beyond++;
    if (!isError(cell) || cell.error !== '#NUM!') return `${where}: the exact result is beyond the largest double, got ${JSON.stringify(cell)}`;
    if (!/exceeds the largest number Excel can hold/.test(cell.message)) return `${where}: message does not say the result is too large: ${cell.message}`;
    // The message names the inputs that carry the result out of range (inputsBeyond), as typed.
    for (const [n, v] of Object.entries(inputsBeyond(c.names ?? {}))) {
      if (!cell.message.includes(`${n} is ${show(v)}`)) return `${where}: message does not name ${n} = ${show(v)}: ${cell.message}`;
    }
    return '';
  }
  if (typeof cell !== 'number') return `${where}: expected a number near ${e.exact.toSignificantDigits(17).toString()}, got ${JSON.stringify(cell)}`;
  const a = agree(cell, e.exact, e.tol, e.floor ?? 0);
  const normal = e.exact.abs().gte(exact(MIN_NORMAL));
  if (normal && !e.floor) s.worst = Math.max(s.worst, a.relative);
  if (normal && e.floor) {
    // Error measured against the terms that cancel (the floor is tol × their size).
    const scale = e.floor.div(e.tol).plus(e.exact.abs());
    if (!scale.isZero()) s.worst = Math.max(s.worst, exact(cell).minus(e.exact).abs().div(scale).toNumber());
  }
  if (e.exact.abs().lt(exact(MIN_NORMAL)) && !e.exact.isZero()) {
    s.subnormal++;
    if (a.correctlyRounded) s.subnormalRounded++;
  }
  return a.ok ? '' : `${where}: ${a.why} (tolerance ${e.tol})`;
}

// ---------------------------------------------------------------------------------------------
// References: the published formula of each function, in decimal
// ---------------------------------------------------------------------------------------------

const F: Record<string, number> = { optimum: 0.25, desirable: 0.5, minimum: 0.75 };
const G: Record<string, number> = { optimum: 0.125, desirable: 0.25, minimum: 0.375 };
const TIERS = ['optimum', 'desirable', 'minimum'] as const;

const X = (x: number): Dec => exact(x);
/** Exact in 1500 digits: for sums whose terms cancel. */
const XW = (x: number): Dec => exactWide(x);
const hyp = (a: number, b: number): Dec => X(a).pow(2).plus(X(b).pow(2)).sqrt();
const allowableTotal = (cvi: number, cvg: number, tier: string, z: number): Dec => X(z).times(F[tier]).times(X(cvi)).plus(hyp(cvi, cvg).times(G[tier]));

/**
 * Tolerances. One rounding: half a unit in the last place (2^-53 ≈ 1.1e-16) — the result must be
 * the correctly rounded value. A few roundings (products, a hypot, a sum of positive terms): 1e-15,
 * about 4.5 units in the last place.
 */
const ONE_ROUNDING = 2 ** -53;
const FEW_ROUNDINGS = 1e-15;

interface Reference {
  cases(rand: () => number): Case[];
}

function scalarCases(lists: number[][], rand: () => number, random: number, make: (v: number[]) => Case | undefined): Case[] {
  const out: Case[] = [];
  for (const v of combos(lists)) {
    const c = make(v);
    if (c) out.push(c);
  }
  for (let i = 0; i < random; i++) {
    const c = make(lists.map(() => anySize(rand)));
    if (c) out.push(c);
  }
  return out;
}

const label = (v: ReadonlyArray<unknown>): string => v.map((x) => (typeof x === 'number' ? show(x) : JSON.stringify(x))).join(', ');

/** The most stringent tier met by exact totals; ties within `tol` accept both answers. */
function tiersMet(met: (tier: string) => 'yes' | 'no' | 'either'): string[] {
  const ok: string[] = [];
  for (const tier of TIERS) {
    const m = met(tier);
    if (m === 'yes') return [...ok, tier];
    if (m === 'either') ok.push(tier);
  }
  return [...ok, 'none'];
}

function lessOrEqual(a: Dec, b: Dec, tol: number): 'yes' | 'no' | 'either' {
  const size = a.abs().plus(b.abs()).times(tol);
  if (a.lt(b.minus(size))) return 'yes';
  if (a.gt(b.plus(size))) return 'no';
  return a.lte(b) ? 'yes' : 'either';
}

/** ln(1 + x), x ≥ 0, by its series below 1e-20 (where 1 + x would lose x at 80 digits). */
function ln1p(x: Dec): Dec {
  return x.lt('1e-20') ? x.minus(x.pow(2).div(2)) : x.plus(1).ln();
}

/** e^x − 1 by its series for |x| below 1e-20. */
function expm1(x: Dec): Dec {
  return x.abs().lt('1e-20') ? x.plus(x.pow(2).div(2)) : x.exp().minus(1);
}

/** 1 − [Φ(L − Δ) − Φ(−L − Δ)]^N for a single-limit rule: N = n·runs observations. */
function singleLimitExact(limit: number, shift: Dec, N: number): Dec {
  const q = phi(new D(-limit).minus(shift)).plus(upperTail(new D(limit).minus(shift)));
  if (q.gte(1)) return new D(1);
  return new D(1).minus(new D(1).minus(q).ln().times(N).exp());
}

/** Numbers around a base B: B·(1 + spread·(u − ½)), each a double. */
function around(rand: () => number, n: number, base: number, spread: number): number[] {
  return Array.from({ length: n }, () => {
    const v = base * (1 + spread * (rand() - 0.5));
    return Number.isFinite(v) ? v : base;
  });
}

const column = (xs: readonly number[]): Arg => xs.map((v) => [v]);

/** Exact mean and sample SD of doubles (1500 digits: a mean whose terms cancel is exact). */
function meanSd(xs: readonly number[]): { mean: Dec; sd: Dec } {
  const e = xs.map(exactWide);
  const n = xs.length;
  const mean = e.reduce((a, b) => a.plus(b), new DW(0)).div(n);
  const ss = e.reduce((a, b) => a.plus(b.minus(mean).pow(2)), new DW(0));
  return { mean: new D(mean), sd: new D(ss.div(n - 1).sqrt()) };
}

/** Magnitudes for data: subnormal to near the largest double. */
const DATA_BASES = [1e-322, 2.5e-320, 1e-310, 1e-300, 1e-170, 1e-160, 1, 1e160, 1e170, 1e300, 1e307, 1.5e308];

function dataBase(rand: () => number): number {
  return rand() < 0.5 ? DATA_BASES[Math.floor(rand() * DATA_BASES.length)] : anySize(rand);
}

// ---------------------------------------------------------------------------------------------
// Functions checked by exact scaling
// ---------------------------------------------------------------------------------------------
//
// Multiplying every input that carries the unit of the results by a power of two 2^k is exact in
// binary (while the numbers stay normal), and each of these functions is, by its formula,
// equivariant under it: figures in the unit of the results (means, SDs, limits, biases) scale by
// 2^k, ratios (CVs, z, sigma, df, probabilities, counts, verdicts, run sizes) do not change. So the
// exact answer at 1e±300 is the function's answer on ordinary data (itself checked against
// published values and independent implementations in the engine tests) times 2^k, computed in
// decimal. Scale equivariance of location and spread estimators: common practice, no source; for
// Algorithm A it is stated in ISO 13528:2015, annex C (from memory).

/** Which cells of a function's output carry the unit of the inputs that are scaled. */
type Unit = 'scales' | 'ratio';

interface Scaled {
  /** Ordinary inputs (magnitudes near 1–10), seeded. */
  readonly base: (rand: () => number) => Arg[];
  /** The same inputs with every unit-carrying number multiplied by f. */
  readonly scale: (args: Arg[], f: number) => Arg[];
  /** Per output cell: does it carry the unit? */
  readonly units: readonly Unit[];
  /** Largest magnitude among the unit-carrying inputs (to keep them normal and finite). */
  readonly top: (args: Arg[]) => number;
  /** Exponents tried; each is clipped so the scaled inputs stay within 2^-1000 … 2^1000. */
  readonly ks?: readonly number[];
}

const times = (a: Arg, f: number): Arg => (Array.isArray(a) ? (a as number[][]).map((r) => r.map((v) => v * f)) : (a as number) * f);
const col = (xs: number[]): number[][] => xs.map((x) => [x]);
const gauss = (rand: () => number): number => {
  // Box–Muller on the seeded generator.
  const u = Math.max(rand(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
};
const flat = (a: Arg): number[] => (Array.isArray(a) ? (a as unknown[][]).flat().filter((v): v is number => typeof v === 'number') : [a as number]);
const topOf = (...as: Arg[]): number => Math.max(...as.flatMap((a) => flat(a).map(Math.abs)));
const replication = (rand: () => number, days: number, reps: number, mean: number, cv: number): { values: number[][]; days: number[][] } => {
  const values: number[] = [];
  const labels: number[] = [];
  for (let d = 0; d < days; d++) {
    const dayShift = gauss(rand) * mean * cv * 0.5;
    for (let r = 0; r < reps; r++) {
      values.push(mean + dayShift + gauss(rand) * mean * cv);
      labels.push(d + 1);
    }
  }
  return { values: col(values), days: col(labels) };
};

const SCALED: Record<string, Scaled> = {
  'EQA.ZSCORE': {
    base: (r) => [4 + r() * 4, 5 + r(), 0.2 + r() * 0.5, r() < 0.5 ? 0 : r() * 0.3],
    scale: (a, f) => a.map((v) => times(v, f)),
    units: ['ratio'],
    top: (a) => topOf(...a),
  },
  'EQA.ZETA': {
    base: (r) => [4 + r() * 4, 5 + r(), 0.1 + r() * 0.5, r() * 0.3],
    scale: (a, f) => a.map((v) => times(v, f)),
    units: ['ratio'],
    top: (a) => topOf(...a),
  },
  'EQA.CONSENSUS': {
    base: (r) => [col(Array.from({ length: 8 + Math.floor(r() * 12) }, (_, i) => 10 + gauss(r) + (i === 0 ? 8 * r() : 0)))],
    scale: (a, f) => [times(a[0], f)],
    units: ['scales', 'scales', 'ratio', 'scales'],
    top: (a) => topOf(a[0]),
  },
  'DATA.CVLIMITS': {
    base: (r) => [1 + r() * 9, 3 + Math.floor(r() * 30), 0.9 + r() * 0.09],
    scale: (a, f) => [times(a[0], f), a[1], a[2]],
    units: ['scales', 'scales'],
    top: (a) => topOf(a[0]),
  },
  'DATA.AGREEMENT': {
    base: (r) => {
      const x = Array.from({ length: 10 + Math.floor(r() * 30) }, () => 2 + r() * 8);
      return [col(x), col(x.map((v) => v * (1 + 0.03 * gauss(r)) + 0.1)), r() < 0.5 ? 'absolute' : 'percent'];
    },
    scale: (a, f) => [times(a[0], f), times(a[1], f), a[2]],
    // Percent differences are ratios; absolute ones carry the unit. Set per case below.
    units: [],
    top: (a) => topOf(a[0], a[1]),
  },
  'PERF.SIGMALIMITS': {
    base: (r) => [6 + r() * 10, r() * 2 - 1, 0.5 + r() * 2, 5 + Math.floor(r() * 50), r() * 0.5],
    scale: (a, f) => [times(a[0], f), times(a[1], f), times(a[2], f), a[3], times(a[4], f)],
    units: ['ratio', 'ratio', 'ratio'],
    top: (a) => topOf(a[0], a[1], a[2], a[4]),
  },
  'VERIFY.PRECISION': {
    base: (r) => {
      const rep = replication(r, 5, 5, 5 + r() * 5, 0.02 + r() * 0.03);
      return [rep.values, rep.days, 2 + r() * 3, 3 + r() * 3];
    },
    scale: (a, f) => [times(a[0], f), a[1], a[2], a[3]],
    units: ['ratio', 'ratio', 'ratio', 'ratio', 'ratio', 'ratio', 'ratio', 'ratio', 'ratio', 'ratio'],
    top: (a) => topOf(a[0]),
  },
  'VERIFY.TRUENESS': {
    base: (r) => {
      const rep = replication(r, 5, 5, 5 + r() * 5, 0.02 + r() * 0.03);
      return [rep.values, rep.days, 5 + r() * 5, r() * 0.1];
    },
    scale: (a, f) => [times(a[0], f), a[1], times(a[2], f), times(a[3], f)],
    units: ['scales', 'scales', 'scales', 'ratio', 'scales', 'scales', 'scales', 'ratio', 'ratio'],
    top: (a) => topOf(a[0], a[2], a[3]),
  },
  'QC.FLAGS': {
    base: (r) => {
      const n = 30;
      const target = 5 + r() * 5;
      const sd = 0.1 + r() * 0.3;
      const values = Array.from({ length: n }, (_, i) => target + sd * (gauss(r) + (i > 20 ? 2.2 : 0)));
      return [col(values), target, sd, '1-3s/2-2s/R-4s/4-1s/10-x', col(values.map((_, i) => Math.floor(i / 2)))];
    },
    scale: (a, f) => [times(a[0], f), times(a[1], f), times(a[2], f), a[3], a[4]],
    units: [],
    top: (a) => topOf(a[0], a[1], a[2]),
  },
  'QC.REVIEW': {
    base: (r) => {
      const target = 5 + r() * 5;
      const sd = 0.1 + r() * 0.3;
      const values = Array.from({ length: 40 }, () => target + sd * 1.2 * gauss(r));
      return [col(values), target, sd, '1-3s/2-2s/R-4s', col(values.map((_, i) => Math.floor(i / 2)))];
    },
    scale: (a, f) => [times(a[0], f), times(a[1], f), times(a[2], f), a[3], a[4]],
    units: ['ratio', 'ratio', 'ratio', 'ratio', 'ratio', 'ratio', 'ratio', 'ratio'],
    top: (a) => topOf(a[0], a[1], a[2]),
  },
  'QC.RISK': {
    base: (r) => [8 + r() * 10, r() * 2, 1 + r(), ['1-3s', '1-2.5s', '1-3s/2-2s/R-4s'][Math.floor(r() * 3)], 1 + Math.floor(r() * 3), 50 + Math.floor(r() * 200)],
    scale: (a, f) => [times(a[0], f), times(a[1], f), times(a[2], f), a[3], a[4], a[5]],
    units: ['ratio'],
    top: (a) => topOf(a[0], a[1], a[2]),
    ks: [-1000, -300, 300, 1000],
  },
  'QC.RUNSIZE': {
    base: (r) => [8 + r() * 10, r() * 2, 1 + r(), ['1-3s', '1-2.5s', '1-3s/2-2s/R-4s'][Math.floor(r() * 3)], 1 + Math.floor(r() * 3)],
    scale: (a, f) => [times(a[0], f), times(a[1], f), times(a[2], f), a[3], a[4]],
    units: ['ratio'],
    top: (a) => topOf(a[0], a[1], a[2]),
    ks: [-1000, -300, 300, 1000],
  },
};

const KS = [-1000, -700, -300, -100, 100, 300, 700, 1000];

function scaledReference(name: string, spec: Scaled): Reference {
  return {
    cases: (rand) => {
      const out: Case[] = [];
      const bases = name.startsWith('QC.R') ? 4 : 6;
      for (let b = 0; b < bases; b++) {
        const base = spec.base(rand);
        const ref = cellsOf(name, evaluate(name, base));
        const top = spec.top(base);
        let units = spec.units;
        if (name === 'DATA.AGREEMENT') units = base[2] === 'percent' ? ref.map((_, i) => (i === 10 ? 'ratio' : 'ratio')) : ref.map((_, i) => (i === 10 ? 'ratio' : 'scales'));
        for (const k0 of spec.ks ?? KS) {
          // Keep the largest scaled input at most 2^1000 and the smallest normal.
          const k = Math.max(-1000 + 8, Math.min(1000 - Math.ceil(Math.log2(top)), k0));
          const f = 2 ** k;
          const args = spec.scale(base, f);
          const cells: Expect[] = ref.map((c, i) => {
            if (typeof c === 'number') {
              const unit = name === 'QC.FLAGS' ? 'ratio' : units[i] ?? 'ratio';
              // Relative 1e-12 of the figure, or of the inputs' size for figures that are
              // differences of them (a mean difference near 0, a bias).
              const size = unit === 'scales' ? X(top).times(X(f)) : X(1);
              return unit === 'scales' ? num(X(c).times(X(f)), 1e-12, size.times(1e-12)) : num(X(c), 1e-12, X(1e-12));
            }
            if (typeof c === 'object' && c !== null) return { kind: 'any' };
            return { kind: 'value', values: [c] };
          });
          out.push({ label: `ordinary case ${b + 1} times 2^${k}`, args, cells });
        }
      }
      return out;
    },
  };
}

const SCALED_REFERENCES: Record<string, Reference> = Object.fromEntries(Object.entries(SCALED).map(([name, spec]) => [name, scaledReference(name, spec)]));

/** 150 seeded result/target columns of 1–12 rows around one size, a tenth of the results off by any size. */
function randomBiasStudies(rand: () => number, add: (r: number[], t: number[], tag: string) => void): void {
  for (let i = 0; i < 150; i++) {
    const n = 1 + Math.floor(rand() * 12);
    const t = around(rand, n, dataBase(rand), 0.5);
    const r = t.map((v) => v * (1 + (rand() < 0.1 ? anySize(rand) : 0.1 * (rand() - 0.3))));
    add(r.map((v, k) => (Number.isFinite(v) ? v : t[k])), t, 'random');
  }
}

const REFERENCES: Record<string, Reference> = {
  'SPEC.CV': {
    // f·CVI: one rounding.
    cases: (rand) =>
      scalarCases([EDGES], rand, 300, ([cvi]) => {
        const tier = TIERS[Math.floor(rand() * 3)];
        return { label: label([cvi, tier]), args: [cvi, tier], cells: [num(X(cvi).times(F[tier]), ONE_ROUNDING)] };
      }),
  },
  'SPEC.BIAS': {
    // g·√(CVI² + CVG²): hypot (about one unit in the last place) and a product.
    cases: (rand) =>
      scalarCases([EDGES, EDGES], rand, 300, ([cvi, cvg]) => {
        const tier = TIERS[Math.floor(rand() * 3)];
        return { label: label([cvi, cvg, tier]), args: [cvi, cvg, tier], cells: [num(hyp(cvi, cvg).times(G[tier]), FEW_ROUNDINGS)] };
      }),
  },
  'SPEC.TOTAL': {
    // z·f·CVI + g·√(CVI² + CVG²): products, a hypot and a sum of positive terms.
    cases: (rand) =>
      scalarCases([SOME, SOME, [0, 1.65, 1e-300, 1e300, MAX]], rand, 300, ([cvi, cvg, z]) => {
        const tier = TIERS[Math.floor(rand() * 3)];
        return { label: label([cvi, cvg, tier, z]), args: [cvi, cvg, tier, z], cells: [num(allowableTotal(cvi, cvg, tier, z), FEW_ROUNDINGS)], names: { cvi, cvg, z } };
      }),
  },
  'SPEC.MU': {
    // k·f·CVI: two roundings.
    cases: (rand) =>
      scalarCases([EDGES, [MIN_SUB, 1e-300, 1, 2, 1e300, MAX]], rand, 300, ([cvi, k]) => {
        const tier = TIERS[Math.floor(rand() * 3)];
        return { label: label([cvi, tier, k]), args: [cvi, tier, k], cells: [num(X(k).times(F[tier]).times(X(cvi)), 2 * ONE_ROUNDING * 1.01)], names: { cvi, k } };
      }),
  },
  'SPEC.FIXED': {
    // max(100·absolute/level, percent): two roundings.
    cases: (rand) =>
      scalarCases([SOME, SOME, [0, MIN_SUB, 10, 1e300]], rand, 300, ([level, absolute, percent]) => {
        const a = X(absolute).times(100).div(X(level));
        return { label: label([level, absolute, percent]), args: [level, absolute, percent], cells: [num(D.max(a, X(percent)), 2 * ONE_ROUNDING * 1.01)], names: { level, absolute } };
      }),
  },
  'SPEC.TIERS': {
    // The table: CV, bias and total of each tier, as SPEC.CV, SPEC.BIAS and SPEC.TOTAL.
    cases: (rand) =>
      scalarCases([SOME, SOME, [1.65, 1e300, MAX]], rand, 100, ([cvi, cvg, z]) => ({
        label: label([cvi, cvg, z]),
        args: [cvi, cvg, z],
        cells: TIERS.flatMap((t) => [num(X(cvi).times(F[t]), ONE_ROUNDING), num(hyp(cvi, cvg).times(G[t]), FEW_ROUNDINGS), num(allowableTotal(cvi, cvg, t, z), FEW_ROUNDINGS)]),
        names: { cvi, cvg, z },
      })),
  },
  ZSCORE: {
    // Φ⁻¹(p) and Φ⁻¹((1 + p)/2) (AS 241, relative accuracy about 1e-16; tolerance 1e-15).
    cases: (rand) => {
      const ps = [MIN_SUB, 1e-320, MIN_NORMAL, 1e-300, 1e-160, 1e-17, 2 ** -54, 0.25, 0.5 - 2 ** -54, 0.5, 0.5 + 2 ** -53, 0.975, 1 - 2 ** -52, 1 - 2 ** -53];
      for (let i = 0; i < 30; i++) ps.push(10 ** -(1 + rand() * 322), 1 - 10 ** -(1 + rand() * 15));
      return ps.flatMap((p) =>
        [1, 2].map((sides) => {
          const got = evaluate('ZSCORE', [p, sides])[0][0];
          const start = typeof got === 'number' ? got : sides === 1 ? normalQuantile(p) : p;
          const ref = sides === 1 ? quantile(X(p), start) : twoSidedQuantile(X(p), start);
          return { label: label([p, sides]), args: [p, sides], cells: [num(ref, FEW_ROUNDINGS)] };
        }),
      );
    },
  },
  'PERF.TOTAL': {
    // |bias| + z·CV: a product and a sum of positive terms.
    cases: (rand) =>
      scalarCases([SOME.flatMap((v) => [v, -v]), SOME, [0, 1.65, MAX]], rand, 300, ([bias, cv, z]) => ({
        label: label([bias, cv, z]),
        args: [bias, cv, z],
        cells: [num(X(bias).abs().plus(X(z).times(X(cv))), 2 * ONE_ROUNDING * 1.01)],
        names: { bias, cv, z },
      })),
  },
  'PERF.SIGMA': {
    // (allowable − |bias|)/CV: the difference of exact inputs is rounded once, then the quotient.
    cases: (rand) => {
      const cs = scalarCases([SOME, SOME.flatMap((v) => [v, -v]), SOME], rand, 300, ([allowable, bias, cv]) => ({
        label: label([allowable, bias, cv]),
        args: [allowable, bias, cv],
        cells: [num(X(allowable).minus(X(bias).abs()).div(X(cv)), 2 * ONE_ROUNDING * 1.01)],
        names: { allowable, bias, cv },
      }));
      // Near-cancellation: allowable and |bias| one unit in the last place apart.
      for (const a of [1e-300, 1, 1e300, MAX]) {
        const b = a * (1 - 2 ** -53);
        for (const cv of [MIN_SUB, 1e-300, 1e300]) cs.push({ label: label([a, b, cv]), args: [a, -b, cv], cells: [num(X(a).minus(X(b)).div(X(cv)), 2 * ONE_ROUNDING * 1.01)], names: { allowable: a, bias: -b, cv } });
      }
      return cs;
    },
  },
  'PERF.SHARE': {
    // observed/allowable: one rounding.
    cases: (rand) =>
      scalarCases([EDGES, EDGES], rand, 300, ([observed, allowable]) => ({
        label: label([observed, allowable]),
        args: [observed, allowable],
        cells: [num(X(observed).div(X(allowable)), ONE_ROUNDING)],
        names: { observed, allowable },
      })),
  },
  'PERF.TIER': {
    // The most stringent tier with |bias| + z·CV ≤ SPEC.TOTAL ("total") or CV ≤ SPEC.CV and |bias| ≤ SPEC.BIAS ("parts");
    // exact totals within 1e-15 of each other accept either side.
    cases: (rand) => {
      const out: Case[] = [];
      const make = (cvi: number, cvg: number, bias: number, cv: number, z: number, mode: string): Case => {
        const observed = X(bias).abs().plus(X(z).times(X(cv)));
        const values =
          mode === 'total'
            ? tiersMet((t) => lessOrEqual(observed, allowableTotal(cvi, cvg, t, z), FEW_ROUNDINGS))
            : tiersMet((t) => {
                const a = lessOrEqual(X(cv), X(cvi).times(F[t]), FEW_ROUNDINGS);
                const b = lessOrEqual(X(bias).abs(), hyp(cvi, cvg).times(G[t]), FEW_ROUNDINGS);
                return a === 'no' || b === 'no' ? 'no' : a === 'yes' && b === 'yes' ? 'yes' : 'either';
              });
        return { label: label([cvi, cvg, bias, cv, z, mode]), args: [cvi, cvg, bias, cv, z, mode], cells: [{ kind: 'value', values }] };
      };
      for (const [cvi, cvg, bias, cv] of combos([SOME, [0, 1e-300, 1e300], SOME, SOME])) out.push(make(cvi, cvg, bias, cv, 1.65, rand() < 0.5 ? 'total' : 'parts'));
      for (let i = 0; i < 400; i++) {
        // Same-sized inputs, so the tier decision is not foregone.
        const s = anySize(rand);
        const cvi = s * (0.5 + rand());
        const v = [cvi, s * (0.5 + rand()), s * (rand() - 0.5), s * rand() * 0.6];
        const z = rand() < 0.3 ? anySize(rand) : 1.65;
        if (v.every(Number.isFinite)) out.push(make(v[0], v[1], v[2], v[3], z, rand() < 0.5 ? 'total' : 'parts'));
      }
      return out;
    },
  },
  'QC.SHIFT': {
    // (allowable − |bias|)/CV − z: a difference of σ and z, so the error is relative to |σ| + z.
    cases: (rand) =>
      scalarCases([SOME, SOME.flatMap((v) => [v, -v]), SOME, [0, 1.65, 1e300, MAX]], rand, 300, ([allowable, bias, cv, z]) => {
        const sigma = X(allowable).minus(X(bias).abs()).div(X(cv));
        return {
          label: label([allowable, bias, cv, z]),
          args: [allowable, bias, cv, z],
          cells: [num(sigma.minus(X(z)), FEW_ROUNDINGS, sigma.abs().plus(X(z)).times(FEW_ROUNDINGS))],
          names: { allowable, bias, cv, z },
        };
      }),
  },
  'BV.RCV': {
    // √2·z·√(CV² + CVI²).
    cases: (rand) =>
      scalarCases([SOME, SOME, [0, 1.96, 1e-300, 1e300, MAX]], rand, 300, ([cv, cvi, z]) => ({
        label: label([cv, cvi, z]),
        args: [cv, cvi, z],
        cells: [num(new D(2).sqrt().times(X(z)).times(hyp(cv, cvi)), FEW_ROUNDINGS)],
        names: { cv, cvi, z },
      })),
  },
  'BV.RCVLOG': {
    // σ = √ln(1 + (√(CV² + CVI²)/100)²), t = √2·z·σ, 100·(e^(±t) − 1). The exponential multiplies
    // the relative error of t (a few units in the last place) by t for a rise: tolerance 1e-15·max(1, t).
    cases: (rand) =>
      scalarCases([SOME, [0, 5.7, 1e300], [0, 1.96, 1e-300, 1e300]], rand, 300, ([cv, cvi, z]) => {
        const direction = rand() < 0.5 ? 'up' : 'down';
        const c = hyp(cv, cvi).div(100);
        const sigma = ln1p(c.pow(2)).sqrt();
        const t = new D(2).sqrt().times(X(z)).times(sigma);
        const value = expm1(direction === 'up' ? t : t.neg()).times(100);
        const tol = FEW_ROUNDINGS * (direction === 'up' ? Math.max(1, t.toNumber()) : 1);
        return { label: label([cv, cvi, z, direction]), args: [cv, cvi, z, direction], cells: [num(value, tol)], names: { cv, cvi, z } };
      }),
  },
  'BV.INDIVIDUALITY': {
    // √(CVI² + CV²)/CVG.
    cases: (rand) =>
      scalarCases([SOME, SOME, [0, 1e-300, 1e300]], rand, 300, ([cvi, cvg, cv]) => ({
        label: label([cvi, cvg, cv]),
        args: [cvi, cvg, cv],
        cells: [num(hyp(cvi, cv).div(X(cvg)), FEW_ROUNDINGS)],
        names: { cvi, cvg, cv },
      })),
  },
  'BV.SETPOINT': {
    // ⌈(z·√(CV² + CVI²)/closeness)²⌉, at least 1; a square within 1e-12 of a whole number counts as
    // it (the function's stated rule). Exact below 2^53; beyond, the square is itself whole and
    // carries its few roundings (1e-15).
    cases: (rand) =>
      scalarCases([SOME, [0, 5.7, 1e300], [MIN_SUB, 1e-300, 5, 1e300], [0, 1.96, 1e300]], rand, 300, ([cv, cvi, closeness, z]) => {
        const x = X(z).times(hyp(cv, cvi)).div(X(closeness)).pow(2);
        const whole = x.round();
        const n = D.max(1, x.minus(whole).abs().lte(x.times(1e-12)) ? whole : x.ceil());
        return {
          label: label([cv, cvi, closeness, z]),
          args: [cv, cvi, closeness, z],
          cells: [num(n, n.lt(2 ** 53) ? 0 : FEW_ROUNDINGS)],
          names: { cv, cvi, closeness, z },
        };
      }),
  },
  'DATA.CV': {
    // 100·s/x̄, s with n − 1. The mean is a correctly rounded sum over n (one unit in the last
    // place, however the values cancel), the SD a sum of up to 30 squares: tolerance 1e-14 (about
    // n units in the last place).
    cases: (rand) => {
      const out: Case[] = [];
      const add = (xs: number[], tag: string): void => {
        const { mean, sd } = meanSd(xs);
        out.push({ label: `${tag}: ${label(xs.slice(0, 4))}${xs.length > 4 ? ', …' : ''}`, args: [column(xs)], cells: [num(sd.times(100).div(mean), 1e-14)] });
      };
      add([1e-170, 2e-170, 3e-170], 'named');
      add([1e300, 2e300, 3e300], 'named');
      add([3 * MIN_SUB, 5 * MIN_SUB, 7 * MIN_SUB], 'subnormal');
      add([MAX, MAX * 0.9, MAX * 0.8], 'near the largest');
      add([MAX, -MAX, MAX * 0.5], 'opposite signs at the largest');
      add([1e300, 1e-300, 3e300], 'mixed');
      add([1e16, 1, -1e16], 'cancelling mean');
      add([0.1, 0.2, -0.3], 'cancelling mean');
      add([1e300, 1, -1e300], 'cancelling mean');
      add([MAX, 1e-300, -MAX], 'cancelling mean');
      for (let i = 0; i < 150; i++) add(around(rand, 2 + Math.floor(rand() * 28), dataBase(rand), rand() < 0.8 ? 0.5 : 4), 'random');
      // CV beyond the range: a mean far smaller than the SD.
      out.push({ label: 'mean tiny beside the SD', args: [column([MAX, -MAX, 1e-300])], cells: [{ kind: 'beyond' }] });
      return out;
    },
  },
  'DATA.BIAS': {
    // mean of 100·(result − target)/target. Each term three roundings; the mean's error is
    // relative to Σ|bias|/n (its terms may cancel): floor 1e-14·Σ|bias|/n. Where the function's
    // stated bound (n + 4)·2^-53·Σ|bias|/n exceeds both the exact mean and 1e-9 (tenfold, either
    // way, to keep clear of the edge) the answer has no reliable digit and is #NUM!.
    cases: (rand) => {
      const out: Case[] = [];
      const add = (r: number[], t: number[], tag: string): void => {
        const b = r.map((v, i) => XW(v).minus(XW(t[i])).times(100).div(XW(t[i])));
        const mean = b.reduce((a, v) => a.plus(v), new DW(0)).div(b.length);
        const sumAbs = b.reduce((a, v) => a.plus(v.abs()), new DW(0)).div(b.length);
        const bound = sumAbs.times((b.length + 4) * 2 ** -53);
        const value = num(mean, 1e-14, sumAbs.times(1e-14));
        const lost = bound.gt(mean.abs().times(10)) && bound.gt(1e-8);
        const kept = bound.lt(mean.abs().div(10)) || bound.lt(1e-10);
        const cell: Expect = lost ? { kind: 'error', pattern: /cancel/ } : kept ? value : { kind: 'error', pattern: /cancel/, or: value };
        out.push({ label: `${tag}: ${label(r.slice(0, 3))} / ${label(t.slice(0, 3))}`, args: [column(r), column(t)], cells: [cell] });
      };
      add([1e-300 * 1.02, 1e-300 * 0.97], [1e-300, 1e-300], 'tiny');
      add([MAX, MAX * 0.99], [MAX * 0.98, MAX], 'near the largest');
      add([MAX, -MAX], [1e-308, 1e-308], 'overflowing terms that cancel (no digit left: #NUM!)');
      add([1e10, -1e10 + 1], [1, 1], 'large exact terms that cancel');
      add([1e300], [1e-300], 'result huge, target tiny');
      add([5 * MIN_SUB, 9 * MIN_SUB], [4 * MIN_SUB, 8 * MIN_SUB], 'subnormal');
      randomBiasStudies(rand, add);
      return out;
    },
  },
  'DATA.RMSBIAS': {
    // √(mean of (100·(result − target)/target)²): positive terms, tolerance 1e-14.
    cases: (rand) => {
      const out: Case[] = [];
      const add = (r: number[], t: number[], tag: string): void => {
        const b = r.map((v, i) => XW(v).minus(XW(t[i])).times(100).div(XW(t[i])));
        const rms = b.reduce((a, v) => a.plus(v.pow(2)), new DW(0)).div(b.length).sqrt();
        out.push({ label: `${tag}: ${label(r.slice(0, 3))} / ${label(t.slice(0, 3))}`, args: [column(r), column(t)], cells: [num(rms, 1e-14)] });
      };
      add([MAX, -MAX], [1e-308, 1e-308], 'beyond the range');
      add([1e300], [1e-300], 'beyond the range');
      add([MAX], [MAX * 0.5], 'near the largest');
      add([5 * MIN_SUB, 9 * MIN_SUB], [4 * MIN_SUB, 8 * MIN_SUB], 'subnormal');
      add([1e-300 * (1 + 1e-15)], [1e-300], 'tiny bias');
      randomBiasStudies(rand, add);
      return out;
    },
  },
  'DATA.PRECISION': {
    // One-way ANOVA as in the help: s_r = √MS_within, s_b = √max(0, (MS_between − MS_within)/n₀),
    // s_WL = √(s_r² + s_b²), CVs in % of the grand mean. Two-pass sums: 1e-13 (up to 40 results,
    // a few units in the last place each); the between-group variance is a difference of mean
    // squares, so its error is relative to MS_between + MS_within.
    cases: (rand) => {
      const out: Case[] = [];
      const add = (values: number[], groups: number[], tag: string): void => {
        const e = values.map(XW);
        const N = values.length;
        const keys = [...new Set(groups)];
        const k = keys.length;
        const grand = e.reduce((a, v) => a.plus(v), new DW(0)).div(N);
        let ssW = new DW(0);
        let ssB = new DW(0);
        let sumSq = new DW(0);
        for (const g of keys) {
          const xs = e.filter((_v, i) => groups[i] === g);
          const m = xs.reduce((a, v) => a.plus(v), new DW(0)).div(xs.length);
          ssW = xs.reduce((a, v) => a.plus(v.minus(m).pow(2)), ssW);
          ssB = ssB.plus(m.minus(grand).pow(2).times(xs.length));
          sumSq = sumSq.plus(xs.length * xs.length);
        }
        const msW = ssW.div(N - k);
        const msB = ssB.div(k - 1);
        const n0 = new D(N).minus(sumSq.div(N)).div(k - 1);
        const diff = msB.minus(msW);
        const between = D.max(0, diff.div(n0));
        const sr = msW.sqrt();
        const sb = between.sqrt();
        const swl = msW.plus(between).sqrt();
        const tol = 1e-13;
        // √ of a variance known to ±tol·(MS_between + MS_within)/n₀ is known to ±√ of that near 0.
        const bFloor = msB.plus(msW).div(n0).times(tol).sqrt().plus(sb.times(tol));
        out.push({
          label: `${tag}: ${label(values.slice(0, 3))}, …`,
          args: [column(values), column(groups)],
          cells: [
            num(grand, 1e-14),
            num(sr, tol),
            num(sb, tol, bFloor),
            num(swl, tol),
            num(sr.times(100).div(grand), tol),
            num(swl.times(100).div(grand), tol),
            { kind: 'value', values: [k] },
            { kind: 'value', values: [N] },
          ],
        });
      };
      add([1e-170, 2e-170, 3e-170, 5e-170], [1, 1, 2, 2], 'named');
      add([1e300, 2e300, 3e300, 5e300], [1, 1, 2, 2], 'named');
      add([3 * MIN_SUB, 5 * MIN_SUB, 9 * MIN_SUB, 12 * MIN_SUB, 14 * MIN_SUB], [1, 1, 2, 2, 2], 'subnormal');
      add([MAX, MAX * 0.9, MAX * 0.5, MAX * 0.4], [1, 1, 2, 2], 'near the largest');
      add([1e300, -1e300, 1, 3, 2, 4], [1, 1, 2, 2, 3, 3], 'grand mean cancelling to 5/3');
      for (let i = 0; i < 60; i++) {
        const k = 2 + Math.floor(rand() * 4);
        const base = dataBase(rand);
        const values: number[] = [];
        const groups: number[] = [];
        for (let g = 0; g < k; g++) {
          const centre = base * (1 + 0.3 * (rand() - 0.5));
          const n = 1 + Math.floor(rand() * 6) + (g === 0 ? 1 : 0);
          for (const v of around(rand, n, centre, 0.2)) {
            values.push(v);
            groups.push(g + 1);
          }
        }
        add(values, groups, 'random');
      }
      // SDs beyond the range (opposite signs at the largest): the SD cells are #NUM!, the CVs finite.
      out.push({
        label: 'SDs beyond the range',
        args: [column([MAX, -MAX, MAX, -MAX * 0.5]), column([1, 1, 2, 2])],
        cells: [{ kind: 'any' }, { kind: 'beyond' }, { kind: 'any' }, { kind: 'beyond' }, { kind: 'any' }, { kind: 'any' }, { kind: 'value', values: [2] }, { kind: 'value', values: [4] }],
      });
      return out;
    },
  },
  'DATA.COMPARE': {
    // Passing–Bablok, Deming (ratio 1 and extreme ratios) and OLS as the help states them, on
    // data y ≈ Y·(0.5 + 0.8·x/X) with 5 % noise, X and Y of any size. Slopes, intercepts and
    // bounds are differences of terms as large as |b|·max|x| and max|y| (and the half-width
    // t·SE): the error is taken relative to those, tolerance 1e-12 (sums over up to 12 pairs,
    // jackknife differences of leave-one-out slopes).
    cases: (rand) => {
      const out: Case[] = [];
      for (let i = 0; i < 90; i++) {
        const n = 4 + Math.floor(rand() * 9);
        const Xs = i < 12 ? [1e-300, 1e300, MAX / 4, 1e-310, 1, 1e160][i % 6] : dataBase(rand);
        const Ys = i < 12 ? [1e300, 1e-300, MAX / 4, 1e-310, 1e160, 1][Math.floor(i / 2) % 6] : dataBase(rand);
        const x = Array.from({ length: n }, (_v, k) => Xs * (0.5 + k / n + 0.05 * rand()));
        const y = x.map((v) => Ys * (0.5 + 0.8 * (v / Xs) + 0.05 * (rand() - 0.5)));
        if (![...x, ...y].every((v) => Number.isFinite(v))) continue;
        const method = ['passing-bablok', 'deming', 'ols'][i % 3];
        const ratio = method === 'deming' ? [1, 1e-300, 1e300, 4][Math.floor(rand() * 4)] : 1;
        const level = rand() < 0.5 ? Xs : anySize(rand);
        out.push(compareCase(x, y, method, level, ratio));
      }
      return out;
    },
  },
  'MU.BIAS': {
    // √(RMS(bias)² + u_ref²), RMS(bias) = √(mean of bias²): positive terms, tolerance 1e-14.
    cases: (rand) => {
      const out: Case[] = [];
      const add = (b: number[], u: number, tag: string): void => {
        const ms = b.map(XW).reduce((a, v) => a.plus(v.pow(2)), new DW(0)).div(b.length);
        out.push({ label: `${tag}: ${label(b.slice(0, 3))}; ${show(u)}`, args: [column(b), u], cells: [num(ms.plus(XW(u).pow(2)).sqrt(), 1e-14)] });
      };
      add([MAX, -MAX], MAX, 'beyond the range');
      add([MAX, MAX], 0, 'at the largest');
      add([1e-300, -2e-300], 1e-300, 'tiny');
      add([MIN_SUB, 3 * MIN_SUB], MIN_SUB, 'subnormal');
      add([1e160, 1e160], 1e-160, 'mixed');
      for (let i = 0; i < 100; i++) add(around(rand, 1 + Math.floor(rand() * 10), dataBase(rand), 3), rand() < 0.5 ? 0 : anySize(rand), 'random');
      return out;
    },
  },
  'MU.COMBINE': {
    // k·√(u_rw² + u_bias²).
    cases: (rand) =>
      scalarCases([SOME, SOME, [MIN_SUB, 1, 2, 1e300, MAX]], rand, 300, ([uRw, uBias, k]) => ({
        label: label([uRw, uBias, k]),
        args: [uRw, uBias, k],
        cells: [num(X(k).times(hyp(uRw, uBias)), FEW_ROUNDINGS)],
        names: { u_rw: uRw, u_bias: uBias, k },
      })),
  },
  'QC.DETECT': {
    // Single-limit rules: 1 − [Φ(L − Δ) − Φ(−L − Δ)]^(n·runs). The engine's Φ is accurate to about
    // 1e-15 absolute (normal.ts), so probabilities down to 4.7e-4 (1-3.5s) are relative 1e-11.
    // The multirule at a shift of 1e3 SD or more rejects with probability 1 to double precision
    // (at least that of its 1-3s term, which the decimal formula rounds to 1); at a shift of
    // 1e-100 SD or less it equals the false rejection at 0 (a change of order 1e-100).
    cases: () => {
      const out: Case[] = [];
      const shifts = [0, MIN_SUB, 1e-310, 1e-300, 1e-160, 1e-100, 1e100, 1e160, 1e300, MAX];
      for (const [rule, limit] of [['1-3s', 3], ['1-2.5s', 2.5], ['1-3.5s', 3.5]] as const) {
        for (const shift of shifts) {
          for (const [n, runs] of [[1, 1], [4, 1], [100, 10000]]) {
            out.push({ label: label([rule, n, shift, runs]), args: [rule, n, shift, runs], cells: [num(singleLimitExact(limit, X(shift), n * runs), 1e-11)] });
          }
        }
      }
      const multi = '1-3s/2-2s/R-4s';
      const atZero = evaluate('QC.FALSEREJECT', [multi, 2])[0][0] as number;
      for (const shift of shifts) {
        if (shift >= 1e3) {
          expect(singleLimitExact(3, X(shift), 2).toNumber()).toBe(1);
          out.push({ label: label([multi, 2, shift]), args: [multi, 2, shift], cells: [{ kind: 'value', values: [1] }] });
        } else {
          out.push({ label: label([multi, 2, shift]), args: [multi, 2, shift], cells: [{ kind: 'value', values: [atZero] }] });
        }
      }
      return out;
    },
  },
  'QC.FALSEREJECT': {
    // No range-sensitive inputs; its domain's extremes (n 1 and 100, runs 1 and 10000) for
    // single-limit rules against 1 − [Φ(L) − Φ(−L)]^(n·runs), tolerance as QC.DETECT.
    cases: () =>
      (['1-3s', '1-2.5s', '1-3.5s'] as const).flatMap((rule) =>
        [[1, 1], [100, 1], [1, 10000], [100, 10000]].map(([n, runs]) => ({
          label: label([rule, n, runs]),
          args: [rule, n, runs],
          cells: [num(singleLimitExact(Number(rule.slice(2, -1)), new D(0), n * runs), 1e-11)],
        })),
      ),
  },
  'QC.PLAN': {
    // The plan follows from the critical shift Δ = (allowable − |bias|)/CV − 1.65, taken exactly
    // in decimal. Δ ≥ 40 SD: 1-3.5s with one control, detection 1 (the decimal formula rounds to 1),
    // false rejection 2Φ(−3.5). Otherwise the plan equals the plan of ordinary inputs with the same
    // shift (allowable Δ + 1.65, bias 0, CV 1), itself checked in test/engine/qc/plan.test.ts.
    cases: (rand) => {
      const out: Case[] = [];
      const make = (allowable: number, bias: number, cv: number): void => {
        const delta = X(allowable).minus(X(bias).abs()).div(X(cv)).minus(1.65);
        const args = [allowable, bias, cv];
        if (delta.gte(40)) {
          out.push({
            label: label(args),
            args,
            cells: [
              { kind: 'value', values: ['1-3.5s'] },
              { kind: 'value', values: [1] },
              { kind: 'value', values: [1] },
              num(singleLimitExact(3.5, delta, 1), 1e-11),
              num(singleLimitExact(3.5, new D(0), 1), 1e-11),
              { kind: 'value', values: [true] },
            ],
          });
        } else {
          const d = Math.max(-MAX, delta.toNumber());
          const same = evaluate('QC.PLAN', [Math.max(0, d + 1.65), d + 1.65 < 0 ? -(d + 1.65) : 0, 1])[1];
          // Rule, controls, runs and target met exactly; detection and false rejection within 1e-12:
          // the shift of the ordinary inputs differs by the rounding of d + 1.65 − 1.65.
          out.push({
            label: label(args),
            args,
            // Run size (cell 6) depends on (allowable + |bias|)/cv as well as on the shift, so it
            // is not the ordinary plan's; QC.RUNSIZE is checked at the edges by exact scaling below.
            cells: same.map((v, i) =>
              i === 6 ? ({ kind: 'any' } as Expect) : i === 3 || i === 4 ? num(X(v as number), 1e-12) : ({ kind: 'value', values: [v as string | number | boolean] } as Expect),
            ),
          });
        }
      };
      for (const [a, b, c] of combos([SOME, [0, 1e-300, -1e300, MAX], SOME])) make(a, b, c);
      // Near-cancellation: allowable and |bias| huge or tiny, the shift ordinary.
      for (const s of [1e-300, 1e-160, 1e160, 1e300]) {
        for (const shift of [0.5, 3, 6]) make(s * 2, s * 2 - (shift + 1.65) * s * 1e-3, s * 1e-3);
      }
      for (let i = 0; i < 100; i++) make(anySize(rand), anySize(rand) * (rand() < 0.5 ? -1 : 1), anySize(rand));
      return out;
    },
  },
  ...SCALED_REFERENCES,
};

/** The DATA.COMPARE case: exact estimates of the chosen method and the bias at the level. */
function compareCase(x: number[], y: number[], method: string, level: number, ratio: number): Case {
  const n = x.length;
  const ex = x.map(X);
  const ey = y.map(X);
  const tol = 1e-12;
  const maxX = ex.reduce((a, v) => D.max(a, v.abs()), new D(0));
  const maxY = ey.reduce((a, v) => D.max(a, v.abs()), new D(0));
  let b: Dec;
  let a: Dec;
  let bounds: Expect[];
  const slopeTerm = (s: Dec): Dec => s.abs();
  const interceptTerm = (s: Dec): Dec => maxY.plus(s.abs().times(maxX));
  if (method === 'passing-bablok') {
    const slopes: Dec[] = [];
    let K = 0;
    for (let i = 0; i < n; i++) {
      for (let j = i + 1; j < n; j++) {
        let dx = ex[j].minus(ex[i]);
        let dy = ey[j].minus(ey[i]);
        if (dx.isNeg() || (dx.isZero() && dy.isNeg())) {
          dx = dx.neg();
          dy = dy.neg();
        }
        if (dx.isZero()) continue; // the generated x are distinct
        if (dy.eq(dx.neg())) continue;
        const s = dy.div(dx);
        if (s.lt(-1)) K++;
        slopes.push(s);
      }
    }
    slopes.sort((p, q) => p.comparedTo(q));
    const N = slopes.length;
    const at = (r: number): Dec => slopes[r - 1];
    const mid = N % 2 ? (N + 1) / 2 + K : N / 2 + K;
    b = N % 2 ? at(mid) : at(mid).plus(at(mid + 1)).div(2);
    const med = (bb: Dec): Dec => {
      const r = ey.map((v, i) => v.minus(bb.times(ex[i]))).sort((p, q) => p.comparedTo(q));
      const h = n >> 1;
      return n % 2 ? r[h] : r[h - 1].plus(r[h]).div(2);
    };
    a = med(b);
    const C = normalQuantile(0.975) * Math.sqrt((n * (n - 1) * (2 * n + 5)) / 18);
    const M1 = Math.round((N - C) / 2);
    const M2 = N - M1 + 1;
    if (M1 < 1 || M1 + K < 1 || M2 + K > N) {
      bounds = [{ kind: 'any' }, { kind: 'any' }, { kind: 'any' }, { kind: 'any' }];
    } else {
      const bL = at(M1 + K);
      const bU = at(M2 + K);
      const a1 = med(bU);
      const a2 = med(bL);
      bounds = [num(bL, tol, slopeTerm(bL).times(tol)), num(bU, tol, slopeTerm(bU).times(tol)), num(D.min(a1, a2), tol, interceptTerm(bU).times(tol)), num(D.max(a1, a2), tol, interceptTerm(bU).times(tol))];
    }
  } else {
    const lambda = X(ratio);
    const moments = (skip: number): { mx: Dec; my: Dec; sxx: Dec; syy: Dec; sxy: Dec } => {
      const xs = ex.filter((_v, i) => i !== skip);
      const ys = ey.filter((_v, i) => i !== skip);
      const mx = xs.reduce((p, v) => p.plus(v), new D(0)).div(xs.length);
      const my = ys.reduce((p, v) => p.plus(v), new D(0)).div(ys.length);
      let sxx = new D(0);
      let syy = new D(0);
      let sxy = new D(0);
      xs.forEach((v, i) => {
        sxx = sxx.plus(v.minus(mx).pow(2));
        syy = syy.plus(ys[i].minus(my).pow(2));
        sxy = sxy.plus(v.minus(mx).times(ys[i].minus(my)));
      });
      return { mx, my, sxx, syy, sxy };
    };
    const slopeOf = (m: ReturnType<typeof moments>): Dec => {
      if (method === 'ols') return m.sxy.div(m.sxx);
      // The rationalised form when Syy − λSxx < 0 (no cancellation even at 80 digits).
      const Dd = m.syy.minus(lambda.times(m.sxx));
      const R = Dd.pow(2).plus(lambda.times(4).times(m.sxy.pow(2))).sqrt();
      return Dd.isNeg() ? lambda.times(2).times(m.sxy).div(R.minus(Dd)) : Dd.plus(R).div(m.sxy.times(2));
    };
    const m = moments(-1);
    b = slopeOf(m);
    a = m.my.minus(b.times(m.mx));
    const tq = new D(tQuantile(0.975, n - 2));
    let seB: Dec;
    let seA: Dec;
    if (method === 'ols') {
      const rss = ex.reduce((p, v, i) => p.plus(ey[i].minus(a).minus(b.times(v)).pow(2)), new D(0));
      const s = rss.div(n - 2).sqrt();
      seB = s.div(m.sxx.sqrt());
      seA = s.times(new D(1).div(n).plus(m.mx.pow(2).div(m.sxx)).sqrt());
    } else {
      const bs: Dec[] = [];
      const as: Dec[] = [];
      for (let i = 0; i < n; i++) {
        const mi = moments(i);
        const bi = slopeOf(mi);
        bs.push(bi);
        as.push(mi.my.minus(bi.times(mi.mx)));
      }
      const se = (v: Dec[]): Dec => {
        const mean = v.reduce((p, q) => p.plus(q), new D(0)).div(n);
        return v.reduce((p, q) => p.plus(q.minus(mean).pow(2)), new D(0)).times(n - 1).div(n).sqrt();
      };
      seB = se(bs);
      seA = se(as);
    }
    const hb = tq.times(seB);
    const ha = tq.times(seA);
    bounds = [
      num(b.minus(hb), tol, slopeTerm(b).plus(hb).times(tol)),
      num(b.plus(hb), tol, slopeTerm(b).plus(hb).times(tol)),
      num(a.minus(ha), tol, interceptTerm(b).plus(ha).times(tol)),
      num(a.plus(ha), tol, interceptTerm(b).plus(ha).times(tol)),
    ];
  }
  if (beyondRange(b) || beyondRange(a)) {
    // The slope or the intercept is beyond the double range: the whole spill is that #NUM!.
    return { label: `${method}, x ≈ ${show(x[0])}, y ≈ ${show(y[0])}: beyond the range`, args: [column(x), column(y), method, level, ratio], cells: [{ kind: 'beyond' }] };
  }
  const bias = a.plus(b.minus(1).times(X(level)));
  const biasFloor = interceptTerm(b).plus(b.abs().plus(1).times(X(level))).times(tol);
  return {
    label: `${method}${method === 'deming' ? ` ratio ${show(ratio)}` : ''}, x ≈ ${show(x[0])}, y ≈ ${show(y[0])}, level ${show(level)}`,
    args: [column(x), column(y), method, level, ratio],
    cells: [
      num(b, tol, slopeTerm(b).times(tol)),
      bounds[0],
      bounds[1],
      num(a, tol, interceptTerm(b).times(tol)),
      bounds[2],
      bounds[3],
      num(bias, tol, biasFloor),
      level === 0 ? { kind: 'any' } : num(bias.times(100).div(X(level)), tol, biasFloor.times(100).div(X(level))),
    ],
  };
}

// ---------------------------------------------------------------------------------------------
// The tests
// ---------------------------------------------------------------------------------------------

afterAll(() => {
  const rows = [...STATS.entries()].map(
    ([name, s]) =>
      `  ${name.padEnd(17)} ${String(s.cases).padStart(5)} cases, worst relative error ${s.worst.toExponential(2)}, ${s.beyond} beyond the range (#NUM!), subnormal results ${s.subnormalRounded}/${s.subnormal} correctly rounded`,
  );
  console.log(`extreme-range cases against decimal.js (80 digits; 1500 for sums that cancel):\n${rows.join('\n')}`);
});

describe.each(FUNCTIONS.map((f) => [f.name] as const))('%s across the whole double range', (name) => {
  test('agrees with its formula evaluated in decimal.js, or is #NUM! naming the inputs where no finite answer exists', () => {
    const reference = REFERENCES[name];
    expect([name, reference !== undefined]).toEqual([name, true]);
    const rand = mulberry32(20261207 ^ (name.length * 7919));
    const cases = (reference as Reference).cases(rand);
    const s = stats(name);
    const failures: string[] = [];
    for (const c of cases) {
      const out = evaluate(name, c.args);
      const cells = cellsOf(name, out);
      expect(cells.length).toBeGreaterThanOrEqual(c.cells.length);
      c.cells.forEach((e, i) => {
        const f = checkCell(name, c, cells[i], e, s);
        if (f) failures.push(f);
      });
      // Cells past those the reference knows (figures added later): the general rule.
      for (let i = c.cells.length; i < cells.length; i++) {
        const f = checkCell(name, c, cells[i], { kind: 'any' }, s);
        if (f) failures.push(f);
      }
      s.cases++;
    }
    expect(failures.slice(0, 10)).toEqual([]);
    expect(cases.length).toBeGreaterThan(10);
  });
});

// ---------------------------------------------------------------------------------------------
// The cases found by hostile testing, by name
// ---------------------------------------------------------------------------------------------

describe('cases found by hostile testing', () => {
  const one = (name: string, args: Arg[]): OutCell => evaluate(name, args)[0][0];

  test('PERF.TIER(1e160, 0, 1e161, 0) is "none": the observed total 1e161 exceeds every allowance (at most 1.6e160)', () => {
    expect(one('PERF.TIER', [1e160, 0, 1e161, 0])).toBe('none');
  });

  test('PERF.TIER(3.9, 0, 0, 3, 1e308) is "none": observed 3e308 and allowances up to 2.9e308 are compared without overflowing to Infinity', () => {
    expect(one('PERF.TIER', [3.9, 0, 0, 3, 1e308])).toBe('none');
    // The exact totals (decimal.js): observed 3e308 > minimum allowance 2.925e308 + 1.46.
    expect(X(3).times(X(1e308)).gt(allowableTotal(3.9, 0, 'minimum', 1e308))).toBe(true);
  });

  test('SPEC.BIAS(1e-200, 1e-200) is 3.5355339059327376e-201, not 0 (the squares would underflow)', () => {
    const got = one('SPEC.BIAS', [1e-200, 1e-200]) as number;
    expect(agree(got, hyp(1e-200, 1e-200).times(0.25), FEW_ROUNDINGS).ok).toBe(true);
    expect(got).toBeGreaterThan(3.5e-201);
  });

  test('SPEC.BIAS(1e160, 1e160) is 3.5355339059327378e159, not #NUM! (the squares would overflow)', () => {
    const got = one('SPEC.BIAS', [1e160, 1e160]) as number;
    expect(agree(got, hyp(1e160, 1e160).times(0.25), FEW_ROUNDINGS).ok).toBe(true);
  });

  test('DATA.CV({1e-170; 2e-170; 3e-170}) is 50 (within 1e-14 of the exact CV of these doubles), not 0', () => {
    const xs = [1e-170, 2e-170, 3e-170];
    const got = one('DATA.CV', [column(xs)]) as number;
    const { mean, sd } = meanSd(xs);
    expect(agree(got, sd.times(100).div(mean), 1e-14).ok).toBe(true);
    expect(Math.abs(got - 50)).toBeLessThan(1e-12);
  });

  test('DATA.PRECISION at 1e-170 gives the SDs of the data, not zeros', () => {
    const values = [1e-170, 2e-170, 3e-170, 5e-170];
    const out = evaluate('DATA.PRECISION', [column(values), column([1, 1, 2, 2])]);
    const row = out[1];
    // Exact (decimal.js): group means 1.5e-170 and 4e-170; MS_within = (0.5 + 2)/2 ·1e-340 = 1.25e-340.
    const sr = X(1e-170).minus(X(2e-170)).pow(2).plus(X(3e-170).minus(X(5e-170)).pow(2)).div(2).div(2).sqrt();
    expect(agree(row[1] as number, sr, 1e-14).ok).toBe(true);
    expect(row[2] as number).toBeGreaterThan(1e-171);
    expect(row[3] as number).toBeGreaterThan(1e-171);
  });

  test('SPEC.TOTAL beyond the range is #NUM! naming every input as typed', () => {
    expect(one('SPEC.TOTAL', [1e308, 1e308, 'desirable', 1e308])).toEqual({
      error: '#NUM!',
      message: 'the result exceeds the largest number Excel can hold (about 1.8e308 in size): cvi is 1e308, cvg is 1e308, z is 1e308',
    });
  });

  test('a message quotes 2.0000000001 as typed, not as 2', () => {
    expect(one('ZSCORE', [2.0000000001])).toEqual({ error: '#NUM!', message: 'probability must be a probability strictly between 0 and 1 (got 2.0000000001)' });
  });

  test('a message quotes −1.7976931348623157e308 as typed, not as -Infinity', () => {
    const cell = one('SPEC.CV', [-MAX]) as { message: string };
    expect(cell.message).toContain('(got -1.7976931348623157e308)');
  });

  test('ZSCORE(1e-300, 2) is 1.2533141373155003e-300, not 0: (1 + p)/2 is not rounded', () => {
    const got = one('ZSCORE', [1e-300, 2]) as number;
    expect(agree(got, twoSidedQuantile(X(1e-300), got), FEW_ROUNDINGS).ok).toBe(true);
  });

  test('ZSCORE(1 − 2^-53, 2) is 8.29, not #NUM!: (1 + p)/2 would round to 1', () => {
    const p = 1 - 2 ** -53;
    const got = one('ZSCORE', [p, 2]) as number;
    expect(agree(got, twoSidedQuantile(X(p), 8.29), FEW_ROUNDINGS).ok).toBe(true);
  });
});

describe('a mean whose terms cancel below their rounding', () => {
  test('DATA.BIAS of biases ±1e618 % (exact mean −100 %) is #NUM!, not a silent 0', () => {
    const cell = evaluate('DATA.BIAS', [column([MAX, -MAX]), column([1e-308, 1e-308])])[0][0];
    expect(cell).toEqual({
      error: '#NUM!',
      message: 'the percent biases cancel: their mean is smaller than the rounding of biases as large as about 1e618 %, so no digit of it is reliable (check results and targets)',
    });
  });

  test('DATA.BIAS of large exact biases that cancel (1e12 % and −1e12 %) keeps its answer, −50 %', () => {
    expect(evaluate('DATA.BIAS', [column([1e10, -1e10 + 1]), column([1, 1])])[0][0]).toBe(-50);
  });
});

describe('the decimal references themselves', () => {
  // Published values, from memory, each to the digits quoted: 2Φ(−3) = 0.00269979606326 (the 3-SD
  // two-sided tail), erfc(6) = 2.1519736712498913e-17, Φ⁻¹(0.975) = 1.959963984540054; each check
  // allows half a unit in the last digit quoted.
  test('reproduce 2Φ(−3), erfc(6) and Φ⁻¹(0.975)', () => {
    expect(phi(new D(-3)).times(2).minus('0.00269979606326').abs().lte('5e-15')).toBe(true);
    expect(erfc(new D(6)).minus('2.1519736712498913e-17').abs().lte('5e-34')).toBe(true);
    expect(quantile(new D('0.975'), 2).minus('1.959963984540054').abs().lte('5e-16')).toBe(true);
  });
});
