/**
 * How a worksheet function is defined: once, in one catalogue entry that carries everything said
 * about it (its help text, each parameter's name, kind and text, the labels of a labelled spill)
 * and the engine call. From the entry come the Excel metadata (functions.json), Excel's
 * association of ids to functions, the help pages, the README table, `leeway list` and
 * `leeway help`. Nothing about a function is written anywhere else.
 *
 * The builders are typed so that a parameter list and the engine function must agree at compile
 * time: each parameter carries the type of the value it hands over (a number, a tier, a grid),
 * the engine function must accept exactly those values in that order, and it must take as many
 * arguments as there are parameters (a forgotten parameter does not compile).
 */
import { LeewayError } from '../engine/errors';
import type { Grid, Output } from './types';

/** Help text of a function, as the function wizard, the help page and the README show it. */
export interface Doc {
  /** One line: what the function gives (the README table, `leeway list`). */
  readonly summary: string;
  /** Formula, units, defaults and domain, in sentences (the wizard's description, before the sources). */
  readonly description: string;
  /** Published sources, or "common practice, no source". */
  readonly sources: readonly string[];
  /** What the result is. */
  readonly returns: string;
  /** An example call: evaluated by the tests, shown in the README and on the help page. */
  readonly example: Example;
  /** Longer notes for the help page only. */
  readonly notes?: readonly string[];
}

/** An example call: JavaScript values for the arguments (arrays of arrays are ranges, rows first). */
export interface Example {
  readonly args: ReadonlyArray<number | string | null | ReadonlyArray<ReadonlyArray<number | string>>>;
  /** For a labelled spill: the labels whose values the README shows (default: the first three). */
  readonly show?: readonly string[];
}

/** A domain check applied when a number argument is coerced; throws a LeewayError. */
export type Check = (x: number, name: string) => number;

interface ParamCommon {
  /** As in the catalogue and the function wizard. */
  readonly name: string;
  /** What the wizard says of it: meaning, unit, domain and default. */
  readonly text: string;
  readonly optional: boolean;
  /** Used when an optional argument is omitted or its cell is blank (shown in the help). */
  readonly default?: number | string;
}

/** A number argument. `T` is what the engine receives (number, or number | undefined when it has no default). */
export interface NumberParam<T = number> extends ParamCommon {
  readonly kind: 'number';
  readonly check?: Check;
  /** The default as the engine receives it, coerced once when the parameter is defined. */
  readonly coercedDefault?: T;
  /** Type carrier only: never set. */
  readonly _value?: T;
}

/** A word argument (tier, method, direction, rule): `read` validates it and gives the engine's value. */
export interface WordParam<T> extends ParamCommon {
  readonly kind: 'word';
  readonly read: (text: string) => T;
  readonly coercedDefault?: T;
  readonly _value?: T;
}

/** A whole range handed over as it is (aggregate functions only). */
export interface RangeParam<T extends Grid | undefined = Grid> extends ParamCommon {
  readonly kind: 'range';
  readonly _value?: T;
}

/* eslint-disable @typescript-eslint/no-explicit-any -- variance positions of generic catalogues */
export type ScalarParam<T = any> = NumberParam<T> | WordParam<T>;
export type AnyParam = ScalarParam<any> | RangeParam<any>;
/* eslint-enable @typescript-eslint/no-explicit-any */

/** The value a parameter hands to the engine. */
export type ValueOf<P> = P extends { readonly _value?: infer T } ? T : never;
export type ValuesOf<P extends readonly unknown[]> = { -readonly [K in keyof P]: ValueOf<P[K]> };

// ---------------------------------------------------------------------------------------------
// Parameter builders
// ---------------------------------------------------------------------------------------------

/** A required number. */
export function num(name: string, text: string, check?: Check): NumberParam<number> {
  return { kind: 'number', name, text, optional: false, check };
}

/** An optional number with a default (already in the unit the engine wants). */
export function optNum(name: string, dflt: number, text: string, check?: Check): NumberParam<number> {
  return { kind: 'number', name, text, optional: true, default: dflt, coercedDefault: dflt, check };
}

/** An optional number without a default: the engine receives undefined when it is omitted. */
export function optNumNone(name: string, text: string, check?: Check): NumberParam<number | undefined> {
  return { kind: 'number', name, text, optional: true, check };
}

/** A required word. */
export function word<W>(name: string, read: (text: string) => W, text: string): WordParam<W> {
  return { kind: 'word', name, text, optional: false, read };
}

/** An optional word with a default word (read once, here). */
export function optWord<W>(name: string, read: (text: string) => W, dflt: string, text: string): WordParam<W> {
  return { kind: 'word', name, text, optional: true, default: dflt, coercedDefault: read(dflt), read };
}

/** A required range. */
export function range(name: string, text: string): RangeParam<Grid> {
  return { kind: 'range', name, text, optional: false };
}

/** An optional range: the function receives undefined when it is omitted. */
export function optRange(name: string, text: string): RangeParam<Grid | undefined> {
  return { kind: 'range', name, text, optional: true };
}

// ---------------------------------------------------------------------------------------------
// Function builders
// ---------------------------------------------------------------------------------------------

/** A value one cell of a result can hold. */
export type Value = number | string | boolean;

/**
 * A figure of a labelled spill: a value, or a LeewayError that becomes that one cell's error
 * while the other figures still show.
 */
export type Figure = Value | LeewayError;

/** Runs the computation of one figure; a LeewayError it throws becomes the figure. */
export function figure(compute: () => Value): Figure {
  try {
    return compute();
  } catch (e) {
    if (e instanceof LeewayError) return e;
    throw e;
  }
}

/* eslint-disable @typescript-eslint/no-explicit-any -- the engine functions' own signatures are checked by the builders */
type AnyFn = (...args: any[]) => any;
/* eslint-enable @typescript-eslint/no-explicit-any */

/** Fails the build when the engine function takes fewer arguments than the parameters listed. */
type ArityOk<P extends readonly unknown[], F extends AnyFn> = P['length'] extends Parameters<F>['length']
  ? unknown
  : { fn: 'the engine function must take one argument per parameter, in order' };

interface DefCommon {
  readonly name: string;
  readonly doc: Doc;
}

/** A scalar function: ranges in any argument spill a same-shaped result. */
export interface ElementwiseDef extends DefCommon {
  readonly kind: 'elementwise';
  readonly params: readonly ScalarParam[];
  /** The engine function, called with the coerced value of each parameter. */
  readonly fn: AnyFn;
  readonly labels?: undefined;
}

/** A function of whole ranges, or one that returns a table (a labelled spill has `labels`). */
export interface AggregateDef extends DefCommon {
  readonly kind: 'aggregate';
  readonly params: readonly AnyParam[];
  /** Called with the grid of each range parameter and the coerced value of each scalar one. */
  readonly fn: AnyFn;
  /** The labels of a labelled spill, in order (the first row it spills). */
  readonly labels?: readonly string[];
}

export type FunctionDef = ElementwiseDef | AggregateDef;

/** A scalar function whose every argument may be a range (the result spills, cell by cell). */
export function elementwise<const P extends readonly ScalarParam[], F extends (...args: ValuesOf<P>) => Value>(
  def: { readonly name: string; readonly doc: Doc; readonly params: P; readonly fn: F } & ArityOk<P, F>,
): ElementwiseDef {
  return { kind: 'elementwise', name: def.name, doc: def.doc, params: def.params, fn: def.fn };
}

/** A function of whole ranges that returns one value or a table it builds itself. */
export function aggregate<const P extends readonly AnyParam[], F extends (...args: ValuesOf<P>) => Value | Output>(
  def: { readonly name: string; readonly doc: Doc; readonly params: P; readonly fn: F } & ArityOk<P, F>,
): AggregateDef {
  return { kind: 'aggregate', name: def.name, doc: def.doc, params: def.params, fn: def.fn };
}

/** A labelled function's definition, its labels typed as the very tuple given (views index by them). */
export type LabelledDef<L extends readonly string[]> = Omit<AggregateDef, 'labels'> & { readonly labels: L };

/** The figures of a labelled spill, one per label (the compiler checks every label has one). */
export type Figures<L extends readonly string[]> = { readonly [K in L[number]]: Figure };

/**
 * A function that spills two rows: its labels, then one figure under each. The engine call
 * returns the figures by label; the order is the labels' order.
 */
export function labelled<
  const P extends readonly AnyParam[],
  const L extends readonly string[],
  F extends (...args: ValuesOf<P>) => Figures<L>,
>(
  def: { readonly name: string; readonly doc: Doc; readonly params: P; readonly labels: L; readonly fn: F } & ArityOk<P, F>,
): LabelledDef<L> {
  const labels = def.labels;
  const compute = def.fn;
  const fn = (...args: unknown[]): Output => {
    const figures = compute(...(args as ValuesOf<P>)) as Readonly<Record<string, Figure>>;
    return [[...labels], labels.map((l) => figures[l] as Output[number][number] | LeewayError)] as Output;
  };
  return { kind: 'aggregate', name: def.name, doc: def.doc, params: def.params, labels, fn };
}
