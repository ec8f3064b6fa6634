/** Small helpers both writers and the task pane use around a plan. */
import type { FillPlan } from './types';

/**
 * True when text typed into a cell would not stay that text: it starts with = + - @ (a formula),
 * or an apostrophe (Excel's text prefix, which would be swallowed), or it would be read as a
 * number, date, time, percent or logical. Writers that go through Excel's parser (the task
 * pane) store such text with a leading apostrophe; file writers store it as a string.
 */
export function needsTextGuard(t: string): boolean {
  if (/^[=+\-@']/.test(t)) return true;
  const s = t.trim();
  if (s !== t) return true;
  if (/^(true|false)$/i.test(s)) return true;
  if (/^[\d.,$€£(]/.test(s)) return true;
  if (/^#/.test(s)) return true;
  return false;
}

/** A sheet name not yet taken (case-insensitive, as Excel compares them): "Specs", "Specs (2)", …; at most 31 characters. */
export function uniqueSheetName(base: string, taken: readonly string[]): string {
  const clean = base.replace(/[\\/?*[\]:]/g, ' ').trim().slice(0, 31) || 'Sheet';
  const lower = new Set(taken.map((t) => t.toLowerCase()));
  if (!lower.has(clean.toLowerCase())) return clean;
  for (let i = 2; ; i++) {
    const suffix = ` (${i})`;
    const name = clean.slice(0, 31 - suffix.length) + suffix;
    if (!lower.has(name.toLowerCase())) return name;
  }
}

/** The conflict list as lines: "D7 holds 5.2; the fill would write 5.7". */
export function formatConflicts(plan: FillPlan): string[] {
  return plan.conflicts.map((c) => `${c.address} holds ${JSON.stringify(c.existing)}; the fill would write ${JSON.stringify(c.planned)}`);
}
