/**
 * What every sheet of a review workbook shares: the workbook, the provenance printed on each
 * sheet, the paper, and the opening lines (title, demo marker, provenance, caution) every sheet
 * starts with. Each sheet is a document of the document-sheet layer.
 */
import type ExcelJS from 'exceljs';
import { DocumentSheet } from '../document';
import type { Paper } from '../document';
import type { Tier } from '../../engine/tiers';
import { VERSION } from '../../engine/version';

export interface Provenance {
  /** The results file's name (no folder). */
  readonly fileName: string;
  readonly sha256: string;
  /** Data rows read. */
  readonly rows: number;
  /** The variation table, when one was given. */
  readonly table?: { readonly name: string; readonly sha256: string };
  readonly tier: Tier;
  /** How the rule was chosen, for the provenance line ("1-3s/2-2s/R-4s for every analyte", "per analyte: see Summary"). */
  readonly rule: string;
  /** The review's date, YYYY-MM-DD. */
  readonly date: string;
  readonly demo: boolean;
}

export interface ReviewContext {
  /** The workbook a sheet is built in: each sheet gets one of its own, written out once finished. */
  readonly wb: ExcelJS.Workbook;
  readonly provenance: Provenance;
  readonly paper: Paper;
}

/**
 * A sheet written after the review's own sheets (the EQA sheet, say): it adds its worksheets to
 * ctx.wb through the document-sheet layer and may use reviewSheet() for the same opening lines.
 * Every worksheet it adds is written, in order, after the Results sheet.
 */
export type ReviewSheetWriter = (ctx: ReviewContext) => void | Promise<void>;

/** The provenance in words, one line per fact group. */
export function provenanceLines(p: Provenance): string[] {
  const lines = [`Results file: ${p.fileName}, ${p.rows} row${p.rows === 1 ? '' : 's'}, SHA-256 ${p.sha256}`];
  const table = p.table ? `variation table ${p.table.name}${p.table.sha256 ? ` (SHA-256 ${p.table.sha256})` : ''} at the ${p.tier} tier` : 'no variation table';
  lines.push(`Rule: ${p.rule}; ${table}; reviewed ${p.date} with Leeway ${VERSION}`);
  return lines;
}

/** A new sheet with its opening lines: title, demo marker, provenance, caution, a blank row. */
export function reviewSheet(ctx: ReviewContext, name: string, title: string): DocumentSheet {
  const demo = ctx.provenance.demo;
  const shown = demo ? `${title} — DEMO` : title;
  const doc = new DocumentSheet(ctx.wb.addWorksheet(name), { title: shown, pageTitle: `Leeway control review — ${name}`, demo, date: ctx.provenance.date, paper: ctx.paper });
  doc.title(shown);
  if (demo) doc.demoMarker();
  for (const line of provenanceLines(ctx.provenance)) doc.note(line);
  doc.caution();
  doc.skip();
  return doc;
}
