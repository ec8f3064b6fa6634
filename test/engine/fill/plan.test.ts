/**
 * The fill planner. Expected values come from the registry's evaluate() on
 * the same inputs (the function both front ends run) and from the usual worked example
 * CVI 5.7 %, CVG 6.9 %, desirable: total error 6.94 % at z = 1.65 (common practice, no source).
 */
import { planFill, selectRows, CAUTION, DEMO_MARKER, DERIVED_FIELDS } from '../../../src/engine/fill';
import type { FillPlan, FillRequest, PlannedCell, SheetSnapshot } from '../../../src/engine/fill';
import { rowKey } from '../../../src/engine/table';
import type { VariationRow, VariationTable } from '../../../src/engine/table';
import { evaluate } from '../../../src/registry';
import { VERSION } from '../../../src/engine/version';
import { mulberry32 } from '../../support/prng';

const row = (analyte: string, cvi: number, cvg: number | null, extra: Partial<VariationRow> = {}): VariationRow => ({
  analyte,
  specimen: 'serum',
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

const table = (rows: VariationRow[], demo = false): VariationTable => ({ name: 'tests.csv', origin: '/tmp/tests.csv', importedAt: '2026-01-05T10:00:00.000Z', demo, rows });

function plan(req: Partial<FillRequest> & { table: VariationTable }): FillPlan {
  const r = planFill({ tier: 'desirable', z: 1.65, mode: 'live', target: { kind: 'new-sheet', sheetName: 'Specs' }, date: '2026-02-03', ...req });
  if (!r.ok) throw new Error(r.problems.map((p) => p.message).join('; '));
  return r.plan;
}

const at = (p: FillPlan, address: string): PlannedCell | undefined => p.cells.find((c) => c.address === address);
const colOf = (p: FillPlan, field: string): string => p.columns.find((c) => c.field === field)!.letter;
const texts = (p: FillPlan): string[] => p.cells.flatMap((c) => (c.content.kind === 'text' ? [c.content.text] : []));

describe('planFill on a new sheet, live formulas', () => {
  const t = table([row('Arvelin', 5.7, 6.9), row('Brontase', 12.4, 18.1, { limitAbs: 5, limitPct: 10, level: 80 }), row('Calpidine', 3.2, null)]);
  const p = plan({ table: t });

  test('the worked example: CVI 5.7, CVG 6.9, desirable, z 1.65 → total error 6.94 %', () => {
    const r = p.rows[0].row;
    const c = at(p, `${colOf(p, 'spec_total')}${r}`)!;
    expect(c.content.kind).toBe('formula');
    if (c.content.kind === 'formula') expect(Math.abs((c.content.result as number) - 6.94)).toBeLessThan(0.005);
  });

  test('every derived cell is a LEEWAY formula on its own row’s inputs, the tier cell and the z cell; its result is the registry’s', () => {
    const L = (f: string): string => colOf(p, f);
    for (const pr of p.rows) {
      const r = pr.row;
      const src = t.rows.find((x) => x.analyte === pr.analyte)!;
      const tierArg = `IF(${L('tier')}${r}="",${p.tierCell},${L('tier')}${r})`;
      const expect1 = (field: string, formula: string, fn: string, args: unknown[]): void => {
        const c = at(p, `${L(field)}${r}`)!;
        expect(c.content).toMatchObject({ kind: 'formula', formula });
        // Cells reach the worksheet function as 1×1 ranges; a blank cell is [[null]].
        const want = evaluate(fn, args.map((a) => [[a]]) as never)[0][0];
        const got = c.content.kind === 'formula' ? c.content.result : undefined;
        if (typeof want === 'number') expect(got as number).toBeRelClose(want, 1e-15);
        else expect(got).toEqual(want);
      };
      expect1('spec_cv', `=LEEWAY.SPEC.CV(${L('cvi')}${r},${tierArg})`, 'SPEC.CV', [src.cvi, 'desirable']);
      expect1('spec_bias', `=LEEWAY.SPEC.BIAS(${L('cvi')}${r},${L('cvg')}${r},${tierArg})`, 'SPEC.BIAS', [src.cvi, src.cvg, 'desirable']);
      expect1('spec_total', `=LEEWAY.SPEC.TOTAL(${L('cvi')}${r},${L('cvg')}${r},${tierArg},${p.zCell})`, 'SPEC.TOTAL', [src.cvi, src.cvg, 'desirable', 1.65]);
      expect1('spec_mu', `=LEEWAY.SPEC.MU(${L('cvi')}${r},${tierArg})`, 'SPEC.MU', [src.cvi, 'desirable']);
    }
  });

  test('a blank CVG gives #N/A in bias and total, as the worksheet function does', () => {
    const r = p.rows[2].row;
    const c = at(p, `${colOf(p, 'spec_bias')}${r}`)!;
    expect(c.content).toMatchObject({ kind: 'formula', result: { error: '#N/A' } });
  });

  test('the fixed limit: max(100·abs/level, pct) where there is a limit, empty text where there is none', () => {
    const r1 = p.rows[1].row;
    const c = at(p, `${colOf(p, 'fixed_pct')}${r1}`)!;
    expect(c.content).toMatchObject({ kind: 'formula', result: 10 });
    expect(evaluate('SPEC.FIXED', [80, 5, 10])[0][0]).toBe(10);
    expect(at(p, `${colOf(p, 'fixed_pct')}${p.rows[0].row}`)!.content).toMatchObject({ result: '' });
  });

  test('the tier cell holds the tier word, the z cell the number; both are single cells of the block', () => {
    expect(at(p, p.tierCell.replace(/\$/g, ''))!.content).toEqual({ kind: 'text', text: 'desirable' });
    expect(at(p, p.zCell.replace(/\$/g, ''))!.content).toEqual({ kind: 'number', value: 1.65 });
  });

  test('provenance: table name and source, tier, z, date, program version; and the caution', () => {
    const all = texts(p);
    expect(all).toEqual(expect.arrayContaining(['tests.csv', '/tmp/tests.csv', '2026-01-05', '2026-02-03', `Leeway ${VERSION}`, 'Invented for tests (2026-01)']));
    const caution = p.cells.filter((c) => c.role === 'caution').map((c) => (c.content.kind === 'text' ? c.content.text : '')).join(' ');
    expect(caution).toBe(CAUTION);
    expect(p.provenance).toMatchObject({ tableName: 'tests.csv', tier: 'desirable', z: 1.65, date: '2026-02-03', version: VERSION, mode: 'live', demo: false });
    expect(all).not.toContain(DEMO_MARKER);
  });

  test('no conflicts on a new sheet; derived cells carry a display format only', () => {
    expect(p.conflicts).toEqual([]);
    expect(p.writable).toBe(true);
    for (const c of p.cells.filter((x) => x.role === 'derived')) expect(c.format).toBe('0.00');
  });
});

describe('planFill in values mode', () => {
  test('derived columns are full-precision numbers (display rounding only), each header notes its formula', () => {
    const p = plan({ table: table([row('Arvelin', 5.7, 6.9)]), mode: 'values', decimals: 3 });
    const r = p.rows[0].row;
    const c = at(p, `${colOf(p, 'spec_bias')}${r}`)!;
    expect(c.content.kind).toBe('number');
    const want = evaluate('SPEC.BIAS', [5.7, 6.9, 'desirable'])[0][0] as number;
    if (c.content.kind === 'number') expect(c.content.value).toBe(want);
    expect(c.format).toBe('0.000');
    const header = at(p, `${colOf(p, 'spec_bias')}${p.headerRow}`)!;
    expect(header.note).toContain(`=LEEWAY.SPEC.BIAS(${colOf(p, 'cvi')}${r},${colOf(p, 'cvg')}${r},IF(`);
    expect(header.note).toContain('stored as full-precision numbers');
  });

  test('an error result is stored as the error value, not as text', () => {
    const p = plan({ table: table([row('Calpidine', 3.2, null)]), mode: 'values' });
    const c = at(p, `${colOf(p, 'spec_total')}${p.rows[0].row}`)!;
    expect(c.content).toEqual({ kind: 'error', error: { error: '#N/A', message: 'cvg is blank: enter a number' } });
  });
});

describe('planFill: text, tiers per row, demo marker', () => {
  test('text that starts with = + - @ stays text', () => {
    const p = plan({ table: table([row('=HYPERLINK("http://x")', 5, 6, { specimen: '+serum', unit: '-', note: '@cmd', source: '=1+1' })]) });
    const inputs = p.cells.filter((c) => c.role === 'input' && c.content.kind !== 'number');
    expect(inputs.map((c) => c.content.kind)).toEqual(['text', 'text', 'text', 'text', 'text']);
    expect(texts(p)).toEqual(expect.arrayContaining(['=HYPERLINK("http://x")', '+serum', '-', '@cmd', '=1+1']));
    expect(p.cells.filter((c) => c.content.kind === 'formula').every((c) => c.role === 'derived')).toBe(true);
  });

  test('a row’s own tier is written in its tier cell and used for its results; the formula still prefers that cell', () => {
    const rows = [row('Arvelin', 5.7, 6.9), row('Brontase', 12.4, 18.1)];
    const p = plan({ table: table(rows), rowTiers: { [rowKey('Brontase', 'serum')]: 'minimum' } });
    const r = p.rows[1].row;
    expect(at(p, `${colOf(p, 'tier')}${r}`)!.content).toEqual({ kind: 'text', text: 'minimum' });
    const total = at(p, `${colOf(p, 'spec_total')}${r}`)!.content;
    expect(total.kind === 'formula' && total.result).toBe(evaluate('SPEC.TOTAL', [12.4, 18.1, 'minimum', 1.65])[0][0]);
    expect(at(p, `${colOf(p, 'tier')}${p.rows[0].row}`)).toBeUndefined();
  });

  test('the demo table carries the demo marker in its block', () => {
    const p = plan({ table: table([row('Arvelin', 5.7, 6.9)], true) });
    expect(texts(p)).toContain(DEMO_MARKER);
    expect(p.provenance.demo).toBe(true);
  });

  test('requests that cannot be planned say why', () => {
    const base = { table: table([row('Arvelin', 5.7, 6.9)]), tier: 'desirable' as const, mode: 'live' as const, target: { kind: 'new-sheet' as const, sheetName: 'S' }, date: '2026-02-03' };
    const r1 = planFill({ ...base, z: -1 });
    expect(r1.ok === false && r1.problems[0].message).toMatch(/z must be/);
    const r2 = planFill({ ...base, z: 1.65, rows: [] });
    expect(r2.ok === false && r2.problems[0].message).toMatch(/no rows/);
    const r3 = planFill({ ...base, z: 1.65, date: '3 Feb' });
    expect(r3.ok === false && r3.problems[0].message).toMatch(/YYYY-MM-DD/);
  });
});

describe('planFill into a template', () => {
  // Headers in another order, an extra column (Reviewer), a pre-listed analyte, pre-filled cells.
  const snapshot: SheetSnapshot = {
    name: 'Verification',
    origin: { row: 1, col: 1 },
    cells: [
      ['Method verification — template', null, null, null, null, null],
      [null, null, null, null, null, null],
      ['Reviewer', 'Test', 'Allowable total error %', 'CVI (%)', 'CVG', 'Reference'],
      ['J. Doe?', 'Brontase', null, 12.4, 99, null],
      ['kept', null, 'hand-typed', null, null, null],
    ],
  };
  const rows = [row('Arvelin', 5.7, 6.9), row('Brontase', 12.4, 18.1)];
  const request = (overwrite = false): FillRequest => ({
    table: table(rows),
    tier: 'desirable',
    z: 1.65,
    mode: 'live',
    target: { kind: 'template', sheet: snapshot, headerAt: { row: 3, col: 1 } },
    date: '2026-02-03',
    overwrite,
  });

  test('columns are matched by the template’s own headers; extra columns are left alone', () => {
    const r = planFill(request());
    if (!r.ok) throw new Error(`expected a plan, got problems: ${r.problems.map((x) => x.message).join('; ')}`);
    const p = r.plan;
    expect(p.columns.map((c) => [c.field, c.letter])).toEqual([['analyte', 'B'], ['spec_total', 'C'], ['cvi', 'D'], ['cvg', 'E'], ['source', 'F']]);
    // The Reviewer column and the header row of the table (rows 3–5) are not written.
    expect(p.cells.some((c) => c.col === 1 && c.row >= 3 && c.row <= 5)).toBe(false);
    expect(p.cells.some((c) => c.row === 3 && c.col <= 6)).toBe(false);
  });

  test('a listed analyte keeps its row; a table analyte the template lacks is reported, and added below the table only when appending is asked for', () => {
    const r = planFill(request());
    if (!r.ok) throw new Error('plan failed');
    expect(r.plan.rows.map((x) => [x.analyte, x.row])).toEqual([['Brontase', 4]]);
    expect(r.plan.template.notInTemplate).toEqual([{ analyte: 'Arvelin', specimen: 'serum' }]);
    const te = r.plan.cells.find((c) => c.address === 'C4')!;
    expect(te.content).toMatchObject({ kind: 'formula', formula: `=LEEWAY.SPEC.TOTAL(D4,E4,${r.plan.tierCell},${r.plan.zCell})` });
    const a = planFill({ ...request(), target: { kind: 'template', sheet: snapshot, headerAt: { row: 3, col: 1 }, append: true } });
    if (!a.ok) throw new Error('plan failed');
    // Row 5 belongs to the template's table (it holds "kept" and "hand-typed"): the first empty row below is 6.
    expect(a.plan.rows.map((x) => [x.analyte, x.row])).toEqual([['Brontase', 4], ['Arvelin', 6]]);
    expect(a.plan.template.appended.map((x) => x.row)).toEqual([6]);
  });

  test('non-empty cells are conflicts, listed and left as they are; identical ones are left alone; overwrite replaces them', () => {
    const r = planFill(request());
    if (!r.ok) throw new Error('plan failed');
    const p = r.plan;
    expect(p.conflicts.map((c) => [c.address, c.existing, c.planned])).toEqual([['E4', 99, '18.1']]);
    expect(p.unchanged).toBe(1); // D4 12.4 already holds what the fill writes (B4, the analyte that matched, is not a target)
    expect(p.cells.find((c) => c.address === 'B4')).toBeUndefined();
    expect(p.cells.find((c) => c.address === 'E4')).toBeUndefined();
    expect(p.writable).toBe(true);
    // The formula reads the sheet's own CVG (99): its stored result is the registry's for 12.4 and 99.
    const te = p.cells.find((c) => c.address === 'C4')!.content;
    expect(te.kind === 'formula' && te.result).toBe(evaluate('SPEC.TOTAL', [12.4, 99, 'desirable', 1.65])[0][0]);
    const o = planFill(request(true));
    if (!o.ok) throw new Error('plan failed');
    expect(o.plan.conflicts.length).toBe(1);
    expect(o.plan.cells.find((c) => c.address === 'E4')!.content).toEqual({ kind: 'number', value: 18.1 });
    const te2 = o.plan.cells.find((c) => c.address === 'C4')!.content;
    expect(te2.kind === 'formula' && te2.result).toBe(evaluate('SPEC.TOTAL', [12.4, 18.1, 'desirable', 1.65])[0][0]);
  });

  test('the block goes below the table in its first column, one blank row between; the tier and z values clear their labels', () => {
    const r = planFill(request());
    if (!r.ok) throw new Error('plan failed');
    expect(r.plan.cells.find((c) => c.role === 'title')!.address).toBe('A7');
    // Labels of 19 characters need three default columns (3 × 8.43 ≥ 20): the values go to column D.
    expect(r.plan.tierCell).toBe('$D$8');
    expect(r.plan.zCell).toBe('$D$9');
    expect(r.plan.cells.find((c) => c.address === 'A8')!.content).toEqual({ kind: 'text', text: 'Tier (whole sheet)' });
    expect(r.plan.template.provenanceAt).toMatch(/^below the table, A7:A\d+$/);
  });

  test('a template without an analyte column, or with a derived column lacking its inputs, is refused with the reason', () => {
    const noAnalyte: SheetSnapshot = { name: 'T', origin: { row: 1, col: 1 }, cells: [['CVI', 'Allowable bias %']] };
    const r = planFill({ ...request(), target: { kind: 'template', sheet: noAnalyte, headerAt: { row: 1, col: 1 } } });
    if (r.ok) throw new Error('expected the request to be refused');
    expect(r.problems.map((x) => x.message).join(' | ')).toMatch(/no analyte column.*\|.*needs a CVG % column/);
  });

  test('the user’s header mapping wins over the automatic match', () => {
    const r = planFill({ ...request(), target: { kind: 'template', sheet: snapshot, headerAt: { row: 3, col: 1 }, mapping: { CVG: null } } });
    // Without a CVG column the total-error column cannot be planned.
    expect(r.ok).toBe(false);
  });
});

describe('selectRows', () => {
  const t = table([row('Arvelin', 1, 2), row('Arvelin', 3, 4, { specimen: 'urine' }), row('Brontase', 5, 6)]);
  test('by analyte (all specimens) or "analyte (specimen)", case-insensitive; unknown names reported', () => {
    expect(selectRows(t, ['arvelin']).rows).toHaveLength(2);
    expect(selectRows(t, ['Arvelin (urine)', 'BRONTASE']).rows.map((r) => r.cvi)).toEqual([3, 5]);
    expect(selectRows(t, ['Nope']).unknown).toEqual(['Nope']);
    expect(selectRows(t).rows).toHaveLength(3);
  });
});

describe('planFill properties (seed 20260203)', () => {
  test('for random tables every formula reads its own row, one tier cell and one z cell; cells never overlap', () => {
    const rand = mulberry32(20260203);
    for (let k = 0; k < 24; k++) {
      const n = 1 + Math.floor(rand() * 25);
      const rows = Array.from({ length: n }, (_, i) => row(`A${i}`, rand() * 30, rand() < 0.2 ? null : rand() * 40, rand() < 0.3 ? { limitPct: rand() * 20 } : {}));
      const tier = (['optimum', 'desirable', 'minimum'] as const)[k % 3];
      const p = plan({ table: table(rows, k % 2 === 0), tier, z: rand() * 3 });
      const seen = new Set<string>();
      for (const c of p.cells) {
        if (seen.has(c.address)) throw new Error(`${c.address} planned twice`);
        seen.add(c.address);
        if (c.content.kind !== 'formula') continue;
        const refs = c.content.formula.match(/\$?[A-Z]+\$?\d+/g) ?? [];
        for (const ref of refs) {
          const ok = ref.includes('$') ? ref === p.tierCell || ref === p.zCell : Number(ref.replace(/[A-Z]+/, '')) === c.row;
          if (!ok) throw new Error(`${c.address}: ${c.content.formula} reads ${ref}`);
        }
      }
      expect(p.cells.filter((c) => c.role === 'derived')).toHaveLength(n * (DERIVED_FIELDS.length - (rows.some((r) => r.limitPct !== null) ? 0 : 1)));
    }
  });
});

describe('planFill: the table’s fingerprint and the decimals it was written with', () => {
  const t = table([row('Arvelin', 14, 6.9), row('Brontase', 12.4, 18.1)]);
  const pairOf = (p: FillPlan, label: string): string | undefined => {
    const l = p.cells.find((c) => c.role === 'label' && c.content.kind === 'text' && c.content.text === label);
    const v = l && p.cells.find((c) => c.row === l.row && c.col === l.col + 1);
    return v && v.content.kind === 'text' ? v.content.text : undefined;
  };

  test('the block records the table file’s SHA-256 and its row count', () => {
    // SHA-256 of the empty string, FIPS 180-4 test vector (NIST, from memory; checked with sha256sum).
    const sha = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';
    const p = plan({ table: t, rows: [t.rows[1]], tableSha256: sha });
    expect(pairOf(p, 'Table SHA-256')).toBe(sha);
    expect(pairOf(p, 'Table rows')).toBe('2 in the table; 1 filled here');
    expect(p.provenance).toMatchObject({ tableSha256: sha, tableRows: 2, rowsFilled: 1 });
  });

  test('without a fingerprint the block says it was not recorded; the demo table says it is no file', () => {
    expect(pairOf(plan({ table: t }), 'Table SHA-256')).toBe('not recorded (imported in the pane)');
    expect(pairOf(plan({ table: table([row('Arvelin', 5.7, 6.9)], true) }), 'Table SHA-256')).toMatch(/^none: the built-in demo table/);
    expect(plan({ table: t }).provenance.tableSha256).toBeNull();
  });

  test('a malformed fingerprint is refused', () => {
    const r = planFill({ table: t, tier: 'desirable', z: 1.65, mode: 'live', target: { kind: 'new-sheet', sheetName: 'S' }, date: '2026-02-03', tableSha256: 'abc' });
    expect(r.ok === false && r.problems[0].message).toMatch(/SHA-256/);
  });

  test('input numbers carry the decimals they were written with (14.0 → "0.0"); without them no format', () => {
    const written = { [rowKey('Arvelin', 'serum')]: { cvi: 1, cvg: 2 } };
    const p = plan({ table: t, writtenDecimals: written });
    const r0 = p.rows[0].row;
    expect(at(p, `${colOf(p, 'cvi')}${r0}`)).toMatchObject({ content: { kind: 'number', value: 14 }, format: '0.0' });
    expect(at(p, `${colOf(p, 'cvg')}${r0}`)!.format).toBe('0.00');
    expect(at(p, `${colOf(p, 'cvi')}${p.rows[1].row}`)!.format).toBeUndefined();
    const bare = plan({ table: t });
    expect(at(bare, `${colOf(bare, 'cvi')}${bare.rows[0].row}`)!.format).toBeUndefined();
  });
});
