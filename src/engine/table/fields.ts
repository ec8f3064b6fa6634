/**
 * Header names: the canonical names of SPEC.md section 5 and the other names labs give the same
 * columns. Matching is case-insensitive and ignores spaces, underscores, hyphens, dots, a unit
 * in brackets and a trailing "%": "CV_I (%)", "cv i" and "CVI" all read as cvi.
 */
import type { ColumnMapping, Field, HeaderMapping } from './types';
import { FIELDS } from './types';
import { columnLetters } from '../fill/a1';

/** Other names for each field, already in normalised form (see normaliseHeader). */
export const HEADER_ALIASES: Readonly<Record<Field, readonly string[]>> = {
  analyte: ['test', 'measurand', 'analytename', 'component', 'parameter', 'quantity', 'name'],
  specimen: ['sample', 'sampletype', 'specimentype', 'matrix', 'material', 'fluid'],
  unit: ['units', 'uom', 'unitofmeasure'],
  cvi: ['cvw', 'cvwithin', 'withinsubjectcv', 'withinsubject', 'withinsubjectbiologicalvariation', 'intraindividualcv', 'intraindividual', 'cvintra', 'withinpersoncv', 'bvwithin'],
  cvg: ['cvb', 'cvbetween', 'betweensubjectcv', 'betweensubject', 'betweensubjectbiologicalvariation', 'interindividualcv', 'interindividual', 'cvinter', 'betweenpersoncv', 'bvbetween'],
  source: ['reference', 'ref', 'citation', 'datasource', 'sourceanddate', 'origin'],
  limit_abs: ['limitabsolute', 'absolutelimit', 'fixedlimitabs', 'fixedabs', 'teaabs', 'teaabsolute', 'abslimit', 'limitunits'],
  limit_pct: ['limitpercent', 'percentlimit', 'limit', 'fixedlimitpct', 'fixedpct', 'teapct', 'teapercent', 'pctlimit'],
  level: ['decisionlevel', 'medicaldecisionlevel', 'concentration', 'leveltested'],
  note: ['notes', 'comment', 'comments', 'remark', 'remarks'],
};

/** Lower case without spaces, _, -, ., :, /, a bracketed unit or "%": "CV_I (%)" → "cvi", "Limit %" → "limit". */
export function normaliseHeader(header: string): string {
  return header
    .replace(/^\uFEFF/, '')
    .toLowerCase()
    .replace(/\([^)]*\)|\[[^\]]*\]/g, '')
    .replace(/[%\s_\-.:/]+/g, '');
}

const BY_NAME = new Map<string, Field>();
const BY_ALIAS = new Map<string, Field>();
for (const f of FIELDS) {
  BY_NAME.set(f.replace(/_/g, ''), f);
  for (const a of HEADER_ALIASES[f]) BY_ALIAS.set(a, f);
}

/** The field a header names, and whether by its canonical name or an alias; undefined when none. */
export function matchHeader(header: string): { field: Field; by: 'name' | 'alias' } | undefined {
  const raw = header.replace(/^\uFEFF/, '').trim().toLowerCase();
  if ((FIELDS as readonly string[]).includes(raw)) return { field: raw as Field, by: 'name' };
  const key = normaliseHeader(header);
  const byName = BY_NAME.get(key);
  if (byName) return { field: byName, by: 'name' };
  const byAlias = BY_ALIAS.get(key);
  if (byAlias) return { field: byAlias, by: 'alias' };
  return undefined;
}

/** Maps each header onto a field: the user's mapping first, then names, then aliases. */
export function mapColumns(headers: readonly string[], mapping: HeaderMapping = {}, firstColumn = 1): ColumnMapping[] {
  return headers.map((h, i) => {
    const header = h.replace(/^\uFEFF/, '').trim();
    const index = firstColumn + i;
    const letter = columnLetters(index);
    if (Object.prototype.hasOwnProperty.call(mapping, header)) {
      return { index, letter, header, field: mapping[header], by: 'user' as const };
    }
    const m = header === '' ? undefined : matchHeader(header);
    return m ? { index, letter, header, field: m.field, by: m.by } : { index, letter, header, field: null, by: 'none' as const };
  });
}
