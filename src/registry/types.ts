/**
 * Types shared by the two front ends of the function registry (the Excel wrappers in
 * src/functions and the CLI in src/cli). No Office types here: a cell is a plain value.
 */
import type { ErrorCode } from '../engine/errors';

/** What one cell can hold when it reaches a function: Excel sends blanks as null or "". */
export type Scalar = number | string | boolean | null | undefined;

/** A range, row-major: grid[row][column]. A single cell arrives as [[value]]. */
export type Grid = Scalar[][];

/** One argument as the front end hands it over: omitted optional arguments are null or undefined. */
export type Arg = Scalar | Grid;

/** An error in one output cell. */
export interface ErrorCell {
  readonly error: ErrorCode;
  readonly message: string;
}

/** A result cell: a number, text, a logical (TRUE/FALSE, e.g. QC.PLAN's `Target met`) or an error. */
export type OutCell = number | string | boolean | ErrorCell;

/** Every result is a grid; a single value is [[value]]. */
export type Output = OutCell[][];

export type ParamType = 'number' | 'word' | 'range';

export interface ParamDef<W = unknown> {
  /** As in SPEC.md and the function wizard. */
  readonly name: string;
  readonly type: ParamType;
  readonly optional?: boolean;
  /** Used when an optional argument is omitted or its cell is blank. */
  readonly default?: number | string;
  /** The default as the function receives it (a tier word already read, say); set by params.ts. */
  readonly coercedDefault?: unknown;
  /** For word parameters: reads (and validates) the word; throws a #VALUE! LeewayError. */
  readonly read?: (text: string) => W;
  /** Optional domain check for number parameters, applied at coercion (throws a LeewayError). */
  readonly check?: (x: number, name: string) => number;
}

/** A scalar function: ranges in any argument spill a same-shaped result. */
export interface ElementwiseDef {
  readonly kind: 'elementwise';
  readonly name: string;
  readonly params: readonly ParamDef[];
  /** Called with the coerced value of each parameter (numbers, or what `read` returned). */
  readonly fn: (...args: never[]) => number | string;
}

/** A function of whole ranges, or one that returns a table (labelled spill). */
export interface AggregateDef {
  readonly kind: 'aggregate';
  readonly name: string;
  readonly params: readonly ParamDef[];
  /** Gets the raw arguments (grids, or undefined when omitted); returns a scalar or a table. */
  readonly fn: (args: ReadonlyArray<Grid | undefined>) => number | string | Output;
}

export type FunctionDef = ElementwiseDef | AggregateDef;
