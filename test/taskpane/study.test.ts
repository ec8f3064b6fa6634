/**
 * The logic behind the Verification and Review views: a selection read as a study, its figures
 * through the function registry, and the block of live formulas written beside it. The written
 * block is put into a real spreadsheet engine (HyperFormula, with the same registry) next to the
 * data, and every figure it computes must equal the figure the pane shows; a corrected result
 * must change the written figures (they are live). Bad selections give a message that says what
 * to select.
 */
import { DetailedCellError } from 'hyperformula';
import { leewaySheet } from '../support/hyperformula';
import { evaluate } from '../../src/registry';
import type { BlockArea, BlockCell, CellGrid } from '../../src/taskpane/host';
import { readReplication, shownRows, verificationBlock, verificationFigures } from '../../src/taskpane/study/verification';
import type { MaterialInput, VerificationInput } from '../../src/taskpane/study/verification';
import { agreementBlock, agreementFigures, agreementPairs, readComparison } from '../../src/taskpane/study/agreement';
import { pairDifference } from '../../src/charts/differencePlot';
import { checkChoice, guessChoice, readControls, reviewBlock, reviewControls } from '../../src/taskpane/study/review';
import type { ReviewChoice } from '../../src/taskpane/study/review';
import { SelectionProblem } from '../../src/taskpane/study/columns';
import type { Figure } from '../../src/taskpane/study/figures';
import { CAUTION } from '../../src/engine/caution';
import { defaultRule, FALLBACK_RULE } from '../../src/taskpane/views/review';
import { PaneState } from '../../src/taskpane/state';
import { demoTable } from '../../src/taskpane/demo';
import { keyOf } from '../../src/taskpane/analytes';
import { readTyped } from '../../src/taskpane/study/inputs';

type Cell = string | number | boolean | null;

const PROV = { title: 'Leeway — verification', demo: false, pairs: [['Data', 'Sheet1!A1:C16'] as const] };

/** A sheet with the selection's values at its place and the block's cells written into it. */
function sheetWith(grid: CellGrid, areas: readonly BlockArea[]): Cell[][] {
  const rows: Cell[][] = [];
  const put = (r: number, c: number, v: Cell): void => {
    while (rows.length < r) rows.push([]);
    const row = rows[r - 1];
    while (row.length < c) row.push(null);
    row[c - 1] = v;
  };
  grid.values.forEach((row, i) => row.forEach((v, j) => put(grid.firstRow + i, grid.firstColumn + j, v ?? null)));
  const content = (b: BlockCell): Cell => (b.content.kind === 'formula' ? b.content.formula : b.content.kind === 'number' ? b.content.value : b.content.text);
  for (const a of areas) a.cells.forEach((r, i) => r.forEach((b, j) => b && put(a.row + i, a.col + j, content(b))));
  return rows;
}

function valueAt(hf: ReturnType<typeof leewaySheet>, row: number, col: number): unknown {
  return hf.getCellValue({ sheet: 0, row: row - 1, col: col - 1 });
}

/** The pane's figure and the sheet's value are the same: numbers to the last bit, texts equal, errors the same code. */
function expectSame(sheet: unknown, pane: Figure, where: string): void {
  if (typeof pane === 'object') {
    expect({ where, code: sheet instanceof DetailedCellError ? sheet.value : sheet }).toEqual({ where, code: pane.error });
  } else if (typeof pane === 'number') {
    expect({ where, v: sheet }).toEqual({ where, v: pane });
  } else {
    expect({ where, v: sheet }).toEqual({ where, v: pane });
  }
}

// Replication study: the VERIFY.PRECISION catalogue example (5 runs × 3) beside a second material.
const L1 = [10.1, 10.3, 9.9, 10.6, 10.4, 10.8, 9.7, 9.9, 10.0, 10.2, 10.1, 10.4, 9.8, 10.0, 10.1];
const L2 = [51.2, 50.6, 51.9, 49.8, 50.4, 50.9, 52.3, 51.7, 51.1, 50.2, 50.8, 50.5, 51.6, 52.0, 51.4];
const RUNS = [1, 1, 1, 2, 2, 2, 3, 3, 3, 4, 4, 4, 5, 5, 5];
const replication: CellGrid = {
  sheet: 'Sheet1',
  address: 'Sheet1!A1:C16',
  firstRow: 1,
  firstColumn: 1,
  values: [['Run', 'Level 1', 'Level 2'], ...RUNS.map((r, i) => [r, L1[i], L2[i]])],
};

const inputs: MaterialInput[] = [
  { claimRepeatability: { kind: 'number', value: 1.5 }, claimWithinLab: { kind: 'number', value: 3 }, assigned: { kind: 'number', value: 10 }, uAssigned: { kind: 'number', value: 0.05 } },
  { claimRepeatability: { kind: 'cell', ref: '$H$1', value: 1.2 }, claimWithinLab: { kind: 'number', value: 2 }, assigned: null, uAssigned: null },
];

describe('verification of a replication study', () => {
  const study = readReplication(replication);
  const v: VerificationInput = {
    study,
    inputs,
    spec: { value: 8, formulaText: '8', from: 'typed' },
    bias: { value: 1.5, from: 'What-if (typed)' },
  };

  test('reads the labels column and one material per column, names from the header', () => {
    expect(study.labels.col).toBe(1);
    expect(study.materials.map((m) => [m.name, m.col])).toEqual([['Level 1', 2], ['Level 2', 3]]);
    expect(study.grid.top).toBe(2);
    expect(study.grid.bottom).toBe(16);
  });

  test('the figures are the worksheet functions’ for the same cells (VERIFY.PRECISION catalogue example)', () => {
    const [m1, m2] = verificationFigures(v);
    const vp = evaluate('VERIFY.PRECISION', [L1.map((x) => [x]), RUNS.map((x) => [x]), 1.5, 3, 2]);
    expect(m1.figures.get('rLimit')).toBe(vp[1][2]);
    expect(m1.figures.get('rOk')).toBe(vp[1][3]);
    expect(m1.figures.get('wlOk')).toBe(vp[1][7]);
    expect(m1.figures.get('rDf')).toBe(vp[1][8]);
    const dp = evaluate('DATA.PRECISION', [L1.map((x) => [x]), RUNS.map((x) => [x])]);
    expect(m1.figures.get('wlCv')).toBe(dp[1][5]);
    const lim = evaluate('DATA.CVLIMITS', [dp[1][4] as number, vp[1][8] as number]);
    expect(m1.figures.get('rLow')).toBe(lim[1][0]);
    expect(m1.figures.get('rHigh')).toBe(lim[1][1]);
    const tr = evaluate('VERIFY.TRUENESS', [L1.map((x) => [x]), RUNS.map((x) => [x]), 10, 0.05, 2]);
    expect(m1.figures.get('biasPct')).toBe(tr[1][3]);
    expect(m1.figures.get('tOk')).toBe(tr[1][7]);
    // Material 1 takes its bias from trueness, material 2 (no assigned value) the bias given.
    expect(m1.figures.get('sigmaBias')).toBe(tr[1][3]);
    expect(m2.figures.get('sigmaBias')).toBe(1.5);
    expect(m2.figures.has('tOk')).toBe(false);
    const sl = evaluate('PERF.SIGMALIMITS', [8, 1.5, m2.figures.get('wlCv') as number, m2.figures.get('wlDf') as number, 0]);
    expect(m2.figures.get('sigma')).toBe(sl[1][0]);
    expect(m2.figures.get('sigmaLow')).toBe(sl[1][1]);
  });

  test('the written block computes, in a spreadsheet, exactly the figures the pane shows', () => {
    const block = verificationBlock(v, PROV);
    expect(block.col).toBe(5); // one empty column right of the selection
    expect(block.row).toBe(1);
    const rows = sheetWith(replication, [block]);
    // The cell the second claim is read from.
    rows[0][7] = 1.2;
    const hf = leewaySheet({ Sheet1: rows });
    const figures = verificationFigures(v);
    const shown = shownRows(v);
    const headerAt = block.cells.findIndex((r) => r[0]?.content.kind === 'text' && r[0].content.text === 'Figure');
    shown.forEach((r, i) => {
      const row = block.row + headerAt + 1 + i;
      expect(block.cells[headerAt + 1 + i][0]?.content).toEqual({ kind: 'text', text: r.label });
      figures.forEach((m, j) => {
        const pane = m.figures.get(r.key);
        if (pane === undefined) return;
        expectSame(valueAt(hf, row, block.col + 1 + j), pane, `${r.key} of ${m.name}`);
      });
    });
    hf.destroy();
  });

  test('the block is live: a corrected result changes the written CV', () => {
    const block = verificationBlock(v, PROV);
    const rows = sheetWith(replication, [block]);
    rows[0][7] = 1.2;
    const hf = leewaySheet({ Sheet1: rows });
    const headerAt = block.cells.findIndex((r) => r[0]?.content.kind === 'text' && r[0].content.text === 'Figure');
    const cvRow = block.row + headerAt + 1 + shownRows(v).findIndex((r) => r.key === 'rCv');
    const before = valueAt(hf, cvRow, block.col + 1);
    hf.setCellContents({ sheet: 0, row: 4, col: 1 }, 12.6);
    const after = valueAt(hf, cvRow, block.col + 1);
    expect(typeof before).toBe('number');
    expect(after).not.toBe(before);
    const corrected = [...L1];
    corrected[3] = 12.6;
    expect(after).toBe(evaluate('DATA.PRECISION', [corrected.map((x) => [x]), RUNS.map((x) => [x])])[1][4]);
    hf.destroy();
  });

  test('the block carries the provenance, the formulas and the caution; a claim read from a cell is referenced', () => {
    const block = verificationBlock(v, PROV);
    const texts = block.cells.flat().filter((c) => c?.content.kind === 'text').map((c) => (c!.content as { text: string }).text);
    expect(texts[0]).toBe('Leeway — verification');
    expect(texts).toContain('Data: Sheet1!A1:C16');
    expect(texts.filter((t) => t.startsWith('Caution') || CAUTION.includes(t)).join(' ').replace('Caution: ', '')).toBe(CAUTION);
    const formulas = block.cells.flat().filter((c) => c?.content.kind === 'formula').map((c) => (c!.content as { formula: string }).formula);
    expect(formulas).toContain('=$H$1');
    expect(formulas.some((f) => f.startsWith('=INDEX(LEEWAY.VERIFY.PRECISION($C$2:$C$16,$A$2:$A$16,'))).toBe(true);
    expect(block.cells.every((r) => r.length === block.cells[0].length)).toBe(true);
  });

  test('a missing claim shows #N/A in its verdict, not a guess', () => {
    const [m] = verificationFigures({ ...v, inputs: [{ ...inputs[0], claimRepeatability: null }, inputs[1]] });
    expect(m.figures.get('rOk')).toMatchObject({ error: '#N/A' });
    expect(typeof m.figures.get('rCv')).toBe('number');
  });

  test('blank rows at the end of the selection (a whole column selected) are left out', () => {
    const tall: CellGrid = { ...replication, address: 'Sheet1!A1:C40', values: [...replication.values, ...Array.from({ length: 24 }, () => ['', '', ''])] };
    const s = readReplication(tall);
    expect(s.grid.bottom).toBe(16);
    expect(verificationBlock({ ...v, study: s }, PROV).cells.flat().some((c) => c?.content.kind === 'formula' && c.content.formula.includes('$B$2:$B$16'))).toBe(true);
  });

  test('bad selections say what to select', () => {
    const one: CellGrid = { ...replication, values: replication.values.map((r) => [r[0]]) };
    expect(() => readReplication(one)).toThrow(/run or day labels and, beside them, one column of results per material/);
    const asText: CellGrid = { ...replication, values: replication.values.map((r, i) => (i === 4 ? [r[0], '10,6', r[2]] : r)) };
    expect(() => readReplication(asText)).toThrow(SelectionProblem);
    expect(() => readReplication(asText)).toThrow(/B5 holds the text "10,6"/);
    const short: CellGrid = { ...replication, values: replication.values.slice(0, 3) };
    expect(() => readReplication(short)).toThrow(/fewer than 3 rows/);
  });
});

describe('method comparison (difference plot)', () => {
  const X = [102, 98, 110, 95, 104, 99, 'n/a', 120];
  const Y = [104, 97, 113, 96, 107, 98, 101, 118];
  const grid: CellGrid = { sheet: 'Sheet1', address: 'Sheet1!B3:C11', firstRow: 3, firstColumn: 2, values: [['Comparative', 'Candidate'], ...X.map((x, i) => [x, Y[i]])] };

  test.each(['absolute', 'percent'] as const)('points and figures agree (%s): the mean of the points is the mean difference', (scale) => {
    const s = readComparison(grid);
    const f = agreementFigures(s, scale);
    const pts = agreementPairs(s, scale);
    expect(pts).toHaveLength(7); // the text pair is skipped, as DATA.AGREEMENT skips it
    expect(f['Pairs']).toBe(7);
    const mean = pts.reduce((a, p) => a + pairDifference(p, scale), 0) / pts.length;
    expect(Math.abs(mean - (f['Mean difference'] as number))).toBeLessThan(1e-12);
    expect(pts[6]).toMatchObject({ x: 120, y: 118, label: 'row 11' });
    expect((pts[6].x + pts[6].y) / 2).toBe(119);
  });

  test('the written block computes DATA.AGREEMENT’s figures', () => {
    const s = readComparison(grid);
    const block = agreementBlock(s, 'percent', PROV);
    expect(block.col).toBe(5);
    const hf = leewaySheet({ Sheet1: sheetWith(grid, [block]) });
    const f = agreementFigures(s, 'percent');
    const headerAt = block.cells.findIndex((r) => r[0]?.content.kind === 'text' && r[0].content.text === 'Figure');
    Object.keys(f).forEach((label, i) => {
      expect(block.cells[headerAt + 1 + i][0]?.content).toEqual({ kind: 'text', text: label });
      expectSame(valueAt(hf, block.row + headerAt + 1 + i, block.col + 1), f[label], label);
    });
    hf.destroy();
  });

  test('three columns are refused with a message', () => {
    const three: CellGrid = { ...grid, values: grid.values.map((r) => [...r, 1]) };
    expect(() => readComparison(three)).toThrow(/Select two columns side by side/);
  });
});

describe('review of control results', () => {
  const values = [101, 104.5, 104.8, 99, 93.5, 100.2, 98.7, 101.1, 200, 100.4];
  const levels = ['L1', 'L1', 'L1', 'L1', 'L1', 'L2', 'L2', 'L2', 'L2', 'L2'];
  const runs = ['d1', 'd2', 'd3', 'd4', 'd5', 'd1', 'd2', 'd3', 'd4', 'd5'];
  const target = [100, 100, 100, 100, 100, 100, 100, 100, 200, 100];
  const grid: CellGrid = {
    sheet: 'QC',
    address: 'QC!A1:D11',
    firstRow: 1,
    firstColumn: 1,
    values: [['Run', 'Level', 'Result', 'Target'], ...values.map((x, i) => [runs[i], levels[i], x, target[i]])],
  };

  test('columns are chosen from the header names', () => {
    const g = readControls(grid);
    const c = guessChoice(g, '1-3s/2-2s/R-4s');
    expect(c).toMatchObject({ values: 2, runs: 0, levels: 1, target: { kind: 'column', index: 3 } });
    expect(c.sd.kind).toBe('number');
  });

  test('flags and figures are QC.FLAGS’s and QC.REVIEW’s; the chart shows the same flags', () => {
    const g = readControls(grid);
    const c: ReviewChoice = { ...guessChoice(g, '1-3s/2-2s/R-4s'), sd: { kind: 'number', value: 2 } };
    const out = reviewControls(g, c);
    if ('error' in out) throw new Error(out.error);
    const col = (k: number) => grid.values.slice(1).map((r) => [r[k]]);
    const want = evaluate('QC.FLAGS', [col(2), col(3), 2, '1-3s/2-2s/R-4s', col(0), col(1)]).map((r) => r[0]);
    expect(out.flags).toEqual(want);
    expect(out.flags.some((f) => f !== '')).toBe(true);
    const review = evaluate('QC.REVIEW', [col(2), col(3), 2, '1-3s/2-2s/R-4s', col(0), col(1)]);
    review[0].forEach((label, k) => expect(out.figures[label as string]).toBe(review[1][k]));
    const charted = out.series.flatMap((s) => s.points.filter((p) => p.flags !== '').map((p) => p.flags));
    expect(charted.sort()).toEqual(want.filter((f) => f !== '').sort());
    expect(out.flagged.map((f) => f.row)).toEqual(want.map((f, i) => (f !== '' ? i + 2 : 0)).filter(Boolean));
  });

  test('the written flags column spills QC.FLAGS and the review below computes QC.REVIEW', () => {
    const g = readControls(grid);
    const c: ReviewChoice = { ...guessChoice(g, '1-3s/2-2s/R-4s'), sd: { kind: 'number', value: 2 } };
    const out = reviewControls(g, c);
    if ('error' in out) throw new Error(out.error);
    const [flags, review] = reviewBlock(g, c, PROV);
    expect(flags).toMatchObject({ row: 1, col: 5 });
    expect(flags.cells[0][0]?.content).toEqual({ kind: 'text', text: 'Flags (1-3s/2-2s/R-4s)' });
    expect(flags.cells[1][0]?.content).toEqual({ kind: 'formula', formula: '=LEEWAY.QC.FLAGS($C$2:$C$11,$D$2:$D$11,2,"1-3s/2-2s/R-4s",$A$2:$A$11,$B$2:$B$11)' });
    expect(flags.cells.slice(2).every((r) => r[0] === null)).toBe(true);
    expect(review).toMatchObject({ row: 13, col: 1 });
    const hf = leewaySheet({ QC: sheetWith(grid, [flags, review]) });
    out.flags.forEach((f, i) => expect(valueAt(hf, 2 + i, 5) ?? '').toBe(f));
    const headerAt = review.cells.findIndex((r) => r[0]?.content.kind === 'text' && r[0].content.text === 'Figure');
    // The values sit under the table's last column; the labels run over the empty cells between.
    expect(review.cells[0]).toHaveLength(4);
    expect(review.widths).toBeUndefined();
    Object.keys(out.figures).forEach((label, i) => expectSame(valueAt(hf, review.row + headerAt + 1 + i, 4), out.figures[label], label));
    hf.destroy();
  });

  test('without run or material columns the optional arguments are left out', () => {
    const one: CellGrid = { sheet: 'QC', address: 'QC!C2:C6', firstRow: 2, firstColumn: 3, values: [[101], [104.5], [104.8], [99], [93.5]] };
    const g = readControls(one);
    const c: ReviewChoice = { ...guessChoice(g, '1-2s'), target: { kind: 'number', value: 100 }, sd: { kind: 'number', value: 2 } };
    expect(c).toMatchObject({ values: 0, runs: null, levels: null });
    const [flags] = reviewBlock(g, c, PROV);
    expect(flags.cells[0][0]?.content).toEqual({ kind: 'formula', formula: '=LEEWAY.QC.FLAGS($C$2:$C$6,100,2,"1-2s")' });
    const out = reviewControls(g, c);
    if ('error' in out) throw new Error(out.error);
    expect(out.flags).toEqual(evaluate('QC.FLAGS', [one.values, 100, 2, '1-2s']).map((r) => r[0]));
    expect(out.series).toHaveLength(1);
  });

  test('a missing SD, a bad rule and a role given twice have clear messages', () => {
    const g = readControls(grid);
    const c = guessChoice(g, '1-3s');
    expect(() => checkChoice(g, c)).toThrow(/Give the SD/);
    const bad = reviewControls(g, { ...c, sd: { kind: 'number', value: 2 }, rule: '1-3q' });
    expect('error' in bad && bad.error).toMatch(/^#VALUE! /);
    expect(() => checkChoice(g, { ...c, sd: { kind: 'number', value: 2 }, runs: 2 })).toThrow(/two roles/);
    const zero = reviewControls(g, { ...c, sd: { kind: 'number', value: 0 } });
    expect('error' in zero && zero.error).toMatch(/^#/);
  });
});

describe('the rule a review starts from', () => {
  test('is the QC plan of the analyte in use (QC.PLAN against its tier’s allowable total error)', () => {
    const state = new PaneState();
    state.setTable('demo', demoTable());
    const r = state.rows().find((x) => x.cvg !== null)!;
    state.setObserved([[keyOf(r), { bias: 0.8, cv: 1.1, from: 'typed' }]]);
    state.setAnalyteTier(keyOf(r), 'minimum');
    const allowable = evaluate('SPEC.TOTAL', [r.cvi, r.cvg, 'minimum', 1.65])[0][0] as number;
    const plan = evaluate('QC.PLAN', [allowable, 0.8, 1.1]);
    const d = defaultRule(state, r);
    expect(d.rule).toBe(plan[1][0]);
    expect(d.from).toMatch(/^the QC plan of .* at the minimum tier \(its own tier, chosen in Fill\), n = /);
  });

  test('is the common multirule, with the reason, when the analyte has no observed bias and CV', () => {
    const state = new PaneState();
    state.setTable('demo', demoTable());
    const d = defaultRule(state, state.rows()[0]);
    expect(d.rule).toBe(FALLBACK_RULE);
    expect(d.from).toMatch(/no observed bias and CV/);
  });
});

describe('a figure typed in the pane', () => {
  test('is a number (decimal point or comma), a cell on this or another sheet, blank, or refused with the reason', () => {
    expect(readTyped(' 1.5 ')).toEqual({ kind: 'number', value: 1.5 });
    expect(readTyped('1,5')).toEqual({ kind: 'number', value: 1.5 });
    expect(readTyped('')).toEqual({ kind: 'blank' });
    expect(readTyped('h2')).toEqual({ kind: 'cell', sheet: null, address: 'H2', ref: '$H$2' });
    expect(readTyped('$H$2')).toMatchObject({ kind: 'cell', address: 'H2', ref: '$H$2' });
    expect(readTyped('Claims!B3')).toEqual({ kind: 'cell', sheet: 'Claims', address: 'B3', ref: 'Claims!$B$3' });
    expect(readTyped("'Lot 7 claims'!B3")).toEqual({ kind: 'cell', sheet: 'Lot 7 claims', address: 'B3', ref: "'Lot 7 claims'!$B$3" });
    expect(readTyped('1.5%')).toEqual({ kind: 'number', value: 1.5 });
    expect(readTyped('about 2')).toEqual({ kind: 'bad', why: '"about 2" is neither a number nor a cell such as H2' });
    expect(readTyped('1.234,5')).toMatchObject({ kind: 'bad' });
  });
});
