/**
 * Header texts and notes of the columns a fill writes, and the match of a template's own header
 * row onto them (the table's header aliases, plus names for the tier and derived columns).
 */
import { matchHeader, normaliseHeader } from '../table/fields';
import type { DerivedField, FillField, TemplateMapping } from './types';

export const COLUMN_HEADERS: Readonly<Record<FillField, string>> = {
  analyte: 'Analyte',
  specimen: 'Specimen',
  unit: 'Unit',
  cvi: 'CVI %',
  cvg: 'CVG %',
  source: 'Source',
  limit_abs: 'Limit (abs.)',
  limit_pct: 'Limit %',
  level: 'Level',
  note: 'Note',
  tier: 'Tier (this row)',
  spec_cv: 'Allowable CV %',
  spec_bias: 'Allowable bias %',
  spec_total: 'Allowable total error %',
  spec_mu: 'Max. standard uncertainty %',
  fixed_pct: 'Fixed limit %',
};

/** Other names for the tier and derived columns, in normalised form (see normaliseHeader). */
const FILL_ALIASES: Readonly<Record<'tier' | DerivedField, readonly string[]>> = {
  tier: ['tier', 'tierthisrow', 'rowtier', 'analytetier'],
  spec_cv: ['allowablecv', 'allowableimprecision', 'speccv', 'maxcv', 'maximumcv', 'cvallowable'],
  spec_bias: ['allowablebias', 'specbias', 'maxbias', 'maximumbias', 'biasallowable'],
  spec_total: ['allowabletotalerror', 'spectotal', 'tea', 'ate', 'totalallowableerror', 'maxtotalerror', 'totalerrorallowable'],
  spec_mu: ['maxstandarduncertainty', 'maximumstandarduncertainty', 'specmu', 'maxuncertainty', 'maximumuncertainty', 'allowableuncertainty', 'maxmu'],
  fixed_pct: ['fixedlimit', 'specfixed', 'regulatorylimit', 'eqalimit', 'fixedlimitpercent'],
};

const FILL_BY_ALIAS = new Map<string, FillField>();
for (const [field, names] of Object.entries(FILL_ALIASES) as Array<[FillField, readonly string[]]>) {
  for (const n of names) FILL_BY_ALIAS.set(n, field);
  FILL_BY_ALIAS.set(field.replace(/_/g, ''), field);
}

/** The field a template header names, or undefined. The user's mapping wins; null there means "leave this column alone". */
export function matchTemplateHeader(header: string, mapping: TemplateMapping = {}): FillField | null | undefined {
  const h = header.trim();
  if (Object.prototype.hasOwnProperty.call(mapping, h)) return mapping[h];
  if (h === '') return undefined;
  const derived = FILL_BY_ALIAS.get(normaliseHeader(h));
  if (derived) return derived;
  return matchHeader(h)?.field;
}
