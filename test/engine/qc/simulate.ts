/**
 * An independent brute-force check of control-rule rejection probabilities: draws the control
 * observations and applies each rule's definition as the published definitions word it (Westgard et al. 1981), directly on the
 * sequence (no interval classes, no state machine, no code shared with src/engine/qc). Seeded
 * (mulberry32 + Box–Muller), so a failure repeats.
 */
// Local bindings: under jest's sandbox a property read on the global Math is slow in hot loops.
const { abs, cos, imul, log, max, min, sin, sqrt, PI } = Math;

/** mulberry32, the generator of test/support/prng.ts, with Math.imul bound locally for speed. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = imul(t ^ (t >>> 15), t | 1);
    t ^= t + imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type Check = (x: Float64Array, n: number) => boolean;

/** One term of the rule text, read by this file's own patterns. */
function termCheck(term: string): Check {
  let m: RegExpExecArray | null;
  if ((m = /^1-([\d.]+)s$/.exec(term))) {
    const L = Number(m[1]);
    return (x) => {
      for (let i = 0; i < x.length; i++) if (abs(x[i]) > L) return true;
      return false;
    };
  }
  if ((m = /^(\d+)-([\d.]+)s$/.exec(term))) {
    const c = Number(m[1]);
    const L = Number(m[2]);
    return (x) => {
      let up = 0;
      let down = 0;
      for (let i = 0; i < x.length; i++) {
        const v = x[i];
        up = v > L ? up + 1 : 0;
        down = v < -L ? down + 1 : 0;
        if (up >= c || down >= c) return true;
      }
      return false;
    };
  }
  if ((m = /^R-([\d.]+)s$/.exec(term))) {
    const L = Number(m[1]);
    return (x, n) => {
      for (let r = 0; r < x.length; r += n) {
        let lo = x[r];
        let hi = x[r];
        for (let i = r; i < r + n; i++) {
          lo = min(lo, x[i]);
          hi = max(hi, x[i]);
        }
        if (hi - lo > L) return true;
      }
      return false;
    };
  }
  if ((m = /^(\d+)-x$/.exec(term))) {
    const c = Number(m[1]);
    return (x) => {
      let up = 0;
      let down = 0;
      for (let i = 0; i < x.length; i++) {
        const v = x[i];
        up = v > 0 ? up + 1 : 0;
        down = v < 0 ? down + 1 : 0;
        if (up >= c || down >= c) return true;
      }
      return false;
    };
  }
  if ((m = /^(\d+)of(\d+)-([\d.]+)s$/.exec(term))) {
    const a = Number(m[1]);
    const b = Number(m[2]);
    const L = Number(m[3]);
    // Every window of b consecutive observations (shorter at the start of the sequence).
    return (x) => {
      for (let end = 0; end < x.length; end++) {
        let up = 0;
        let down = 0;
        for (let i = max(0, end - b + 1); i <= end; i++) {
          if (x[i] > L) up++;
          else if (x[i] < -L) down++;
        }
        if (up >= a || down >= a) return true;
      }
      return false;
    };
  }
  throw new Error(`simulate: unknown term ${term}`);
}

export interface SimResult {
  readonly p: number;
  /** Binomial standard error of p. */
  readonly se: number;
}

/** P(rejection) by simulation of `trials` series of `runs` runs of n observations at `shift` SD. */
export function simulateRejection(rule: string, n: number, shift: number, runs: number, trials: number, seed: number): SimResult {
  const checks = rule.split('/').map(termCheck);
  const rand = mulberry32(seed);
  const x = new Float64Array(n * runs);
  let spare = 0;
  let haveSpare = false;
  const gauss = (): number => {
    if (haveSpare) {
      haveSpare = false;
      return spare;
    }
    let u = rand();
    while (u === 0) u = rand();
    const r = sqrt(-2 * log(u));
    const t = 2 * PI * rand();
    spare = r * sin(t);
    haveSpare = true;
    return r * cos(t);
  };
  let hits = 0;
  for (let k = 0; k < trials; k++) {
    for (let i = 0; i < x.length; i++) x[i] = shift + gauss();
    for (let c = 0; c < checks.length; c++) {
      if (checks[c](x, n)) {
        hits++;
        break;
      }
    }
  }
  const p = hits / trials;
  return { p, se: sqrt(max(p * (1 - p), 1 / trials) / trials) };
}
