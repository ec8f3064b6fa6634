/**
 * The real PaneHost: the SheetIO (sheetio.ts) for the fill's reads and writes
 * and the table import, the pane's own reads (read.ts), the tier-cell writer and the summary
 * writer. Each method is one Excel.run.
 */
import type { PaneHost } from '../host';
import { HostError } from '../host';
import type { ExcelRun, SheetIO } from './sheetio';
import { createSheetIO, FillWriteError } from './sheetio';
import { readActiveCellOf, readActiveContext, readActiveSheetGrid, readRangesOf } from './read';
import { writeTierCell } from './tierCell';
import { writeSummarySheet } from './summary';
import { writeBlockTo } from './block';
import { uniqueSheetName } from '../../engine/fill';

function userMessage(e: unknown): Error {
  if (e instanceof FillWriteError || e instanceof HostError) return e;
  const err = e as { code?: string; message?: string; debugInfo?: { errorLocation?: string } };
  const where = err?.debugInfo?.errorLocation ? ` (at ${err.debugInfo.errorLocation})` : '';
  return new HostError(`Excel refused the request: ${err?.message ?? String(e)}${where}`);
}

async function guarded<T>(f: () => Promise<T>): Promise<T> {
  try {
    return await f();
  } catch (e) {
    throw userMessage(e);
  }
}

/**
 * Worksheet notes (the fill's header notes) need ExcelApi 1.18; on an older Excel the fill goes
 * without them rather than failing — in a live fill the formulas are in the cells anyway.
 */
export function supportedNotes(): 'notes' | 'none' {
  try {
    return typeof Office !== 'undefined' && Office.context?.requirements?.isSetSupported('ExcelApi', '1.18') ? 'notes' : 'none';
  } catch {
    return 'none';
  }
}

/** Merged areas (read so a fill never writes through a merge) need ExcelApi 1.13. */
export function supportedLayout(): boolean {
  try {
    return typeof Office !== 'undefined' && Office.context?.requirements?.isSetSupported('ExcelApi', '1.13') === true;
  } catch {
    return false;
  }
}

export function excelPaneHost(run: ExcelRun = (batch) => Excel.run(batch), io: SheetIO = createSheetIO(run, { notes: supportedNotes(), layout: supportedLayout() })): PaneHost {
  return {
    label: 'Excel',
    available: true,
    readSelection: () =>
      guarded(async () => {
        const r = await io.readSelection();
        return { sheet: r.sheetName, address: r.address, firstRow: r.origin.row, firstColumn: r.origin.col, values: r.values };
      }),
    readActiveSheet: () => guarded(() => run((c) => readActiveSheetGrid(c))),
    readActiveCell: () => guarded(() => run((c) => readActiveCellOf(c))),
    readRanges: (refs) => guarded(() => run((c) => readRangesOf(c, refs))),
    sheetNames: () => guarded(() => io.sheetNames()),
    readTarget: () =>
      guarded(async () => {
        const active = await run((c) => readActiveContext(c));
        const snapshot = await io.readUsed(active.sheet);
        const sheetNames = await io.sheetNames();
        return { snapshot: { ...snapshot, sheetNames }, selection: active.selection };
      }),
    writeFill: (plan) =>
      guarded(async () => {
        const r = await io.write(plan);
        return { sheet: r.sheetName, cells: r.cellsWritten };
      }),
    setTierCell: (w) => guarded(() => run((c) => writeTierCell(c, w))),
    writeSummary: (req) =>
      guarded(async () => {
        const sheetName = uniqueSheetName(req.sheetName, await io.sheetNames());
        return run((c) => writeSummarySheet(c, { ...req, sheetName }));
      }),
    writeBlock: (req) => guarded(() => run((c) => writeBlockTo(c, req))),
  };
}
