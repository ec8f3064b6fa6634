/**
 * The task pane's Excel writer against office-addin-mock: what is written where, nothing over
 * non-empty cells without confirmation, formula-looking text kept as text, and the number of
 * context.sync() calls the same for 10 and 1,000 rows (SPEC.md section 6: one batch per fill).
 */
import { OfficeMockObject } from 'office-addin-mock';

// office-addin-mock reads only the OfficeApp names from office-addin-manifest, whose ESM
// dependencies jest cannot load: give it the names directly.
jest.mock('office-addin-manifest', () => ({
  OfficeApp: { Excel: 'excel', OneNote: 'onenote', Outlook: 'outlook', PowerPoint: 'powerpoint', Project: 'project', Word: 'word' },
}));
import { createSheetIO, excelInput, FillWriteError } from '../../../src/taskpane/excel';
import type { ExcelRun } from '../../../src/taskpane/excel';
import { planFill, parseA1, a1 } from '../../../src/engine/fill';
import type { FillPlan, FillRequest, SheetSnapshot } from '../../../src/engine/fill';
import type { VariationRow, VariationTable } from '../../../src/engine/table';

/** A sheet model: address → what the cell holds as Excel's `formulas` reports it. */
type Model = Map<string, string | number>;

interface Harness {
  run: ExcelRun;
  syncs: () => number;
  ranges: () => number;
  sheets: Map<string, Model>;
  notes: Array<[string, string]>;
  formats: Map<string, string>;
  styles: Map<string, Record<string, unknown>>;
}

function rangeCells(address: string): Array<{ row: number; col: number }> {
  const [from, to] = address.split(':');
  const a = parseA1(from)!;
  const b = to ? parseA1(to)! : a;
  const out = [];
  for (let r = a.row; r <= b.row; r++) for (let c = a.col; c <= b.col; c++) out.push({ row: r, col: c });
  return out;
}

function harness(initial: Record<string, Model> = {}): Harness {
  const sheets = new Map<string, Model>(Object.entries(initial));
  const notes: Array<[string, string]> = [];
  const formats = new Map<string, string>();
  const styles = new Map<string, Record<string, unknown>>();
  let syncs = 0;
  let rangeCount = 0;
  const pending: Array<{ mock: OfficeMockObject & Record<string, unknown>; model: Model; address: string; loaded: unknown }> = [];

  const makeSheet = (name: string): Record<string, unknown> => {
    const model = sheets.get(name)!;
    return {
      name,
      getRange(address: string) {
        rangeCount++;
        const cells = address.includes(':') && /^[A-Z]+:[A-Z]+$/.test(address) ? [] : rangeCells(address);
        const rows = new Map<number, Array<string | number>>();
        for (const c of cells) {
          if (!rows.has(c.row)) rows.set(c.row, []);
          rows.get(c.row)!.push(model.get(a1(c)) ?? '');
        }
        const loaded = [...rows.values()];
        const mock = new OfficeMockObject({
          formulas: loaded,
          numberFormat: [],
          format: { font: {}, fill: {}, borders: { getItem: () => ({}) } },
          dataValidation: { clear: () => undefined },
        }) as OfficeMockObject & Record<string, unknown>;
        pending.push({ mock, model, address, loaded });
        return mock;
      },
      notes: { add: (address: string, text: string) => notes.push([address, text]) },
      activate: () => undefined,
    };
  };

  const flush = (): void => {
    for (const p of pending.splice(0)) {
      const written = p.mock.formulas;
      if (Array.isArray(written) && written !== p.loaded) {
        const cells = rangeCells(p.address);
        // Excel leaves a cell unchanged when its entry is null.
        (written as unknown[][]).flat().forEach((v, i) => v !== null && p.model.set(a1(cells[i]), v as string | number));
      }
      const nf = p.mock.numberFormat;
      if (Array.isArray(nf) && nf.length) rangeCells(p.address).forEach((c, i) => (nf as (string | null)[][]).flat()[i] !== null && formats.set(a1(c), (nf as string[][]).flat()[i]));
      const font = (p.mock.format as Record<string, Record<string, unknown>>).font;
      const fill = (p.mock.format as Record<string, Record<string, unknown>>).fill;
      const style: Record<string, unknown> = {};
      for (const k of ['bold', 'italic', 'size', 'color']) if (font[k] !== undefined) style[k] = font[k];
      if (fill.color !== undefined) style.fill = fill.color;
      if (Object.keys(style).length) rangeCells(p.address).forEach((c) => styles.set(a1(c), style));
    }
  };

  const mockData = {
    context: {
      workbook: {
        worksheets: {
          getItem: (name: string) => {
            if (!sheets.has(name)) throw new Error(`no sheet ${name}`);
            return makeSheet(name);
          },
          add: (name: string) => {
            if (sheets.has(name)) throw new Error(`sheet ${name} exists`);
            sheets.set(name, new Map());
            return makeSheet(name);
          },
        },
        comments: { add: () => undefined },
      },
      application: { suspendApiCalculationUntilNextSync: () => undefined },
      sync: async function () {
        syncs++;
        for (const p of pending) await p.mock.sync();
        flush();
      },
    },
  };
  const excel = new OfficeMockObject(mockData) as unknown as { context: Excel.RequestContext };
  const run: ExcelRun = async (batch) => {
    const out = await batch(excel.context);
    flush();
    return out;
  };
  return { run, syncs: () => syncs, ranges: () => rangeCount, sheets, notes, formats, styles };
}

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

    test('refuses a plan with unconfirmed conflicts and sends nothing to Excel', async () => {
      const h = harness({ T: template() });
      const plan = makePlan([row(1), row(2)], { kind: 'template', sheet: snapshot(template()) });
      expect(plan.conflicts.map((c) => c.address)).toEqual(['E2']);
      await expect(createSheetIO(h.run).write(plan)).rejects.toThrow(FillWriteError);
      expect(h.syncs()).toBe(0);
      expect(h.sheets.get('T')!.get('E2')).toBe('typed by hand');
      expect(h.sheets.get('T')!.size).toBe(7);
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
      const plan = makePlan([row(1), row(2)], { kind: 'template', sheet: snapshot(m) }, true);
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
                  (made = new OfficeMockObject({ isNullObject: false, rowIndex: 0, columnIndex: 0, formulas: snapshot(m).cells.map((r) => r.map((v) => v ?? '')) })),
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
  });
});
