/**
 * Run, day and material labels as users type them: the one reading used by DATA.PRECISION,
 * VERIFY.* and the review of control results.
 */

/** One label cell: number, text, logical, or blank (null/undefined). */
export type Label = number | string | boolean | null | undefined;

/**
 * A label's identity: text trimmed and lower-cased, a finite number as its shortest decimal
 * (so 1 and "1" meet), a logical as true/false; undefined for a blank.
 */
export function labelKey(v: Label): string | undefined {
  if (v === null || v === undefined) return undefined;
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : undefined;
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  const t = v.trim();
  return t === '' ? undefined : t.toLowerCase();
}
