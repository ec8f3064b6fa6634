/**
 * Student's t distribution: upper tail, density and quantile, for the t-based confidence
 * intervals of the method-comparison regressions (DATA.COMPARE, ν = n − 2 degrees of freedom).
 *
 * Method (tail probabilities): P(T > t) = ½·I_z(ν/2, ½) with z = ν/(ν + t²), and
 * P(0 < T < t) = ½·I_w(½, ν/2) with w = t²/(ν + t²) = 1 − z (both z and w formed directly, so
 * neither loses digits to a subtraction). The regularized incomplete beta function I is the
 * continued fraction of Abramowitz & Stegun 26.5.8, evaluated by the modified Lentz method
 * (Lentz 1976; Thompson & Barnett 1986; citations from memory) on whichever side of (a + 1)/(a + b + 2) it converges
 * fast, the other side by I_x(a, b) = 1 − I_{1−x}(b, a). ln B(ν/2, ½) comes from ln Γ (Lanczos
 * 1964, g = 7, 9 terms, ~1e-15) for ν < 20, and from the difference of two Stirling series
 * (A&S 6.1.41) for ν ≥ 20, where a difference of two large ln Γ values would lose digits.
 *
 * Method (quantile): closed forms for ν = 1 (t = cot(πq) = tan(π(½ − q))) and ν = 2
 * (t = (1 − 2q)/√(2q(1 − q))), q = min(p, 1 − p). Otherwise a root of the tail equation,
 * bracketed by two bounds that hold for every ν > 0: below by the normal quantile |Φ⁻¹(q)|
 * (the t distribution has the heavier tails) and above by the tail bound
 * P(T > t) ≤ ν^(ν/2 − 1)·t^(−ν)/B(ν/2, ½); started from the Cornish–Fisher expansion
 * (A&S 26.7.5) and refined by Newton steps (on ln P(T > t) against ln t in the tails, q < 0.25;
 * on P(0 < T < t) against t near the centre, where ½ − q is exact), falling back to bisection
 * whenever a step leaves the bracket. For ν > 2000 the Cornish–Fisher expansion to ν⁻⁵ itself is
 * used (within 2e-15 relative there for p ≥ 1e-12).
 *
 * Accuracy: relative error below 1e-13 for ν from 0.5 to 1e8 and p from 1e-12 to 1 − 1e-12
 * (checked in the test suite against @stdlib/stats-base-dists-t-quantile, a port of the Boost
 * incomplete-beta inverse, and against the closed forms).
 */
import { normalQuantile } from '../normal';

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];
const LN_SQRT_2PI = 0.91893853320467274178;
const LN_SQRT_PI = 0.57236494292470008707;

/** ln Γ(x) for x > 0 (Lanczos approximation, g = 7; absolute error about 1e-15 near x = 1, 2). */
export function lnGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
  const y = x - 1;
  let a = LANCZOS[0];
  const t = y + 7.5;
  for (let i = 1; i < 9; i++) a += LANCZOS[i] / (y + i);
  return LN_SQRT_2PI + (y + 0.5) * Math.log(t) - t + Math.log(a);
}

/** The Stirling series ln Γ(x) − [(x − ½)ln x − x + ½ln 2π] to the x^−13 term, x ≥ 10 (A&S 6.1.41; error < 1e-16). */
export function stirlingTail(x: number): number {
  const r = 1 / (x * x);
  return (
    (1 / x) *
    (1 / 12 + r * (-1 / 360 + r * (1 / 1260 + r * (-1 / 1680 + r * (1 / 1188 + r * (-691 / 360360 + r / 156))))))
  );
}

/** ln B(a, ½) = ln Γ(a) + ln Γ(½) − ln Γ(a + ½), a > 0. */
function lnBetaHalf(a: number): number {
  if (a < 10) return lnGamma(a) + LN_SQRT_PI - lnGamma(a + 0.5);
  // ln Γ(a + ½) − ln Γ(a) = ½ ln a + a·ln(1 + 1/(2a)) − ½ + S(a + ½) − S(a), no large terms cancel.
  const diff = 0.5 * Math.log(a) + a * Math.log1p(0.5 / a) - 0.5 + stirlingTail(a + 0.5) - stirlingTail(a);
  return LN_SQRT_PI - diff;
}

const TINY = 1e-300;

/**
 * Above this many degrees of freedom the Cornish–Fisher expansion alone is used: there it is
 * within 2e-15 relative down to p = 1e-12, while the continued fraction, which needs O(√ν) terms,
 * starts to collect rounding error.
 */
const CORNISH_FISHER_NU = 2000;

/** Continued fraction for I_x(a, b) (A&S 26.5.8), modified Lentz; converges fast for x < (a + 1)/(a + b + 2). */
function betaFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 20000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-16) break;
  }
  return h;
}

/**
 * Tail masses of T with ν degrees of freedom at t ≥ 0: upper = P(T > t), central = P(0 < T < t);
 * each computed without subtracting it from the other.
 */
function tailMasses(t: number, nu: number): { upper: number; central: number } {
  if (t === 0) return { upper: 0.5, central: 0 };
  if (t === Infinity) return { upper: 0, central: 0.5 };
  const a = nu / 2;
  const ratio = (t / Math.sqrt(nu)) ** 2; // t²/ν
  let z: number;
  let w: number;
  let lnZ: number;
  let lnW: number;
  if (Number.isFinite(ratio)) {
    z = 1 / (1 + ratio);
    w = ratio / (1 + ratio);
    lnZ = -Math.log1p(ratio);
    lnW = Math.log(w);
  } else {
    lnZ = Math.log(nu) - 2 * Math.log(t);
    z = Math.exp(lnZ);
    w = 1;
    lnW = 0;
  }
  const lnB = lnBetaHalf(a);
  const front = Math.exp(a * lnZ + 0.5 * lnW - lnB);
  // I_z(a, ½) on the fast side: directly when z < (a + 1)/(a + 2.5), else via I_w(½, a).
  if (z < (a + 1) / (a + 2.5)) {
    const iz = (front * betaFraction(z, a, 0.5)) / a;
    return { upper: 0.5 * iz, central: 0.5 * (1 - iz) };
  }
  const iw = (front * betaFraction(w, 0.5, a)) / 0.5;
  return { upper: 0.5 * (1 - iw), central: 0.5 * iw };
}

/** Density of T with ν degrees of freedom. */
export function tDensity(t: number, nu: number): number {
  const ratio = (t / Math.sqrt(nu)) ** 2;
  return Math.exp(-lnBetaHalf(nu / 2) - 0.5 * Math.log(nu) - ((nu + 1) / 2) * Math.log1p(ratio));
}

/** P(T ≤ t) for T with ν > 0 degrees of freedom. */
export function tCdf(t: number, nu: number): number {
  if (Number.isNaN(t) || !(nu > 0)) return NaN;
  const m = tailMasses(Math.abs(t), nu);
  return t < 0 ? m.upper : 0.5 + m.central;
}

/**
 * Cornish–Fisher expansion of the upper-q quantile in terms of z = Φ⁻¹(1 − q), terms g₁…g₅ in
 * powers of 1/ν (A&S 26.7.5 for g₁…g₄; g₅ from memory, confirmed by the stdlib comparison).
 */
function cornishFisher(z: number, nu: number): number {
  const z2 = z * z;
  const g1 = (z2 + 1) * z / 4;
  const g2 = ((5 * z2 + 16) * z2 + 3) * z / 96;
  const g3 = (((3 * z2 + 19) * z2 + 17) * z2 - 15) * z / 384;
  const g4 = ((((79 * z2 + 776) * z2 + 1482) * z2 - 1920) * z2 - 945) * z / 92160;
  const g5 = (((((27 * z2 + 339) * z2 + 930) * z2 - 1782) * z2 - 765) * z2 + 17955) * z / 368640;
  return z + (g1 + (g2 + (g3 + (g4 + g5 / nu) / nu) / nu) / nu) / nu;
}

/** The t > 0 with P(T > t) = q, 0 < q < ½. */
function upperQuantile(q: number, nu: number): number {
  if (nu === 1) return q < 0.25 ? 1 / Math.tan(Math.PI * q) : Math.tan(Math.PI * (0.5 - q));
  if (nu === 2) return (1 - 2 * q) / Math.sqrt(2 * q * (1 - q));
  const zq = -normalQuantile(q);
  if (nu > CORNISH_FISHER_NU) return cornishFisher(zq, nu);
  const lnQ = Math.log(q);
  // Bracket [lo, hi]: P(T > lo) ≥ q ≥ P(T > hi).
  let lo = zq;
  let hi = Math.exp(((nu / 2 - 1) * Math.log(nu) - lnBetaHalf(nu / 2) - lnQ) / nu);
  if (!(hi > lo)) hi = lo * 2 + 1;
  let t = cornishFisher(zq, nu);
  if (!(t > lo && t < hi)) t = Math.sqrt(lo * hi);
  if (q < 0.25) {
    // Newton on g(s) = ln P(T > e^s) − ln q, g'(s) = −f(t)·t / P(T > t).
    for (let i = 0; i < 100; i++) {
      const u = tailMasses(t, nu).upper;
      const g = Math.log(u) - lnQ;
      if (g > 0) lo = t;
      else if (g < 0) hi = t;
      else return t;
      const step = g / ((tDensity(t, nu) * t) / u);
      let next = t * Math.exp(step);
      if (!(next > lo && next < hi)) next = Math.sqrt(lo * hi);
      if (Math.abs(next - t) <= 1e-15 * t || hi - lo <= 4e-16 * hi) return next;
      t = next;
    }
    return t;
  }
  // Near the centre: Newton on P(0 < T < t) − d, d = ½ − q exactly.
  const d = 0.5 - q;
  for (let i = 0; i < 100; i++) {
    const c = tailMasses(t, nu).central - d;
    if (c < 0) lo = t;
    else if (c > 0) hi = t;
    else return t;
    let next = t - c / tDensity(t, nu);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - t) <= 1e-15 * t || hi - lo <= 4e-16 * hi) return next;
    t = next;
  }
  return t;
}

/**
 * The p-quantile of Student's t with ν degrees of freedom: the t with P(T ≤ t) = p.
 * Domain: 0 < p < 1 and ν > 0 (p = 0 and 1 give ∓Infinity; anything else NaN; the callers guard).
 */
export function tQuantile(p: number, nu: number): number {
  if (Number.isNaN(p) || Number.isNaN(nu) || !(nu > 0) || p < 0 || p > 1) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p === 0.5) return 0;
  return p < 0.5 ? -upperQuantile(p, nu) : upperQuantile(1 - p, nu);
}
