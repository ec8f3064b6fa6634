/**
 * The EQA sheet: a laboratory's external quality assessment results across rounds, one printable
 * document sheet. Per analyte and round: the result, the assigned value, sd_pt, the assigned
 * value's uncertainty, the deviation in percent, the score (z or z′; ζ beside it when the
 * laboratory gives its own uncertainty) as a live add-in formula over the sheet's own cells with
 * the engine's value cached, its band, the running mean and RMS of the deviation, and the EQA
 * limit judged. Then the comparison rounds among the laboratory's own analysers (scored against
 * their Algorithm A consensus), a chart per analyte, notes on every figure, the caution, the
 * note that the EQA provider's own evaluation is the one of record, and the sign-off.
 *
 * The figures come from src/engine/eqaRounds.ts; nothing here computes a figure of its own.
 */
import { createHash } from 'crypto';
import type ExcelJS from 'exceljs';
import { DocumentSheet } from '../document';
import type { DocValue, Paper, PrintLayout } from '../document';
import { storedFormula } from '../xlsx';
import { pngSize, svgToPng } from '../picture';
import { eqaRounds, scorePeerRound, NEGLIGIBLE_U_SHARE } from '../../engine/eqaRounds';
import type { EqaAnalyteRounds, EqaLimit, EqaRoundFigures, PeerResult, PeerRound } from '../../engine/eqaRounds';
import type { Fig } from '../../engine/assess';
import { columnLetters } from '../../engine/fill';
import { labelKey } from '../../engine/import/order';
import { show as showNumber } from '../../engine/guards';
import { eqaChartRounds, eqaChartSvg } from '../../charts/eqaChart';
import { keepBlocksTogether, placePictures, rowsFor } from './layout';
import type { Picture } from './layout';

/** One result of an analyte in a round: what the EQA results importer accepts, and optionally the laboratory's own uncertainty. */
export interface EqaSheetRecord {
  readonly analyte: string;
  readonly round: string;
  readonly result: number;
  readonly assigned: number;
  readonly sdPt: number;
  readonly uAssigned: number;
  readonly unit?: string;
  readonly date?: string | null;
  readonly note?: string;
  /** The laboratory's standard uncertainty of its result, same unit: gives ζ. */
  readonly uResult?: number | null;
}

/** Where the results came from: a file (its name and bytes, for the SHA-256) or the invented demo. */
export type EqaSheetSource = { readonly kind: 'file'; readonly name: string; readonly bytes: Uint8Array } | { readonly kind: 'demo' };

/** A comparison round among the laboratory's own analysers or sites for one analyte. */
export interface EqaPeerRoundInput {
  readonly analyte: string;
  readonly round: string;
  readonly unit?: string;
  readonly results: readonly PeerResult[];
}

export interface EqaSheetInput {
  /** In file order; grouped by analyte (case and surrounding spaces ignored) in order of first appearance, rounds kept in order. */
  readonly results: readonly EqaSheetRecord[];
  /** EQA limits by analyte name (case and surrounding spaces ignored); an analyte without one is not judged. */
  readonly limits?: Readonly<Record<string, EqaLimit>>;
  readonly source: EqaSheetSource;
  /** The date the document is of, YYYY-MM-DD. */
  readonly date: string;
  readonly paper?: Paper;
  /** Default "EQA". */
  readonly sheetName?: string;
  /** Default "External quality assessment across rounds". */
  readonly title?: string;
  /** The page header's title; default "Leeway — <sheet name>". */
  readonly pageTitle?: string;
  /** Lines under the title (a scenario, a scheme's name). */
  readonly intro?: readonly string[];
  readonly peerRounds?: readonly EqaPeerRoundInput[];
}

export interface EqaSheetWritten {
  readonly ws: ExcelJS.Worksheet;
  readonly layout: PrintLayout;
  readonly analytes: readonly EqaAnalyteRounds[];
  readonly peers: readonly PeerRound[];
  /** The first row of each analyte's rounds in the rounds table. */
  readonly firstRows: readonly number[];
  readonly pictures: number;
}

export const EQA_SHEET_NAME = 'EQA';
export const EQA_SHEET_TITLE = 'External quality assessment across rounds';
/** Said on every EQA sheet. */
export const PROVIDER_OF_RECORD =
  "The EQA provider's own evaluation of each round is the one of record; these figures are the laboratory's own reading of its results, for its review.";
/** Width of each chart, px (print). */
const CHART_WIDTH = 560;
const P2 = '0.00';

/** SHA-256 of the source file, lower-case hex. */
export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** The provenance line. */
export function provenance(source: EqaSheetSource): string {
  return source.kind === 'demo' ? 'Source: DEMO — invented data (the built-in demo scenario).' : `Source: ${source.name}, SHA-256 ${sha256Hex(source.bytes)}.`;
}

/** An EQA limit in words: "± 9 µmol/L or ± 10 %" (whichever is greater at the assigned value). */
export function limitText(limit: EqaLimit | undefined, unit: string): string {
  const abs = limit?.absolute ?? null;
  const pct = limit?.percent ?? null;
  const absText = abs !== null ? `± ${showNumber(abs)}${unit ? ` ${unit}` : ' (result unit)'}` : '';
  if (abs !== null && pct !== null) return `${absText} or ± ${showNumber(pct)} %`;
  if (abs !== null) return absText;
  if (pct !== null) return `± ${showNumber(pct)} %`;
  return 'none given';
}

interface Group {
  readonly analyte: string;
  readonly unit: string;
  readonly records: readonly EqaSheetRecord[];
  readonly limit: EqaLimit | undefined;
}

function groups(input: EqaSheetInput): Group[] {
  const limits = new Map(Object.entries(input.limits ?? {}).map(([k, v]) => [labelKey(k), v]));
  const by = new Map<string, EqaSheetRecord[]>();
  for (const r of input.results) {
    const k = labelKey(r.analyte);
    const list = by.get(k);
    if (list) list.push(r);
    else by.set(k, [r]);
  }
  return [...by].map(([k, records]) => ({ analyte: records[0].analyte, unit: records.find((r) => r.unit)?.unit ?? '', records, limit: limits.get(k) }));
}

/** A figure as a cell: its value, its error, or nothing when absent. */
function cell<T extends number | string | boolean>(f: Fig<T>): DocValue {
  if (f.ok) return typeof f.value === 'boolean' ? (f.value ? 'yes' : 'no') : f.value;
  return f.absent ? null : { error: f.code };
}

type Col = 'analyte' | 'round' | 'date' | 'result' | 'assigned' | 'sdPt' | 'uAssigned' | 'deviation' | 'kind' | 'score' | 'band' | 'uResult' | 'zeta' | 'zetaBand' | 'mean' | 'rms' | 'limit' | 'within' | 'note';

const HEADERS: Record<Col, string> = {
  analyte: 'Analyte',
  round: 'Round',
  date: 'Date',
  result: 'Result',
  assigned: 'Assigned value',
  sdPt: 'sd_pt',
  uAssigned: 'u(assigned)',
  deviation: 'Deviation %',
  kind: 'Score type',
  score: 'Score',
  band: 'Band',
  uResult: 'u(result)',
  zeta: 'ζ',
  zetaBand: 'ζ band',
  mean: 'Running mean deviation %',
  rms: 'Running RMS deviation %',
  limit: 'EQA limit %',
  within: 'Within EQA limit',
  note: 'Note',
};

/** The rounds table's columns: the optional ones only when some round has them. */
function columns(records: readonly EqaSheetRecord[]): Col[] {
  const cols: Col[] = ['analyte', 'round'];
  if (records.some((r) => r.date)) cols.push('date');
  cols.push('result', 'assigned', 'sdPt', 'uAssigned', 'deviation', 'kind', 'score', 'band');
  if (records.some((r) => r.uResult !== undefined && r.uResult !== null)) cols.push('uResult', 'zeta', 'zetaBand');
  cols.push('mean', 'rms', 'limit', 'within');
  if (records.some((r) => r.note)) cols.push('note');
  return cols;
}

/** A live add-in call with the engine's value (or error) cached, as `leeway fill --live` stores it. */
function liveCell(ws: ExcelJS.Worksheet, row: number, col: number, typed: string, f: Fig<number>): void {
  const c = ws.getCell(row, col);
  const result: ExcelJS.CellFormulaValue['result'] = f.ok ? f.value : f.absent ? undefined : { error: f.code as ExcelJS.CellErrorValue['error'] };
  c.value = { formula: storedFormula(typed), result };
  c.numFmt = P2;
}

function roundRow(doc: DocumentSheet, cols: readonly Col[], g: Group, r: EqaRoundFigures): void {
  const at = (c: Col): number => cols.indexOf(c) + 1;
  const ref = (c: Col): string => `${columnLetters(at(c))}${row}`;
  const i = r.input as EqaSheetRecord;
  const values: Record<Col, DocValue> = {
    analyte: g.analyte,
    round: i.round,
    date: i.date ?? null,
    result: i.result,
    assigned: i.assigned,
    sdPt: i.sdPt,
    uAssigned: i.uAssigned,
    deviation: cell(r.deviation),
    kind: r.scoreKind,
    score: null,
    band: cell(r.band),
    uResult: i.uResult ?? null,
    zeta: null,
    zetaBand: cell(r.zetaBand),
    mean: cell(r.runningMean),
    rms: cell(r.runningRms),
    limit: cell(r.limit),
    within: cell(r.withinLimit),
    note: i.note ?? null,
  };
  const formats: Partial<Record<Col, string>> = { deviation: P2, mean: P2, rms: P2, limit: P2 };
  const row = doc.line(
    cols.map((c) => values[c]),
    { formats: cols.map((c) => formats[c]) },
  );
  const uArg = r.scoreKind === 'z′' ? `,${ref('uAssigned')}` : '';
  liveCell(doc.ws, row, at('score'), `=LEEWAY.EQA.ZSCORE(${ref('result')},${ref('assigned')},${ref('sdPt')}${uArg})`, r.score);
  if (cols.includes('zeta') && i.uResult !== undefined && i.uResult !== null) {
    liveCell(doc.ws, row, at('zeta'), `=LEEWAY.EQA.ZETA(${ref('result')},${ref('assigned')},${ref('uResult')},${ref('uAssigned')})`, r.zeta);
  }
}

function summaryTable(doc: DocumentSheet, gs: readonly Group[], analytes: readonly EqaAnalyteRounds[]): void {
  doc.text('Summary by analyte', { bold: true, size: 12 });
  doc.header(['Analyte', 'EQA limit', 'Unit', 'Rounds', 'Satisfactory', 'Questionable', 'Unsatisfactory', 'Within EQA limit', 'Mean deviation %', 'RMS deviation %']);
  analytes.forEach((a, k) => {
    const s = a.summary;
    const within = s.judged ? `${s.within} of ${s.judged}` : 'not judged';
    doc.line([a.analyte, limitText(gs[k].limit, gs[k].unit), gs[k].unit, s.rounds, s.satisfactory, s.questionable, s.unsatisfactory, within, cell(s.mean), cell(s.rms)], { formats: [undefined, undefined, undefined, '0', '0', '0', '0', undefined, P2, P2] });
  });
  doc.skip();
}

function roundsTable(doc: DocumentSheet, gs: readonly Group[], analytes: readonly EqaAnalyteRounds[], records: readonly EqaSheetRecord[]): number[] {
  const cols = columns(records);
  doc.text('Rounds', { bold: true, size: 12 });
  doc.printTitle(doc.header(cols.map((c) => HEADERS[c])));
  const firsts: number[] = [];
  analytes.forEach((a, k) => {
    if (k > 0) doc.skip();
    firsts.push(doc.row);
    for (const r of a.rounds) roundRow(doc, cols, gs[k], r);
  });
  if (cols.includes('note')) doc.wrap(cols.indexOf('note') + 1);
  doc.skip();
  return firsts;
}

/** Writes the comparison rounds; returns each round's rows (to keep on one page). */
function peerSection(doc: DocumentSheet, peers: readonly EqaPeerRoundInput[], scored: readonly PeerRound[]): Array<[number, number]> {
  const blocks: Array<[number, number]> = [];
  if (!peers.length) return blocks;
  const head = doc.text("Comparison rounds among the laboratory's own analysers", { bold: true, size: 12 });
  doc.note('Each result against the consensus of all the analysers in the round: assigned value = robust mean x*, sd_pt = robust SD s*, u(assigned) = 1.25·s*/√p (LEEWAY.EQA.CONSENSUS, Algorithm A); z′ while u(assigned) > 0.3·s* (fewer than 18 analysers).');
  peers.forEach((p, k) => {
    const s = scored[k];
    const top = doc.text(`${p.analyte}${p.unit ? ` (${p.unit})` : ''}, round ${p.round}: ${p.results.length} analysers`, { bold: true });
    doc.header(['Robust mean', 'Robust SD', 'Participants', 'Uncertainty of the assigned value']);
    const cRow = doc.row++;
    doc.header(['Analyser or site', 'Result', 'Deviation % from consensus', 'Score type', 'Score', 'Band']);
    const first = doc.row;
    const kind = s.scoreKind.ok ? s.scoreKind.value : null;
    for (const r of s.scores) {
      const row = doc.line([r.name, r.result, cell(r.deviation), kind, null, cell(r.band)], { formats: [undefined, undefined, P2] });
      const uArg = kind === 'z′' ? `,$D$${cRow}` : '';
      liveCell(doc.ws, row, 5, `=LEEWAY.EQA.ZSCORE(B${row},$A$${cRow},$B$${cRow}${uArg})`, r.score);
    }
    const c = s.consensus;
    const values: DocValue[] = c.ok ? [c.value.robustMean, c.value.robustSd, c.value.participants, c.value.uncertainty] : [cell(c), null, null, null];
    values.forEach((v, j) => doc.put(cRow, j + 1, v, { format: j === 2 ? '0' : '0.000' }));
    // The section's heading and note stay with its first round.
    blocks.push([k === 0 ? head : top, doc.note(`Consensus: =LEEWAY.EQA.CONSENSUS(B${first}:B${doc.row - 1}); scores: =LEEWAY.EQA.ZSCORE(result, robust mean, robust SD${kind === 'z′' ? ', uncertainty' : ''}).`)]);
    doc.skip();
  });
  return blocks;
}

/** The pictures: one chart per analyte, its PNG rendered from the shared SVG. */
function charts(analytes: readonly EqaAnalyteRounds[], gs: readonly Group[]): Picture[] {
  return analytes.map((a, k) => {
    const svg = eqaChartSvg({ title: `${a.analyte}${gs[k].unit ? ` (${gs[k].unit})` : ''}: deviation by round`, rounds: eqaChartRounds(a), width: CHART_WIDTH, id: `eqa-${k}` });
    const png = svgToPng(svg, 2);
    const size = pngSize(png);
    return { png, width: size.width / 2, height: size.height / 2 };
  });
}

/** Writes the notes; returns their rows. */
function notes(doc: DocumentSheet): [number, number] {
  const first = doc.text('How each figure is computed', { bold: true, size: 12 });
  for (const line of [
    'Deviation % = 100·(result − assigned)/assigned. Running mean and running RMS: the mean of the deviations % of this round and every earlier one, and the square root of the mean of their squares (bias and scatter together).',
    `Score: z = (result − assigned)/sd_pt (=LEEWAY.EQA.ZSCORE(result, assigned, sd_pt)) when u(assigned) ≤ ${NEGLIGIBLE_U_SHARE}·sd_pt; otherwise z′ = (result − assigned)/√(sd_pt² + u(assigned)²) (=LEEWAY.EQA.ZSCORE(result, assigned, sd_pt, u)). ISO 13528:2015.`,
    'ζ = (result − assigned)/√(u(result)² + u(assigned)²) (=LEEWAY.EQA.ZETA), shown when the laboratory gives its own standard uncertainty; it judges the result and that uncertainty together.',
    'Band of the score as reported (two decimals): |score| ≤ 2 satisfactory, 2 < |score| < 3 questionable, |score| ≥ 3 unsatisfactory (ISO 13528:2015).',
    'EQA limit %: a limit of "± units or ± %" is the greater of the two at each round\'s assigned value, in percent (=LEEWAY.SPEC.FIXED(assigned, absolute, percent)); within the limit when |deviation %| ≤ the limit.',
    'The Score and ζ cells are add-in formulas over this sheet\'s cells, saved with their values: with the add-in installed they recalculate; without it the saved values show.',
  ]) doc.note(line);
  return [first, doc.row - 1];
}

/**
 * Writes the EQA sheet into `wb` and returns what it wrote. Throws (an Error) only for a sheet
 * name already in the workbook; every figure that cannot be computed is an error cell saying so.
 */
export function writeEqaSheet(wb: ExcelJS.Workbook, input: EqaSheetInput): EqaSheetWritten {
  const name = input.sheetName ?? EQA_SHEET_NAME;
  if (wb.getWorksheet(name)) throw new Error(`the workbook already has a sheet named ${name}`);
  const demo = input.source.kind === 'demo';
  const title = input.title ?? EQA_SHEET_TITLE;
  const doc = new DocumentSheet(wb.addWorksheet(name), { title, pageTitle: input.pageTitle ?? `Leeway — ${name}`, demo, date: input.date, paper: input.paper });
  doc.title(title);
  if (demo) doc.demoMarker();
  for (const line of input.intro ?? []) doc.text(line);
  doc.caution();
  doc.text(PROVIDER_OF_RECORD, { bold: true });
  doc.text(provenance(input.source));
  doc.skip();

  const gs = groups(input);
  const analytes = gs.map((g) => eqaRounds(g.analyte, g.records, { limit: g.limit }));
  summaryTable(doc, gs, analytes);
  const firstRows = roundsTable(doc, gs, analytes, input.results);
  const pictures = charts(analytes, gs);
  const perRow = 2;
  const rowsEach = Math.max(1, ...pictures.map((p) => rowsFor(p.height, 15)));
  let chartRow = doc.row;
  if (pictures.length) {
    doc.text('Deviation from the assigned value by round', { bold: true, size: 12 });
    chartRow = doc.row;
    doc.skip(Math.ceil(pictures.length / perRow) * rowsEach);
  }
  const peers = (input.peerRounds ?? []).map((p) => scorePeerRound(p.results));
  const peerBlocks = peerSection(doc, input.peerRounds ?? [], peers);
  const noteBlock = notes(doc);
  const layout = doc.finish();
  placePictures(wb, doc.ws, layout, pictures, chartRow, rowsEach, perRow);
  const blocks: Array<[number, number]> = [];
  // The first row of pictures keeps its heading with it.
  for (let k = 0; k < Math.ceil(pictures.length / perRow); k++) blocks.push([chartRow + k * rowsEach - (k === 0 ? 1 : 0), chartRow + (k + 1) * rowsEach - 2]);
  blocks.push(...peerBlocks, noteBlock, [layout.signOffRow, layout.lastRow]);
  keepBlocksTogether(doc.ws, layout, blocks);
  return { ws: doc.ws, layout, analytes, peers, firstRows, pictures: pictures.length };
}
