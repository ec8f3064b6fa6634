/**
 * The document-sheet layer: every worksheet the CLI creates with exceljs goes through a
 * DocumentSheet, so that each prints as a document (page set-up, header and footer, caution,
 * sign-off, widths from the content). See docs/reference/printing.md.
 */
export { DocumentSheet, SET_IN, tableBodyOf, SIGN_OFF_FIELDS, SIGN_OFF_ROLES, SIGN_OFF_TITLE, WRAP_WIDTH, MAX_WIDTH, shownText, signOffGroups, styleHeader } from './sheet';
export type { BodyRow, BodyStyle, BodyValue, FormulaResult, TableBody, DocValue, DocumentOptions, LineStyle, PrintLayout, RowOptions } from './sheet';
export { planDocument } from './plan';
export { PAPERS, MARGINS, PORTRAIT_MIN_SCALE, chooseOrientation, fitScale, headerFooterStrings, printable } from './page';
export type { Orientation, Paper } from './page';
export { CELL_PADDING, LINE_POINTS, columnPoints, longestWord, textUnits, wrappedLines } from './measure';
