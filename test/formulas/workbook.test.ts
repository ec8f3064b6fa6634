/**
 * Formula-level tests in a real spreadsheet engine (HyperFormula): a small QC workbook typed as a
 * user would — cell references, a tier cell and a z cell, ranges that spill, the tier cell changed
 * and the sheet recalculated, bad inputs showing the right error in the cell.
 */
import { DetailedCellError } from 'hyperformula';
import { leewaySheet } from '../support/hyperformula';
import { allowableTotalError, allowableImprecision } from '../../src/engine/spec';
import { sigmaMetric, observedTotalError } from '../../src/engine/perf';

// Columns: A analyte, B CVI, C CVG, D CV, E bias, F spec CV, G spec bias, H TEa, I observed TE, J sigma, K tier met
const row = (r: number) => [
  `=LEEWAY.SPEC.CV(B${r},$B$10)`,
  `=LEEWAY.SPEC.BIAS(B${r},C${r},$B$10)`,
  `=LEEWAY.SPEC.TOTAL(B${r},C${r},$B$10,$B$11)`,
  `=LEEWAY.PERF.TOTAL(E${r},D${r},$B$11)`,
  `=LEEWAY.PERF.SIGMA(H${r},E${r},D${r})`,
  `=LEEWAY.PERF.TIER(B${r},C${r},E${r},D${r},$B$11)`,
];

function workbook() {
  return leewaySheet({
    QC: [
      ['Analyte', 'CVI', 'CVG', 'CV', 'Bias', 'Spec CV', 'Spec bias', 'TEa', 'Observed TE', 'Sigma', 'Tier met'],
      ['Analyte one (demo)', 5.7, 6.9, 1.2, -0.8, ...row(2)],
      ['Analyte two (demo)', 12, 20, 4, 3, ...row(3)],
      ['Analyte three (demo)', 'n/a', 20, 4, 3, ...row(4)],
      ['Analyte four (demo)', null, 20, 4, 3, ...row(5)],
      ['Analyte five (demo)', -3, 20, 4, 3, ...row(6)],
      ['Analyte six (demo)', 8, 10, 0, 1, ...row(7)],
      [],
      [],
      ['Tier', 'desirable'],
      ['z', 1.65],
      ['Spill', '=LEEWAY.SPEC.CV(B2:B3,$B$10)'],
      [],
      ['Tiers', '=LEEWAY.SPEC.TIERS(B2,C2)'],
    ],
  });
}

const at = (hf: ReturnType<typeof workbook>, a1: string) => {
  const addr = hf.simpleCellAddressFromString(a1, 0);
  if (!addr) throw new Error(a1);
  return hf.getCellValue(addr);
};
const errorOf = (v: unknown) => (v instanceof DetailedCellError ? v.value : undefined);

describe('a QC workbook in a spreadsheet engine', () => {
  test('row formulas equal the engine', () => {
    const hf = workbook();
    expect(at(hf, 'F2')).toBe(allowableImprecision(5.7, 'desirable'));
    expect(at(hf, 'H2')).toBe(allowableTotalError(5.7, 6.9, 'desirable', 1.65));
    expect(at(hf, 'I2')).toBe(observedTotalError(-0.8, 1.2, 1.65));
    expect(at(hf, 'J2')).toBe(sigmaMetric(allowableTotalError(5.7, 6.9, 'desirable', 1.65), -0.8, 1.2));
    expect(at(hf, 'K2')).toBe('optimum'); // 0.8 + 1.65·1.2 = 2.78 ≤ 3.47 (optimum TEa)
    expect(at(hf, 'K3')).toBe('desirable'); // 3 + 6.6 = 9.6: above 7.87 (optimum), within 15.73
  });

  test('changing the tier cell recalculates every dependent formula', () => {
    const hf = workbook();
    const before = at(hf, 'H3');
    hf.setCellContents(hf.simpleCellAddressFromString('B10', 0)!, 'minimum');
    expect(at(hf, 'H3')).toBe(allowableTotalError(12, 20, 'minimum', 1.65));
    expect(at(hf, 'H3')).not.toBe(before);
    hf.setCellContents(hf.simpleCellAddressFromString('B11', 0)!, 2.33);
    expect(at(hf, 'H3')).toBe(allowableTotalError(12, 20, 'minimum', 2.33));
  });

  test('a range argument spills down; SPEC.TIERS spills its 4×4 table', () => {
    const hf = workbook();
    expect(at(hf, 'B12')).toBe(2.85);
    expect(at(hf, 'B13')).toBe(6);
    expect(at(hf, 'B14')).toBe('Tier');
    expect(at(hf, 'E14')).toBe('Total');
    expect(at(hf, 'B16')).toBe('desirable');
    expect(at(hf, 'E16')).toBe(allowableTotalError(5.7, 6.9, 'desirable', 1.65));
  });

  test('bad inputs show the right error in the cell, with a message', () => {
    const hf = workbook();
    expect(errorOf(at(hf, 'F4'))).toBe('#VALUE!'); // text CVI
    expect((at(hf, 'F4') as DetailedCellError).message).toMatch(/cvi must be a number/);
    expect(errorOf(at(hf, 'F5'))).toBe('#N/A'); // blank CVI
    expect(errorOf(at(hf, 'F6'))).toBe('#NUM!'); // negative CVI
    expect(errorOf(at(hf, 'J7'))).toBe('#DIV/0!'); // CV of zero in the sigma
    hf.setCellContents(hf.simpleCellAddressFromString('B10', 0)!, 'best');
    expect(errorOf(at(hf, 'F2'))).toBe('#VALUE!');
    expect((at(hf, 'F2') as DetailedCellError).message).toMatch(/optimum/);
  });
});
