/**
 * Figures and formulas from the one function registry. Every figure the study views show is
 * what the worksheet function returns for the same inputs (evaluate), and every formula they
 * write calls that function on the user's ranges, so Excel recomputes the same figure when a
 * result is corrected. A labelled spill's figure is written as INDEX(LEEWAY.X(…),2,k), k being
 * the label's place in the catalogue.
 */
import { evaluate, evaluateLabelled, findFunction, NAMESPACE } from '../../registry';
import type { Arg } from '../../registry';
import type { ErrorCell, OutCell } from '../../registry/types';
import type { BlockCell, BlockStyle } from '../host';
import { CAUTION, DEMO_MARKER, wrapText } from '../../engine/fill';

/** A figure as the worksheet shows it: a number, a text, a logical, or an error cell. */
export type Figure = OutCell;

export const isError = (f: Figure | undefined): f is ErrorCell => typeof f === 'object' && f !== null;

/** The figures of a labelled spill by label; a call that fails as a whole gives its error under every label. */
export function labelledFigures(name: string, args: readonly Arg[]): Record<string, Figure> {
  return Object.fromEntries(evaluateLabelled(name, args));
}

/** One figure of a single-valued function (its one cell). */
export function singleFigure(name: string, args: readonly Arg[]): Figure {
  return evaluate(name, args)[0][0];
}

/** The 1-based place of a label in a labelled function's spill. */
export function labelIndex(name: string, label: string): number {
  const k = findFunction(name)?.labels?.indexOf(label) ?? -1;
  if (k < 0) throw new Error(`${name} has no figure labelled "${label}"`);
  return k + 1;
}

/** `LEEWAY.NAME(a, b, …)` with the arguments as formula texts (trailing omitted ones dropped). */
export function callText(name: string, args: ReadonlyArray<string | undefined>): string {
  const list = [...args];
  while (list.length && list[list.length - 1] === undefined) list.pop();
  return `${NAMESPACE}.${name}(${list.map((a) => a ?? '').join(',')})`;
}

/** `=INDEX(LEEWAY.NAME(…),2,k)`: one figure of a labelled spill, live. */
export function indexFormula(name: string, args: ReadonlyArray<string | undefined>, label: string): string {
  return `=INDEX(${callText(name, args)},2,${labelIndex(name, label)})`;
}

/** A number as a formula argument: shortest exact form. */
export function numberText(x: number): string {
  return String(x);
}

/** A word as a formula argument. */
export function wordText(w: string): string {
  return `"${w.replace(/"/g, '""')}"`;
}

export const text = (t: string, style?: BlockStyle): BlockCell => ({ content: { kind: 'text', text: t }, ...(style ? { style } : {}) });
export const formula = (f: string, format?: string): BlockCell => ({ content: { kind: 'formula', formula: f }, style: 'figure', ...(format ? { format } : {}) });
export const number = (v: number, format?: string): BlockCell => ({ content: { kind: 'number', value: v }, style: 'figure', ...(format ? { format } : {}) });

/** What every written block says about itself. */
export interface Provenance {
  readonly title: string;
  readonly demo: boolean;
  /** Label and text pairs: what was selected, the analyte and tier, the date and version. */
  readonly pairs: ReadonlyArray<readonly [string, string]>;
}

const padded = (cells: ReadonlyArray<BlockCell | null>, width: number): (BlockCell | null)[] => [...cells, ...new Array<null>(Math.max(0, width - cells.length)).fill(null)];

/**
 * The opening rows of a block: title, demo marker, provenance (a pair's text longer than the
 * block continues on the rows below), a blank row; every row padded with nulls to `width` cells.
 */
export function headRows(p: Provenance, width: number, wrap: number): (BlockCell | null)[][] {
  const rows: (BlockCell | null)[][] = [padded([text(p.demo ? `${p.title} — DEMO` : p.title, 'title')], width)];
  if (p.demo) rows.push(padded([text(DEMO_MARKER, 'demo')], width));
  for (const [label, value] of p.pairs) {
    wrapText(`${label}: ${value}`, wrap, true).forEach((line, i) => rows.push(padded([text(i === 0 ? line : `  ${line}`, 'provenance')], width)));
  }
  rows.push(padded([], width));
  return rows;
}

/** The closing rows: a blank row and the caution wrapped to `wrap` characters. */
export function cautionRows(width: number, wrap: number): (BlockCell | null)[][] {
  return [padded([], width), ...wrapText(`Caution: ${CAUTION}`, wrap).map((line) => padded([text(line, 'caution')], width))];
}

export function padRow(cells: ReadonlyArray<BlockCell | null>, width: number): (BlockCell | null)[] {
  return padded(cells, width);
}

/** "2026-12-05 07:31 UTC". */
export function stamp(d: Date): string {
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}
