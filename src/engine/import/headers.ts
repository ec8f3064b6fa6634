/**
 * Reading a header: its name and what it says about units. Names match case-insensitively,
 * ignoring spaces, underscores, hyphens, dots, colons and slashes ("CV_I", "cv i" and "CVI" are
 * one name). A bracketed part and a "%" are not dropped: they are read.
 * - On a column of percent numbers (a CV): "%" or words are fine ("CVI (%)", "CVg (between)"); a
 *   unit ("CVI (mmol/L)") contradicts the name and is reported: an SD is not a CV.
 * - On a column of amounts (a level, a result, a target): a unit is kept as the column's unit.
 * - On a column of spreads (an SD): a unit is kept; "%" is reported (an SD in % is a CV).
 * - On a limit column: "(%)" or "%" makes it the percent limit, a unit ("Limit (mmol/L)",
 *   "TEa [µmol/L]") or "(abs.)" the absolute limit in that unit; a bare "Limit" or "TEa" could
 *   be either and is reported as ambiguous, as is a name that says one kind with a unit of the
 *   other ("limit_pct (mmol/L)") and a bracket that names both kinds ("Limit (mmol/L or %)",
 *   "TEa (abs/rel)").
 * - On a percent column, "(SD)" or "(absolute)" says it is not a CV: reported, never dropped.
 */

/** How a column's header may speak of units. */
export type UnitRule = 'text' | 'percent' | 'amount' | 'spread';

/** What an import kind needs to read its headers. */
export interface HeaderSpec<F extends string> {
  readonly fields: readonly F[];
  /** Other names, in normalised form (see headerKey). */
  readonly aliases: Readonly<Record<F, readonly string[]>>;
  readonly units: Readonly<Record<F, UnitRule>>;
  /** The absolute and percent limit fields, when the kind has limits. */
  readonly limits?: { readonly abs: F; readonly pct: F };
}

export type HeaderReading<F extends string> =
  | { readonly kind: 'field'; readonly field: F; readonly by: 'name' | 'alias'; readonly unit?: string }
  | { readonly kind: 'ambiguous'; readonly candidates: readonly F[]; readonly why: string }
  | { readonly kind: 'unknown' };

/** Names of a limit column that do not say whether it is absolute or percent. */
export const LIMIT_WORDS: readonly string[] = ['limit', 'tea', 'fixedlimit', 'allowablelimit', 'allowableerror', 'totalallowableerror', 'allowabletotalerror', 'ate', 'fixedtea'];

/** The name part of a header: lower case, no bracketed parts, no "%", no spaces _ - . : / */
export function headerKey(header: string): string {
  return header
    .replace(/^\uFEFF/, '')
    .toLowerCase()
    .replace(/\([^)]*\)|\[[^\]]*\]/g, '')
    .replace(/[%\s_\-.:/]+/g, '');
}

/** The parts of a header: the name key, the bracketed texts, and whether a "%" stands outside brackets. */
export function headerParts(header: string): { readonly key: string; readonly brackets: readonly string[]; readonly percent: boolean } {
  const h = header.replace(/^\uFEFF/, '').trim();
  const brackets: string[] = [];
  const outside = h.replace(/\(([^)]*)\)|\[([^\]]*)\]/g, (_m, a?: string, b?: string) => {
    brackets.push((a ?? b ?? '').trim());
    return ' ';
  });
  return { key: headerKey(h), brackets, percent: outside.includes('%') };
}

const PERCENT_WORD = /^(%|percent|per\s*cent|pct|%\s*of\s+.*|relative)$/i;
const ABSOLUTE_WORD = /^(abs\.?|absolute|units?|in\s+units|same\s+units?)$/i;
/** Units that carry no "/": counts, enzyme units, pressures, times, masses, volumes, amounts. */
const BARE_UNIT = /^(?:[µμunmpkfd]?(?:mol|g|l|kat|eq|osm)|[µμmk]?i?u|mmhg|k?pa|s|sec|min|h|fl|pg|ratio|inr|°c|mm|cells|copies)$/i;

/** "mmol/L", "µmol/L", "U/L", "g/dL", "10^9/L", "fL", "mmHg", "%"… as opposed to words. */
export function looksLikeUnit(text: string): boolean {
  const t = text.trim();
  if (t === '' || t.length > 24) return false;
  if (!/^[\p{L}\p{N}µμ°%×·^*/.\-\s]+$/u.test(t)) return false;
  if (t.includes('/')) return true;
  if (/^(?:10\^?\d+|10[⁰¹²³⁴⁵⁶⁷⁸⁹]+)/.test(t) || /×\s*10/.test(t)) return true;
  return BARE_UNIT.test(t.replace(/\s+/g, ''));
}

type BracketSense = 'percent' | 'absolute' | 'unit' | 'mixed' | 'spread' | 'words';

/** Words that make a bracket speak of a percent, however else it is written ("% or mmol/L", "abs/rel"). */
const PERCENT_TOKEN = /%|\b(?:percent|pct|rel|relative)\b/i;
/** Words that make a bracket speak of an amount in the result's unit. */
const ABSOLUTE_TOKEN = /\b(?:abs|absolute|units?)\b/i;
/** Words that say a column holds an SD or a variance, not a CV. */
const SPREAD_WORD = /^(?:sd|s\.d\.?|standard\s+deviation|variance|var)$/i;

function bracketSense(b: string): BracketSense {
  if (PERCENT_WORD.test(b)) return 'percent';
  if (ABSOLUTE_WORD.test(b)) return 'absolute';
  if (SPREAD_WORD.test(b)) return 'spread';
  // Two kinds in one bracket ("mmol/L or %", "abs/rel", "% of mmol/L"): neither is dropped.
  if (PERCENT_TOKEN.test(b) && (ABSOLUTE_TOKEN.test(b) || b.replace(PERCENT_TOKEN, ' ').split(/\s+|\bor\b/).some((w) => looksLikeUnit(w)))) return 'mixed';
  if (/\b(?:or|and)\b/i.test(b)) return 'words';
  if (looksLikeUnit(b)) return 'unit';
  return 'words';
}

/**
 * What the header says about units: percent, a unit (the first one given), an absolute word, an
 * SD word, a bracket naming two kinds at once (mixed), other words.
 */
function unitsOf(parts: ReturnType<typeof headerParts>): { percent: boolean; unit?: string; absolute: boolean; spread: boolean; mixed?: string; words: boolean } {
  let percent = parts.percent;
  let unit: string | undefined;
  let absolute = false;
  let spread = false;
  let mixed: string | undefined;
  let words = false;
  for (const b of parts.brackets) {
    const s = bracketSense(b);
    if (s === 'percent') percent = true;
    else if (s === 'absolute') absolute = true;
    else if (s === 'spread') spread = true;
    else if (s === 'mixed') mixed = mixed ?? b;
    else if (s === 'unit') unit = unit ?? b;
    else words = true;
  }
  return { percent, unit, absolute, spread, mixed, words };
}

/** Name and alias lookup tables of a spec, built once per spec. */
const TABLES = new WeakMap<object, { byName: Map<string, string>; byAlias: Map<string, string> }>();

function tablesOf<F extends string>(spec: HeaderSpec<F>): { byName: Map<string, F>; byAlias: Map<string, F> } {
  let t = TABLES.get(spec);
  if (!t) {
    t = { byName: new Map(), byAlias: new Map() };
    for (const f of spec.fields) {
      t.byName.set(f.replace(/_/g, ''), f);
      for (const a of spec.aliases[f]) t.byAlias.set(a, f);
    }
    TABLES.set(spec, t);
  }
  return t as { byName: Map<string, F>; byAlias: Map<string, F> };
}

/** The field a header names, with the unit it states; or why it is ambiguous; or unknown. */
export function readHeader<F extends string>(spec: HeaderSpec<F>, header: string): HeaderReading<F> {
  const raw = header.replace(/^\uFEFF/, '').trim();
  const lower = raw.toLowerCase();
  if ((spec.fields as readonly string[]).includes(lower)) return { kind: 'field', field: lower as F, by: 'name' };
  const parts = headerParts(raw);
  if (parts.key === '') return { kind: 'unknown' };
  const { byName, byAlias } = tablesOf(spec);
  const units = unitsOf(parts);
  const limits = spec.limits;

  const named = byName.get(parts.key);
  const field = named ?? byAlias.get(parts.key);
  const generic = limits !== undefined && LIMIT_WORDS.includes(parts.key);
  if (units.mixed !== undefined && (generic || (field !== undefined && spec.units[field] !== 'text'))) {
    const candidates = generic || (limits && (field === limits.abs || field === limits.pct)) ? [limits!.abs, limits!.pct] : [field!];
    return { kind: 'ambiguous', candidates, why: `"${raw}" says "${units.mixed}": a percent and an amount at once` };
  }
  if (limits && generic) return genericLimit(limits, raw, units);
  if (field === undefined) return { kind: 'unknown' };
  const by = named ? ('name' as const) : ('alias' as const);

  if (limits && field === limits.abs) {
    if (units.percent) return { kind: 'ambiguous', candidates: [limits.abs, limits.pct], why: `"${raw}" names the absolute limit but says "%"` };
    return withUnit(field, by, units.unit);
  }
  if (limits && field === limits.pct) {
    if (units.unit !== undefined || units.absolute) return { kind: 'ambiguous', candidates: [limits.abs, limits.pct], why: `"${raw}" names the percent limit but gives the unit ${units.unit ?? 'of the result'}` };
    return { kind: 'field', field, by };
  }
  switch (spec.units[field]) {
    case 'percent':
      if (units.spread || units.absolute) {
        return { kind: 'ambiguous', candidates: [field], why: `"${raw}" names ${field}, a percent number, but says it is ${units.spread ? 'an SD' : 'absolute'}: an SD is not a CV` };
      }
      if (units.unit !== undefined && units.unit !== '%') {
        return { kind: 'ambiguous', candidates: [field], why: `"${raw}" names ${field}, a percent number, but gives the unit ${units.unit}: is this column an SD rather than a CV?` };
      }
      return { kind: 'field', field, by };
    case 'spread':
      if (units.percent) return { kind: 'ambiguous', candidates: [field], why: `"${raw}" names ${field}, which is in the result's unit, but says "%": an SD in percent is a CV` };
      return withUnit(field, by, units.unit);
    case 'amount':
      return withUnit(field, by, units.unit ?? (units.percent ? '%' : undefined));
    default:
      return { kind: 'field', field, by };
  }
}

function withUnit<F extends string>(field: F, by: 'name' | 'alias', unit: string | undefined): HeaderReading<F> {
  return unit === undefined ? { kind: 'field', field, by } : { kind: 'field', field, by, unit };
}

function genericLimit<F extends string>(limits: { abs: F; pct: F }, raw: string, u: ReturnType<typeof unitsOf>): HeaderReading<F> {
  const both = [limits.abs, limits.pct];
  if (u.percent && (u.unit !== undefined || u.absolute)) return { kind: 'ambiguous', candidates: both, why: `"${raw}" says both "%" and ${u.unit ?? 'absolute'}` };
  if (u.percent) return { kind: 'field', field: limits.pct, by: 'alias' };
  if (u.unit !== undefined) return { kind: 'field', field: limits.abs, by: 'alias', unit: u.unit };
  if (u.absolute) return { kind: 'field', field: limits.abs, by: 'alias' };
  return {
    kind: 'ambiguous',
    candidates: both,
    why: `"${raw}" does not say whether the limit is a percent or an amount in the result's unit`,
  };
}

/** Units compared as people write them: case, spaces and the two µ signs (and "u") do not matter. */
export function sameUnit(a: string, b: string): boolean {
  const n = (s: string): string => s.trim().toLowerCase().replace(/\s+/g, '').replace(/[µμ]/g, 'u');
  return n(a) === n(b);
}

/** The unit a header states in brackets ("Value [µmol/L]" → "µmol/L"), or undefined. */
export function headerUnit(header: string): string | undefined {
  return unitsOf(headerParts(header)).unit;
}
