/**
 * Header names of a variation table: the canonical column names and the other names labs give the
 * same columns. Matching is case-insensitive and ignores spaces, underscores, hyphens, dots,
 * colons and slashes; a bracketed part and a "%" are read, not dropped (see import/headers.ts):
 * "CV_I (%)", "cv i" and "CVI" read as cvi; "Limit (%)" as limit_pct; "Limit (mmol/L)" and
 * "TEa [µmol/L]" as limit_abs in that unit; a bare "Limit" is ambiguous.
 */
import type { ColumnMapping, Field, HeaderMapping } from './types';
import { FIELDS, NUMERIC_FIELDS, REQUIRED_FIELDS } from './types';
import { headerKey, readHeader } from '../import/headers';
import type { UnitRule } from '../import/headers';
import { columnsOf } from '../import/read';
import type { ImportKind } from '../import/read';

/** Other names for each field, already in normalised form (see normaliseHeader). */
export const HEADER_ALIASES: Readonly<Record<Field, readonly string[]>> = {
  analyte: ['test', 'measurand', 'analytename', 'component', 'parameter', 'quantity', 'name'],
  specimen: ['sample', 'sampletype', 'specimentype', 'matrix', 'material', 'fluid'],
  unit: ['units', 'uom', 'unitofmeasure'],
  cvi: ['cvw', 'cvwithin', 'withinsubjectcv', 'withinsubject', 'withinsubjectbiologicalvariation', 'intraindividualcv', 'intraindividual', 'cvintra', 'withinpersoncv', 'bvwithin'],
  cvg: ['cvb', 'cvbetween', 'betweensubjectcv', 'betweensubject', 'betweensubjectbiologicalvariation', 'interindividualcv', 'interindividual', 'cvinter', 'betweenpersoncv', 'bvbetween'],
  source: ['reference', 'ref', 'citation', 'datasource', 'sourceanddate', 'origin'],
  limit_abs: ['limitabsolute', 'absolutelimit', 'fixedlimitabs', 'fixedabs', 'teaabs', 'teaabsolute', 'abslimit', 'limitunits', 'limitabs'],
  // "limit", "tea" and the like say neither kind: see LIMIT_WORDS in import/headers.ts.
  limit_pct: ['limitpercent', 'percentlimit', 'fixedlimitpct', 'fixedpct', 'teapct', 'teapercent', 'pctlimit', 'limitpct', 'fixedlimitpercent'],
  level: ['decisionlevel', 'medicaldecisionlevel', 'concentration', 'leveltested'],
  note: ['notes', 'comment', 'comments', 'remark', 'remarks'],
};

const UNITS: Readonly<Record<Field, UnitRule>> = {
  analyte: 'text',
  specimen: 'text',
  unit: 'text',
  cvi: 'percent',
  cvg: 'percent',
  source: 'text',
  limit_abs: 'amount',
  limit_pct: 'percent',
  level: 'amount',
  note: 'text',
};

/** The variation table as a kind of file the importer reads. */
export const TABLE_KIND: ImportKind<Field> = {
  noun: 'table',
  fields: FIELDS,
  aliases: HEADER_ALIASES,
  units: UNITS,
  limits: { abs: 'limit_abs', pct: 'limit_pct' },
  required: REQUIRED_FIELDS,
  numeric: NUMERIC_FIELDS,
  unitField: 'unit',
  needs: 'a header row (analyte, cvi, source, …) and one row per analyte',
};

/** Lower case without spaces, _, -, ., :, /, bracketed parts or "%": "CV_I (%)" → "cvi", "Limit %" → "limit". */
export function normaliseHeader(header: string): string {
  return headerKey(header);
}

/**
 * The field a header names, whether by its canonical name or an alias, and the unit it states;
 * undefined when it names none, or is ambiguous ("Limit" alone: percent or absolute?).
 */
export function matchHeader(header: string): { field: Field; by: 'name' | 'alias'; unit?: string } | undefined {
  const r = readHeader(TABLE_KIND, header);
  if (r.kind !== 'field') return undefined;
  return r.unit === undefined ? { field: r.field, by: r.by } : { field: r.field, by: r.by, unit: r.unit };
}

/** Maps each header onto a field: the user's mapping first, then names, then aliases. */
export function mapColumns(headers: readonly string[], mapping: HeaderMapping = {}, firstColumn = 1): ColumnMapping[] {
  return columnsOf(TABLE_KIND, headers, mapping, firstColumn);
}
