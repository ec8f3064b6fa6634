/**
 * The reads behind "Explain the active cell" against office-addin-mock: the active cell's formula
 * in one load and one sync, and all its input ranges in one batch (one sync, whatever their count).
 */
import { OfficeMockObject } from 'office-addin-mock';

jest.mock('office-addin-manifest', () => ({
  OfficeApp: { Excel: 'excel', OneNote: 'onenote', Outlook: 'outlook', PowerPoint: 'powerpoint', Project: 'project', Word: 'word' },
}));
import { readActiveCellOf, readRangesOf } from '../../src/taskpane/excel/read';
import { explain, parseLeewayCall, referencesOf, refKey } from '../../src/taskpane/explain';
import type { Grid } from '../../src/registry/types';

function workbook(cells: Record<string, unknown>) {
  let syncs = 0;
  const pending: OfficeMockObject[] = [];
  const sheetOf = (name: string) => ({
    getRange: (address: string) => {
      const r = new OfficeMockObject({ values: [[cells[`${name}!${address}`] ?? '']] });
      pending.push(r);
      return r;
    },
  });
  const active = new OfficeMockObject({ address: 'QC!D2', formulas: [['=LEEWAY.PERF.SIGMA(A2,B2,Limits!C1)']], values: [['#DIV/0!']], worksheet: { name: 'QC' } });
  const context = new OfficeMockObject({
    workbook: {
      getActiveCell: () => active,
      worksheets: { getActiveWorksheet: () => sheetOf('QC'), getItem: (n: string) => sheetOf(n) },
    },
    sync: async () => {
      syncs++;
      await active.sync();
      for (const r of pending) await r.sync();
    },
  }) as unknown as Excel.RequestContext;
  return { context, syncs: () => syncs };
}

test('the active cell and its inputs are read in one sync each, and the message is the registry’s', async () => {
  const wb = workbook({ 'QC!A2': 6.94, 'QC!B2': 1.2, 'Limits!C1': 0 });
  const cell = await readActiveCellOf(wb.context);
  expect(cell).toEqual({ sheet: 'QC', address: 'D2', formula: '=LEEWAY.PERF.SIGMA(A2,B2,Limits!C1)', value: '#DIV/0!' });
  expect(wb.syncs()).toBe(1);
  const call = parseLeewayCall(cell.formula)!;
  const refs = referencesOf(call);
  const grids = await readRangesOf(wb.context, refs);
  expect(wb.syncs()).toBe(2);
  const values = new Map<string, Grid>(refs.map((r, i) => [refKey(r.sheet, r.address), grids[i] as Grid]));
  expect(explain(call, values).message).toMatch(/^#DIV\/0! cv must not be zero/);
});
