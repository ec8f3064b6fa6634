/** Small helpers both writers and the task pane use around a plan. */
import type { AnalyteName, FillPlan } from './types';

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

function named(n: AnalyteName): string {
  return n.specimen ? `${n.analyte} (${n.specimen})` : n.analyte;
}

function listed(names: readonly string[], limit: number): string {
  return names.length <= limit ? names.join(', ') : `${names.slice(0, limit).join(', ')} and ${names.length - limit} more`;
}

/** How each front end tells the user to change the outcome (a command-line option, a pane control). */
export interface ReportHints {
  /** "add --overwrite to replace them". */
  readonly overwrite: string;
  /** "add --append to add them below the table". */
  readonly append: string;
  /** "pick one with --analytes" */
  readonly pick: string;
}

/**
 * What a template fill found, as lines for the user: cells kept or overwritten, cells never
 * written (merged), table analytes the template lacks (and what appending did with them),
 * template analytes the table lacks, ambiguous rows, and where the provenance went. Lists longer
 * than `limit` are cut with a count.
 */
export function formatTemplateReport(plan: FillPlan, hints: ReportHints, limit = 50): string[] {
  const t = plan.template;
  const out: string[] = [];
  const n = (k: number, one: string, many = `${one}s`): string => `${k} ${k === 1 ? one : many}`;
  if (plan.conflicts.length) {
    out.push(
      plan.overwrite
        ? `overwrote ${n(plan.conflicts.length, 'cell')}: ${listed(plan.conflicts.map((c) => c.address), limit)}`
        : `left ${n(plan.conflicts.length, 'non-empty target cell')} as ${plan.conflicts.length === 1 ? 'it was' : 'they were'} (${hints.overwrite}):`,
    );
    for (const c of plan.conflicts.slice(0, limit)) out.push(`  ${c.address} ${plan.overwrite ? 'held' : 'holds'} ${JSON.stringify(c.existing)}; Leeway ${plan.overwrite ? 'wrote' : 'would write'} ${JSON.stringify(c.planned)}`);
    if (plan.conflicts.length > limit) out.push(`  and ${plan.conflicts.length - limit} more`);
  }
  if (plan.blocked.length) {
    out.push(`did not write ${n(plan.blocked.length, 'cell')} that cannot be written without changing the sheet's layout:`);
    for (const b of plan.blocked.slice(0, limit)) out.push(`  ${b.address} (${b.reason}); Leeway would write ${JSON.stringify(b.planned)}`);
    if (plan.blocked.length > limit) out.push(`  and ${plan.blocked.length - limit} more`);
  }
  const notAdded = t.notInTemplate.filter((x) => !t.appended.some((r) => r.analyte === x.analyte && r.specimen === x.specimen) && !t.noRoom.some((r) => r.analyte === x.analyte && r.specimen === x.specimen));
  if (notAdded.length) out.push(`the template does not list ${n(notAdded.length, 'analyte')} of the table (not added; ${hints.append}): ${listed(notAdded.map(named), limit)}`);
  if (t.appended.length) out.push(`appended ${n(t.appended.length, 'analyte')} below the table: ${t.appended.map((r) => `${named(r)} (row ${r.row})`).join(', ')}`);
  if (t.noRoom.length) out.push(`no room to append ${n(t.noRoom.length, 'analyte')} (${t.noRoomReason}): ${listed(t.noRoom.map(named), limit)}`);
  if (t.missingFromTable.length) out.push(`the table has no row for ${n(t.missingFromTable.length, 'analyte')} of the template (left blank): ${listed(t.missingFromTable.map((m) => `${named(m)} (row ${m.row})`), limit)}`);
  for (const a of t.ambiguous) {
    out.push(`row ${a.row}, "${a.analyte}": left blank, the template has no specimen column and the table lists ${a.analyte} for ${a.specimens.join(', ')} (${hints.pick}, or add a Specimen column)`);
  }
  if (t.belowTable.length) {
    out.push(`below the end of the template's table (${t.tableRange}; a blank row ends it), not filled: ${listed(t.belowTable.map((b) => `${named(b)} (row ${b.row})`), limit)}`);
  }
  for (const note of t.notes.slice(0, limit)) out.push(note);
  if (t.notes.length > limit) out.push(`and ${t.notes.length - limit} more notes`);
  if (t.provenanceAt) out.push(`provenance and caution: ${t.provenanceAt}`);
  return out;
}
