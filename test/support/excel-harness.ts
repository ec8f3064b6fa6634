/**
 * An Excel host for the writer's tests and the benchmark, built on office-addin-mock: a model of
 * each sheet (address → what the cell holds as Excel's `formulas` reports it), with counts of
 * context.sync() calls and range objects. Excel's rule that a null entry leaves a cell unchanged
 * is kept.
 */
import { OfficeMockObject } from 'office-addin-mock';
import type { ExcelRun } from '../../src/taskpane/excel';
import { parseA1, a1 } from '../../src/engine/fill';

/** A sheet model: address → what the cell holds as Excel's `formulas` reports it. */
export type Model = Map<string, string | number>;

export interface Harness {
  run: ExcelRun;
  syncs: () => number;
  ranges: () => number;
  sheets: Map<string, Model>;
  notes: Array<[string, string]>;
  formats: Map<string, string>;
  styles: Map<string, Record<string, unknown>>;
}

export function rangeCells(address: string): Array<{ row: number; col: number }> {
  const [from, to] = address.split(':');
  const a = parseA1(from)!;
  const b = to ? parseA1(to)! : a;
  const out = [];
  for (let r = a.row; r <= b.row; r++) for (let c = a.col; c <= b.col; c++) out.push({ row: r, col: c });
  return out;
}

export function harness(initial: Record<string, Model> = {}): Harness {
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

