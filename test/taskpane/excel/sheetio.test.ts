/**
 * The task pane's Excel writer against office-addin-mock: what is written where, nothing over
 * non-empty cells without confirmation, formula-looking text kept as text, and the number of
 * context.sync() calls the same for 10 and 1,000 rows (one batch per fill).
 */

// office-addin-mock reads only the OfficeApp names from office-addin-manifest, whose ESM
// dependencies jest cannot load: give it the names directly.
jest.mock('office-addin-manifest', () => ({
  OfficeApp: { Excel: 'excel', OneNote: 'onenote', Outlook: 'outlook', PowerPoint: 'powerpoint', Project: 'project', Word: 'word' },
}));
import { createSheetIO, excelInput, FillWriteError, READ_CELL_LIMIT } from '../../../src/taskpane/excel';
import { OfficeMockObject } from 'office-addin-mock';
import type { ExcelRun } from '../../../src/taskpane/excel';
import { harness } from '../../support/excel-harness';
import type { Model } from '../../support/excel-harness';
import { planFill } from '../../../src/engine/fill';
import type { FillPlan, FillRequest, SheetSnapshot } from '../../../src/engine/fill';
import type { VariationRow, VariationTable } from '../../../src/engine/table';

const row = (i: number, extra: Partial<VariationRow> = {}, note = ''): VariationRow => ({
  analyte: `Analyte ${i}`,
  specimen: 'serum',
  unit: 'U/L',
  cvi: 2 + (i % 17),
  cvg: 5 + (i % 23),
  source: 'Invented for tests (2026-01)',
  limitAbs: null,
  limitPct: null,
  level: null,
  note,
  line: i + 2,
  ...extra,
});

const table = (rows: VariationRow[]): VariationTable => ({ name: 'tests.csv', origin: 'tests.csv', importedAt: '2026-01-05T00:00:00.000Z', demo: false, rows });

function makePlan(rows: VariationRow[], target: FillRequest['target'] = { kind: 'new-sheet', sheetName: 'Specs' }, overwrite = false): FillPlan {
  const r = planFill({ table: table(rows), tier: 'desirable', z: 1.65, mode: 'live', target, date: '2026-02-03', overwrite });
  if (!r.ok) throw new Error(r.problems.map((p) => p.message).join('; '));
  return r.plan;
}

describe('Excel writer (office-addin-mock)', () => {
  test('writes every planned cell where the plan says: values, LEEWAY formulas, text, number formats, notes', async () => {
    const h = harness();
    const plan = makePlan([row(1), row(2)]);
    const report = await createSheetIO(h.run).write(plan);
    const sheet = h.sheets.get('Specs')!;
    expect(report.cellsWritten).toBe(plan.cells.length);
    for (const c of plan.cells) expect(sheet.get(c.address)).toEqual(excelInput(c.content));
    const te = plan.cells.find((c) => c.role === 'derived' && c.content.kind === 'formula' && c.content.formula.startsWith('=LEEWAY.SPEC.TOTAL'))!;
    expect(sheet.get(te.address)).toBe(`=LEEWAY.SPEC.TOTAL(D${te.row},E${te.row},IF(F${te.row}="",${plan.tierCell},F${te.row}),${plan.zCell})`);
    expect(h.formats.get(te.address)).toBe('0.00');
    expect(sheet.get(plan.tierCell.replace(/\$/g, ''))).toBe('desirable');
    expect(h.notes.map(([a]) => a)).toEqual(plan.cells.filter((c) => c.note).map((c) => c.address));
    expect(h.styles.get(`A${plan.headerRow}`)).toMatchObject({ bold: true });
  });

  test('text that starts with = + - @ is sent with an apostrophe, so Excel stores it as text', async () => {
    const h = harness();
    const plan = makePlan([row(1, { analyte: '=HYPERLINK("http://x","y")', specimen: '+1', unit: '-', note: '@SUM(A1)' })]);
    await createSheetIO(h.run).write(plan);
    const sheet = h.sheets.get('Specs')!;
    const r = plan.rows[0].row;
    expect(sheet.get(`A${r}`)).toBe('\'=HYPERLINK("http://x","y")');
    expect(sheet.get(`B${r}`)).toBe("'+1");
    expect(sheet.get(`C${r}`)).toBe("'-");
    expect([...sheet.values()]).toContain("'@SUM(A1)");
    // The provenance block's formula texts are text too.
    expect([...sheet.values()].filter((v) => typeof v === 'string' && v.startsWith('=LEEWAY')).length).toBe(plan.cells.filter((c) => c.content.kind === 'formula').length);
  });

  test('the number of syncs is the same for 10 and 1,000 rows (2), and so is the number of ranges per column', async () => {
    const counts: number[] = [];
    const ranges: number[] = [];
    for (const n of [10, 1000]) {
      const h = harness();
      // Some rows leave columns blank (limits on every 5th row, notes on every 7th): still one range per column.
      await createSheetIO(h.run).write(makePlan(Array.from({ length: n }, (_, i) => row(i, i % 5 === 0 ? { limitPct: 10, level: 50, limitAbs: 2 } : {}, i % 7 === 0 ? 'a note' : ''))));
      counts.push(h.syncs());
      ranges.push(h.ranges());
      expect(h.sheets.get('Specs')!.size).toBeGreaterThan(n * 10);
    }
    expect(counts).toEqual([2, 2]);
    expect(ranges[0]).toBe(ranges[1]);
  });

  describe('into a template', () => {
    const template = (): Model =>
      new Map<string, string | number>([
        ['A1', 'Analyte'],
        ['B1', 'CVI'],
        ['C1', 'CVG'],
        ['D1', 'Source'],
        ['E1', 'Allowable total error'],
        ['A2', 'Analyte 1'],
        ['E2', 'typed by hand'],
      ]);
    const snapshot = (m: Model): SheetSnapshot => ({
      name: 'T',
      origin: { row: 1, col: 1 },
      cells: [1, 2, 3].map((r) => ['A', 'B', 'C', 'D', 'E'].map((c) => m.get(`${c}${r}`) ?? null)),
    });

    // Behaviour changed: the planner leaves non-empty cells out of the plan (and lists them)
    // instead of making a plan the writer must refuse; the writer still refuses a plan marked not
    // writable, and sends nothing to Excel.
    test('a plan leaves the listed non-empty cells as they are; a plan marked not writable is refused and nothing is sent to Excel', async () => {
      const h = harness({ T: template() });
      const plan = makePlan([row(1), row(2)], { kind: 'template', sheet: snapshot(template()) });
      expect(plan.conflicts.map((c) => c.address)).toEqual(['E2']);
      await expect(createSheetIO(h.run).write({ ...plan, writable: false })).rejects.toThrow(FillWriteError);
      expect(h.syncs()).toBe(0);
      expect(h.sheets.get('T')!.get('E2')).toBe('typed by hand');
      expect(h.sheets.get('T')!.size).toBe(7);
      await createSheetIO(h.run).write(plan);
      expect(h.sheets.get('T')!.get('E2')).toBe('typed by hand');
      expect(h.sheets.get('T')!.get('B2')).toBe(3);
    });

    test('with overwrite confirmed, the listed cells are overwritten and reported', async () => {
      const h = harness({ T: template() });
      const plan = makePlan([row(1), row(2)], { kind: 'template', sheet: snapshot(template()) }, true);
      const report = await createSheetIO(h.run).write(plan);
      expect(report.overwritten).toEqual(['E2']);
      expect(h.sheets.get('T')!.get('E2')).toBe(`=LEEWAY.SPEC.TOTAL(B2,C2,${plan.tierCell},${plan.zCell})`);
      expect(h.sheets.get('T')!.get('A1')).toBe('Analyte');
    });

    test('a cell filled after planning stops the write before anything is written', async () => {
      const m = template();
      const plan = makePlan([row(1), row(2)], { kind: 'template', sheet: snapshot(m), append: true }, true);
      m.set('B3', 99);
      const h = harness({ T: m });
      await expect(createSheetIO(h.run).write(plan)).rejects.toThrow(/changed since the fill was planned \(B3\)/);
      expect(h.syncs()).toBe(1);
      expect(h.sheets.get('T')!.get('A3')).toBeUndefined();
    });

    test('readUsed gives the snapshot the planner reads (formulas as =…, blanks as null)', async () => {
      const m = template();
      m.set('C3', '=1+1');
      // office-addin-mock's range: its loaded properties become readable when it is synced.
      let made: OfficeMockObject | undefined;
      const run: ExcelRun = async (batch) => {
        const ctx = {
          workbook: {
            worksheets: {
              getItem: () => ({
                getUsedRangeOrNullObject: () =>
                  (made = new OfficeMockObject({ isNullObject: false, rowIndex: 0, columnIndex: 0, rowCount: 3, columnCount: 5, formulas: snapshot(m).cells.map((r) => r.map((v) => v ?? '')) })),
              }),
            },
          },
          sync: async () => {
            await made?.sync();
          },
        };
        return batch(ctx as unknown as Excel.RequestContext);
      };
      const snap = await createSheetIO(run).readUsed('T');
      expect(snap.origin).toEqual({ row: 1, col: 1 });
      expect(snap.cells[0]).toEqual(['Analyte', 'CVI', 'CVG', 'Source', 'Allowable total error']);
      expect(snap.cells[1][1]).toBeNull();
      expect(snap.cells[2][2]).toBe('=1+1');
    });

    test('a used range stretched by a far stray value is read from its first rows only; merged areas and column widths come with it', async () => {
      // The used range A1:ZZ200000 (702 columns): at most READ_CELL_LIMIT cells are loaded.
      let resized: [number, number] | undefined;
      const objects: OfficeMockObject[] = [];
      const mock = (o: Record<string, unknown>): OfficeMockObject => {
        const m = new OfficeMockObject(o as never);
        objects.push(m);
        return m;
      };
      const part = mock({ formulas: [['Analyte', 'CVI %']] });
      // office-addin-mock does not load collection paths (areas/items/…): a plain stand-in whose values are there already.
      const merged = { isNullObject: false, areas: { items: [{ rowIndex: 2, columnIndex: 1, rowCount: 1, columnCount: 2 }] }, load: () => undefined };
      Object.assign(part, { getMergedAreasOrNullObject: () => merged });
      const used = Object.assign(mock({ isNullObject: false, rowIndex: 0, columnIndex: 0, rowCount: 200000, columnCount: 702 }), {
        getResizedRange: (dr: number, dc: number) => {
          resized = [dr, dc];
          return part;
        },
      });
      const run: ExcelRun = async (batch) => {
        const ctx = {
          workbook: { worksheets: { getItem: () => ({ getUsedRangeOrNullObject: () => used, getCell: () => ({ format: mock({ columnWidth: 56 }) }) }) } },
          sync: async () => {
            for (const o of objects) await o.sync();
          },
        };
        return batch(ctx as unknown as Excel.RequestContext);
      };
      const snap = await createSheetIO(run, { layout: true }).readUsed('T');
      const rows = Math.floor(READ_CELL_LIMIT / 702);
      expect(resized).toEqual([rows - 200000, 0]);
      expect(snap.readThrough).toBe(rows);
      expect(snap.merges).toEqual([{ top: 3, left: 2, bottom: 3, right: 3 }]);
      // 56 points at 5.6 points a character (the pane's own conversion): 10 characters, for the first 64 columns.
      expect(Object.keys(snap.columnWidths!)).toHaveLength(64);
      expect(snap.columnWidths![1]).toBeCloseTo(10, 12);
    });
  });
});
