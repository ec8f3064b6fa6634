/**
 * Coercion of cell values to the types a parameter wants, with the error each kind of bad input
 * gets (the project's error rules: docs/reference/conventions.md).
 */
import { LeewayError, naError, numError, valueError } from '../engine/errors';
import { show } from '../engine/guards';
import type { AnyParam } from './define';
import type { ErrorCell, Grid, Scalar } from './types';

export function isBlank(v: Scalar): v is null | undefined | '' {
  return v === null || v === undefined || v === '';
}

/** Describes a cell value for a message. */
export function describe(v: unknown): string {
  if (typeof v === 'string') return `text "${v.length > 40 ? v.slice(0, 40) + '…' : v}"`;
  if (typeof v === 'boolean') return `logical ${v ? 'TRUE' : 'FALSE'}`;
  if (typeof v === 'number') return show(v);
  if (v === null || v === undefined) return 'a blank cell';
  return 'a value that is not a number';
}

export function errorCell(e: LeewayError): ErrorCell {
  return { error: e.code, message: e.message };
}

/** A number from one cell: text and logicals #VALUE!, blank #N/A, NaN/±Infinity #NUM!. */
export function toNumber(v: Scalar, name: string): number {
  if (typeof v === 'number') {
    if (Number.isFinite(v)) return v;
    throw numError(`${name} must be a finite number (got ${show(v)})`);
  }
  if (isBlank(v)) throw naError(`${name} is blank: enter a number`);
  throw valueError(`${name} must be a number (got ${describe(v)})`);
}

/** A word from one cell: numbers and logicals #VALUE!, blank #N/A. */
export function toWord(v: Scalar, name: string): string {
  if (isBlank(v) || (typeof v === 'string' && v.trim() === '')) throw naError(`${name} is blank: enter a word`);
  if (typeof v === 'string') return v;
  throw valueError(`${name} must be a word (got ${describe(v)})`);
}

/** Blank for this parameter: an empty cell, or (for a word) text of spaces only. */
export function isBlankFor(v: Scalar, p: AnyParam): boolean {
  return isBlank(v) || (p.kind === 'word' && typeof v === 'string' && v.trim() === '');
}

/** The value an omitted optional parameter gives the engine (its default, coerced once at definition). */
export function defaultValue(p: AnyParam): unknown {
  return p.kind === 'range' ? undefined : p.coercedDefault;
}

/** Coerces one cell for one scalar parameter (the default for a blank optional cell). */
export function coerceCell(v: Scalar, p: AnyParam): unknown {
  if (p.optional && isBlankFor(v, p)) return defaultValue(p);
  if (p.kind === 'number') {
    const x = toNumber(v, p.name);
    return p.check ? p.check(x, p.name) : x;
  }
  if (p.kind === 'word') return p.read(toWord(v, p.name));
  throw valueError(`${p.name} is a range, not a single value`);
}

/** Turns a top-level argument (omitted, a scalar or a grid) into a grid; omitted gives undefined. */
export function asGrid(a: Scalar | Grid): Grid | undefined {
  if (a === null || a === undefined) return undefined;
  if (Array.isArray(a)) return a;
  return [[a]];
}

/** One value out of a range argument that must be a single cell. */
export function singleCell(g: Grid | undefined, p: AnyParam, fn: string): Scalar {
  if (g === undefined) return undefined;
  if (g.length !== 1 || g[0].length !== 1) {
    throw valueError(`${fn}: ${p.name} must be a single cell, not a ${g.length}×${g[0]?.length ?? 0} range`);
  }
  return g[0][0];
}

/** All numbers of a range, row by row; text, logicals and blanks skipped. */
export function numbersOf(g: Grid | undefined): number[] {
  const out: number[] = [];
  if (!g) return out;
  for (const row of g) for (const v of row) if (typeof v === 'number' && Number.isFinite(v)) out.push(v);
  return out;
}

/** All cells of a range, row by row (for pairing two ranges cell by cell). */
export function cellsOf(g: Grid | undefined): Scalar[] {
  const out: Scalar[] = [];
  if (!g) return out;
  for (const row of g) for (const v of row) out.push(v);
  return out;
}

/** The number of cells of a range (0 when omitted). */
export function cellCount(g: Grid | undefined): number {
  let n = 0;
  if (g) for (const row of g) n += row.length;
  return n;
}
