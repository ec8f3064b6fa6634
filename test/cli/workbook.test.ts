/**
 * The package layer of the template fill, part by part, on small hand-written parts. Sources of
 * the expected structure: ECMA-376 Part 1 (SpreadsheetML): 18.3.1.73 row and its optional r
 * (a row without r follows the one before), 18.3.1.4 c and its optional r, 18.3.1.40 f (shared
 * and array formulas), 18.4 shared strings (rich-text runs, phonetic runs), 22.9.2.19 ST_Xstring
 * (the _xHHHH_ escape), 18.8.30 numFmt (built-in ids 1 "0" and 2 "0.00"); ECMA-376 Part 2 for
 * relationship targets; XML 1.0 for entities and well-formedness (checked with saxes).
 */
import { cellXml, editSheet, readSharedStrings, readSheet, shiftFormula } from '../../src/cli/workbook/sheet';
import { StyleBook } from '../../src/cli/workbook/styles';
import { checkWellFormed, parsePrintArea } from '../../src/cli/workbook/template';
import { resolveTarget, relsPathOf } from '../../src/cli/workbook/package';
import { tags, XmlError } from '../../src/cli/workbook/xml';
import type { CellEdit } from '../../src/cli/workbook/sheet';

const MAIN = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const sheetXml = (data: string, before = '', after = ''): string => `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<worksheet xmlns="${MAIN}">${before}<sheetData>${data}</sheetData>${after}</worksheet>`;
const styles = (xfs = '<xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/>'): StyleBook => new StyleBook(`<styleSheet xmlns="${MAIN}"><cellXfs count="${(xfs.match(/<xf /g) ?? []).length}">${xfs}</cellXfs></styleSheet>`);
const num = (row: number, col: number, value: number, format?: string): CellEdit => ({ row, col, content: { kind: 'number', value }, ...(format ? { format } : {}) });
const txt = (row: number, col: number, t: string): CellEdit => ({ row, col, content: { kind: 'text', text: t } });

function edit(xml: string, edits: CellEdit[], book = styles()): string {
  const read = readSheet(xml, []);
  const out = editSheet(xml, edits, book, read.columnStyles, read.formulaCells).xml;
  checkWellFormed(out, 'sheet');
  return out;
}

describe('reading a worksheet part', () => {
  test('values by type: numbers, shared and inline strings (runs joined, phonetic runs left out), booleans, errors, formulas in their typed form', () => {
    const sst = readSharedStrings(`<sst xmlns="${MAIN}"><si><t>plain</t></si><si><r><t>rich </t></r><r><t xml:space="preserve">text</t></r><rPh><t>PHONETIC</t></rPh></si><si/><si><t>a_x000D_b</t></si></sst>`);
    expect(sst).toEqual(['plain', 'rich text', '', 'a\rb']);
    const xml = sheetXml(
      '<row r="2"><c r="A2"><v>5.5</v></c><c r="B2" t="s"><v>1</v></c><c r="C2" t="inlineStr"><is><t>in &amp; line</t></is></c><c r="D2" t="b"><v>1</v></c><c r="E2" t="e"><v>#N/A</v></c><c r="F2"><f>_xldudf_LEEWAY_SPEC_CV(A2,"desirable")</f><v>2.75</v></c><c r="G2" s="3"/></row>',
    );
    expect(readSheet(xml, sst).cells).toEqual([
      { row: 2, col: 1, value: 5.5 },
      { row: 2, col: 2, value: 'rich text' },
      { row: 2, col: 3, value: 'in & line' },
      { row: 2, col: 4, value: true },
      { row: 2, col: 5, value: '#N/A' },
      { row: 2, col: 6, value: '=LEEWAY.SPEC.CV(A2,"desirable")' },
    ]);
  });

  test('rows and cells without r follow the one before; a prefixed main namespace reads the same', () => {
    const xml = `<x:worksheet xmlns:x="${MAIN}"><x:sheetData><x:row r="3"><x:c><x:v>1</x:v></x:c><x:c><x:v>2</x:v></x:c></x:row><x:row><x:c r="C4"><x:v>3</x:v></x:c><x:c><x:v>4</x:v></x:c></x:row></x:sheetData></x:worksheet>`;
    expect(readSheet(xml, []).cells).toEqual([
      { row: 3, col: 1, value: 1 },
      { row: 3, col: 2, value: 2 },
      { row: 4, col: 3, value: 3 },
      { row: 4, col: 4, value: 4 },
    ]);
  });

  test('merges, widths (stored width less 0.71 of padding; hidden columns 0), array formulas and shared-formula heads are kept as locked', () => {
    const xml = sheetXml(
      '<row r="1"><c r="A1"><f t="shared" ref="A1:A3" si="0">B1*2</f><v>2</v></c><c r="C1"><f t="array" ref="C1:C2">TRANSPOSE(D1:E1)</f><v>1</v></c></row><row r="2"><c r="A2"><f t="shared" si="0"/><v>4</v></c></row>',
      '<sheetFormatPr baseColWidth="10" defaultRowHeight="15"/><cols><col min="1" max="2" width="20.71" customWidth="1"/><col min="3" max="3" width="9" hidden="1"/></cols>',
      '<mergeCells count="1"><mergeCell ref="B3:C3"/></mergeCells>',
    );
    const r = readSheet(xml, []);
    expect(r.merges).toEqual([{ top: 3, left: 2, bottom: 3, right: 3 }]);
    expect(r.widths[1]).toBeCloseTo(20, 10);
    expect(r.widths[3]).toBe(0);
    expect(r.defaultWidth).toBeCloseTo(10.43, 10);
    expect(r.locked.map((l) => l.reason)).toEqual(['the first cell of the shared formula A1:A3, which the cells after it read', 'part of the array formula C1:C2']);
    // A cell sharing the formula reads it moved by its own offset.
    expect(r.cells.find((c) => c.row === 2)!.value).toBe('=B2*2');
  });

  test('shared formulas move relative references only; text in quotes and function names stay', () => {
    expect(shiftFormula('B1*2+$C$1+C$1+$D2+SUM(E1:F2)+"A1"+LOG10(A1)', 2, 1)).toBe('C3*2+$C$1+D$1+$D4+SUM(F3:G4)+"A1"+LOG10(B3)');
  });
});

describe('writing cells into a worksheet part', () => {
  test('a new cell goes between its neighbours in column order; a new row between rows; the rest of the part is as it was', () => {
    const rows = '<row r="1" spans="1:3"><c r="A1"><v>1</v></c><c r="C1"><v>3</v></c></row><row r="5"><c r="A5"><v>5</v></c></row>';
    const tail = '<mergeCells count="1"><mergeCell ref="A9:B9"/></mergeCells><extLst><ext uri="{X}"><y:z xmlns:y="urn:y"/></ext></extLst>';
    const xml = sheetXml(rows, '<dimension ref="A1:C5"/>', tail);
    const out = edit(xml, [num(1, 2, 2), num(3, 1, 7), num(6, 4, 8)]);
    expect(out).toContain('<row r="1" spans="1:3"><c r="A1"><v>1</v></c><c r="B1"><v>2</v></c><c r="C1"><v>3</v></c></row>');
    expect(out).toContain('<row r="3"><c r="A3"><v>7</v></c></row><row r="5"><c r="A5"><v>5</v></c></row><row r="6"><c r="D6"><v>8</v></c></row>');
    expect(out).toContain('<dimension ref="A1:D6"/>');
    expect(out.endsWith(`</sheetData>${tail}</worksheet>`)).toBe(true);
  });

  test('an existing styled empty cell keeps its style and other attributes; its old type, metadata and children go', () => {
    const xml = sheetXml('<row r="2"><c r="B2" s="4" t="s" cm="1" ph="1"><v>0</v><extLst/></c></row>');
    const out = edit(xml, [txt(2, 2, 'new')], styles('<xf numFmtId="0"/><xf numFmtId="0"/><xf numFmtId="0"/><xf numFmtId="0"/><xf numFmtId="0"/>'));
    expect(out).toContain('<c r="B2" s="4" t="inlineStr" ph="1"><is><t>new</t></is></c>');
  });

  test('text is an inline string whatever it starts with, escaped for XML and ST_Xstring; leading spaces kept', () => {
    const t = '=1+1 & <b> _x0041_ \u0001 ';
    const xml = cellXml('', 'A1', undefined, { kind: 'text', text: t });
    expect(xml).toBe('<c r="A1" t="inlineStr"><is><t xml:space="preserve">=1+1 &amp; &lt;b&gt; _x005F_x0041_ _x0001_ </t></is></c>');
    checkWellFormed(`<r xmlns="${MAIN}">${xml}</r>`, 'cell');
    // Read back through the reader: the same text.
    const back = readSheet(sheetXml(`<row r="1">${xml}</row>`), []).cells[0].value;
    expect(back).toBe('=1+1 & <b> _x0041_ \u0001 ');
  });

  test('formulas with their cached results: a number as <v>, text as t="str", an error as t="e"; the add-in name as Excel stores it', () => {
    const f = (result: number | string | { error: '#N/A'; message: string }): string => cellXml('', 'E7', 2, { kind: 'formula', formula: '=LEEWAY.SPEC.TOTAL(C7,D7,$B$2,$B$3)', result });
    expect(f(6.939965083526444)).toBe('<c r="E7" s="2"><f>_xldudf_LEEWAY_SPEC_TOTAL(C7,D7,$B$2,$B$3)</f><v>6.939965083526444</v></c>');
    expect(f('')).toBe('<c r="E7" s="2" t="str"><f>_xldudf_LEEWAY_SPEC_TOTAL(C7,D7,$B$2,$B$3)</f><v></v></c>');
    expect(f({ error: '#N/A', message: 'cvg is blank' })).toBe('<c r="E7" s="2" t="e"><f>_xldudf_LEEWAY_SPEC_TOTAL(C7,D7,$B$2,$B$3)</f><v>#N/A</v></c>');
  });

  test('a row or cell numbered by its position gets its number when something is inserted before it', () => {
    const xml = sheetXml('<row r="2"><c><v>1</v></c><c><v>2</v></c></row><row><c r="A3"><v>3</v></c></row>');
    const out = edit(xml, [num(1, 1, 9)]);
    expect(readSheet(out, []).cells).toEqual([
      { row: 1, col: 1, value: 9 },
      { row: 2, col: 1, value: 1 },
      { row: 2, col: 2, value: 2 },
      { row: 3, col: 1, value: 3 },
    ]);
    const out2 = edit(sheetXml('<row r="1"><c><v>1</v></c><c><v>2</v></c></row>'), [num(1, 1, 0)]);
    expect(readSheet(out2, []).cells).toEqual([
      { row: 1, col: 1, value: 0 },
      { row: 1, col: 2, value: 2 },
    ]);
  });

  test('an empty sheetData and an empty row element are opened to take cells; a prefixed part gets prefixed cells', () => {
    expect(edit(sheetXml('').replace('<sheetData></sheetData>', '<sheetData/>'), [num(1, 1, 1)])).toContain('<sheetData><row r="1"><c r="A1"><v>1</v></c></row></sheetData>');
    expect(edit(sheetXml('<row r="4" ht="20" customHeight="1"/>'), [num(4, 2, 1)])).toContain('<row r="4" ht="20" customHeight="1"><c r="B4"><v>1</v></c></row>');
    const px = `<x:worksheet xmlns:x="${MAIN}"><x:sheetData><x:row r="1"><x:c r="A1"><x:v>1</x:v></x:c></x:row></x:sheetData></x:worksheet>`;
    expect(edit(px, [txt(1, 2, 'b')])).toContain('<x:c r="B1" t="inlineStr"><x:is><x:t>b</x:t></x:is></x:c></x:row>');
  });

  test('a new cell takes the row’s style when the row has one, else the column’s', () => {
    const xml = sheetXml('<row r="2" s="1" customFormat="1"><c r="A2"><v>1</v></c></row>', '<cols><col min="3" max="3" width="9" style="2"/></cols>');
    const out = edit(xml, [num(2, 2, 5), num(3, 3, 6)], styles('<xf numFmtId="0"/><xf numFmtId="0"/><xf numFmtId="0"/>'));
    expect(out).toContain('<c r="B2" s="1"><v>5</v></c>');
    expect(out).toContain('<c r="C3" s="2"><v>6</v></c>');
  });
});

describe('number formats', () => {
  test('a General cell gets a copy of its format with the number format, appended once to cellXfs; built-in ids for 0 and 0.00, new ids from 164', () => {
    const book = styles('<xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/><xf numFmtId="0" fontId="1" fillId="0" borderId="2" xfId="0" applyBorder="1"><alignment wrapText="1"/></xf>');
    expect(book.styleFor(1, '0.00')).toBe(2);
    expect(book.styleFor(1, '0.00')).toBe(2);
    expect(book.styleFor(undefined, '0.000')).toBe(3);
    const out = book.toXml();
    checkWellFormed(out, 'styles');
    expect(out).toContain('<cellXfs count="4">');
    expect(out).toContain('<xf numFmtId="2" fontId="1" fillId="0" borderId="2" xfId="0" applyBorder="1" applyNumberFormat="1"><alignment wrapText="1"/></xf>');
    expect(out).toContain('<numFmts count="1"><numFmt numFmtId="164" formatCode="0.000"/></numFmts>');
  });

  test('a cell with the lab’s own number format keeps it; General written as a custom format counts as General', () => {
    const book = new StyleBook(`<styleSheet xmlns="${MAIN}"><numFmts count="2"><numFmt numFmtId="164" formatCode="General"/><numFmt numFmtId="165" formatCode="0.0"/></numFmts><cellXfs count="2"><xf numFmtId="164"/><xf numFmtId="165"/></cellXfs></styleSheet>`);
    expect(book.styleFor(1, '0.00')).toBe(1);
    expect(book.styleFor(0, '0.00')).toBe(2);
    expect(book.styleFor(0, '0.000')).toBe(3);
    expect(book.toXml()).toContain('<numFmt numFmtId="166" formatCode="0.000"/></numFmts>');
  });
});

describe('small parts', () => {
  test('relationship targets resolve against the folder of their source part; rels paths', () => {
    expect(resolveTarget('xl/workbook.xml', 'worksheets/sheet1.xml')).toBe('xl/worksheets/sheet1.xml');
    expect(resolveTarget('xl/worksheets/sheet1.xml', '../drawings/drawing1.xml')).toBe('xl/drawings/drawing1.xml');
    expect(resolveTarget('xl/workbook.xml', '/xl/styles.xml')).toBe('xl/styles.xml');
    expect(relsPathOf('xl/workbook.xml')).toBe('xl/_rels/workbook.xml.rels');
  });

  test('print areas: ranges, whole columns, whole rows, several areas, quoted sheet names', () => {
    expect(parsePrintArea("'My sheet'!$A$1:$F$30,'My sheet'!$H$2")).toEqual([
      { top: 1, left: 1, bottom: 30, right: 6 },
      { top: 2, left: 8, bottom: 2, right: 8 },
    ]);
    expect(parsePrintArea('Sheet1!$A:$C')).toEqual([{ top: 1, left: 1, bottom: 1048576, right: 3 }]);
    expect(parsePrintArea('Sheet1!$1:$10')).toEqual([{ top: 1, left: 1, bottom: 10, right: 16384 }]);
  });

  test('the scanner keeps offsets, skips comments, CDATA and processing instructions, and refuses a DOCTYPE', () => {
    const xml = '<?xml version="1.0"?><!-- <a> --><a x="1>2"><![CDATA[<b>]]><b/></a>';
    expect([...tags(xml)].map((t) => [t.kind, t.name, xml.slice(t.start, t.end)])).toEqual([
      ['open', 'a', '<a x="1>2">'],
      ['empty', 'b', '<b/>'],
      ['close', 'a', '</a>'],
    ]);
    expect(() => [...tags('<!DOCTYPE x [<!ENTITY e "e">]><x/>')]).toThrow(XmlError);
  });
});
