/**
 * Reading observed bias and CV from a worksheet (src/taskpane/sheetRows.ts) and picking analytes
 * (src/taskpane/analytes.ts).
 */
import { readActiveRow, readAllRows, findTierCell } from '../../src/taskpane/sheetRows';
import { planFill } from '../../src/engine/fill';
import type { ActiveSheet } from '../../src/taskpane/host';
import { filterRows, specimensOf, displayName, keyOf } from '../../src/taskpane/analytes';
import { demoTable } from '../../src/engine/demo';

const sheet = (activeRow: number): ActiveSheet => ({
  activeRow,
  grid: {
    sheet: 'Specs',
    address: 'Specs!B3:H9',
    firstRow: 3,
    firstColumn: 2,
    values: [
      ['Leeway — analytical performance specifications', '', '', '', '', '', ''],
      ['', '', '', '', '', '', ''],
      ['Analyte', 'Specimen', 'CVI %', 'CVG %', 'Allowable bias %', 'Bias %', 'CV %'],
      ['Arvelin', 'serum', 5.7, 6.9, 2.24, -1.2, '2,1'],
      ['Brontase', 'serum', 12.4, 18.1, 5.5, '', 3],
      ['', '', '', '', '', '', ''],
      ['Calpidine', 'plasma', 3.2, '', '', '0.4 %', 1.1],
    ],
  },
});

describe('reading observed figures from the sheet', () => {
  test('the active row is read under the nearest header above it; "Allowable bias %" is not the observed bias', () => {
    const r = readActiveRow(sheet(6));
    if (!r.ok) throw new Error(r.why);
    expect(r.value).toEqual({ row: 6, analyte: 'Arvelin', specimen: 'serum', cvi: 5.7, cvg: 6.9, bias: -1.2, cv: 2.1, biasCell: 'G6', cvCell: 'H6' });
    expect(r.columns.headerRow).toBe(5);
  });

  test('a blank observed cell reads as null; decimal commas and a trailing % are numbers', () => {
    const b = readActiveRow(sheet(7));
    if (!b.ok) throw new Error(b.why);
    expect(b.value.bias).toBeNull();
    const c = readActiveRow(sheet(9));
    if (!c.ok) throw new Error(c.why);
    expect(c.value).toMatchObject({ analyte: 'Calpidine', cvg: null, bias: 0.4, cv: 1.1 });
  });

  test('the header row itself, an empty row and a row above any header say why nothing was read', () => {
    expect(readActiveRow(sheet(5))).toEqual({ ok: false, why: expect.stringContaining('header row (5)') });
    expect(readActiveRow(sheet(8))).toEqual({ ok: false, why: 'row 8 has no analyte' });
    expect(readActiveRow(sheet(3))).toEqual({ ok: false, why: expect.stringContaining('no header row') });
  });

  test('every row under the header is read, skipping blank rows', () => {
    const all = readAllRows(sheet(6));
    if (!all.ok) throw new Error(all.why);
    expect(all.rows.map((r) => [r.analyte, r.bias, r.cv])).toEqual([
      ['Arvelin', -1.2, 2.1],
      ['Brontase', null, 3],
      ['Calpidine', 0.4, 1.1],
    ]);
  });
});

describe('picking analytes', () => {
  const rows = demoTable().rows;

  test('the search matches every word in analyte, specimen, unit or note, any case', () => {
    const first = rows[0];
    expect(filterRows(rows, { search: first.analyte.toUpperCase(), specimen: '*' }).map(keyOf)).toContain(keyOf(first));
    expect(filterRows(rows, { search: 'no-such-analyte-xyz', specimen: '*' })).toEqual([]);
    expect(filterRows(rows, { search: '', specimen: '*' })).toHaveLength(rows.length);
  });

  test('the specimen filter keeps only that specimen', () => {
    for (const sp of specimensOf(rows)) {
      const got = filterRows(rows, { search: '', specimen: sp });
      expect(got.length).toBeGreaterThan(0);
      expect(got.every((r) => r.specimen.toLowerCase() === sp.toLowerCase())).toBe(true);
    }
  });

  test('display names add the specimen in brackets', () => {
    expect(displayName({ analyte: 'A', specimen: 'serum' })).toBe('A (serum)');
    expect(displayName({ analyte: 'A', specimen: '' })).toBe('A');
  });
});

describe('findTierCell: the tier and z cells of a sheet Leeway filled, found by their labels', () => {
  /** A plan's cells laid on a grid from A1, as Excel's used range would give them back. */
  function gridOf(cells: readonly { row: number; col: number; content: { kind: string; text?: string; value?: number } }[]): ActiveSheet {
    const rows = Math.max(...cells.map((c) => c.row));
    const cols = Math.max(...cells.map((c) => c.col));
    const values: (string | number | null)[][] = Array.from({ length: rows }, () => Array.from({ length: cols }, () => ''));
    for (const c of cells) values[c.row - 1][c.col - 1] = c.content.kind === 'number' ? (c.content.value as number) : (c.content.text ?? '');
    return { activeRow: 1, grid: { sheet: 'S', address: 'S!A1', firstRow: 1, firstColumn: 1, values } };
  }
  const t = demoTable();

  test('on a new sheet the value is the next cell; below a template’s table it is further right, where the label ends', () => {
    const fresh = planFill({ table: t, tier: 'minimum', z: 1.65, mode: 'live', target: { kind: 'new-sheet', sheetName: 'S' }, date: '2026-02-03' });
    const template = planFill({
      table: t,
      rows: t.rows.slice(0, 1),
      tier: 'minimum',
      z: 1.65,
      mode: 'live',
      target: { kind: 'template', sheet: { name: 'S', origin: { row: 1, col: 1 }, cells: [['Analyte', 'CVI %'], [t.rows[0].analyte, null]] } },
      date: '2026-02-03',
    });
    for (const r of [fresh, template]) {
      if (!r.ok) throw new Error('plan failed');
      const found = findTierCell(gridOf(r.plan.cells as never));
      expect(found).toEqual({ tierCell: r.plan.tierCell, zCell: r.plan.zCell, tier: 'minimum' });
    }
    if (template.ok) expect(template.plan.tierCell).toMatch(/^\$D\$/);
  });
});
