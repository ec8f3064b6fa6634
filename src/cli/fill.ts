/**
 * `leeway fill --table T.csv --out OUT.xlsx [--tier T] [--z Z] [--analytes A,B]
 *   [--template X.xlsx [--sheet S] [--at A1] [--append]] [--overwrite] [--force] [--live]
 *   [--paper A4|Letter]`
 * fills an .xlsx headless with the planner the task pane uses. A new workbook is written with
 * exceljs and laid out for printing by the document-sheet layer (src/cli/document). A template is filled by editing its package directly (src/cli/workbook): only the
 * cells the fill writes change, and every other part of the file keeps its bytes. By default
 * derived columns are values (full precision; rounding only in the number format); --live writes
 * LEEWAY formulas (stored as Excel stores add-in calls, see xlsx.ts) with their results cached.
 */
import { createHash } from 'crypto';
import * as path from 'path';
import { UsageError } from './call';
import type { Io } from './main';
import { one, readDecimal, readOptions } from './options';
import { readBytes, checkOutput, writeWorkbookAtomically, writeBytesAtomically, today, newWorkbook } from './files';
import { progressBar } from './progress';
import { writePlan } from './xlsx';
import { planDocument, PAPERS } from './document';
import type { Paper } from './document';
import { TemplateWorkbook } from './workbook/template';
import { WorkbookError } from './workbook/package';
import { parseTableBytes, acceptImport, formatProblem, formatReport } from '../engine/table';
import type { HeaderMapping, Field } from '../engine/table';
import { FIELDS } from '../engine/table';
import { planFill, selectRows, parseA1, a1, formatTemplateReport, MAX_COLUMNS, MAX_ROWS } from '../engine/fill';
import type { FillMode, FillPlan, FillRequest } from '../engine/fill';
import { readTier } from '../engine/tiers';
import { LeewayError } from '../engine/errors';
import { Z_TOTAL_ERROR } from '../engine/coverage';

export const FILL_USAGE = `  leeway fill --table T.csv --out OUT.xlsx [--tier T] [--z Z] [--analytes A,B] [--analyte NAME]
              [--template X.xlsx [--sheet S] [--at A1] [--append]] [--overwrite] [--force]
              [--live] [--date YYYY-MM-DD] [--decimals N] [--map HEADER=FIELD]
              [--paper A4|Letter]
                                   fill a workbook from a variation table (values by default;
                                   --live writes LEEWAY formulas for the add-in); a template gets
                                   only its empty target cells written (--overwrite replaces the
                                   others) and its other analytes only with --append;
                                   --analytes splits its list at commas, --analyte takes one name
                                   whole (for a name with a comma: --analyte "Iron, total");
                                   both may be repeated`;

const DEFAULT_SHEET = 'Specifications';

/**
 * The analytes asked for: each --analytes value is a comma-separated list, each --analyte value one
 * name taken whole (commas and all); both may be repeated and mixed, in the order given.
 */
export function analyteNames(lists: readonly string[] | undefined, single: readonly string[] | undefined): string[] {
  const names = (lists ?? []).flatMap((s) => s.split(',')).map((s) => s.trim());
  for (const n of single ?? []) {
    if (n.trim() === '') throw new UsageError('fill: --analyte needs a name');
    names.push(n.trim());
  }
  return names.filter(Boolean);
}

/** --map "Header text=field" (or "=" with nothing after it to ignore the column). */
export function readMappings(list: readonly string[] | undefined, command: string): HeaderMapping {
  const out: Record<string, Field | null> = {};
  for (const m of list ?? []) {
    const eq = m.lastIndexOf('=');
    if (eq <= 0) throw new UsageError(`${command}: --map needs HEADER=FIELD (got ${m})`);
    const header = m.slice(0, eq).trim();
    const field = m.slice(eq + 1).trim().toLowerCase();
    if (field === '' || field === 'ignore') out[header] = null;
    else if ((FIELDS as readonly string[]).includes(field)) out[header] = field as Field;
    else throw new UsageError(`${command}: --map ${m}: ${field} is not one of ${FIELDS.join(', ')} (or "ignore")`);
  }
  return out;
}

/** --paper A4 (default) or Letter, any case. */
export function readPaper(text: string | undefined, command: string): Paper {
  if (text === undefined) return 'A4';
  const found = PAPERS.find((p) => p.toLowerCase() === text.trim().toLowerCase());
  if (!found) throw new UsageError(`${command}: --paper must be ${PAPERS.join(' or ')} (got ${text})`);
  return found;
}

export async function fillCommand(args: string[], io: Io): Promise<number> {
  const o = readOptions('fill', args, {
    values: ['table', 'out', 'tier', 'z', 'analytes', 'analyte', 'template', 'sheet', 'at', 'date', 'decimals', 'map', 'paper'],
    flags: ['overwrite', 'force', 'live', 'append'],
    repeatable: ['map', 'analytes', 'analyte'],
    outExtensions: ['xlsx', 'xlsm', 'xltx', 'xltm'],
  });
  if (o.positional.length) throw new UsageError(`fill: unexpected argument ${o.positional[0]} (options are --table, --out, …)`);
  const tablePath = one(o, 'table');
  const out = one(o, 'out');
  const template = one(o, 'template');
  if (!tablePath) throw new UsageError('fill needs --table T.csv');
  if (!out) throw new UsageError('fill needs --out OUT.xlsx');
  if (!template && !out.toLowerCase().endsWith('.xlsx')) throw new UsageError(`fill: --out ${out}: a new workbook is an .xlsx file, so the name must end in .xlsx`);
  let tier: FillRequest['tier'] = 'desirable';
  const tierText = one(o, 'tier');
  if (tierText !== undefined) {
    try {
      tier = readTier(tierText);
    } catch (e) {
      throw new UsageError(`fill: --tier ${e instanceof LeewayError ? e.message.replace(/^tier /, '') : tierText}`);
    }
  }
  const zText = one(o, 'z');
  const z = zText === undefined ? Z_TOTAL_ERROR : readDecimal(zText, 'fill: --z');
  if (!(z >= 0)) throw new UsageError(`fill: --z must be a number ≥ 0 (got ${zText})`);
  const decText = one(o, 'decimals');
  const decimals = decText === undefined ? 2 : readDecimal(decText, 'fill: --decimals');
  if (!(Number.isInteger(decimals) && decimals >= 0 && decimals <= 15)) throw new UsageError(`fill: --decimals must be a whole number from 0 to 15 (got ${decText})`);
  // --date was checked as a calendar date by readOptions.
  const date = one(o, 'date') ?? today();
  const paper = readPaper(one(o, 'paper'), 'fill');
  const sheetName = one(o, 'sheet');
  const atText = one(o, 'at');
  if (atText !== undefined && !template) throw new UsageError('fill: --at needs --template (a new workbook is always filled from A1)');
  if (o.flags.has('append') && !template) throw new UsageError('fill: --append needs --template (a new workbook gets every analyte)');
  if (one(o, 'paper') !== undefined && template) throw new UsageError("fill: --paper is for a new workbook: a template keeps the lab's own page set-up");
  const at = atText === undefined ? undefined : parseA1(atText);
  if (atText !== undefined && !at) throw new UsageError(`fill: --at ${atText} is not a cell inside a sheet (A1 to XFD${MAX_ROWS}, at most ${MAX_COLUMNS} columns)`);
  const mode: FillMode = o.flags.has('live') ? 'live' : 'values';
  const force = o.flags.has('force');

  // Refuse an existing output before any work.
  checkOutput(out, force);

  const bytes = readBytes(tablePath, 'table');
  const tableSha256 = createHash('sha256').update(bytes).digest('hex');
  const imported = parseTableBytes(bytes, { name: path.basename(tablePath), origin: path.resolve(tablePath), mapping: readMappings(o.values.get('map'), 'fill') });
  if (!imported.ok) {
    for (const line of formatReport(imported)) io.err(line);
    io.err(`leeway fill: the table ${tablePath} has errors: nothing was written (see leeway check)`);
    return 1;
  }
  // Warnings (an encoding read as Windows-1252, a unit that differs) do not stop a fill: say them.
  for (const p of imported.problems) io.err(`leeway fill: ${formatProblem(p)}`);
  const table = acceptImport(imported);
  const names = analyteNames(o.values.get('analytes'), o.values.get('analyte'));
  const selection = selectRows(table, names);
  if (selection.unknown.length) {
    const whole = (o.values.get('analytes') ?? []).find((list) => list.includes(',') && selectRows(table, [list.trim()]).unknown.length === 0);
    if (whole !== undefined) throw new UsageError(`fill: the table has an analyte named "${whole.trim()}" (with a comma): name it with --analyte "${whole.trim()}", which takes one name whole; --analytes splits at commas`);
    throw new Error(`the table has no analyte ${selection.unknown.map((n) => `"${n}"`).join(', ')}: nothing was written (it lists ${table.rows.slice(0, 8).map((r) => r.analyte).join(', ')}${table.rows.length > 8 ? ', …' : ''})`);
  }
  const base = { table, rows: selection.rows, tier, z, mode, overwrite: o.flags.has('overwrite'), date, decimals, tableSha256, writtenDecimals: imported.decimals };

  if (!template) {
    const wb = newWorkbook();
    const ws = wb.addWorksheet(sheetName ?? DEFAULT_SHEET);
    const planned = planFill({ ...base, target: { kind: 'new-sheet', sheetName: ws.name } });
    if (!planned.ok) return refuse(planned.problems, io);
    const bar = progressBar('filling');
    writePlan(ws, planned.plan, (d, t) => bar.update(d, t));
    planDocument(ws, planned.plan, { paper }).finish();
    bar.done();
    await writeWorkbookAtomically(wb, out, force);
    io.out(summary(out, planned.plan));
    return 0;
  }

  const templateBytes = readBytes(template, 'template');
  let wb: TemplateWorkbook;
  try {
    wb = await TemplateWorkbook.open(templateBytes);
  } catch (e) {
    if (e instanceof WorkbookError) throw new Error(`cannot read the template ${template}: ${e.message}`, { cause: e });
    throw e;
  }
  const kind = wb.pkg.kind;
  if ((kind === 'xlsm' || kind === 'xltm' || kind === 'xltx') && !out.toLowerCase().endsWith(`.${kind}`)) {
    throw new UsageError(`fill: the template ${template} is ${kind === 'xltx' ? 'an Excel template' : 'a macro-enabled workbook'} (.${kind}): write it to a .${kind} file (--out NAME.${kind}), or a spreadsheet program will refuse to open it`);
  }
  if (kind === 'xlsx' && !out.toLowerCase().endsWith('.xlsx')) {
    throw new UsageError(`fill: the template ${template} is an .xlsx workbook: write it to an .xlsx file (--out NAME.xlsx), or a spreadsheet program will refuse to open it`);
  }
  let snapshot;
  let entry;
  try {
    entry = wb.pick(sheetName, template);
    snapshot = await wb.snapshot(entry);
  } catch (e) {
    if (e instanceof WorkbookError) throw new Error(e.message.startsWith('the template') ? e.message : `cannot read the template ${template}: ${e.message}`, { cause: e });
    throw e;
  }
  const lastRow = snapshot.sparse!.reduce((m, c) => Math.max(m, c.row), 0);
  const lastCol = snapshot.sparse!.reduce((m, c) => Math.max(m, c.col), 0);
  if (at && (at.row > lastRow || at.col > lastCol)) {
    throw new UsageError(`fill: --at ${atText} is outside the used part of sheet "${entry.name}" (${lastRow && lastCol ? `A1:${a1({ row: lastRow, col: lastCol })}` : 'the sheet is empty'}): point it at the first cell of the template's header row`);
  }
  const planned = planFill({ ...base, target: { kind: 'template', sheet: snapshot, headerAt: at, append: o.flags.has('append') } });
  if (!planned.ok) {
    const hint = planned.problems.some((p) => p.code === 'no-header') ? `point at the first cell of the header row with --at CELL (for example --at A6)${sheetName === undefined ? ', and at another sheet with --sheet NAME' : ''}` : undefined;
    return refuse(planned.problems, io, hint);
  }
  const plan = planned.plan;
  const bar = progressBar('filling');
  bar.update(0, 1);
  const filled = await wb.fill(entry, plan);
  bar.done();
  await writeBytesAtomically(filled.bytes, out, force);
  io.out(summary(out, plan));
  const hints = { overwrite: 'add --overwrite to replace them', append: 'add --append to add them in empty rows below the table', pick: 'pick one with --analytes "NAME (SPECIMEN)"' };
  for (const line of formatTemplateReport(plan, hints)) io.out(line);
  for (const note of filled.notes) io.out(note);
  return 0;
}

function refuse(problems: readonly { where: string; message: string }[], io: Io, hint?: string): number {
  for (const p of problems) io.err(`${p.where ? p.where + ': ' : ''}${p.message}`);
  if (hint) io.err(hint);
  io.err('leeway fill: nothing was written');
  return 1;
}

function summary(out: string, plan: FillPlan): string {
  const n = plan.rows.length;
  const what = plan.mode === 'live' ? 'live LEEWAY formulas' : 'values';
  const cells = plan.cells.length + (plan.blockSheet?.cells.length ?? 0);
  return `wrote ${out}: sheet "${plan.sheetName}", ${n} analyte${n === 1 ? '' : 's'}, ${cells} cells, ${what} at the ${plan.provenance.tier} tier, z ${plan.provenance.z}`;
}
