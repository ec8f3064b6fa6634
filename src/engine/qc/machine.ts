/**
 * A control rule compiled into an exact finite-state machine over interval classes.
 *
 * Every consecutive-count term (c-Ls, c-x, a-of-b-Ls) and every single-limit term (1-Ls) looks at
 * an observation only through the interval it falls in, the intervals being cut at ±L of each
 * term and at 0 when a mean-side term is present. So the sequence of observations can be
 * replaced, without approximation, by the sequence of their interval classes, and the memory
 * each term needs by a small state:
 *   1-Ls          none (fires on a class beyond ±L)
 *   c-Ls, c-x     the signed length of the trailing run beyond +L / below −L (or above / below 0),
 *                 −(c−1) … c−1
 *   a-of-b-Ls     the status (beyond +L, beyond −L, neither) of the last b − 1 observations
 * The machine's states are the reachable combinations of these, found by breadth-first search
 * from "nothing seen yet"; next[s·K + k] is the state after an observation of class k, or −1
 * when some term fires. The range term R-Ls is not a function of classes: it is kept aside as
 * rangeLimit (the smallest R limit; a wider one can never fire first) and handled by power.ts.
 * Windows shorter than b at the very start of the sequence count what they hold.
 */
import { valueError } from '../errors';
import { BoundedCache } from './cache';
import type { ControlRule, RuleTerm } from './rules';

export interface RuleMachine {
  /** Interval boundaries, ascending; class k is (bounds[k−1], bounds[k]) with ±∞ at the ends. */
  readonly bounds: Float64Array;
  /** Number of classes, bounds.length + 1. */
  readonly classes: number;
  /** Number of states; state 0 is the start (no observation yet). */
  readonly states: number;
  /** Transition table, states × classes; −1 where a term fires (the run is rejected). */
  readonly next: Int32Array;
  /** The smallest R-<L>s limit, or undefined when the rule has no range term. */
  readonly rangeLimit: number | undefined;
}

/** The most states a compiled rule may have (the published multirules need about 120). */
export const MAX_STATES = 5000;

type Status = 1 | -1 | 0;

interface TermMachine {
  /** The next state of this term after an observation with the given statuses, or null: it fires. */
  step(state: number, cls: ClassInfo): number | null;
}

interface ClassInfo {
  /** Lower and upper boundary of the class. */
  readonly lo: number;
  readonly hi: number;
}

function beyond(cls: ClassInfo, limit: number): Status {
  if (cls.lo >= limit) return 1;
  if (cls.hi <= -limit) return -1;
  return 0;
}

function side(cls: ClassInfo): Status {
  return cls.lo >= 0 ? 1 : -1;
}

function trailingRun(count: number, status: (c: ClassInfo) => Status): TermMachine {
  return {
    step(t, cls) {
      const s = status(cls);
      const t2 = s === 0 ? 0 : s === 1 ? (t > 0 ? t + 1 : 1) : t < 0 ? t - 1 : -1;
      return Math.abs(t2) >= count ? null : t2;
    },
  };
}

function windowRule(of: number, window: number, limit: number): TermMachine {
  const keep = 3 ** (window - 1);
  return {
    step(h, cls) {
      const s = beyond(cls, limit);
      let above = s === 1 ? 1 : 0;
      let below = s === -1 ? 1 : 0;
      let rest = h;
      for (let i = 0; i < window - 1; i++) {
        const d = rest % 3;
        if (d === 1) above++;
        else if (d === 2) below++;
        rest = (rest - d) / 3;
      }
      if (above >= of || below >= of) return null;
      return ((h * 3) % keep) + (s === 1 ? 1 : s === -1 ? 2 : 0);
    },
  };
}

function termMachine(t: RuleTerm): TermMachine | undefined {
  switch (t.kind) {
    case 'limit':
      return { step: (_s, cls) => (beyond(cls, t.limit) === 0 ? 0 : null) };
    case 'count':
      return trailingRun(t.count, (cls) => beyond(cls, t.limit));
    case 'side':
      return trailingRun(t.count, side);
    case 'window':
      return windowRule(t.of, t.window, t.limit);
    case 'range':
      return undefined;
  }
}

function boundsOf(terms: readonly RuleTerm[]): number[] {
  const set = new Set<number>();
  for (const t of terms) {
    if (t.kind === 'side') set.add(0);
    else if (t.kind !== 'range') {
      set.add(t.limit);
      set.add(-t.limit);
    }
  }
  return [...set].sort((a, b) => a - b);
}

/** Builds the machine of a parsed rule (not cached; see machineOf). */
export function compileRule(rule: ControlRule): RuleMachine {
  const bounds = boundsOf(rule.terms);
  const K = bounds.length + 1;
  const classes: ClassInfo[] = [];
  for (let k = 0; k < K; k++) {
    classes.push({ lo: k === 0 ? -Infinity : bounds[k - 1], hi: k === K - 1 ? Infinity : bounds[k] });
  }
  const machines = rule.terms.map(termMachine).filter((m): m is TermMachine => m !== undefined);
  const ranges = rule.terms.filter((t) => t.kind === 'range').map((t) => t.limit);

  const index = new Map<string, number>();
  const tuples: number[][] = [];
  const add = (tuple: number[]): number => {
    const key = tuple.join(',');
    let s = index.get(key);
    if (s === undefined) {
      s = tuples.length;
      if (s >= MAX_STATES) {
        throw valueError(`rule "${rule.text}" combines too many counting terms to evaluate (more than ${MAX_STATES} states)`);
      }
      index.set(key, s);
      tuples.push(tuple);
    }
    return s;
  };
  add(machines.map(() => 0));
  const next: number[] = [];
  for (let s = 0; s < tuples.length; s++) {
    const tuple = tuples[s];
    for (let k = 0; k < K; k++) {
      const out: number[] = new Array(machines.length);
      let fired = false;
      for (let i = 0; i < machines.length && !fired; i++) {
        const t2 = machines[i].step(tuple[i], classes[k]);
        if (t2 === null) fired = true;
        else out[i] = t2;
      }
      next[s * K + k] = fired ? -1 : add(out);
    }
  }
  return {
    bounds: Float64Array.from(bounds),
    classes: K,
    states: tuples.length,
    next: Int32Array.from(next),
    rangeLimit: ranges.length ? Math.min(...ranges) : undefined,
  };
}

const MACHINES = new BoundedCache<string, RuleMachine>(500);

/** The compiled machine of a rule, cached by the rule's order-free key. */
export function machineOf(rule: ControlRule): RuleMachine {
  let m = MACHINES.get(rule.key);
  if (!m) {
    m = compileRule(rule);
    MACHINES.set(rule.key, m);
  }
  return m;
}

/** Empties the machine cache (for benchmarks that measure a cold start). */
export function clearMachineCache(): void {
  MACHINES.clear();
}
