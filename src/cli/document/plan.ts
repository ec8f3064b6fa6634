/** A fill plan's new sheet as a printed document: the planner's block lines run across the page, Source and Note wrap. */
import type ExcelJS from 'exceljs';
import type { FillPlan } from '../../engine/fill';
import { TITLE } from '../../engine/fill';
import { DocumentSheet } from './sheet';
import type { Paper } from './page';

/** Roles of the planner's cells that are lines of text running across the page. */
const SPANNING = new Set(['title', 'demo', 'provenance', 'caution']);

/** Long-text columns of a fill: wrapped. */
const LONG_TEXT = new Set(['source', 'note']);

/** A DocumentSheet over a sheet that writePlan() has filled (a new sheet); call finish() on it. */
export function planDocument(ws: ExcelJS.Worksheet, plan: FillPlan, options: { paper?: Paper; pageTitle?: string } = {}): DocumentSheet {
  const p = plan.provenance;
  const doc = new DocumentSheet(ws, { title: p.demo ? `${TITLE} — DEMO` : TITLE, pageTitle: options.pageTitle, demo: p.demo, date: p.date, paper: options.paper, version: p.version });
  for (const c of plan.cells) if (SPANNING.has(c.role)) doc.markSpan(c.row, c.col);
  doc.markHeader(plan.headerRow);
  doc.markCaution();
  doc.wrap(...plan.columns.filter((c) => LONG_TEXT.has(c.field)).map((c) => c.col));
  doc.row = plan.cells.reduce((m, c) => Math.max(m, c.row), 0) + 1;
  return doc;
}
