/**
 * How live formulas are stored in the file. What is known (Office maintainers in public issue
 * threads, see src/cli/xlsx.ts): JavaScript custom functions are saved with the prefix
 * "_xldudf_" and the namespace's dot as an underscore; the dots inside a family name were not
 * confirmed, and this writer turns them into underscores too.
 */
import { storedFormula, typedFormula, headerHeight } from '../../src/cli/xlsx';

describe('storedFormula / typedFormula', () => {
  test('NS.FAMILY.FUNC( becomes _xldudf_NS_FAMILY_FUNC(, without the leading =', () => {
    expect(storedFormula('=LEEWAY.SPEC.TOTAL(D7,E7,$B$3,$B$4)')).toBe('_xldudf_LEEWAY_SPEC_TOTAL(D7,E7,$B$3,$B$4)');
    expect(storedFormula('=LEEWAY.ZSCORE(0.95)')).toBe('_xldudf_LEEWAY_ZSCORE(0.95)');
  });

  test('every call in a formula is renamed, built-in functions and string literals are not', () => {
    const f = '=IF(L7="",IF(M7="","LEEWAY.SPEC.CV(x)",M7),LEEWAY.SPEC.FIXED(N7,L7,N(M7)))';
    expect(storedFormula(f)).toBe('IF(L7="",IF(M7="","LEEWAY.SPEC.CV(x)",M7),_xldudf_LEEWAY_SPEC_FIXED(N7,L7,N(M7)))');
    expect(storedFormula('=leeway.spec.cv(A1)')).toBe('_xldudf_LEEWAY_SPEC_CV(A1)');
  });

  test('typedFormula undoes storedFormula', () => {
    for (const f of ['=LEEWAY.SPEC.TOTAL(D7,E7,IF(F7="",$B$3,F7),$B$4)', '=IF(L7="",IF(M7="","",M7),LEEWAY.SPEC.FIXED(N7,L7,N(M7)))', '=SUM(A1:A3)']) {
      expect(typedFormula(storedFormula(f))).toBe(f);
    }
  });

  test('header rows are tall enough for their wrapped texts (15 points a line, at most 4)', () => {
    expect(headerHeight([['Analyte', 12]])).toBe(15);
    // "Allowable / total error / %" in 11 characters a line.
    expect(headerHeight([['Allowable total error %', 12]])).toBe(45);
    expect(headerHeight([['a b c d e f g h i j', 2]])).toBe(60);
  });
});
