/**
 * Control rules: the rule syntax read into a typed rule.
 *
 * A rule is terms joined by `/`; observations are in SD units from the target mean.
 *   `1-<L>s`         any observation beyond ±L                                  (kind 'limit')
 *   `<c>-<L>s`, c>1  c consecutive observations all above +L or all below −L    (kind 'count')
 *   `R-<L>s`         within one run, highest minus lowest observation exceeds L (kind 'range')
 *   `<c>-x`, c>1     c consecutive observations on the same side of the mean    (kind 'side')
 *   `<a>of<b>-<L>s`  a of b consecutive observations beyond the same limit L,
 *                    all +L or all −L; 2 ≤ a ≤ b ≤ 6 (the published one is 2of3-2s) (kind 'window')
 * Underscores are accepted for `-`; letters in any case; spaces around terms ignored.
 * Published rules: Westgard JO, Barry PL, Hunt MR, Groth T. Clin Chem 1981;27:493–501 (the
 * multirule); Westgard JO, Groth T. Clin Chem 1979;25:863–9 (power functions of Shewhart rules).
 */
import { valueError } from '../errors';
import { BoundedCache } from './cache';

export type RuleTerm =
  | { readonly kind: 'limit'; readonly limit: number }
  | { readonly kind: 'count'; readonly count: number; readonly limit: number }
  | { readonly kind: 'range'; readonly limit: number }
  | { readonly kind: 'side'; readonly count: number }
  | { readonly kind: 'window'; readonly of: number; readonly window: number; readonly limit: number };

export interface ControlRule {
  /** The terms in the order written, duplicates removed. */
  readonly terms: readonly RuleTerm[];
  /** Canonical text in the order written, e.g. "1-3s/2-2s/R-4s". */
  readonly text: string;
  /** Order-free identity (terms sorted): two rules with the same key reject the same runs. */
  readonly key: string;
}

/** The largest count of a consecutive-count rule and the widest a-of-b window accepted. */
export const MAX_COUNT = 100;
export const MAX_WINDOW = 6;
/** The longest rule accepted: terms as written (before duplicates are removed) and characters. */
export const MAX_TERMS = 20;
export const MAX_RULE_LENGTH = 200;

const NUMBER = '(\\d+(?:\\.\\d*)?|\\.\\d+)';
const LIMIT_TERM = new RegExp(`^(\\d+)-${NUMBER}s$`);
const RANGE_TERM = new RegExp(`^r-${NUMBER}s$`);
const SIDE_TERM = /^(\d+)-x$/;
const WINDOW_TERM = new RegExp(`^(\\d+)of(\\d+)-${NUMBER}s$`);

const SYNTAX = 'write 1-<limit>s, <count>-<limit>s, R-<limit>s, <count>-x or 2of3-2s, joined by /';

function showLimit(x: number): string {
  return String(Number(x.toPrecision(12)));
}

/** The canonical spelling of one term (published rules keep their usual form). */
export function termText(t: RuleTerm): string {
  switch (t.kind) {
    case 'limit':
      return `1-${showLimit(t.limit)}s`;
    case 'count':
      return `${t.count}-${showLimit(t.limit)}s`;
    case 'range':
      return `R-${showLimit(t.limit)}s`;
    case 'side':
      return `${t.count}-x`;
    case 'window':
      return `${t.of}of${t.window}-${showLimit(t.limit)}s`;
  }
}

function bad(term: string, why: string): never {
  throw valueError(`rule term "${term}" ${why}`);
}

function readLimit(text: string, term: string): number {
  const x = Number(text);
  if (!(x > 0) || !Number.isFinite(x)) bad(term, `has limit ${text}: the limit must be a number of SD greater than 0`);
  return x;
}

function readCount(text: string, term: string, min: number, what: string): number {
  const c = Number(text);
  if (!Number.isSafeInteger(c) || c < min || c > MAX_COUNT) {
    bad(term, `has ${what} ${text}: it must be a whole number from ${min} to ${MAX_COUNT}`);
  }
  return c;
}

/** Reads one term; throws #VALUE! naming the term. */
export function parseTerm(raw: string): RuleTerm {
  const term = raw.trim();
  const t = term.replace(/_/g, '-').toLowerCase();
  let m: RegExpExecArray | null;
  if ((m = LIMIT_TERM.exec(t))) {
    const count = readCount(m[1], term, 1, 'count');
    const limit = readLimit(m[2], term);
    return count === 1 ? { kind: 'limit', limit } : { kind: 'count', count, limit };
  }
  if ((m = RANGE_TERM.exec(t))) return { kind: 'range', limit: readLimit(m[1], term) };
  if ((m = SIDE_TERM.exec(t))) return { kind: 'side', count: readCount(m[1], term, 2, 'count') };
  if ((m = WINDOW_TERM.exec(t))) {
    const of = Number(m[1]);
    const window = Number(m[2]);
    if (!(Number.isSafeInteger(of) && Number.isSafeInteger(window) && of >= 2 && of <= window && window <= MAX_WINDOW)) {
      bad(term, `must have 2 ≤ a ≤ b ≤ ${MAX_WINDOW} in <a>of<b>-<limit>s (got a = ${m[1]}, b = ${m[2]})`);
    }
    return { kind: 'window', of, window, limit: readLimit(m[3], term) };
  }
  if (term === '') bad(term, `is empty: ${SYNTAX}`);
  return bad(term, `is not a control rule: ${SYNTAX}`);
}

const PARSED = new BoundedCache<string, ControlRule>(2000);

/**
 * Reads a rule such as "1-3s/2-2s/R-4s". Unknown or malformed terms are #VALUE! with a message
 * naming the term; so is a rule of more than MAX_TERMS terms or MAX_RULE_LENGTH characters. Results are cached by the text as typed.
 */
export function parseRule(text: string): ControlRule {
  const hit = PARSED.get(text);
  if (hit) return hit;
  if (text.trim() === '') throw valueError(`rule is empty: ${SYNTAX}`);
  if (text.length > MAX_RULE_LENGTH) throw valueError(`rule is ${text.length} characters long: at most ${MAX_RULE_LENGTH} are accepted`);
  const parts = text.split('/');
  if (parts.length > MAX_TERMS) throw valueError(`rule has ${parts.length} terms: at most ${MAX_TERMS} are accepted`);
  const terms: RuleTerm[] = [];
  const seen = new Set<string>();
  for (const part of parts) {
    const term = parseTerm(part);
    const name = termText(term);
    if (seen.has(name)) continue;
    seen.add(name);
    terms.push(term);
  }
  const names = terms.map(termText);
  const rule: ControlRule = { terms, text: names.join('/'), key: [...names].sort().join('/') };
  PARSED.set(text, rule);
  return rule;
}

/** True when every term is a single-limit term (1-<L>s): then the closed form applies. */
export function isSingleLimit(rule: ControlRule): boolean {
  return rule.terms.every((t) => t.kind === 'limit');
}

/** Empties the parse cache (for benchmarks that measure a cold start). */
export function clearRuleCache(): void {
  PARSED.clear();
}
