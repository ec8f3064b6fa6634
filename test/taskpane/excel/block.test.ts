/**
 * The block writer against office-addin-mock: formulas, numbers and text where the areas say,
 * number formats and styles; nothing written when a covered cell holds something (the spill
 * room of a formula included) unless the user confirmed; then those cells replaced and listed.
 * Two syncs per write (read, then write) whatever the size of the block; columns widened to the
 * block's widths, never narrowed.
 */
jest.mock('office-addin-manifest', () => ({
  OfficeApp: { Excel: 'excel', OneNote: 'onenote', Outlook: 'outlook', PowerPoint: 'powerpoint', Project: 'project', Word: 'word' },
}));
import { OfficeMockObject } from 'office-addin-mock';
import { writeBlockTo, blockInput } from '../../../src/taskpane/excel/block';
import { excelPaneHost } from '../../../src/taskpane/excel/paneHost';
import { HostError, OccupiedError } from '../../../src/taskpane/host';
import type { BlockArea, BlockCell } from '../../../src/taskpane/host';
import type { ExcelRun, SheetIO } from '../../../src/taskpane/excel';
import { a1, parseA1 } from '../../../src/engine/fill';
import { rangeCells } from '../../support/excel-harness';

type Model = Map<string, string | number>;


/** A sheet model behind office-addin-mock: formulas, formats, styles and column widths by address. */
function mockExcel(initial: Record<string, string | number> = {}, widths: Record<number, number> = {}) {
  const model: Model = new Map(Object.entries(initial));
  const formats = new Map<string, string>();
  const styles = new Map<string, Record<string, unknown>>();
  const columnWidths = new Map<number, number>(Object.entries(widths).map(([k, v]) => [Number(k), v]));
  let syncs = 0;
  const pending: Array<{ mock: OfficeMockObject & Record<string, unknown>; address: string; loaded: unknown[][] }> = [];
  const sheet = {
    getRange(address: string) {
      const whole = /^([A-Z]+):\1$/.exec(address);
      const cells = whole ? [] : rangeCells(address);
      const rows = new Map<number, unknown[]>();
      for (const c of cells) {
        if (!rows.has(c.row)) rows.set(c.row, []);
        rows.get(c.row)!.push(model.get(a1(c)) ?? '');
      }
      const first = cells[0];
      const loaded = [...rows.values()];
      const mock = new OfficeMockObject({
        formulas: loaded,
        numberFormat: [],
        format: { font: {}, fill: {}, borders: { getItem: () => ({}) }, columnWidth: first ? columnWidths.get(first.col) ?? 48 : 48 },
      }) as OfficeMockObject & Record<string, unknown>;
      pending.push({ mock, address, loaded });
      return mock;
    },
  };
  const flush = (): void => {
    for (const p of pending.splice(0)) {
      const cells = /^([A-Z]+):\1$/.test(p.address) ? [] : rangeCells(p.address);
      const f = p.mock.formulas;
      if (Array.isArray(f) && f !== p.loaded) (f as unknown[][]).flat().forEach((v, i) => v !== null && (v === '' ? model.delete(a1(cells[i])) : model.set(a1(cells[i]), v as string | number)));
      const nf = p.mock.numberFormat as (string | null)[][];
      if (Array.isArray(nf) && nf.length) nf.flat().forEach((v, i) => v !== null && formats.set(a1(cells[i]), v));
      const fmt = p.mock.format as Record<string, Record<string, unknown> | number>;
      const font = fmt.font as Record<string, unknown>;
      const style: Record<string, unknown> = {};
      for (const k of ['bold', 'italic', 'size', 'color']) if (font[k] !== undefined) style[k] = font[k];
      if (Object.keys(style).length) cells.forEach((c) => styles.set(a1(c), style));
      const whole = /^([A-Z]+):\1$/.exec(p.address);
      if (whole) columnWidths.set(parseA1(`${whole[1]}1`)!.col, fmt.columnWidth as number);
    }
  };
  const excel = new OfficeMockObject({
    context: {
      workbook: { worksheets: { getItem: () => sheet } },
      application: { suspendApiCalculationUntilNextSync: () => undefined },
      sync: async () => {
        syncs++;
        for (const p of pending) await p.mock.sync();
        flush();
      },
    },
  }) as unknown as { context: Excel.RequestContext };
  const run: ExcelRun = async (batch) => {
    const out = await batch(excel.context);
    flush();
    return out;
  };
  return { run, context: excel.context, model, formats, styles, columnWidths, syncs: () => syncs };
}

const text = (t: string, style?: BlockCell['style']): BlockCell => ({ content: { kind: 'text', text: t }, ...(style ? { style } : {}) });
const formula = (f: string, format?: string): BlockCell => ({ content: { kind: 'formula', formula: f }, ...(format ? { format } : {}) });

function area(rows: number): BlockArea {
  const cells: (BlockCell | null)[][] = [[text('Leeway — test', 'title'), null], [text('Figure', 'header'), text('Value', 'header')]];
  for (let i = 0; i < rows; i++) cells.push([text(`Figure ${i + 1}`, 'label'), formula(`=INDEX(LEEWAY.DATA.PRECISION($B$2:$B$9,$A$2:$A$9),2,${(i % 9) + 1})`, '0.00')]);
  cells.push([text('=looks like a formula'), { content: { kind: 'number', value: 1.5 } }]);
  return { row: 2, col: 5, cells, widths: [26, 12] };
}

describe('the block writer (office-addin-mock)', () => {
  test('writes formulas, numbers and text where the area says, with formats and styles, in two syncs', async () => {
    const x = mockExcel();
    const a = area(3);
    const out = await writeBlockTo(x.context, { sheet: 'Data', areas: [a], overwrite: false });
    expect(out).toEqual({ sheet: 'Data', addresses: ['E2:F7'], cells: 11, overwritten: [] });
    expect(x.model.get('E2')).toBe('Leeway — test');
    expect(x.model.has('F2')).toBe(false); // a null entry writes nothing
    expect(x.model.get('F4')).toBe('=INDEX(LEEWAY.DATA.PRECISION($B$2:$B$9,$A$2:$A$9),2,1)');
    expect(x.formats.get('F4')).toBe('0.00');
    expect(x.model.get('E7')).toBe("'=looks like a formula"); // text stays text
    expect(x.model.get('F7')).toBe(1.5);
    expect(x.styles.get('E2')).toMatchObject({ bold: true, size: 14 });
    expect(x.styles.get('E3')).toMatchObject({ bold: true });
    expect(x.syncs()).toBe(2);
  });

  test('the number of syncs does not grow with the block', async () => {
    const x = mockExcel();
    await writeBlockTo(x.context, { sheet: 'Data', areas: [area(200)], overwrite: false });
    expect(x.syncs()).toBe(2);
  });

  test('refuses, writing nothing, when a covered cell holds something — a spill room included', async () => {
    const x = mockExcel({ F2: 'kept', E30: 7 });
    const spill: BlockArea = { row: 20, col: 5, cells: [[formula('=LEEWAY.QC.FLAGS($C$2:$C$12,100,2,"1-2s")')], ...Array.from({ length: 12 }, () => [null])] };
    const err = await writeBlockTo(x.context, { sheet: 'Data', areas: [area(3), spill], overwrite: false }).catch((e) => e);
    expect(err).toBeInstanceOf(OccupiedError);
    expect((err as OccupiedError).addresses).toEqual(['F2', 'E30']);
    expect((err as Error).message).toMatch(/^2 cells where the block goes already hold something \(F2, E30\): nothing was written/);
    expect([...x.model.keys()].sort()).toEqual(['E30', 'F2']);
    expect(x.syncs()).toBe(1);
  });

  test('with confirmation it replaces them and says which; the spill room is cleared', async () => {
    const x = mockExcel({ F2: 'kept', E30: 7 });
    const spill: BlockArea = { row: 20, col: 5, cells: [[formula('=LEEWAY.QC.FLAGS($C$2:$C$12,100,2,"1-2s")')], ...Array.from({ length: 12 }, () => [null])] };
    const out = await writeBlockTo(x.context, { sheet: 'Data', areas: [area(3), spill], overwrite: true });
    expect(out.overwritten).toEqual(['F2', 'E30']);
    expect(x.model.has('E30')).toBe(false);
    expect(x.model.has('F2')).toBe(false);
    expect(x.model.get('E20')).toBe('=LEEWAY.QC.FLAGS($C$2:$C$12,100,2,"1-2s")');
  });

  test('columns are widened to the block’s widths, never narrowed', async () => {
    const x = mockExcel({}, { 5: 40, 6: 200 });
    await writeBlockTo(x.context, { sheet: 'Data', areas: [area(2)], overwrite: false });
    expect(x.columnWidths.get(5)).toBeCloseTo(26 * 5.6);
    expect(x.columnWidths.get(6)).toBe(200);
  });

  test('a ragged or empty area is refused before anything is read', async () => {
    const x = mockExcel();
    await expect(writeBlockTo(x.context, { sheet: 'Data', areas: [{ row: 1, col: 1, cells: [[text('a')], [text('b'), text('c')]] }], overwrite: false })).rejects.toThrow(HostError);
    await expect(writeBlockTo(x.context, { sheet: 'Data', areas: [], overwrite: false })).rejects.toThrow(/nothing to write/);
    expect(x.syncs()).toBe(0);
  });

  test('through the PaneHost, a refusal reaches the user as the OccupiedError with its addresses', async () => {
    const x = mockExcel({ E2: 'x' });
    const host = excelPaneHost(x.run, {} as SheetIO);
    const err = await host.writeBlock({ sheet: 'Data', areas: [area(1)], overwrite: false }).catch((e) => e);
    expect(err).toBeInstanceOf(OccupiedError);
    expect(err.addresses).toEqual(['E2']);
  });

  test('text a spreadsheet would read as something else is sent with an apostrophe', () => {
    expect(blockInput(text('+5'))).toBe("'+5");
    expect(blockInput(text('Mean'))).toBe('Mean');
    expect(blockInput(formula('=A1'))).toBe('=A1');
  });
});
