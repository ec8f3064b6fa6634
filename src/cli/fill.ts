/**
 * `leeway fill --table T.csv --out OUT.xlsx [--tier T] [--z Z] [--analytes A,B]
 *   [--template X.xlsx [--sheet S] [--at A1]] [--overwrite] [--force] [--live]`
 * fills an .xlsx headless by the worksheet-filling rules, with the planner the task pane uses.
 * By default derived columns are values (full precision; rounding only in the number format) and
 * each derived column's worksheet formula is in its header's note; --live writes LEEWAY formulas
 * (stored as Excel stores add-in calls, see xlsx.ts) with their results cached.
 */
import * as path from 'path';
import { createHash } from 'crypto';
import type ExcelJS from 'exceljs';
import { UsageError } from './call';
import type { Io } from './main';
import { one, readOptions } from './options';
import { readBytes, checkRegularFile, checkOutput, writeWorkbookAtomically, today, newWorkbook } from './files';
import { progressBar } from './progress';
import { readSnapshot, writePlan } from './xlsx';
import { planDocument, PAPERS } from './document';
import type { Paper } from './document';
import { parseTableBytes, acceptImport, formatProblem, formatReport } from '../engine/table';
import type { HeaderMapping, Field } from '../engine/table';
import { FIELDS } from '../engine/table';
import { planFill, selectRows, parseA1, a1, formatConflicts, MAX_COLUMNS, MAX_ROWS } from '../engine/fill';
import type { FillMode, FillPlan, FillRequest } from '../engine/fill';
import { readTier } from '../engine/tiers';
import { LeewayError } from '../engine/errors';
import { Z_TOTAL_ERROR } from '../engine/coverage';

export const FILL_USAGE = `  leeway fill --table T.csv --out OUT.xlsx [--tier T] [--z Z] [--analytes A,B]
              [--template X.xlsx [--sheet S] [--at A1]] [--overwrite] [--force] [--live]
              [--date YYYY-MM-DD] [--decimals N] [--map HEADER=FIELD] [--paper A4|Letter]
                                   fill a workbook from a variation table (values by default;
                                   --live writes LEEWAY formulas for the add-in)`;

const DEFAULT_SHEET = 'Specifications';

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
    values: ['table', 'out', 'tier', 'z', 'analytes', 'template', 'sheet', 'at', 'date', 'decimals', 'map', 'paper'],
    flags: ['overwrite', 'force', 'live'],
    repeatable: ['map', 'analytes'],
  });
  if (o.positional.length) throw new UsageError(`fill: unexpected argument ${o.positional[0]} (options are --table, --out, …)`);
  const tablePath = one(o, 'table');
  const out = one(o, 'out');
  if (!tablePath) throw new UsageError('fill needs --table T.csv');
  if (!out) throw new UsageError('fill needs --out OUT.xlsx');
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
  const z = zText === undefined ? Z_TOTAL_ERROR : Number(zText);
  if (!(Number.isFinite(z) && z >= 0) || (zText !== undefined && zText.trim() === '')) throw new UsageError(`fill: --z must be a number ≥ 0 (got ${zText})`);
  const decText = one(o, 'decimals');
  const decimals = decText === undefined ? 2 : Number(decText);
  if (!(Number.isInteger(decimals) && decimals >= 0 && decimals <= 15)) throw new UsageError(`fill: --decimals must be a whole number from 0 to 15 (got ${decText})`);
  const date = one(o, 'date') ?? today();
  if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) throw new UsageError(`fill: --date must be YYYY-MM-DD (got ${date})`);
  const paper = readPaper(one(o, 'paper'), 'fill');
  const template = one(o, 'template');
  const sheetName = one(o, 'sheet');
  const atText = one(o, 'at');
  if (atText !== undefined && !template) throw new UsageError('fill: --at needs --template (a new workbook is always filled from A1)');
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
  const names = (o.values.get('analytes') ?? []).flatMap((s) => s.split(',')).map((s) => s.trim()).filter(Boolean);
  const selection = selectRows(table, names);
  if (selection.unknown.length) {
    throw new Error(`the table has no analyte ${selection.unknown.map((n) => `"${n}"`).join(', ')}: nothing was written (it lists ${table.rows.slice(0, 8).map((r) => r.analyte).join(', ')}${table.rows.length > 8 ? ', …' : ''})`);
  }

  const wb = newWorkbook();
  let target: FillRequest['target'];
  let ws: ExcelJS.Worksheet;
  if (template) {
    checkRegularFile(template, 'template');
    try {
      await wb.xlsx.readFile(template);
    } catch (e) {
      throw new Error(`cannot read the template ${template}: ${(e as Error).message} (is it an .xlsx workbook?)`);
    }
    const found = sheetName === undefined ? wb.worksheets[0] : wb.getWorksheet(sheetName);
    if (!found) {
      const all = wb.worksheets.map((s) => `"${s.name}"`).join(', ');
      throw new Error(sheetName === undefined ? `the template ${template} has no sheets` : `the template ${template} has no sheet "${sheetName}" (it has ${all})`);
    }
    ws = found;
    const snapshot = readSnapshot(ws);
    const lastRow = snapshot.cells.length;
    const lastCol = snapshot.cells.reduce((m, r) => Math.max(m, r.length), 0);
    if (at && (at.row > lastRow || at.col > lastCol)) {
      throw new UsageError(`fill: --at ${atText} is outside the used part of sheet "${ws.name}" (${lastRow && lastCol ? `A1:${a1({ row: lastRow, col: lastCol })}` : 'the sheet is empty'}): point it at the first cell of the template's header row`);
    }
    target = { kind: 'template', sheet: snapshot, headerAt: at };
  } else {
    ws = wb.addWorksheet(sheetName ?? DEFAULT_SHEET);
    target = { kind: 'new-sheet', sheetName: ws.name };
  }

  const planned = planFill({ table, rows: selection.rows, tier, z, mode, target, overwrite: o.flags.has('overwrite'), date, decimals, tableSha256, writtenDecimals: imported.decimals });
  if (!planned.ok) {
    for (const p of planned.problems) io.err(`${p.where ? p.where + ': ' : ''}${p.message}`);
    io.err('leeway fill: nothing was written');
    return 1;
  }
  const plan = planned.plan;
  if (!plan.writable) {
    io.err(`leeway fill: ${plan.conflicts.length} target cell${plan.conflicts.length === 1 ? '' : 's'} of sheet "${plan.sheetName}" already hold something:`);
    for (const line of formatConflicts(plan)) io.err(`  ${line}`);
    io.err('nothing was written; add --overwrite to replace these cells');
    return 1;
  }
  const bar = progressBar('filling');
  writePlan(ws, plan, (d, t) => bar.update(d, t));
  if (target.kind === 'new-sheet') planDocument(ws, plan, { paper }).finish();
  bar.done();
  await writeWorkbookAtomically(wb, out, force);
  io.out(summary(out, plan));
  if (plan.overwrite && plan.conflicts.length) io.out(`overwrote ${plan.conflicts.length} cell${plan.conflicts.length === 1 ? '' : 's'}: ${plan.conflicts.map((c) => c.address).join(', ')}`);
  return 0;
}

function summary(out: string, plan: FillPlan): string {
  const n = plan.rows.length;
  const what = plan.mode === 'live' ? 'live LEEWAY formulas' : 'values';
  return `wrote ${out}: sheet "${plan.sheetName}", ${n} analyte${n === 1 ? '' : 's'}, ${plan.cells.length} cells, ${what} at the ${plan.provenance.tier} tier, z ${plan.provenance.z}`;
}
