/**
 * The real PaneHost (src/taskpane/excel/paneHost.ts) composes the Excel writer's SheetIO with the
 * pane's own reads and writers: the summary gets a sheet name not yet taken, the fill goes to the
 * SheetIO unchanged, and Excel's failures reach the user as a message, not an exception trace.
 */
import { OfficeMockObject } from 'office-addin-mock';

jest.mock('office-addin-manifest', () => ({
  OfficeApp: { Excel: 'excel', OneNote: 'onenote', Outlook: 'outlook', PowerPoint: 'powerpoint', Project: 'project', Word: 'word' },
}));
import { excelPaneHost } from '../../src/taskpane/excel/paneHost';
import type { ExcelRun, SheetIO } from '../../src/taskpane/excel';
import { FillWriteError } from '../../src/taskpane/excel';
import { HostError } from '../../src/taskpane/host';
import type { FillPlan } from '../../src/engine/fill';

function fakeIO(names: string[]): SheetIO & { written: FillPlan[] } {
  const written: FillPlan[] = [];
  return {
    written,
    readUsed: async (sheetName) => ({ name: sheetName, origin: { row: 2, col: 1 }, cells: [['Analyte']] }),
    readSelection: async () => ({ sheetName: 'Data', address: 'Data!B2:C3', origin: { row: 2, col: 2 }, values: [['analyte', 'cvi'], ['A', 1]] }),
    sheetNames: async () => names,
    write: async (plan) => {
      written.push(plan);
      return { sheetName: plan.sheetName, cellsWritten: plan.cells.length, overwritten: [] };
    },
  };
}

function mockRun(): { run: ExcelRun; added: string[]; syncs: () => number } {
  const added: string[] = [];
  let syncs = 0;
  const range = () => new OfficeMockObject({ values: [], numberFormat: [], format: { font: {}, columnWidth: 0 } });
  const sheet = { getRange: range, charts: { add: () => Object.assign(new OfficeMockObject({ title: { text: '' }, legend: { visible: true } }), { setPosition: () => undefined }) }, activate: () => undefined };
  const excel = new OfficeMockObject({
    context: {
      workbook: {
        worksheets: {
          add: (n: string) => {
            added.push(n);
            return sheet;
          },
          getActiveWorksheet: () => active,
        },
        getSelectedRange: () => sel,
      },
      sync: async () => {
        syncs++;
        await active.sync();
        await sel.sync();
      },
    },
  }) as unknown as { context: Excel.RequestContext };
  const active = new OfficeMockObject({ name: 'Template' });
  const sel = new OfficeMockObject({ address: 'Template!A2:D2', rowIndex: 1, columnIndex: 0, rowCount: 1, columnCount: 4 });
  return { run: async (batch) => batch(excel.context), added, syncs: () => syncs };
}

describe('the Excel PaneHost', () => {
  test('the summary sheet gets a name not yet taken; its writes stay one sync', async () => {
    const m = mockRun();
    const host = excelPaneHost(m.run, fakeIO(['Sheet1', 'Summary', 'summary (2)']));
    const out = await host.writeSummary({ sheetName: 'Summary', rows: [], header: ['x'] });
    expect(out.sheet).toBe('Summary (3)');
    expect(m.added).toEqual(['Summary (3)']);
    expect(m.syncs()).toBe(1);
  });

  test('the fill target is the active sheet’s used range and the selection', async () => {
    const m = mockRun();
    const host = excelPaneHost(m.run, fakeIO([]));
    const t = await host.readTarget();
    expect(t.snapshot).toEqual({ name: 'Template', origin: { row: 2, col: 1 }, cells: [['Analyte']], sheetNames: [] });
    expect(t.selection).toEqual({ row: 2, col: 1, rows: 1, cols: 4, address: 'Template!A2:D2' });
  });

  test('the selection for a table import keeps its sheet coordinates', async () => {
    const host = excelPaneHost(mockRun().run, fakeIO([]));
    expect(await host.readSelection()).toEqual({ sheet: 'Data', address: 'Data!B2:C3', firstRow: 2, firstColumn: 2, values: [['analyte', 'cvi'], ['A', 1]] });
  });

  test('a refused write keeps the writer’s message; any other Excel failure becomes a HostError naming Excel', async () => {
    const io = fakeIO([]);
    io.write = async () => {
      throw new FillWriteError('changed', 'cells changed since the fill was planned (B3): nothing was written; plan the fill again');
    };
    const host = excelPaneHost(mockRun().run, io);
    await expect(host.writeFill({} as FillPlan)).rejects.toThrow(/^cells changed since the fill was planned/);
    const failing: ExcelRun = async () => {
      throw Object.assign(new Error('The requested resource doesn\u2019t exist.'), { debugInfo: { errorLocation: 'Worksheet.getItem' } });
    };
    const host2 = excelPaneHost(failing, io);
    const err = await host2.setTierCell({ sheet: 'Gone', cell: 'B3', tier: 'optimum' }).catch((e) => e);
    expect(err).toBeInstanceOf(HostError);
    expect(err.message).toBe('Excel refused the request: The requested resource doesn\u2019t exist. (at Worksheet.getItem)');
  });
});

describe('header notes and the Excel version', () => {
  const g = globalThis as unknown as { Office?: unknown };
  afterEach(() => {
    delete g.Office;
  });

  test('notes are written only where ExcelApi 1.18 is supported; elsewhere the fill goes without them', async () => {
    const { supportedNotes } = await import('../../src/taskpane/excel/paneHost');
    expect(supportedNotes()).toBe('none'); // no Office at all
    g.Office = { context: { requirements: { isSetSupported: (set: string, v: string) => set === 'ExcelApi' && Number(v) <= 1.17 } } };
    expect(supportedNotes()).toBe('none');
    g.Office = { context: { requirements: { isSetSupported: (set: string, v: string) => set === 'ExcelApi' && Number(v) <= 1.18 } } };
    expect(supportedNotes()).toBe('notes');
  });
});
