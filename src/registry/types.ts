/**
 * Cell types shared by the two front ends of the function registry (the Excel adapter in
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

export type { AnyParam as ParamDef, FunctionDef, ElementwiseDef, AggregateDef } from './define';
