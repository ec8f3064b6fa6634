#!/usr/bin/env node
// Writes test/fixtures/chi-square/quantiles.json: chi-square quantiles computed in 60-digit
// decimal.js arithmetic, independently of the engine, for the engine's quantile tests.
//
//   node scripts/make-chisquare-reference.js
//
// χ²_p(ν) = 2y with P(a, y) = p (lower tail) or Q(a, y) = q (upper tail), a = ν/2:
//   P(a, y) = y^a·e^(−y)/Γ(a + 1) · Σₙ yⁿ/((a + 1)…(a + n))              (A&S 6.5.29), y < a + 1
//   Q(a, y) = y^a·e^(−y)/Γ(a) · 1/(y + 1 − a − 1·(1 − a)/(y + 3 − a − …))  (A&S 6.5.31), y ≥ a + 1
// the other tail as 1 minus (60 digits leave ≥ 50 of it). ln Γ by the Stirling series with ten
// Bernoulli terms after shifting the argument to ≥ 60 (truncation below 1e-38). The root by
// Newton's method in ln y from the Wilson–Hilferty value (or the lower bound (p·Γ(a + 1))^(1/a) in
// the lower tail), until the step is below 1e-40; the script checks the final residual of
// ln(tail) − ln(target) and records the largest. Each probability is the exact binary value of
// the double the test passes (toPrecision(100) spells a double out exactly). No random input.
'use strict';
const fs = require('fs');
const path = require('path');
const Decimal = require('decimal.js');

const PRECISION = 60;
const D = Decimal.clone({ precision: PRECISION });
const BERNOULLI = [[1, 6], [-1, 30], [1, 42], [-1, 30], [5, 66], [-691, 2730], [7, 6], [-3617, 510], [43867, 798], [-174611, 330]];
const HALF_LN_2PI = D.ln(D.acos(-1).times(2)).div(2);
const EPS = new D('1e-58');

function lnGamma(z0) {
  let z = z0;
  let acc = new D(0);
  while (z.lt(60)) {
    acc = acc.minus(D.ln(z));
    z = z.plus(1);
  }
  let s = z.minus(0.5).times(D.ln(z)).minus(z).plus(HALF_LN_2PI);
  let zp = z;
  const z2 = z.times(z);
  BERNOULLI.forEach(([num, den], i) => {
    const k = i + 1;
    s = s.plus(new D(num).div(den).div(2 * k * (2 * k - 1)).div(zp));
    zp = zp.times(z2);
  });
  return s.plus(acc);
}

/** ln P, ln Q and ln(y^a e^(−y)/Γ(a)) at (a, y). */
function tails(a, y, lnGammaA) {
  const lnPrefix = a.times(D.ln(y)).minus(y).minus(lnGammaA);
  if (y.lt(a.plus(1))) {
    let term = new D(1);
    let sum = new D(1);
    for (let n = 1; ; n++) {
      term = term.times(y).div(a.plus(n));
      sum = sum.plus(term);
      if (term.lt(sum.times(EPS))) break;
    }
    const P = D.exp(lnPrefix).times(sum).div(a);
    return { lnP: D.ln(P), lnQ: D.ln(new D(1).minus(P)), lnPrefix };
  }
  const tiny = new D('1e-300');
  let b = y.plus(1).minus(a);
  let c = new D(1).div(tiny);
  let d = new D(1).div(b);
  let h = d;
  for (let i = 1; ; i++) {
    const an = new D(-i).times(new D(i).minus(a));
    b = b.plus(2);
    d = an.times(d).plus(b);
    if (d.abs().lt(tiny)) d = tiny;
    c = b.plus(an.div(c));
    if (c.abs().lt(tiny)) c = tiny;
    d = new D(1).div(d);
    const del = d.times(c);
    h = h.times(del);
    if (del.minus(1).abs().lt(EPS)) break;
  }
  const lnQ = lnPrefix.plus(D.ln(h));
  return { lnP: D.ln(new D(1).minus(D.exp(lnQ))), lnQ, lnPrefix };
}

/** Standard normal quantile for the start only (Acklam-free: bisection on erfc in doubles is enough). */
function roughZ(p) {
  // A&S 26.2.23, |error| < 4.5e-4: only a starting value.
  const q = p < 0.5 ? p : 1 - p;
  const t = Math.sqrt(-2 * Math.log(q));
  const z = t - (2.515517 + 0.802853 * t + 0.010328 * t * t) / (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
  return p < 0.5 ? -z : z;
}

/** The reference quantile: tail 'lower' solves P = prob, 'upper' solves Q = prob. */
function quantile(nu, prob, tail) {
  const a = new D(nu.toPrecision(100)).div(2);
  const lnGammaA = lnGamma(a);
  const pExact = new D(prob.toPrecision(100));
  // A lower probability above ½ is solved in the upper tail, Q = 1 − p exactly.
  const upper = tail === 'upper' || pExact.gt(0.5);
  const target = tail === 'upper' ? pExact : upper ? new D(1).minus(pExact) : pExact;
  const lnTarget = D.ln(target);
  const an = nu / 2;
  const z = upper ? roughZ(1 - target.toNumber()) : roughZ(target.toNumber());
  const w = 1 - 1 / (9 * an) + z / (3 * Math.sqrt(an));
  let y;
  if (!upper) {
    const bound = D.exp(lnTarget.plus(lnGamma(a.plus(1))).div(a));
    y = w > 0 ? D.max(bound, new D(an * w * w * w)) : bound;
  } else {
    y = new D(w > 0 ? an * w * w * w : Math.max(1, -Math.log(target.toNumber())));
  }
  for (let i = 0; i < 200; i++) {
    const t = tails(a, y, lnGammaA);
    const g = (upper ? t.lnQ : t.lnP).minus(lnTarget);
    const slope = upper ? D.exp(t.lnPrefix.minus(t.lnQ)).neg() : D.exp(t.lnPrefix.minus(t.lnP));
    let step = g.neg().div(slope);
    if (step.abs().lt('1e-40')) {
      y = y.times(D.exp(step));
      const f = tails(a, y, lnGammaA);
      return { x: y.times(2), residual: (upper ? f.lnQ : f.lnP).minus(lnTarget).abs() };
    }
    if (step.gt(20)) step = new D(20);
    if (step.lt(-20)) step = new D(-20);
    y = y.times(D.exp(step));
  }
  throw new Error(`no convergence at ν = ${nu}, ${tail} ${prob}`);
}

const SMALL_NU = [0.5, 1, 2.7, 4, 24, 1000];
const LOWER = [1e-10, 1e-6, 0.001, 0.025, 0.05, 0.1, 0.5, 0.9, 0.95, 0.975, 0.999, 1 - 1e-6, 1 - 1e-10];
for (let L = 2; L <= 10; L++) LOWER.push(1 - 0.05 / L);
const UPPER = [0.5, 0.1, 0.001, 1e-6, 1e-10];
for (let L = 1; L <= 10; L++) UPPER.push(0.05 / L);
for (let L = 1; L <= 10; L++) UPPER.push(0.025 / L);

const cases = [];
for (const nu of SMALL_NU) {
  for (const p of LOWER) cases.push([nu, 'lower', p]);
  for (const q of UPPER) cases.push([nu, 'upper', q]);
}
// Far tails, where a double-precision start or a subtraction from 1 would fail.
for (const nu of [0.5, 4, 24]) cases.push([nu, 'upper', 1e-300]);
cases.push([24, 'lower', 1e-300]);
// Around and above the switch to the Cornish–Fisher expansion (ν ≥ 2e5).
for (const nu of [1e5, 2e5, 1e6]) {
  for (const p of [1e-10, 0.025, 0.5, 0.975]) cases.push([nu, 'lower', p]);
  for (const q of [0.05, 1e-10]) cases.push([nu, 'upper', q]);
}

const rows = [];
let worst = new D(0);
for (const [nu, tail, prob] of cases) {
  const { x, residual } = quantile(nu, prob, tail);
  if (residual.gt(worst)) worst = residual;
  rows.push([nu, tail, prob, x.toSignificantDigits(25).toString()]);
}
if (worst.gt('1e-35')) throw new Error(`residual ${worst} too large`);

const out = {
  description:
    'Chi-square quantiles: x with P(χ² ≤ x) = prob (tail "lower") or P(χ² > x) = prob (tail "upper"), ν degrees of freedom. ' +
    'Generated by scripts/make-chisquare-reference.js (decimal.js, series and continued fraction for the incomplete gamma ' +
    'function, Newton in ln y); x rounded to 25 significant digits. Each row: [nu, tail, prob, x].',
  precisionDigits: PRECISION,
  largestLogResidual: worst.toExponential(2),
};
const dir = path.join(__dirname, '..', 'test', 'fixtures', 'chi-square');
fs.mkdirSync(dir, { recursive: true });
const body = JSON.stringify(out, null, 1).replace(/\n}$/, ',\n "rows": [\n');
fs.writeFileSync(path.join(dir, 'quantiles.json'), body + rows.map((r) => '  ' + JSON.stringify(r)).join(',\n') + '\n ]\n}\n');
console.log(`${rows.length} quantiles written; largest |ln tail − ln target| ${worst.toExponential(2)}`);
