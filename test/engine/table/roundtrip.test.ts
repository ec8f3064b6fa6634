/**
 * Export to CSV and import again gives the same table, for seeded random tables whose text holds
 * separators, quotes, line breaks and formula-looking text (seed 20260107).
 */
import { parseTableText, parseTableGrid, tableToCsv, acceptImport } from '../../../src/engine/table';
import type { VariationRow, VariationTable } from '../../../src/engine/table';
import { mulberry32 } from '../../support/prng';

const PIECES = ['Arvelin', 'serum', ',', ';', '\t', '"', '""', '\n', '=SUM(A1)', '+1', '-x', '@me', 'ü', 'µmol/L', ' ', "'"];

function randomText(rand: () => number, nonEmpty: boolean): string {
  const n = Math.floor(rand() * 4) + (nonEmpty ? 1 : 0);
  let s = '';
  for (let i = 0; i < n; i++) s += PIECES[Math.floor(rand() * PIECES.length)];
  s = s.trim();
  return nonEmpty && s === '' ? 'X' : s;
}

function randomTable(rand: () => number): VariationTable {
  const rows: VariationRow[] = [];
  const n = 1 + Math.floor(rand() * 12);
  for (let i = 0; i < n; i++) {
    const maybe = (): number | null => (rand() < 0.3 ? null : Math.round(rand() * 1e6) / 1e4);
    const level = maybe();
    rows.push({
      analyte: `${randomText(rand, true)} ${i}`,
      specimen: randomText(rand, false),
      unit: randomText(rand, false),
      cvi: Math.round(rand() * 5e5) / 1e4,
      cvg: maybe(),
      source: randomText(rand, true),
      limitAbs: level === null ? null : maybe(),
      limitPct: maybe(),
      level,
      note: randomText(rand, false),
      line: i + 2,
    });
  }
  return { name: 't', origin: 'o', importedAt: '2026-01-07T00:00:00.000Z', demo: false, rows };
}

describe('CSV export and import round-trip', () => {
  test('property: parse(export(table)) gives the same rows, for each separator and decimal mark', () => {
    const rand = mulberry32(20260107);
    for (let k = 0; k < 300; k++) {
      const t = randomTable(rand);
      const style = [{}, { delimiter: ';' as const, decimal: ',' as const }, { delimiter: '\t' as const }, { bom: true }][k % 4];
      const csv = tableToCsv(t, style);
      const r = parseTableText(csv, { name: 't', origin: 'o', importedAt: t.importedAt });
      expect(r.problems).toEqual([]);
      expect(acceptImport(r)).toEqual(t);
    }
  });

  test('formula-looking text is exported with an apostrophe, so a spreadsheet opening the CSV shows text', () => {
    const t = randomTable(mulberry32(1));
    const csv = tableToCsv({ ...t, rows: [{ ...t.rows[0], analyte: '=cmd', note: '@x' }] });
    expect(csv).toMatch(/^'=cmd|\n'=cmd|,'=cmd/m);
    expect(csv).toContain("'@x");
  });

  test('a decimal comma with a comma separator is refused', () => {
    expect(() => tableToCsv(randomTable(mulberry32(2)), { decimal: ',' })).toThrow(/separator/);
  });
});

describe('worksheet-range import', () => {
  test('numbers arrive as numbers; rows and columns are named as the sheet shows them', () => {
    const r = parseTableGrid(
      [
        ['Analyte', 'CVI', 'CVG', 'Source'],
        ['Arvelin', 5.7, 6.9, 'Invented for tests'],
        ['Brontase', -1, null, 'Invented for tests'],
      ],
      { firstRow: 4, firstColumn: 3 },
    );
    expect(r.problems.map((p) => [p.row, p.column, p.code])).toEqual([[6, 'D', 'negative']]);
  });

  test('a blank range is an error at its first cell', () => {
    const r = parseTableGrid([[null, ''], ['', undefined]], { firstRow: 2, firstColumn: 2 });
    expect(r.problems.map((p) => [p.row, p.column, p.code])).toEqual([[2, 'B', 'empty-file']]);
  });
});
