/**
 * Risk-based QC frequency (QC.RISK, QC.RUNSIZE): the expected number of unreliable final patient
 * results that a shift of the method leaves behind, and the largest number of patient results
 * between QC events that keeps it acceptable.
 *
 * Model (Parvin CA. Clin Chem 2008;54:2049–54; CLSI C24, 4th ed., 2016). QC events bracket runs
 * of M patient results (M = runsize), reported as they are produced. A systematic shift of Δ SD
 * of the method begins at a uniformly random point between two QC events; when a QC event
 * rejects, the results since the last accepted event are corrected. A = allowable %, b = |bias| %,
 * s = CV % (s > 0); z = (error of a result)/s is normal with mean b/s + Δ and SD 1.
 *   P_E(Δ)  = Φ(−(A + b)/s − Δ) + Φ(−(A − b)/s + Δ), the share of results beyond ±A;
 *   ΔP_E(Δ) = P_E(Δ) − P_E(0), the share the shift adds;
 *   S_k(Δ)  = 1 − QC.DETECT(rule, n, Δ, k), no rejection in the first k events after the shift
 *             (the rule's memory empty at the shift);
 *   the results between the shift and the first event (M/2 on average) stay uncorrected when that
 *   event accepts; the M results between events k and k + 1 when events 1 … k + 1 all accept:
 *   E(Nuf)(Δ) = ΔP_E(Δ)·M·W(Δ),  W(Δ) = S_1/2 + Σ_{k≥2} S_k.
 *   QC.RISK   = MaxE(Nuf) = max over 0 ≤ Δ ≤ 10 of E(Nuf)(Δ);
 *   QC.RUNSIZE = ⌊maxrisk / max_Δ (ΔP_E·W)⌋ (E is linear in M), at most 1,000,000.
 * Shifts are taken in the direction of the bias (the worse one: P_E(Δ) ≥ P_E(−Δ) when b ≥ 0).
 *
 * ΔP_E ≥ 0 for every Δ ≥ 0 and A ≥ 0: dP_E/dΔ = φ((A − b)/s − Δ) − φ((A + b)/s + Δ) ≥ 0 because
 * |(A − b)/s − Δ| ≤ (A + b)/s + Δ. So a shift never makes results more reliable.
 *
 * A method that fails without a shift. MaxE(Nuf) counts only the results a shift makes
 * unreliable in addition to those the stable method already produces. When the stable method
 * itself fails its allowance, that count shrinks as the method gets worse (P_E(0) → 1 leaves
 * nothing to add; with A = 0 it is 0), so it would read as "low risk" for a failing method, and
 * QC.RUNSIZE would then rise as the allowance falls. So the risk functions require the method to
 * meet its allowance without a shift in the sense QC.PLAN uses: the critical shift
 * (A − b)/s − 1.65 must be > 0, i.e. fewer than about 5 % of results exceed the allowance on
 * the side of the bias. Otherwise QC.RISK (and the expected counts below) give #NUM! saying so, and
 * QC.RUNSIZE gives 0: no run size makes the results reliable. (Above that threshold the risk
 * falls and the run size rises with the allowance, checked in the tests; the count's turn
 * happens near sigma 1 and below.)
 *
 * Method.
 * - ΔP_E without cancellation: ΔP_E(Δ) = ∫_0^Δ φ(a₂ − t)·(1 − e^{−2α(β + t)}) dt with α = A/s,
 *   β = b/s, a₂ = (A − b)/s (from φ(a₁ + t) = φ(a₂ − t)·e^{−2α(β + t)}, a₁ = (A + b)/s), the
 *   bracket computed by expm1. The integrand is positive and smooth; 10-point Gauss–Legendre on
 *   pieces at most 0.125 SD wide keeps a relative error near 1e-14 (worst 1e-14 against 110-digit
 *   decimal arithmetic in the tests), also for Δ near 0 where ΔP_E is tiny.
 * - W(Δ) from one pass of the exact chain (survivalSequence in power.ts), with the geometric tail
 *   S_K·λ/(1 − λ) once the normalised state distribution has settled (exact), or the pass stopped
 *   when the rest is below 1e-15 of the sum (bounded from every state by the rule's 1-Ls term).
 *   Single-limit rules in closed form: W = r/2 + r²/(1 − r), r = P(|Z + Δ| ≤ L)^n (relative
 *   error 7e-14 at worst in the tests, shifts up to 10 SD). For multirules far beyond the limits
 *   (per-event pass probability below about 1e-6) the chain's class probabilities keep only the
 *   absolute accuracy of Φ (about 1e-15), so W loses relative digits there; E(Nuf) is then a
 *   negligible fraction of its maximum.
 * - The maximum: E on a grid Δ = 0, 0.25, …, 10; each of the three largest local maxima of the
 *   grid is refined by Brent's method (parabolic steps and golden sections, Brent RP. Algorithms
 *   for minimization without derivatives, 1973, ch. 5) on the two grid cells around it, to
 *   2e-5 SD in Δ; the largest value found is the result. At a smooth maximum an error δ in Δ
 *   costs a relative ½·|E''/E|·δ² in the value, far below the required 1e-6; the tests check
 *   the located maximum against an independent dense search.
 * Results are cached by the exact inputs (W by rule, n and shift, so that a sheet of plans
 * shares the grid): a hit is the same number.
 */
import { numError } from '../errors';
import { divisor, finite, show, wholeNumber, positive, nonNegative } from '../guards';
import { normalCdf } from '../normal';
import { BoundedCache } from './cache';
import { checkControls, gaussLegendre, survivalSequence, withChainBudget } from './power';
import { ControlRule, parseRule } from './rules';

/** The largest shift searched, SD. */
export const MAX_SHIFT = 10;
/** The largest run size QC.RUNSIZE reports. */
export const MAX_RUN_SIZE = 1_000_000;
/** The default of maxrisk: CLSI C24 (4th ed.) suggests MaxE(Nuf) ≤ 1. */
export const DEFAULT_MAX_RISK = 1;
/** Spacing of the search grid, SD (also the default axis of a risk curve). */
export const RISK_GRID_STEP = 0.25;

/** One point of a risk curve: E(Nuf) at a shift in SD. */
export interface RiskPoint {
  readonly shift: number;
  readonly risk: number;
}

/** The largest expected number of unreliable final results and the shift where it occurs. */
export interface MaximumRisk {
  readonly maxRisk: number;
  /** The shift Δ (SD) at which E(Nuf) is largest; 0 when it is 0 everywhere. */
  readonly argmax: number;
}

export interface RiskCurve extends MaximumRisk {
  readonly points: readonly RiskPoint[];
}

interface Method {
  /** A/s, |b|/s, (A − |b|)/s. */
  readonly alpha: number;
  readonly beta: number;
  readonly a2: number;
  readonly key: string;
}

/** Guards allowable, bias and cv (as PERF.SIGMA does) and standardises them. */
function methodOf(allowable: number, bias: number, cv: number): Method {
  nonNegative(allowable, 'allowable');
  finite(bias, 'bias');
  divisor(cv, 'cv');
  const b = Math.abs(bias);
  // allowable − |b| cannot overflow (both ≥ 0); a quotient beyond the double range is Infinity
  // here, a method so far inside its allowance that it carries no risk (see FAR_INSIDE).
  return { alpha: allowable / cv, beta: b / cv, a2: (allowable - b) / cv, key: `${allowable}|${b}|${cv}` };
}

/**
 * Sigma beyond which E(Nuf) is 0 to double precision at every shift searched: ΔP_E(Δ) ≤
 * Φ(Δ − σ) + Φ(−σ − Δ) ≤ 2Φ(10 − σ), below the smallest subnormal (4.9e-324) once σ − 10 > 39.
 */
const FAR_INSIDE = 50;

/** runsize: whole, 1 … 1,000,000 (the largest run size QC.RUNSIZE reports). */
function checkRunSize(runsize: number): void {
  wholeNumber(runsize, 'runsize', 1);
  if (runsize > MAX_RUN_SIZE) throw numError(`runsize must be at most ${MAX_RUN_SIZE} (got ${show(runsize)})`);
}

function ruleOf(rule: ControlRule | string): ControlRule {
  return typeof rule === 'string' ? parseRule(rule) : rule;
}

/** z of the threshold: the same as QC.PLAN's critical shift (5 % beyond the allowance, one-sided). */
export const STABLE_Z = 1.65;

/** True when the method meets its allowance without a shift: (A − |b|)/s − 1.65 > 0. */
function meetsAllowance(m: Method): boolean {
  return m.a2 - STABLE_Z > 0;
}

function requireMeetsAllowance(m: Method): void {
  if (!meetsAllowance(m)) {
    throw numError(
      `the method fails its allowable error without any shift: sigma (allowable − |bias|)/cv = ${show(m.a2)} must be greater than ${STABLE_Z} (about 5 % or more of the results already exceed the allowance, and no QC frequency changes that)`,
    );
  }
}

const SQRT_2PI = Math.sqrt(2 * Math.PI);
const GL = gaussLegendre(10);
const PIECE = 0.125;

function increase(m: Method, shift: number): number {
  if (!(shift > 0) || !(m.alpha > 0)) return 0;
  // Beyond 40 SD from t = a₂ the integrand is below φ(40) ≈ 1e-348: zero in double precision.
  const lo = Math.max(0, m.a2 - 40);
  const hi = Math.min(shift, m.a2 + 40);
  if (!(hi > lo)) return 0;
  const pieces = Math.ceil((hi - lo) / PIECE);
  const h = (hi - lo) / pieces;
  let total = 0;
  for (let p = 0; p < pieces; p++) {
    const mid = lo + (p + 0.5) * h;
    let part = 0;
    for (let i = 0; i < GL.x.length; i++) {
      const t = mid + 0.5 * h * GL.x[i];
      const u = m.a2 - t;
      part += GL.w[i] * Math.exp(-0.5 * u * u) * -Math.expm1(-2 * m.alpha * (m.beta + t));
    }
    total += 0.5 * h * part;
  }
  return total / SQRT_2PI;
}

/**
 * P_E(Δ) = Φ(−(A + b)/s − Δ) + Φ(−(A − b)/s + Δ): the probability that a patient result's error
 * exceeds ±allowable when the method carries |bias| and a shift of `shift` SD in the direction of
 * the bias. allowable ≥ 0, cv > 0 (%), shift finite ≥ 0.
 */
export function errorProbability(allowable: number, bias: number, cv: number, shift: number): number {
  const m = methodOf(allowable, bias, cv);
  nonNegative(shift, 'shift');
  return normalCdf(-(m.alpha + m.beta) - shift) + normalCdf(shift - m.a2);
}

/**
 * ΔP_E(Δ) = P_E(Δ) − P_E(0), the share of results a shift of `shift` SD adds beyond ±allowable;
 * ≥ 0. Computed as an integral without cancellation (Method above); relative accuracy about
 * 1e-14 also where it is tiny (Δ near 0).
 */
export function errorIncrease(allowable: number, bias: number, cv: number, shift: number): number {
  const m = methodOf(allowable, bias, cv);
  nonNegative(shift, 'shift');
  return increase(m, shift);
}

const WEIGHTS = new BoundedCache<string, number>(200000);

function weightOf(rule: ControlRule, n: number, shift: number): number {
  const key = `${rule.key}|${n}|${shift}`;
  const hit = WEIGHTS.get(key);
  if (hit !== undefined) return hit;
  const seq = survivalSequence(rule, n, shift);
  const s = seq.survival;
  let w = 0;
  for (let k = s.length - 1; k >= 1; k--) w += s[k];
  w += 0.5 * s[0] + seq.tail;
  WEIGHTS.set(key, w);
  return w;
}

/**
 * W(Δ) = S_1/2 + Σ_{k≥2} S_k: the expected number of uncorrected patient results after a shift of
 * `shift` SD, in runs of M (E(Nuf) = ΔP_E·M·W). Infinity when the rule cannot reject at that
 * shift. n whole 1…100, shift finite ≥ 0.
 */
export function uncorrectedRuns(rule: ControlRule | string, n: number, shift: number): number {
  const r = ruleOf(rule);
  checkControls(n);
  nonNegative(shift, 'shift');
  return weightOf(r, n, shift);
}

/** E(Nuf)/M at one shift: ΔP_E·W, 0 where ΔP_E is 0 (W may then be infinite). */
function perResult(m: Method, rule: ControlRule, n: number, shift: number): number {
  const dp = increase(m, shift);
  if (dp === 0) return 0;
  return dp * weightOf(rule, n, shift);
}

function neverRejects(rule: ControlRule, n: number, shift: number): never {
  throw numError(
    `rule "${rule.text}" with n = ${n} almost never rejects after a shift of ${show(shift)} SD: the expected number of unreliable results is too large to compute`,
  );
}

/**
 * E(Nuf)(Δ), the expected number of unreliable final patient results after a shift of `shift`
 * SD, with runs of `runsize` patient results between QC events of n controls each (Model above).
 * allowable ≥ 0 with (allowable − |bias|)/cv > 1.65 (else #NUM!, see above), cv > 0 (%; 0 →
 * #DIV/0!), n whole 1…100, runsize whole 1…1,000,000, shift finite ≥ 0.
 */
export function expectedUnreliable(
  allowable: number,
  bias: number,
  cv: number,
  rule: ControlRule | string,
  n: number,
  runsize: number,
  shift: number,
): number {
  const m = methodOf(allowable, bias, cv);
  const r = ruleOf(rule);
  checkControls(n);
  checkRunSize(runsize);
  nonNegative(shift, 'shift');
  requireMeetsAllowance(m);
  const e = runsize * perResult(m, r, n, shift);
  if (!Number.isFinite(e)) neverRejects(r, n, shift);
  return e;
}

interface Peak {
  /** max ΔP_E·W (per patient result in the run). */
  readonly value: number;
  readonly shift: number;
}

const GOLDEN = 0.3819660112501051; // (3 − √5)/2
const SHIFT_TOLERANCE = 2e-5;

/**
 * Brent's minimisation without derivatives (Brent 1973, ch. 5, procedure localmin), applied to
 * −f on [a, b] from the interior point x with known value fx; returns the best point evaluated.
 */
function brentMax(f: (x: number) => number, a: number, b: number, x: number, fx: number): Peak {
  const g = (t: number): number => -f(t);
  let v = x;
  let w = x;
  let gx = -fx;
  let gv = gx;
  let gw = gx;
  let d = 0;
  let e = 0;
  for (let iter = 0; iter < 100; iter++) {
    const m = 0.5 * (a + b);
    const tol = 1.4901161193847656e-8 * Math.abs(x) + SHIFT_TOLERANCE / 3;
    const t2 = 2 * tol;
    if (Math.abs(x - m) <= t2 - 0.5 * (b - a)) break;
    let useGolden = true;
    if (Math.abs(e) > tol) {
      let r = (x - w) * (gx - gv);
      let q = (x - v) * (gx - gw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      r = e;
      e = d;
      if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
        d = p / q;
        const u = x + d;
        if (u - a < t2 || b - u < t2) d = x < m ? tol : -tol;
        useGolden = false;
      }
    }
    if (useGolden) {
      e = (x < m ? b : a) - x;
      d = GOLDEN * e;
    }
    const u = x + (Math.abs(d) >= tol ? d : d > 0 ? tol : -tol);
    const gu = g(u);
    if (gu <= gx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      gv = gw;
      w = x;
      gw = gx;
      x = u;
      gx = gu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (gu <= gw || w === x) {
        v = w;
        gv = gw;
        w = u;
        gw = gu;
      } else if (gu <= gv || v === x || v === w) {
        v = u;
        gv = gu;
      }
    }
  }
  return { value: -gx, shift: x };
}

/** Grid points of the search: 0, 0.25, …, 10 SD. */
function searchGrid(): number[] {
  const count = Math.round(MAX_SHIFT / RISK_GRID_STEP);
  return Array.from({ length: count + 1 }, (_, i) => i * RISK_GRID_STEP);
}

const GRID = searchGrid();
/** How many of the grid's local maxima are refined. */
const REFINED = 3;

function locatePeak(f: (x: number) => number): Peak {
  const values = GRID.map(f);
  for (let i = 0; i < values.length; i++) if (values[i] === Infinity) return { value: Infinity, shift: GRID[i] };
  const maxima: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const left = i > 0 ? values[i - 1] : -Infinity;
    const right = i + 1 < values.length ? values[i + 1] : -Infinity;
    if (values[i] > 0 && values[i] >= left && values[i] >= right) maxima.push(i);
  }
  if (!maxima.length) return { value: 0, shift: 0 };
  maxima.sort((i, j) => values[j] - values[i] || i - j);
  let best: Peak = { value: values[maxima[0]], shift: GRID[maxima[0]] };
  for (const i of maxima.slice(0, REFINED)) {
    const lo = GRID[Math.max(0, i - 1)];
    const hi = GRID[Math.min(GRID.length - 1, i + 1)];
    const p = brentMax(f, lo, hi, GRID[i], values[i]);
    if (p.value > best.value) best = p;
  }
  return best;
}

const PEAKS = new BoundedCache<string, Peak>(20000);

function peakOf(m: Method, rule: ControlRule, n: number): Peak {
  if (m.a2 > FAR_INSIDE) return { value: 0, shift: MAX_SHIFT };
  const key = `${m.key}|${rule.key}|${n}`;
  const hit = PEAKS.get(key);
  if (hit) return hit;
  // The whole search over the shift shares one budget of chain work (power.ts), so a costly
  // rule is refused in a fraction of a second instead of once per shift tried.
  const peak = withChainBudget(() => locatePeak((shift) => perResult(m, rule, n, shift)));
  PEAKS.set(key, peak);
  return peak;
}

/**
 * MaxE(Nuf) and the shift where it occurs, for runs of `runsize` patient results between QC
 * events of n controls with `rule`. Inputs as expectedUnreliable (sigma > 1.65, else #NUM!).
 * maxRisk = runsize·max_Δ(ΔP_E·W): linear in runsize.
 */
export function maximumRisk(
  allowable: number,
  bias: number,
  cv: number,
  rule: ControlRule | string,
  n: number,
  runsize: number,
): MaximumRisk {
  const m = methodOf(allowable, bias, cv);
  const r = ruleOf(rule);
  checkControls(n);
  checkRunSize(runsize);
  requireMeetsAllowance(m);
  const peak = peakOf(m, r, n);
  const maxRisk = runsize * peak.value;
  if (!Number.isFinite(maxRisk)) neverRejects(r, n, peak.shift);
  return { maxRisk, argmax: peak.shift };
}

/** QC.RISK: MaxE(Nuf), the largest expected number of unreliable final patient results. */
export function qcRisk(allowable: number, bias: number, cv: number, rule: ControlRule | string, n: number, runsize: number): number {
  return maximumRisk(allowable, bias, cv, rule, n, runsize).maxRisk;
}

/**
 * E(Nuf) over `shifts` (each finite ≥ 0, SD; default the search grid 0, 0.25, …, 10) with the
 * maximum located as QC.RISK does: for the task pane's risk chart.
 */
export function riskCurve(
  allowable: number,
  bias: number,
  cv: number,
  rule: ControlRule | string,
  n: number,
  runsize: number,
  shifts: readonly number[] = GRID,
): RiskCurve {
  const r = ruleOf(rule);
  const max = maximumRisk(allowable, bias, cv, r, n, runsize);
  const points = shifts.map((shift) => ({ shift, risk: expectedUnreliable(allowable, bias, cv, r, n, runsize, shift) }));
  return { ...max, points };
}

/**
 * QC.RUNSIZE: the largest whole number M of patient results between QC events with
 * QC.RISK(…, M) ≤ maxrisk (default 1, CLSI C24), at most 1,000,000; 0 when even M = 1 exceeds
 * maxrisk, and 0 when the method fails its allowance without a shift (sigma ≤ 1.65, see
 * above). maxrisk > 0.
 * Rounding: M starts from ⌊maxrisk/e⌋ (e = max ΔP_E·W) and is then moved so that M·e ≤ maxrisk
 * < (M + 1)·e hold in the very arithmetic QC.RISK uses (QC.RISK(…, M) = M·e): a quotient that
 * rounds to just below a whole number cannot lose one, nor one just above gain one.
 */
export function qcRunSize(
  allowable: number,
  bias: number,
  cv: number,
  rule: ControlRule | string,
  n: number,
  maxrisk = DEFAULT_MAX_RISK,
): number {
  const m = methodOf(allowable, bias, cv);
  const r = ruleOf(rule);
  checkControls(n);
  positive(maxrisk, 'maxrisk');
  if (!meetsAllowance(m)) return 0;
  const e = peakOf(m, r, n).value;
  if (!(e > 0)) return MAX_RUN_SIZE;
  if (!Number.isFinite(e)) return 0;
  let size = Math.min(MAX_RUN_SIZE, Math.floor(maxrisk / e));
  while (size > 0 && size * e > maxrisk) size--;
  while (size < MAX_RUN_SIZE && (size + 1) * e <= maxrisk) size++;
  return size;
}

/** Empties the risk caches (for cold-start benchmarks). */
export function clearRiskCaches(): void {
  WEIGHTS.clear();
  PEAKS.clear();
}
