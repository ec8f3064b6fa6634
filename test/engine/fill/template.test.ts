/**
 * The fill planner on a lab's template: the header scan, matching by analyte and specimen, the
 * default of leaving non-empty cells as they are, appending, merged cells, where the provenance
 * goes, and a far stray cell. Expected values of derived cells come from the registry's
 * evaluate() (the function the worksheet runs); layout rules are the project's own (see
 * docs/reference/templates.md), checked cell by cell. The default column width of 8.43
 * characters is common practice, no source.
 */
import { planFill, findHeaderRow, formatTemplateReport, PROVENANCE_SHEET, CAUTION, NO_FINGERPRINT } from '../../../src/engine/fill';
import type { FillPlan, FillRequest, SheetCell, SheetSnapshot, TemplateTarget } from '../../../src/engine/fill';
import type { VariationRow, VariationTable } from '../../../src/engine/table';
import { rowKey } from '../../../src/engine/table/parse';
import { evaluate } from '../../../src/registry';
import { mulberry32 } from '../../support/prng';

const row = (analyte: string, specimen: string, cvi: number, cvg: number | null, extra: Partial<VariationRow> = {}): VariationRow => ({
  analyte,
  specimen,
  unit: 'mmol/L',
  cvi,
  cvg,
  source: 'Invented for tests (2026-01)',
  limitAbs: null,
  limitPct: null,
  level: null,
  note: '',
  line: 2,
  ...extra,
});

const table = (rows: VariationRow[]): VariationTable => ({ name: 'lab.csv', origin: '/data/lab.csv', importedAt: '2026-01-05T10:00:00.000Z', demo: false, rows });

/** A sparse sheet from "A1"-keyed values. */
function sheet(values: Record<string, string | number>, extra: Partial<SheetSnapshot> = {}): SheetSnapshot {
  const sparse: SheetCell[] = Object.entries(values).map(([addr, value]) => {
    const m = /^([A-Z]+)(\d+)$/.exec(addr)!;
    let col = 0;
    for (const ch of m[1]) col = col * 26 + ch.charCodeAt(0) - 64;
    return { row: Number(m[2]), col, value };
  });
  return { name: 'Verification', origin: { row: 1, col: 1 }, cells: [], sparse, ...extra };
}

function plan(rows: VariationRow[], target: Omit<TemplateTarget, 'kind'>, extra: Partial<FillRequest> = {}): FillPlan {
  const r = planFill({ table: table(rows), tier: 'desirable', z: 1.65, mode: 'values', target: { kind: 'template', ...target }, date: '2026-02-03', ...extra });
  if (!r.ok) throw new Error(r.problems.map((p) => p.message).join('; '));
  return r.plan;
}

const cell = (p: FillPlan, address: string) => p.cells.find((c) => c.address === address);
const value = (p: FillPlan, address: string): unknown => {
  const c = cell(p, address);
  if (!c) return undefined;
  return c.content.kind === 'number' ? c.content.value : c.content.kind === 'text' ? c.content.text : c.content.kind === 'formula' ? c.content.formula : c.content.error.error;
};
const total = (cvi: number, cvg: number, tier = 'desirable', z = 1.65): number => evaluate('SPEC.TOTAL', [cvi, cvg, tier, z])[0][0] as number;

/** The lab's sheet: a merged title, the lab's name, a reviewer line, the header at row 6, three analytes, a blank row, a footnote. */
const LAB = (): SheetSnapshot =>
  sheet(
    {
      A1: 'Method verification — chemistry',
      A2: 'Invented laboratory (DEMO)',
      A4: 'Prepared by:',
      B4: 'Analyte list reviewed',
      A6: 'Analyte',
      B6: 'Specimen',
      C6: 'CVI %',
      D6: 'CVG %',
      E6: 'Allowable total error %',
      F6: 'Lab limit %',
      A7: 'Sodium',
      B7: 'Serum',
      A8: 'Potassium',
      B8: 'Serum',
      E8: 5,
      A9: 'Glucose',
      B9: 'Urine',
      A11: '* Lab limit from the national regulation',
    },
    { merges: [{ top: 1, left: 1, bottom: 1, right: 6 }, { top: 11, left: 1, bottom: 11, right: 6 }] },
  );

const TABLE_ROWS = [row('Sodium', 'Serum', 0.5, 0.7), row('Potassium', 'serum', 4.6, 5.6), row('Glucose', '', 5.0, 7.0), row('Calcium', 'Serum', 1.8, 2.2)];

describe('header scan', () => {
  test('finds the header below a merged title, the lab name and a reviewer line (row 6), not the first filled row', () => {
    const h = findHeaderRow(LAB());
    expect(h?.at).toEqual({ row: 6, col: 1 });
    expect(h?.columns.map((c) => c.field)).toEqual(['analyte', 'specimen', 'cvi', 'cvg', 'spec_total']);
  });

  test('a merged title that reads "Analyte" and "CVI" is not a header; a row naming more fill columns wins over one naming fewer', () => {
    const s = sheet({ A1: 'Analyte', B1: 'CVI', A3: 'Analyte', B3: 'CVI %', C3: 'CVG %' }, { merges: [{ top: 1, left: 1, bottom: 1, right: 1 }, { top: 1, left: 1, bottom: 1, right: 2 }] });
    expect(findHeaderRow(s)?.at.row).toBe(3);
    const t = sheet({ A1: 'Analyte', B1: 'CVI', A3: 'Analyte', B3: 'CVI %' });
    expect(findHeaderRow(t)?.at.row).toBe(1); // a tie goes to the upper row
  });

  test('only the first 30 rows that hold anything are read', () => {
    const values: Record<string, string> = {};
    for (let r = 1; r <= 30; r++) values[`A${r}`] = `line ${r}`;
    values.A31 = 'Analyte';
    values.B31 = 'CVI %';
    expect(findHeaderRow(sheet(values))).toBeUndefined();
  });

  test('no header: the problem says so, with a code each front end turns into its own way of pointing at it', () => {
    const r = planFill({ table: table(TABLE_ROWS), tier: 'desirable', z: 1.65, mode: 'values', target: { kind: 'template', sheet: sheet({ A1: 'Title', A2: 'Name', B2: 'Value' }) }, date: '2026-02-03' });
    if (r.ok) throw new Error('expected the request to be refused');
    expect(r.problems[0].code).toBe('no-header');
    expect(r.problems[0].message).toMatch(/^no header row found in the first 30 rows of sheet "Verification"/);
  });
});

describe('matching rows by analyte and specimen', () => {
  const p = plan(TABLE_ROWS, { sheet: LAB() });

  test('analyte and specimen both match (case and spaces ignored); the analyte and specimen cells are left as the lab wrote them', () => {
    expect(p.rows.map((r) => [r.analyte, r.specimen, r.row])).toEqual([
      ['Sodium', 'Serum', 7],
      ['Potassium', 'serum', 8],
    ]);
    expect(cell(p, 'A7')).toBeUndefined();
    expect(cell(p, 'B8')).toBeUndefined();
    expect(value(p, 'C7')).toBe(0.5);
    expect(value(p, 'D8')).toBe(5.6);
  });

  test('a table row without a specimen does not fill the template’s "Glucose | Urine" row; both are reported', () => {
    expect(cell(p, 'C9')).toBeUndefined();
    expect(p.template.missingFromTable).toEqual([{ row: 9, analyte: 'Glucose', specimen: 'Urine' }]);
    expect(p.template.notInTemplate).toEqual([
      { analyte: 'Glucose', specimen: '' },
      { analyte: 'Calcium', specimen: 'Serum' },
    ]);
  });

  test('the footnote row ends the table; nothing is written into it or after it', () => {
    expect(p.template.tableRange).toBe('A6:F9');
    expect(p.cells.some((c) => c.row >= 10)).toBe(false);
  });

  test('without a specimen column an analyte the table lists for several specimens is ambiguous: reported, its row left blank', () => {
    const s = sheet({ A1: 'Analyte', B1: 'CVI %', A2: 'Glucose', A3: 'Sodium' });
    const q = plan([row('Glucose', 'serum', 5, 7), row('Glucose', 'urine', 9, 11), row('Sodium', 'serum', 0.5, 0.7)], { sheet: s });
    expect(q.template.ambiguous).toEqual([{ row: 2, analyte: 'Glucose', specimens: ['serum', 'urine'] }]);
    expect(cell(q, 'B2')).toBeUndefined();
    expect(value(q, 'B3')).toBe(0.5);
    // Ambiguous analytes are not also listed as missing from the template.
    expect(q.template.notInTemplate).toEqual([]);
    // Picking one specimen resolves it.
    const one = plan([row('Glucose', 'serum', 5, 7)], { sheet: s });
    expect(value(one, 'B2')).toBe(5);
  });
});

describe('non-empty target cells', () => {
  test('by default a hand-entered value is kept and listed with what Leeway would write; the derived cells of its row read it', () => {
    const s = LAB();
    const p = plan(TABLE_ROWS, { sheet: s });
    // E8 holds the lab's own 5 under "Allowable total error %".
    expect(p.conflicts).toEqual([{ address: 'E8', row: 8, col: 5, existing: 5, planned: String(total(4.6, 5.6)) }]);
    expect(cell(p, 'E8')).toBeUndefined();
    expect(value(p, 'E7')).toBe(total(0.5, 0.7));
    const report = formatTemplateReport(p, { overwrite: 'add --overwrite to replace them', append: 'add --append', pick: 'pick one' });
    expect(report[0]).toBe('left 1 non-empty target cell as it was (add --overwrite to replace them):');
    expect(report[1]).toBe(`  E8 holds 5; Leeway would write "${total(4.6, 5.6)}"`);
  });

  test('an input kept as the lab wrote it feeds the derived values of its row, and the report says so', () => {
    const s = sheet({ A1: 'Analyte', B1: 'CVI %', C1: 'CVG %', D1: 'Allowable total error %', A2: 'Sodium', B2: 0.6 });
    const p = plan([row('Sodium', 'serum', 0.5, 0.7)], { sheet: s });
    expect(p.conflicts.map((c) => c.address)).toEqual(['B2']);
    expect(value(p, 'D2')).toBe(total(0.6, 0.7));
    expect(p.template.notes.join('\n')).toMatch(/Sodium \(serum\) \(row 2\): the derived columns use the sheet's own CVI % 0.6 \(the table has 0.5\)/);
  });

  test('an input that holds text leaves the derived cells it feeds empty (values) or without a stored result (live), and says which', () => {
    const s = sheet({ A1: 'Analyte', B1: 'CVI %', C1: 'CVG %', D1: 'Allowable CV %', E1: 'Allowable bias %', A2: 'Sodium', C2: 'n/a' });
    const v = plan([row('Sodium', 'serum', 0.5, 0.7)], { sheet: s });
    expect(value(v, 'D2')).toBe(evaluate('SPEC.CV', [0.5, 'desirable'])[0][0]);
    expect(cell(v, 'E2')).toBeUndefined();
    expect(v.template.notes.join('\n')).toMatch(/E2 was left empty: it would read a cell that holds no number \(C2\)/);
    const l = plan([row('Sodium', 'serum', 0.5, 0.7)], { sheet: s }, { mode: 'live' });
    expect(cell(l, 'E2')!.content).toMatchObject({ kind: 'formula', result: '' });
  });

  test('with overwrite the listed cells are replaced and the derived values use the table’s inputs', () => {
    const p = plan(TABLE_ROWS, { sheet: LAB() }, { overwrite: true });
    expect(value(p, 'E8')).toBe(total(4.6, 5.6));
    expect(p.conflicts.map((c) => c.address)).toEqual(['E8']);
  });
});

describe('merged cells', () => {
  // B3:C3 (CVI and CVG of Sodium) and A5:D5 merged, both empty.
  const s = sheet(
    { A1: 'Analyte', B1: 'CVI %', C1: 'CVG %', D1: 'Allowable total error %', A2: 'Potassium', A3: 'Sodium', A4: 'Chloride' },
    { merges: [{ top: 3, left: 2, bottom: 3, right: 3 }, { top: 5, left: 1, bottom: 5, right: 4 }] },
  );
  const rows = [row('Potassium', '', 4.6, 5.6), row('Sodium', '', 0.5, 0.7), row('Chloride', '', 1.1, 1.4), row('Calcium', '', 1.8, 2.2)];

  test('never writes through a merge, even with overwrite: merged targets are listed with the range', () => {
    for (const overwrite of [false, true]) {
      const p = plan(rows, { sheet: s }, { overwrite });
      expect(p.blocked.map((b) => [b.address, b.reason])).toEqual([
        ['B3', 'merged B3:C3'],
        ['C3', 'merged B3:C3'],
      ]);
      expect(p.cells.some((c) => c.row === 3 && (c.col === 2 || c.col === 3))).toBe(false);
      // The derived cell of the row reads the empty merge: #N/A, as the worksheet function gives for a blank cvi.
      expect(cell(p, 'D3')!.content).toMatchObject({ kind: 'error', error: { error: '#N/A' } });
      expect(value(p, 'B2')).toBe(4.6);
      expect(value(p, 'C4')).toBe(1.4);
    }
  });

  test('an analyte the template lacks is not appended into a merged band; with append the report says there is no room', () => {
    const p = plan(rows, { sheet: s, append: true });
    expect(p.template.noRoom).toEqual([{ analyte: 'Calcium', specimen: '' }]);
    expect(p.template.noRoomReason).toMatch(/^row 5 holds other content directly below the table;/);
    expect(p.cells.some((c) => c.row === 5)).toBe(false);
  });
});

describe('appending', () => {
  const rows = [row('Sodium', '', 0.5, 0.7), row('Calcium', '', 1.8, 2.2), row('Magnesium', '', 3.1, 10.5)];
  const base = { A1: 'Analyte', B1: 'CVI %', C1: 'CVG %', A2: 'Sodium' };

  test('without append nothing is added; the table’s other analytes are reported by name', () => {
    const p = plan(rows, { sheet: sheet(base) });
    expect(p.rows.map((r) => r.analyte)).toEqual(['Sodium']);
    expect(p.template.notInTemplate.map((n) => n.analyte)).toEqual(['Calcium', 'Magnesium']);
    expect(p.template.appended).toEqual([]);
  });

  test('with append, into the empty rows directly below the table’s last data row', () => {
    const p = plan(rows, { sheet: sheet(base), append: true });
    expect(p.template.appended.map((r) => [r.analyte, r.row])).toEqual([
      ['Calcium', 3],
      ['Magnesium', 4],
    ]);
    expect(value(p, 'A3')).toBe('Calcium');
    expect(value(p, 'C4')).toBe(10.5);
  });

  test('a footnote directly below the table leaves no room; two empty rows above a footnote take one analyte and keep one empty row', () => {
    const tight = plan(rows, { sheet: sheet({ ...base, A3: 'Note: limits are local' }), append: true });
    expect(tight.template.appended).toEqual([]);
    expect(tight.template.noRoom.map((n) => n.analyte)).toEqual(['Calcium', 'Magnesium']);
    expect(tight.template.noRoomReason).toMatch(/^row 3 holds other content directly below the table;/);
    const two = plan(rows, { sheet: sheet({ ...base, A5: '* limits are local' }), append: true });
    expect(two.template.appended.map((r) => [r.analyte, r.row])).toEqual([['Calcium', 3]]);
    expect(two.template.noRoom.map((n) => n.analyte)).toEqual(['Magnesium']);
    expect(two.cells.some((c) => c.row === 4 || c.row === 5)).toBe(false);
  });

  test('an analyte listed further down, below a blank row, is named in the report and not filled', () => {
    const p = plan(rows, { sheet: sheet({ ...base, A8: 'Calcium' }) });
    expect(p.template.belowTable).toEqual([{ row: 8, analyte: 'Calcium', specimen: '' }]);
    expect(cell(p, 'B8')).toBeUndefined();
  });
});

describe('where the provenance goes', () => {
  test('below the table when the rows there are empty: one text per row in the first column, wrapped to the table’s width, the caution whole', () => {
    const p = plan([row('Sodium', '', 0.5, 0.7)], { sheet: sheet({ A1: 'Analyte', B1: 'CVI %', C1: 'CVG %', A2: 'Sodium' }) }, { tableSha256: 'ab'.repeat(32) });
    expect(p.blockSheet).toBeUndefined();
    const block = p.cells.filter((c) => c.row >= 4);
    expect(block[0]).toMatchObject({ address: 'A4', role: 'title' });
    const texts = block.filter((c) => c.col === 1 && c.content.kind === 'text').map((c) => (c.content.kind === 'text' ? c.content.text : ''));
    // Three default columns: 25.29 characters, so lines of at most 24.
    for (const t of texts) expect(t.length).toBeLessThanOrEqual(24);
    const joined = texts.join(' ');
    expect(joined.replace(/\s+/g, ' ')).toContain(`Caution: ${CAUTION}`);
    expect(texts.join('')).toContain('ab'.repeat(32));
    expect(joined).toContain('Table rows: 1');
    expect(joined).toContain('Table source: /data/lab.csv');
    // The tier and z values sit right of their labels, clear of them (D: 3 × 8.43 ≥ 20 characters).
    expect(p.tierCell).toMatch(/^\$D\$\d+$/);
    expect(value(p, p.tierCell.replace(/\$/g, ''))).toBe('desirable');
    expect(value(p, p.zCell.replace(/\$/g, ''))).toBe(1.65);
  });

  test('wider columns of the sheet give longer lines and move the values left', () => {
    const p = plan([row('Sodium', '', 0.5, 0.7)], { sheet: sheet({ A1: 'Analyte', B1: 'CVI %', C1: 'CVG %', A2: 'Sodium' }, { columnWidths: { 1: 30, 2: 10, 3: 10 } }) });
    expect(p.tierCell).toMatch(/^\$B\$/);
    const longest = Math.max(...p.cells.filter((c) => c.role === 'caution').map((c) => (c.content.kind === 'text' ? c.content.text.length : 0)));
    expect(longest).toBeGreaterThan(40);
    expect(longest).toBeLessThanOrEqual(49);
  });

  test('on a sheet of its own when the rows below the table are not empty; formulas read its tier and z cells; it names the sheet and range it documents', () => {
    const s = sheet({ A1: 'Analyte', B1: 'CVI %', C1: 'CVG %', D1: 'Allowable CV %', A2: 'Sodium', A6: 'Reviewed by:' }, { sheetNames: ['Verification', 'Leeway provenance'] });
    const p = plan([row('Sodium', '', 0.5, 0.7)], { sheet: s }, { mode: 'live' });
    expect(p.blockSheet?.name).toBe(`${PROVENANCE_SHEET} (2)`);
    // Title, the lines that say what it documents (wrapped to the value column), then the tier cell.
    const lines = p.blockSheet!.cells.filter((c) => c.col === 2 && c.row < 5).map((c) => (c.content.kind === 'text' ? c.content.text : ''));
    expect(lines.join(' ')).toBe('sheet "Verification", A1:D2 (header row 1): its formulas read the tier and z cells below');
    expect(p.tierCell).toBe("'Leeway provenance (2)'!$B$5");
    expect(cell(p, 'D2')!.content).toMatchObject({ kind: 'formula', formula: "=LEEWAY.SPEC.CV(B2,'Leeway provenance (2)'!$B$5)" });
    expect(p.cells.some((c) => c.row > 2)).toBe(false);
    expect(p.template.provenanceAt).toBe('the sheet "Leeway provenance (2)" (the rows below the table are not empty)');
  });

  test('a print area that leaves the block out is reported, not changed', () => {
    const s = sheet({ A1: 'Analyte', B1: 'CVI %', A2: 'Sodium' }, { printArea: [{ top: 1, left: 1, bottom: 2, right: 2 }] });
    const p = plan([row('Sodium', '', 0.5, 0.7)], { sheet: s });
    expect(p.template.notes.join('\n')).toMatch(/print area \(A1:B2\) leaves out the provenance block/);
  });
});

describe('the provenance and the written decimals, as on a new sheet', () => {
  const small = (): SheetSnapshot => sheet({ A1: 'Analyte', B1: 'Specimen', C1: 'CVI %', D1: 'CVG %', A2: 'Sodium', B2: 'Serum' });
  const blockText = (p: FillPlan): string =>
    p.cells
      .filter((c) => c.col === 1 && c.row >= 4 && c.content.kind === 'text')
      .map((c) => (c.content.kind === 'text' ? c.content.text : ''))
      .join(' ');

  test('the block counts the table rows the template received, and says so when the fill has no SHA-256 of the table file (the pane)', () => {
    const rows = [row('Sodium', 'Serum', 0.5, 0.7), row('Chloride', 'Serum', 1.1, 1.3)];
    const p = plan(rows, { sheet: small() });
    expect(p.provenance).toMatchObject({ tableSha256: null, tableRows: 2, rowsFilled: 1 });
    const text = blockText(p).replace(/\s+/g, ' ');
    expect(text).toContain(`Table SHA-256: ${NO_FINGERPRINT}`);
    expect(text).toContain('Table rows: 2 in the table; 1 filled here');
    // Appended rows count as filled.
    const appended = plan(rows, { sheet: small(), append: true });
    expect(appended.provenance.rowsFilled).toBe(2);
  });

  test('an input number written with trailing zeros gets a format only where General would drop them (14.0, 0.70), not where it shows them already (0.5)', () => {
    const p = plan([row('Sodium', 'Serum', 14, 0.7), row('Chloride', 'Serum', 0.5, 1.3)], { sheet: sheet({ A1: 'Analyte', B1: 'Specimen', C1: 'CVI %', D1: 'CVG %', A2: 'Sodium', B2: 'Serum', A3: 'Chloride', B3: 'Serum' }) }, {
      writtenDecimals: { [rowKey('Sodium', 'Serum')]: { cvi: 1, cvg: 2 }, [rowKey('Chloride', 'Serum')]: { cvi: 1, cvg: 1 } },
    });
    expect(cell(p, 'C2')).toMatchObject({ content: { kind: 'number', value: 14 }, format: '0.0' });
    expect(cell(p, 'D2')).toMatchObject({ content: { kind: 'number', value: 0.7 }, format: '0.00' });
    expect(cell(p, 'C3')!.format).toBeUndefined();
    expect(cell(p, 'D3')!.format).toBeUndefined();
    // Without written decimals (a table from the pane's library) no input cell gets a format.
    const bare = plan([row('Sodium', 'Serum', 14, 0.7)], { sheet: small() });
    expect(cell(bare, 'C2')!.format).toBeUndefined();
  });
});

describe('a far stray cell', () => {
  test('a value at ZZ200000 costs one entry: the plan is the same as without it, the block still below the table', () => {
    const values = { A1: 'Analyte', B1: 'CVI %', C1: 'CVG %', A2: 'Sodium' };
    const with_ = plan([row('Sodium', '', 0.5, 0.7)], { sheet: sheet({ ...values, ZZ200000: 'x' }) });
    const without = plan([row('Sodium', '', 0.5, 0.7)], { sheet: sheet(values) });
    expect(with_.cells).toEqual(without.cells);
  });
});

describe('template plans, seeded random sheets (seed 20260204)', () => {
  test('no cell is planned twice; none where the sheet holds something unless overwriting a listed conflict; none in a merge; appended rows and the block only in empty rows', () => {
    const rand = mulberry32(20260204);
    const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)];
    const names = ['Arvelin', 'Brontase', 'Calpidine', 'Dorvane', 'Elmicate', 'Ferrolin'];
    let planned = 0;
    let written = 0;
    const specimens = ['', 'Serum', 'Urine'];
    for (let k = 0; k < 200; k++) {
      const headerRow = 1 + Math.floor(rand() * 8);
      const values: Record<string, string | number> = { A1: 'Title of the sheet' };
      const headers = ['Analyte', pick(['Specimen', 'Note']), 'CVI %', 'CVG %', pick(['Allowable total error %', 'Allowable CV %', 'Unit'])];
      headers.forEach((h, j) => (values[`${String.fromCharCode(65 + j)}${headerRow}`] = h));
      const n = Math.floor(rand() * 6);
      for (let i = 0; i < n; i++) {
        const r = headerRow + 1 + i;
        values[`A${r}`] = pick(names);
        if (headers[1] === 'Specimen' && rand() < 0.7) values[`B${r}`] = pick(specimens.slice(1));
        if (rand() < 0.3) values[`${pick(['C', 'D', 'E'])}${r}`] = rand() < 0.5 ? 9 : 'typed';
      }
      if (rand() < 0.5) values[`A${headerRow + n + 1 + Math.floor(rand() * 4)}`] = '* a footnote';
      if (rand() < 0.3) values.ZZ5000 = 'stray';
      const merges = rand() < 0.5 ? [{ top: headerRow + 1, left: 3, bottom: headerRow + 1, right: 4 }] : [];
      const s = sheet(values, { merges });
      const rows = names.filter(() => rand() < 0.6).map((a) => row(a, pick(specimens), 1 + rand() * 10, rand() < 0.2 ? null : 1 + rand() * 10));
      if (rows.length === 0) continue;
      const overwrite = rand() < 0.5;
      const r = planFill({ table: table(rows), tier: 'desirable', z: 1.65, mode: rand() < 0.5 ? 'live' : 'values', target: { kind: 'template', sheet: s, append: rand() < 0.5 }, overwrite, date: '2026-02-03' });
      if (!r.ok) continue;
      const p = r.plan;
      planned++;
      written += p.rows.length;
      const index = new Map((s.sparse ?? []).map((c) => [`${c.row},${c.col}`, c.value]));
      const conflicts = new Set(p.conflicts.map((c) => c.address));
      const seen = new Set<string>();
      for (const c of p.cells) {
        if (seen.has(c.address)) throw new Error(`case ${k}: ${c.address} planned twice`);
        seen.add(c.address);
        if (index.has(`${c.row},${c.col}`) && !(overwrite && conflicts.has(c.address))) throw new Error(`case ${k}: ${c.address} holds something`);
        if (merges.some((m) => c.row >= m.top && c.row <= m.bottom && c.col >= m.left && c.col <= m.right)) throw new Error(`case ${k}: ${c.address} is merged`);
      }
      const taken = new Set((s.sparse ?? []).map((c) => c.row));
      for (const a of p.template.appended) if (taken.has(a.row)) throw new Error(`case ${k}: appended into row ${a.row}, which holds something`);
      if (!p.blockSheet) for (const c of p.cells.filter((x) => ['title', 'label', 'tier', 'z', 'provenance', 'caution'].includes(x.role))) if (taken.has(c.row)) throw new Error(`case ${k}: block in row ${c.row}`);
      if (!overwrite) expect(p.cells.some((c) => conflicts.has(c.address))).toBe(false);
    }
    // The cases exercise real plans, not only refusals.
    expect(planned).toBeGreaterThan(120);
    expect(written).toBeGreaterThan(150);
  });
});
