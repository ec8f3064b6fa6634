/**
 * The generic importer of lab files and its kinds: control results files and EQA results files
 * (the variation table, the first kind, lives in ../table and reads through this importer too).
 * The task pane and the command line call these same functions, so both give the same report.
 */
export type { ColumnMappingOf, FileReading, ImportColumn, ImportProblem, ImportReport, ProblemCode, ReadOptions, Severity } from './types';
export { IMPORT_LIMITS, describeBytes } from './limits';
export { guessDelimiter, splitRecords } from './records';
export type { Delimiter, Records } from './records';
export { decideDecimalMark, readNumberText, resolveAmbiguous } from './numbers';
export type { DecimalDecision, Mark, NumberReading } from './numbers';
export { readDateText } from './dates';
export type { DateReading } from './dates';
export { LIMIT_WORDS, headerKey, headerParts, headerUnit, looksLikeUnit, readHeader, sameUnit } from './headers';
export type { HeaderReading, HeaderSpec, UnitRule } from './headers';
export { columnsOf, makeReport, prepareBytes, prepareGrid, prepareText, readRows } from './read';
export type { Cell, ImportKind, Prepared, RowReader, Sheet } from './read';
export { columnText, decimalText, formatProblem, formatReading, formatReport, separatorName } from './report';
export {
  RESULTS_ALIASES,
  RESULTS_FIELDS,
  RESULTS_KIND,
  RESULTS_NUMERIC,
  RESULTS_REQUIRED,
  acceptResults,
  parseResultsBytes,
  parseResultsGrid,
  parseResultsText,
} from './results';
export type { ControlAnalyteResults, ControlLevelResults, ControlResult, ControlResultsFile, ResultsField, ResultsImport, ResultsMapping, ResultsOptions, ResultsProblem } from './results';
export { EQA_ALIASES, EQA_FIELDS, EQA_KIND, EQA_NUMERIC, EQA_REQUIRED, acceptEqa, parseEqaBytes, parseEqaGrid, parseEqaText } from './eqa';
export type { EqaAnalyteResults, EqaField, EqaImport, EqaMapping, EqaOptions, EqaProblem, EqaResult, EqaResultsFile } from './eqa';
export { decodeText, ACCEPTED_ENCODINGS } from '../text/decode';
export type { DecodeFailure, DecodeResult, TextEncodingName } from '../text/decode';
