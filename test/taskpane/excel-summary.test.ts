/**
 * The pane's own Excel writers and readers against office-addin-mock: the summary sheet (one row
 * per analyte, the chart of sigma by analyte created on the right range, a number of syncs that
 * does not grow with the analytes), the tier-cell writer, and the active-sheet reader.
 */
import { OfficeMockObject } from 'office-addin-mock';

// office-addin-mock reads only the OfficeApp names from office-addin-manifest, whose ESM
// dependencies jest cannot load: give it the names directly.
jest.mock('office-addin-manifest', () => ({
  OfficeApp: { Excel: 'excel', OneNote: 'onenote', Outlook: 'outlook', PowerPoint: 'powerpoint', Project: 'project', Word: 'word' },
}));
import { writeSummarySheet, cellValue } from '../../src/taskpane/excel/summary';
import { writeTierCell } from '../../src/taskpane/excel/tierCell';
import { readActiveSheetGrid, readActiveContext } from '../../src/taskpane/excel/read';
import { SUMMARY_HEADERS, summaryRow, summaryCells, summaryHeader } from '../../src/taskpane/summaryRows';
import type { VariationRow, VariationTable } from '../../src/engine/table';
import { CAUTION } from '../../src/engine/caution';

type Rec = Record<string, unknown>;

interface Mock {
  context: Excel.RequestContext;
  syncs(): number;
  ranges: Array<{ sheet: string; address: string; mock: Rec }>;
  charts: Array<{ sheet: string; type: string; address: string; by: string; mock: Rec }>;
  added: string[];
  activated: string[];
}

function mockWorkbook(): Mock {
  let syncs = 0;
  const ranges: Mock['ranges'] = [];
  const charts: Mock['charts'] = [];
  const added: string[] = [];
  const activated: string[] = [];
  const sheet = (name: string): Rec => ({
    name,
    getRange(address: string) {
      const mock = new OfficeMockObject({ values: [], numberFormat: [], format: { font: {}, columnWidth: 0 } }) as unknown as Rec;
      (mock as { address?: string }).address = address;
      ranges.push({ sheet: name, address, mock });
      return mock;
    },
    charts: {
      add(type: string, range: { address: string }, by: string) {
        const mock = new OfficeMockObject({ title: { text: '' }, legend: { visible: true } }) as unknown as Rec;
        (mock as { position?: string }).position = '';
        (mock as { setPosition?: (a: string) => void }).setPosition = (a: string) => {
          (mock as { position?: string }).position = a;
        };
        charts.push({ sheet: name, type, address: range.address, by, mock });
        return mock;
      },
    },
    activate: () => activated.push(name),
  });
  const data = {
    context: {
      workbook: {
        worksheets: {
          add: (name: string) => {
            added.push(name);
            return sheet(name);
          },
          getItem: (name: string) => sheet(name),
        },
      },
      sync: async () => {
        syncs++;
      },
    },
  };
  const excel = new OfficeMockObject(data) as unknown as { context: Excel.RequestContext };
  return { context: excel.context, syncs: () => syncs, ranges, charts, added, activated };
}

const row = (i: number, extra: Partial<VariationRow> = {}): VariationRow => ({
  analyte: `Analyte ${i}`,
  specimen: 'serum',
  unit: 'U/L',
  cvi: 3 + (i % 7),
  cvg: 6 + (i % 11),
  source: 'Invented for tests (2026-01)',
  limitAbs: null,
  limitPct: null,
  level: null,
  note: '',
  line: i + 2,
  ...extra,
});

const table = (rows: VariationRow[], demo = false): VariationTable => ({ name: 'tests.csv', origin: 'tests.csv', importedAt: '2026-01-05T00:00:00.000Z', demo, rows });

function request(n: number, withObserved = true) {
  const rows = Array.from({ length: n }, (_, i) => row(i));
  const summary = rows.map((r, i) => summaryRow(r, 'desirable', 1.65, withObserved && i % 3 !== 2 ? { bias: 0.5 + (i % 4) * 0.3, cv: 1 + (i % 5) * 0.25, from: 'typed' } : undefined));
  return { sheetName: 'Summary', rows: summary, header: summaryHeader(table(rows), 'desirable', 1.65, '2026-02-03') };
}

describe('summary sheet (office-addin-mock)', () => {
  test('writes one row per analyte under the header lines, in SUMMARY_HEADERS order', async () => {
    const m = mockWorkbook();
    const req = request(5);
    const out = await writeSummarySheet(m.context, req);
    expect(m.added).toEqual(['Summary']);
    const headerRow = req.header.length + 2;
    expect(out.tableAddress).toBe(`A${headerRow}:N${headerRow + 5}`);
    const table = m.ranges.find((r) => r.address === out.tableAddress)!;
    const values = table.mock.values as Array<Array<string | number>>;
    expect(values).toHaveLength(1 + 5);
    expect(values[0]).toEqual([...SUMMARY_HEADERS]);
    for (let i = 0; i < 5; i++) expect(values[i + 1]).toEqual(summaryCells(req.rows[i]).map(cellValue));
    expect(values[1][0]).toBe('Analyte 0 (serum)');
    // A rule such as 1-3s/2-2s/R-4s would be read by Excel as a date or a number: it goes in as text.
    expect(values[1][8]).toBe(`'${req.rows[0].rule}`);
    // The header lines carry the provenance and the caution.
    const top = m.ranges.find((r) => r.address === `A1:A${req.header.length}`)!;
    const lines = (top.mock.values as string[][]).map((l) => l[0]);
    expect(lines.some((l) => l.includes(CAUTION))).toBe(true);
    expect(lines.some((l) => l.includes('tests.csv') && l.includes('2026-01-05'))).toBe(true);
  });

  test('creates a clustered bar chart of sigma by analyte on the Analyte and Sigma columns', async () => {
    const m = mockWorkbook();
    const req = request(7);
    const out = await writeSummarySheet(m.context, req);
    const headerRow = req.header.length + 2;
    expect(m.charts).toHaveLength(1);
    const c = m.charts[0];
    expect(c).toMatchObject({ sheet: 'Summary', type: 'BarClustered', by: 'Columns', address: `A${headerRow}:B${headerRow + 7}` });
    expect(out.chartSeriesAddress).toBe(c.address);
    expect(SUMMARY_HEADERS.slice(0, 2)).toEqual(['Analyte', 'Sigma']);
    expect((c.mock.title as { text: string }).text).toBe('Sigma metric by analyte');
    expect((c.mock.legend as { visible: boolean }).visible).toBe(false);
    expect(m.activated).toEqual(['Summary']);
  });

  test('the number of syncs is the same for 10 and 1,000 analytes (one)', async () => {
    const counts: number[] = [];
    const rangeCounts: number[] = [];
    for (const n of [10, 1000]) {
      const m = mockWorkbook();
      await writeSummarySheet(m.context, request(n));
      counts.push(m.syncs());
      rangeCounts.push(m.ranges.length);
    }
    expect(counts).toEqual([1, 1]);
    // Ranges grow with the columns, not the rows.
    expect(rangeCounts[0]).toBe(rangeCounts[1]);
  });

  test('an analyte without observed data has a blank sigma (a gap in the chart, not a zero) and says why', async () => {
    const m = mockWorkbook();
    const req = request(3);
    const out = await writeSummarySheet(m.context, req);
    const values = m.ranges.find((r) => r.address === out.tableAddress)!.mock.values as Array<Array<string | number>>;
    expect(values[3][1]).toBe('');
    expect(values[3][2]).toBe('no observed data');
    expect(typeof values[1][1]).toBe('number');
  });

  test('an analyte name that looks like a formula is written as text (leading apostrophe)', async () => {
    const m = mockWorkbook();
    const r = row(1, { analyte: '=HYPERLINK("http://x","y")', specimen: '' });
    const req = { sheetName: 'Summary', rows: [summaryRow(r, 'desirable', 1.65, { bias: 1, cv: 2, from: 'typed' })], header: ['+not a formula'] };
    const out = await writeSummarySheet(m.context, req);
    const values = m.ranges.find((x) => x.address === out.tableAddress)!.mock.values as Array<Array<string | number>>;
    expect(values[1][0]).toBe('\'=HYPERLINK("http://x","y")');
    expect((m.ranges.find((x) => x.address === 'A1:A1')!.mock.values as string[][])[0][0]).toBe("'+not a formula");
  });
});

describe('tier cell writer (office-addin-mock)', () => {
  test('writes the tier word into the named sheet’s tier cell with one sync', async () => {
    const m = mockWorkbook();
    await writeTierCell(m.context, { sheet: 'Specifications', cell: '$B$3', tier: 'minimum' });
    expect(m.syncs()).toBe(1);
    expect(m.ranges).toHaveLength(1);
    expect(m.ranges[0]).toMatchObject({ sheet: 'Specifications', address: 'B3' });
    expect(m.ranges[0].mock.values).toEqual([['minimum']]);
  });

  test('refuses a word that is not a tier, before anything is written', async () => {
    const m = mockWorkbook();
    await expect(writeTierCell(m.context, { sheet: 'S', cell: 'B3', tier: 'best' })).rejects.toThrow(/optimum, desirable or minimum/);
    expect(m.syncs()).toBe(0);
  });
});

describe('active sheet reader (office-addin-mock)', () => {
  function readerMock(isNull: boolean) {
    let syncs = 0;
    const data = {
      context: {
        workbook: {
          worksheets: {
            getActiveWorksheet: () => sheetMock,
          },
          getActiveCell: () => activeMock,
          getSelectedRange: () => selMock,
        },
        sync: async () => {
          syncs++;
          for (const o of [sheetMock, usedMock, activeMock, selMock]) await (o as unknown as OfficeMockObject).sync();
        },
      },
    };
    const usedMock = new OfficeMockObject({ address: 'Specs!B20:F22', values: [['Analyte', 'CVI %', 'Bias %', 'CV %', 'x'], ['Arvelin', 5.7, 1.2, 2.1, ''], ['Brontase', 12.4, -0.5, 3, true]], rowIndex: 19, columnIndex: 1, isNullObject: isNull });
    const sheetMock = new OfficeMockObject({ name: 'Specs' }) as unknown as Rec;
    (sheetMock as { getUsedRangeOrNullObject?: () => unknown }).getUsedRangeOrNullObject = () => usedMock;
    const activeMock = new OfficeMockObject({ rowIndex: 21 });
    const selMock = new OfficeMockObject({ address: 'Specs!C5:D9', rowIndex: 4, columnIndex: 2, rowCount: 5, columnCount: 2 });
    const excel = new OfficeMockObject(data) as unknown as { context: Excel.RequestContext };
    return { context: excel.context, syncs: () => syncs };
  }

  test('reads the used range and the active row in one sync, with 1-based sheet coordinates', async () => {
    const m = readerMock(false);
    const s = await readActiveSheetGrid(m.context);
    expect(m.syncs()).toBe(1);
    expect(s.activeRow).toBe(22);
    expect(s.grid).toMatchObject({ sheet: 'Specs', address: 'Specs!B20:F22', firstRow: 20, firstColumn: 2 });
    expect(s.grid.values[1]).toEqual(['Arvelin', 5.7, 1.2, 2.1, '']);
  });

  test('an empty sheet reads as an empty grid', async () => {
    const m = readerMock(true);
    const s = await readActiveSheetGrid(m.context);
    expect(s.grid.values).toEqual([]);
    expect(s.grid.sheet).toBe('Specs');
  });

  test('reads the selection as 1-based row, column and size', async () => {
    const m = readerMock(false);
    const a = await readActiveContext(m.context);
    expect(a).toEqual({ sheet: 'Specs', selection: { row: 5, col: 3, rows: 5, cols: 2, address: 'Specs!C5:D9' } });
    expect(m.syncs()).toBe(1);
  });
});
