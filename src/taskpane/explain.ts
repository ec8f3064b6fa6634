/**
 * "Why does this cell show an error?" Excel shows our message only with #VALUE! and #N/A; for
 * #NUM! and #DIV/0! it keeps none. The pane reads the active cell's LEEWAY formula, reads the
 * cells it refers to, evaluates it through the same registry and shows the message.
 *
 * Arguments it can follow: numbers, "text", TRUE/FALSE, {array constants}, cell and range
 * references (A1, $B$2, C2:C40, Sheet1!A1, 'My sheet'!A1:B3), and the pattern the fill writes
 * for a per-row tier, IF(ref="",other,ref). Anything else is reported as not followed.
 */
import { evaluate, findFunction } from '../registry';
import type { Arg, Output } from '../registry';
import type { Grid, Scalar } from '../registry/types';

export type ArgExpr =
  | { readonly kind: 'value'; readonly value: Arg }
  | { readonly kind: 'ref'; readonly sheet: string | null; readonly address: string }
  | { readonly kind: 'ifBlank'; readonly test: ArgExpr; readonly whenBlank: ArgExpr }
  | { readonly kind: 'other'; readonly text: string };

export interface LeewayCall {
  /** The registry name, e.g. SPEC.TOTAL. */
  readonly name: string;
  readonly args: readonly ArgExpr[];
}

/** Splits at top-level commas (not inside quotes, parentheses or braces). */
export function splitTopLevel(s: string, sep = ','): string[] {
  const out: string[] = [];
  let depth = 0;
  let quote: string | null = null;
  let cur = '';
  for (let i = 0; i < s.length; i++) {
    const ch = s[i];
    if (quote) {
      cur += ch;
      if (ch === quote) {
        if (s[i + 1] === quote) cur += s[++i];
        else quote = null;
      }
      continue;
    }
    if (ch === '"' || ch === "'") quote = ch;
    else if (ch === '(' || ch === '{') depth++;
    else if (ch === ')' || ch === '}') depth--;
    if (depth === 0 && ch === sep) {
      out.push(cur.trim());
      cur = '';
    } else cur += ch;
  }
  out.push(cur.trim());
  return out;
}

const REF = /^(?:(?:'((?:[^']|'')+)'|([A-Za-z_][\w.]*))!)?(\$?[A-Z]{1,3}\$?\d{1,7}(?::\$?[A-Z]{1,3}\$?\d{1,7})?)$/;

function literal(text: string): Scalar | undefined {
  if (/^"(?:[^"]|"")*"$/.test(text)) return text.slice(1, -1).replace(/""/g, '"');
  if (/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?%?$/i.test(text)) return text.endsWith('%') ? Number(text.slice(0, -1)) / 100 : Number(text);
  if (/^true$/i.test(text)) return true;
  if (/^false$/i.test(text)) return false;
  return undefined;
}

function parseArg(text: string): ArgExpr {
  const t = text.trim();
  if (t === '') return { kind: 'value', value: null };
  const lit = literal(t);
  if (lit !== undefined) return { kind: 'value', value: lit };
  if (t.startsWith('{') && t.endsWith('}')) {
    const rows = splitTopLevel(t.slice(1, -1), ';').map((r) => splitTopLevel(r).map(literal));
    if (rows.every((r) => r.every((v) => v !== undefined))) return { kind: 'value', value: rows as Grid };
  }
  const ref = REF.exec(t);
  if (ref) return { kind: 'ref', sheet: ref[1] ? ref[1].replace(/''/g, "'") : (ref[2] ?? null), address: ref[3].replace(/\$/g, '') };
  const ifBlank = /^IF\((.*)\)$/i.exec(t);
  if (ifBlank) {
    const parts = splitTopLevel(ifBlank[1]);
    const test = /^(.*)=""$/.exec(parts[0] ?? '');
    if (parts.length === 3 && test && test[1].trim() === parts[2]) {
      return { kind: 'ifBlank', test: parseArg(parts[2]), whenBlank: parseArg(parts[1]) };
    }
  }
  return { kind: 'other', text: t };
}

/**
 * Reads a formula like =LEEWAY.SPEC.TOTAL(B2,C2,$B$2,$B$3) (also as a file stores it,
 * _xldudf_LEEWAY_SPEC_TOTAL(…)). Null when the formula is not one LEEWAY call.
 */
export function parseLeewayCall(formula: string): LeewayCall | null {
  const m = /^=?\s*(?:_xldudf_)?LEEWAY[._]([A-Z][A-Z_.]*)\((.*)\)\s*$/i.exec(formula.trim());
  if (!m) return null;
  const def = findFunction(m[1]) ?? findFunction(m[1].replace(/_/g, '.'));
  if (!def) return null;
  const inner = m[2];
  // The outer parentheses must close at the very end: =LEEWAY.A(1)+LEEWAY.B(2) is not one call.
  let depth = 0;
  let quote = false;
  for (let i = 0; i < inner.length; i++) {
    if (inner[i] === '"') quote = !quote;
    else if (!quote && inner[i] === '(') depth++;
    else if (!quote && inner[i] === ')' && --depth < 0) return null;
  }
  const args = inner.trim() === '' ? [] : splitTopLevel(inner).map(parseArg);
  return { name: def.name, args };
}

/** Every reference a call needs read, as "sheet!address" (sheet null: the formula's own sheet). */
export function referencesOf(call: LeewayCall): Array<{ sheet: string | null; address: string }> {
  const out: Array<{ sheet: string | null; address: string }> = [];
  const walk = (a: ArgExpr): void => {
    if (a.kind === 'ref') out.push({ sheet: a.sheet, address: a.address });
    else if (a.kind === 'ifBlank') {
      walk(a.test);
      walk(a.whenBlank);
    }
  };
  call.args.forEach(walk);
  return out;
}

export const refKey = (sheet: string | null, address: string): string => `${sheet ?? ''}!${address}`;

export interface Explanation {
  readonly name: string;
  /** The result as the registry computes it from the cells read now. */
  readonly output: Output | null;
  /** What to tell the user. */
  readonly message: string;
  readonly isError: boolean;
}

function isBlankGrid(g: Arg): boolean {
  if (g === null || g === undefined || g === '') return true;
  return Array.isArray(g) && g.length === 1 && g[0].length === 1 && (g[0][0] === null || g[0][0] === undefined || g[0][0] === '');
}

/** Evaluates the call on the values read for its references (keyed by refKey). */
export function explain(call: LeewayCall, values: ReadonlyMap<string, Grid>): Explanation {
  const resolve = (a: ArgExpr): Arg | undefined => {
    if (a.kind === 'value') return a.value;
    if (a.kind === 'ref') return values.get(refKey(a.sheet, a.address));
    if (a.kind === 'ifBlank') {
      const t = resolve(a.test);
      return isBlankGrid(t ?? null) ? resolve(a.whenBlank) : t;
    }
    return undefined;
  };
  const args: Arg[] = [];
  for (let i = 0; i < call.args.length; i++) {
    const a = call.args[i];
    const v = resolve(a);
    if (v === undefined) {
      const text = a.kind === 'other' ? a.text : 'a reference';
      return { name: call.name, output: null, isError: false, message: `Argument ${i + 1} (${text}) is an expression the pane does not follow; check that each of its inputs is a number.` };
    }
    args.push(v);
  }
  const output = evaluate(call.name, args);
  const first = output[0][0];
  if (typeof first === 'object') return { name: call.name, output, isError: true, message: `${first.error} ${first.message}` };
  const errorCells = output.flat().filter((v): v is { error: '#VALUE!'; message: string } => typeof v === 'object');
  if (errorCells.length) {
    const e = errorCells[0];
    return { name: call.name, output, isError: true, message: `${errorCells.length} cell(s) of the spill are errors; the first: ${e.error} ${e.message}` };
  }
  return { name: call.name, output, isError: false, message: `No error: LEEWAY.${call.name} gives ${JSON.stringify(first)} from the cells as they are now.` };
}
