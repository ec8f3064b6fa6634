/** The EQA sheet of the command line (one print-ready document sheet of EQA results across rounds). */
export { writeEqaSheet, sha256Hex, provenance, limitText, EQA_SHEET_NAME, EQA_SHEET_TITLE, PROVIDER_OF_RECORD } from './sheet';
export type { EqaSheetInput, EqaSheetRecord, EqaSheetSource, EqaPeerRoundInput, EqaSheetWritten } from './sheet';
