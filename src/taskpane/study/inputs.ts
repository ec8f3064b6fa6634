/**
 * What the study views take from the user and from the pane: a figure typed or given as a cell,
 * the analyte in use with its allowable total error (SPEC.TOTAL through the registry) and where
 * its tier came from, and the provenance lines of a written block. No DOM here.
 */
import type { VariationRow } from '../../engine/table';
import { readDecimal } from '../../engine/table';
import { parseA1, a1, sheetPrefix } from '../../engine/fill';
import { VERSION } from '../../engine/version';
import type { PaneState } from '../state';
import { zOf } from '../state';
import { keyOf, displayName } from '../analytes';
import { numberText, singleFigure, stamp, wordText } from './figures';
import type { Provenance } from './figures';
import type { BiasInUse, SpecInUse } from './verification';

/** A figure as typed: blank, a number, or a cell (optionally on another sheet). */
export type Typed =
  | { readonly kind: 'blank' }
  | { readonly kind: 'number'; readonly value: number }
  | { readonly kind: 'cell'; readonly sheet: string | null; readonly address: string; readonly ref: string }
  | { readonly kind: 'bad'; readonly why: string };

/** Reads "1.5", "1,5", "H2", "$H$2" or "Claims!H2"; anything else is refused with the reason. */
export function readTyped(text: string): Typed {
  const t = text.trim();
  if (t === '') return { kind: 'blank' };
  const n = readDecimal(t);
  if (n !== undefined) return { kind: 'number', value: n };
  const m = /^(?:'((?:[^']|'')+)'|([A-Za-z_][A-Za-z0-9_. ]*))!(.+)$/.exec(t);
  const sheet = m ? (m[1] !== undefined ? m[1].replace(/''/g, "'") : m[2]) : null;
  const cell = parseA1(m ? m[3] : t);
  if (!cell) return { kind: 'bad', why: `"${t}" is neither a number nor a cell such as H2` };
  const address = a1(cell);
  return { kind: 'cell', sheet, address, ref: `${sheet === null ? '' : sheetPrefix(sheet)}${a1(cell, true)}` };
}

/** Where the tier of an analyte comes from, in words. */
export function tierSource(state: PaneState, r: VariationRow): string {
  return state.tierOriginOf(r);
}

/** The allowable total error of the analyte at its tier (SPEC.TOTAL), or why there is none. */
export function specFor(state: PaneState, r: VariationRow): SpecInUse | string {
  const q = zOf(state.coverage);
  if (!q.ok) return `The coverage in Fill is not valid: ${q.why}.`;
  if (r.cvg === null) return `${displayName(r)} has no CVG in the table: no allowable total error from biological variation.`;
  const tier = state.tierFor(r);
  const value = singleFigure('SPEC.TOTAL', [r.cvi, r.cvg, tier, q.z]);
  const table = state.table;
  return {
    value,
    formulaText: `LEEWAY.SPEC.TOTAL(${numberText(r.cvi)},${numberText(r.cvg)},${wordText(tier)},${numberText(q.z)})`,
    from: `${displayName(r)}: ${tier} tier (${tierSource(state, r)}), z ${q.z}; CVI ${r.cvi} %, CVG ${r.cvg} % from ${table ? `table "${table.name}"` : 'the table'}${r.source ? `, source: ${r.source}` : ''}`,
  };
}

/** The observed bias the pane holds for an analyte (What-if), for sigma when a material has no assigned value. */
export function observedBias(state: PaneState, r: VariationRow): BiasInUse | null {
  const o = state.observed.get(keyOf(r));
  return o ? { value: o.bias, from: o.from === 'typed' ? 'typed in What-if' : `read from ${o.from}` } : null;
}

/** The provenance of a block: what was selected, the analyte, when and by which version. */
export function provenance(title: string, demo: boolean, selected: string, more: ReadonlyArray<readonly [string, string]>, when: Date): Provenance {
  return { title, demo, pairs: [['Data', selected], ...more, ['Written', `${stamp(when)} by Leeway ${VERSION}`]] };
}
