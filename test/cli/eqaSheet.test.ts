/**
 * The EQA sheet writer (src/cli/eqa): fed the EQA results importer's accepted records, as
 * `leeway review --eqa` will feed it, written to a file and read back. Score cells are add-in
 * calls over the sheet's own cells whose cached values the registry reproduces from those cells.
 */
import * as path from 'path';
import ExcelJS from 'exceljs';
import { writeEqaSheet, sha256Hex, PROVIDER_OF_RECORD, limitText } from '../../src/cli/eqa';
import type { EqaSheetInput } from '../../src/cli/eqa';
import { columnPoints } from '../../src/cli/document';
import { newWorkbook } from '../../src/cli/files';
import { typedFormula } from '../../src/cli/xlsx';
import { acceptEqa, parseEqaText } from '../../src/engine/import';
import { CAUTION, DEMO_MARKER } from '../../src/engine/caution';
import { columnNumber } from '../../src/engine/fill';
import { evaluate } from '../../src/registry';
import { tempDir } from './support';

const CSV = [
  'analyte,round,result,assigned,sd_pt,u_assigned,unit,date',
  // z: u 0.05 ≤ 0.3·0.25; (5.5 − 5)/0.25 = 2 exactly: satisfactory; deviation 10 %.
  'Demo-one,R1,5.5,5.0,0.25,0.05,mmol/L,2026-01-10',
  // z′: u 0.4 > 0.3·0.3; (4.0 − 5.0)/√(0.09 + 0.16) = −2: satisfactory; deviation −20 %.
  'Demo-one,R2,4.0,5.0,0.3,0.4,mmol/L,2026-02-10',
  // z = 0.75/0.25 = 3 exactly: unsatisfactory; deviation 15 %.
  'Demo-one,R3,5.75,5.0,0.25,,mmol/L,2026-03-10',
  // Assigned 0: deviation #DIV/0!, the score is still (0.2 − 0)/0.1 = 2.
  'Demo-two,S1,0.2,0,0.1,0,U/L,2026-01-11',
  'Demo-two,S2,10.5,10,0.2,0,U/L,2026-02-11',
].join('\n');

function records() {
  const report = parseEqaText(CSV, { name: 'eqa.csv', importedAt: '2026-03-01T00:00:00Z' });
  return acceptEqa(report).results;
}

async function roundTrip(input: EqaSheetInput): Promise<{ ws: ExcelJS.Worksheet; file: string }> {
  const wb = newWorkbook();
  writeEqaSheet(wb, input);
  const file = path.join(tempDir('eqa-sheet'), 'eqa.xlsx');
  await wb.xlsx.writeFile(file);
  const back = new ExcelJS.Workbook();
  await back.xlsx.readFile(file);
  return { ws: back.getWorksheet('EQA')!, file };
}

const texts = (ws: ExcelJS.Worksheet): string[] => {
  const out: string[] = [];
  ws.eachRow((row) => row.eachCell((c) => void (typeof c.value === 'string' && out.push(c.value))));
  return out;
};

/** The rounds table: its header row and the columns by header text. */
function roundsTable(ws: ExcelJS.Worksheet): { header: number; col: (name: string) => number } {
  let header = 0;
  ws.eachRow((row, r) => {
    if (!header && row.getCell(1).value === 'Analyte' && row.getCell(2).value === 'Round') header = r;
  });
  expect(header).toBeGreaterThan(0);
  const names: string[] = [];
  ws.getRow(header).eachCell((c, k) => void (names[k] = String(c.value)));
  return { header, col: (name) => names.indexOf(name) };
}

const bytes = new TextEncoder().encode(CSV);
const input = (over: Partial<EqaSheetInput> = {}): EqaSheetInput => ({
  results: records(),
  limits: { 'demo-one': { absolute: 0.6, percent: 12 } },
  source: { kind: 'file', name: 'eqa.csv', bytes },
  date: '2026-03-01',
  ...over,
});

describe('writeEqaSheet', () => {
  test('SHA-256 of "abc" (FIPS 180-2, appendix B.1)', () => {
    expect(sha256Hex(new TextEncoder().encode('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  test('provenance, the caution and the provider-of-record note; no demo marker for a file', async () => {
    const { ws } = await roundTrip(input());
    const t = texts(ws);
    expect(t).toContain(`Source: eqa.csv, SHA-256 ${sha256Hex(bytes)}.`);
    expect(t).toContain(PROVIDER_OF_RECORD);
    expect(t.filter((x) => CAUTION.includes(x) && x.length > 20).join(' ')).toBe(CAUTION);
    expect(t).not.toContain(DEMO_MARKER);
    expect(t).toContain('Sign-off');
  });

  test('score cells are live EQA.ZSCORE calls over the row, z or z′ by the 0.3·sd_pt rule, cached values the registry reproduces', async () => {
    const { ws } = await roundTrip(input());
    const { header, col } = roundsTable(ws);
    const score = col('Score');
    const kinds: string[] = [];
    const scores: number[] = [];
    for (let r = header + 1; r <= header + 3; r++) {
      const v = ws.getCell(r, score).value as ExcelJS.CellFormulaValue;
      expect(v.formula.startsWith('_xldudf_LEEWAY_EQA_ZSCORE(')).toBe(true);
      const typed = typedFormula(v.formula);
      const refs = /\(([^)]*)\)/.exec(typed)![1].split(',');
      const args = refs.map((ref) => {
        const m = /^([A-Z]+)(\d+)$/.exec(ref)!;
        expect(Number(m[2])).toBe(r);
        return ws.getCell(r, columnNumber(m[1])).value as number;
      });
      expect(evaluate('EQA.ZSCORE', args)[0][0]).toBe(v.result);
      kinds.push(String(ws.getCell(r, col('Score type')).value));
      scores.push(v.result as number);
    }
    expect(kinds).toEqual(['z', 'z′', 'z']);
    expect(scores[0]).toBe(2);
    expect(Math.abs(scores[1] + 2)).toBeLessThanOrEqual(4e-16 * 2);
    expect(scores[2]).toBe(3);
    expect([1, 2, 3].map((k) => ws.getCell(header + k, col('Band')).value)).toEqual(['satisfactory', 'satisfactory', 'unsatisfactory']);
  });

  test('deviation, running figures and the EQA limit: ± 0.6 units or ± 12 % at assigned 5 is 12 %', async () => {
    const { ws } = await roundTrip(input());
    const { header, col } = roundsTable(ws);
    const at = (k: number, name: string) => ws.getCell(header + k, col(name)).value;
    expect([1, 2, 3].map((k) => at(k, 'Deviation %'))).toEqual([10, -20, 15]);
    expect(at(3, 'Running mean deviation %')).toBeCloseTo(5 / 3, 13);
    expect(at(3, 'Running RMS deviation %')).toBeCloseTo(Math.sqrt((100 + 400 + 225) / 3), 13);
    expect([1, 2, 3].map((k) => at(k, 'EQA limit %'))).toEqual([12, 12, 12]);
    expect([1, 2, 3].map((k) => at(k, 'Within EQA limit'))).toEqual(['yes', 'no', 'no']);
    // Demo-two starts after one empty row: its assigned value 0 gives #DIV/0! for the deviation; no limit, no verdict.
    expect(at(5, 'Analyte')).toBe('Demo-two');
    expect(at(5, 'Deviation %')).toEqual({ error: '#DIV/0!' });
    expect((at(5, 'Score') as ExcelJS.CellFormulaValue).result).toBe(2);
    expect(at(5, 'Within EQA limit')).toEqual({ error: '#DIV/0!' });
    expect(at(6, 'EQA limit %')).toBeNull();
    expect(limitText({ absolute: 0.6, percent: 12 }, 'mmol/L')).toBe('± 0.6 mmol/L or ± 12 %');
  });

  test('no ζ columns without the laboratory’s uncertainty; a live EQA.ZETA with it', async () => {
    const plain = await roundTrip(input());
    expect(roundsTable(plain.ws).col('ζ')).toBe(-1);
    const withU = await roundTrip(input({ results: records().map((r) => ({ ...r, uResult: 0.3 })) }));
    const { header, col } = roundsTable(withU.ws);
    const z = withU.ws.getCell(header + 1, col('ζ')).value as ExcelJS.CellFormulaValue;
    expect(typedFormula(z.formula)).toMatch(/^=LEEWAY\.EQA\.ZETA\(D\d+,E\d+,[A-Z]+\d+,G\d+\)$/);
    // (5.5 − 5)/√(0.3² + 0.05²)
    expect(Math.abs((z.result as number) - 0.5 / Math.hypot(0.3, 0.05))).toBeLessThanOrEqual(1e-15);
  });

  test('one chart picture per analyte, each within the printed width of the columns', async () => {
    const { ws } = await roundTrip(input());
    const images = ws.getImages();
    expect(images).toHaveLength(2);
    const widths: number[] = [];
    ws.columns.forEach((c, i) => void (widths[i] = columnPoints(c.width ?? 9)));
    const area = ws.pageSetup.printArea as string;
    const lastCol = columnNumber(/:([A-Z]+)\d+$/.exec(area)![1]);
    const room = widths.slice(0, lastCol).reduce((a, b) => a + b, 0);
    for (const img of images) {
      const range = img.range as unknown as { tl: { nativeCol: number }; ext: { width: number; height: number } };
      const left = widths.slice(0, range.tl.nativeCol).reduce((a, b) => a + b, 0);
      expect(left + range.ext.width * 0.75).toBeLessThanOrEqual(room + 1);
    }
  });

  test('the same sheet name twice is refused', () => {
    const wb = newWorkbook();
    writeEqaSheet(wb, input());
    expect(() => writeEqaSheet(wb, input())).toThrow(/already has a sheet named EQA/);
  });

  test('a demo source carries the demo marker and says so in the provenance', async () => {
    const { ws } = await roundTrip(input({ source: { kind: 'demo' } }));
    const t = texts(ws);
    expect(t).toContain(DEMO_MARKER);
    expect(t).toContain('Source: DEMO — invented data (the built-in demo scenario).');
  });
});
