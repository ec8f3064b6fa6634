/**
 * A period of control results picked from the selection: which column holds the results, and
 * optionally the run and the material of each; the target and SD as numbers or columns; the
 * control rule. The flags are QC.FLAGS's and the summary QC.REVIEW's (the registry's evaluate on
 * the selection's cells); the chart is drawn from the same evaluation of the same series. The
 * block written beside the data is a column of one live QC.FLAGS formula that spills down the
 * results' rows, and the QC.REVIEW figures below the data.
 */
import type { BlockArea, BlockCell, CellGrid } from '../host';
import type { GridCell } from '../../engine/table';
import { a1 } from '../../engine/fill';
import { isLeewayError } from '../../engine/errors';
import { parseRule } from '../../engine/qc/rules';
import { evaluateControls } from '../../engine/qc/flags';
import type { ControlEvaluation } from '../../engine/qc/flags';
import { series as controlSeries } from '../../registry/catalogue/qc';
import { evaluate } from '../../registry';
import type { Arg } from '../../registry';
import type { Grid } from '../../registry/types';
import { chartSeries } from '../../charts/controlChart';
import type { ChartSeries } from '../../charts/controlChart';
import { asColumnGrid, columnRef, refuseNumbersAsText, SelectionProblem, studyGrid } from './columns';
import type { StudyColumn, StudyGrid } from './columns';
import { callText, cautionRows, formula, headRows, indexFormula, isError, labelledFigures, numberText, text, wordText } from './figures';
import type { Figure, Provenance } from './figures';
import { QC_REVIEW } from '../../registry/catalogue/qc';

/** The target or the SD: one number for every result, or a column of the selection. */
export type Setting = { readonly kind: 'number'; readonly value: number } | { readonly kind: 'column'; readonly index: number };

export interface ReviewChoice {
  /** Indexes into the study's columns; runs and levels may be null. */
  readonly values: number;
  readonly runs: number | null;
  readonly levels: number | null;
  readonly target: Setting;
  readonly sd: Setting;
  readonly rule: string;
}

const WORDS: ReadonlyArray<readonly [keyof Omit<ReviewChoice, 'rule'>, RegExp]> = [
  ['values', /^(value|values|result|results|control result|observed)\b/i],
  ['runs', /^(run|runs|date|day|time|date-?time|batch)\b/i],
  ['levels', /^(level|levels|material|control|lot)\b/i],
  ['target', /^(target|mean|assigned|expected)\b/i],
  ['sd', /^(sd|s\.d\.|standard deviation)\b/i],
];

const numeric = (c: StudyColumn): number => c.cells.filter((v) => typeof v === 'number').length;

/** A first choice of columns from the header names, else from what the columns hold. */
export function guessChoice(g: StudyGrid, rule: string): ReviewChoice {
  const found: Partial<Record<string, number>> = {};
  g.columns.forEach((c, i) => {
    for (const [role, re] of WORDS) if (found[role] === undefined && re.test(c.name)) found[role] = i;
  });
  let values = found.values;
  if (values === undefined) {
    const taken = new Set(Object.values(found));
    values = g.columns.findIndex((c, i) => !taken.has(i) && numeric(c) >= Math.max(1, c.cells.length / 2));
    if (values < 0) values = g.columns.length - 1;
  }
  let runs = found.runs ?? null;
  if (runs === null && found.values === undefined && values > 0 && numeric(g.columns[values - 1]) < g.columns[values - 1].cells.length) runs = values - 1;
  return {
    values,
    runs,
    levels: found.levels ?? null,
    target: found.target !== undefined ? { kind: 'column', index: found.target } : { kind: 'number', value: NaN },
    sd: found.sd !== undefined ? { kind: 'column', index: found.sd } : { kind: 'number', value: NaN },
    rule,
  };
}

/** Reads the selection as columns (one at least). */
export function readControls(grid: CellGrid): StudyGrid {
  const g = studyGrid(grid);
  if (!g.columns.length || g.bottom < g.top) throw new SelectionProblem('Select the control results: a column of results, and beside it, if you have them, the run, the material, the target and the SD.');
  return g;
}

function settingArg(g: StudyGrid, s: Setting): Arg {
  return s.kind === 'number' ? [[s.value]] : asColumnGrid(g.columns[s.index]);
}

function settingRef(g: StudyGrid, s: Setting): string {
  return s.kind === 'number' ? numberText(s.value) : columnRef(g, g.columns[s.index]);
}

/** Checks a choice against the selection; a number stored as text in a used column is refused. */
export function checkChoice(g: StudyGrid, c: ReviewChoice): void {
  const used = [c.values, c.target.kind === 'column' ? c.target.index : -1, c.sd.kind === 'column' ? c.sd.index : -1].filter((i) => i >= 0);
  if (new Set([c.values, c.runs, c.levels].filter((i) => i !== null)).size !== [c.values, c.runs, c.levels].filter((i) => i !== null).length) {
    throw new SelectionProblem('One column is chosen for two roles: pick a different column for the results, the runs and the materials.');
  }
  if (c.target.kind === 'number' && !Number.isFinite(c.target.value)) throw new SelectionProblem('Give the target: a number, or the column that holds it.');
  if (c.sd.kind === 'number' && !Number.isFinite(c.sd.value)) throw new SelectionProblem('Give the SD: a number, or the column that holds it.');
  if (c.rule.trim() === '') throw new SelectionProblem('Give the control rule, e.g. 1-3s/2-2s/R-4s.');
  refuseNumbersAsText(g, used.map((i) => g.columns[i]));
}

function args(g: StudyGrid, c: ReviewChoice): Arg[] {
  return [
    asColumnGrid(g.columns[c.values]),
    settingArg(g, c.target),
    settingArg(g, c.sd),
    c.rule,
    c.runs === null ? null : asColumnGrid(g.columns[c.runs]),
    c.levels === null ? null : asColumnGrid(g.columns[c.levels]),
  ];
}

function refs(g: StudyGrid, c: ReviewChoice): Array<string | undefined> {
  return [
    columnRef(g, g.columns[c.values]),
    settingRef(g, c.target),
    settingRef(g, c.sd),
    wordText(c.rule.trim()),
    c.runs === null ? undefined : columnRef(g, g.columns[c.runs]),
    c.levels === null ? undefined : columnRef(g, g.columns[c.levels]),
  ];
}

/** One flagged result, for the text list beside the chart. */
export interface FlagLine {
  /** The sheet row of the result. */
  readonly row: number;
  readonly run: string;
  readonly level: string;
  readonly z: number;
  readonly flags: string;
}

export interface ReviewOutcome {
  /** QC.FLAGS per data row ("" for none). */
  readonly flags: readonly string[];
  readonly figures: Record<string, Figure>;
  readonly series: ChartSeries[];
  readonly flagged: FlagLine[];
  /** The sheet row of each point of the chart, by "material|index" (as chartSeries numbers them). */
  readonly rowOfPoint: ReadonlyMap<string, number>;
}

const labelOf = (v: GridCell): string => (v === null || v === undefined ? '' : String(v).trim());

/** Flags, review figures and chart series; a failure of the whole call as the worksheet would show it. */
export function reviewControls(g: StudyGrid, c: ReviewChoice): ReviewOutcome | { error: string } {
  const a = args(g, c);
  const out = evaluate('QC.FLAGS', a);
  const rows = g.bottom - g.top + 1;
  if (out.length !== rows) {
    const e = out[0][0];
    return { error: isError(e) ? `${e.error} ${e.message}` : 'QC.FLAGS did not give one flag per result' };
  }
  const flags = out.map((r) => (isError(r[0]) ? `${r[0].error}` : String(r[0])));
  const figures = labelledFigures('QC.REVIEW', a);
  let ev: ControlEvaluation;
  try {
    ev = evaluateControls(controlSeries(a[0] as Grid, a[1] as Grid, a[2] as Grid, parseRule(c.rule), (a[4] ?? undefined) as Grid | undefined, (a[5] ?? undefined) as Grid | undefined));
  } catch (e) {
    if (isLeewayError(e)) return { error: `${e.code} ${e.message}` };
    throw e;
  }
  const flagged: FlagLine[] = [];
  flags.forEach((f, i) => {
    const z = ev.z[i];
    if (f === '' || z === null) return;
    flagged.push({
      row: g.top + i,
      run: c.runs === null ? '' : labelOf(g.columns[c.runs].cells[i]),
      level: c.levels === null ? '' : labelOf(g.columns[c.levels].cells[i]),
      z,
      flags: f,
    });
  });
  const rowOfPoint = new Map<string, number>();
  for (let i = 0; i < ev.z.length; i++) if (ev.z[i] !== null) rowOfPoint.set(`${ev.levelLabels[ev.level[i]]}|${ev.position[i] + 1}`, g.top + i);
  return { flags, figures, series: chartSeries(ev), flagged, rowOfPoint };
}

/** The labels of QC.REVIEW's spill: the catalogue's own. */
export const REVIEW_LABELS = QC_REVIEW.labels;

const REVIEW_FORMATS: Readonly<Record<string, string>> = {
  'Share of runs flagged': '0.000',
  'Expected false rejection per run': '0.000',
  'Mean z': '0.00',
  'SD of z': '0.00',
};

export const REVIEW_LABEL_WIDTH = 30;
export const REVIEW_VALUE_WIDTH = 12;
export const FLAGS_WIDTH = 14;

/**
 * Two areas: the flags column right of the selection (a header where the selection has one,
 * then one QC.FLAGS formula spilling down the results' rows), and the review below the data.
 */
export function reviewBlock(g: StudyGrid, c: ReviewChoice, p: Provenance): BlockArea[] {
  const r = refs(g, c);
  const flagCol = g.columns[g.columns.length - 1].col + 1;
  const rows = g.bottom - g.top + 1;
  const flagCells: (BlockCell | null)[][] = [];
  if (g.headerRow !== null) flagCells.push([text(`Flags (${c.rule.trim()})`, 'header')]);
  flagCells.push([formula(`=${callText('QC.FLAGS', r)}`)]);
  for (let i = 1; i < rows; i++) flagCells.push([null]);
  const flags: BlockArea = { row: g.headerRow ?? g.top, col: flagCol, cells: flagCells, widths: [FLAGS_WIDTH] };

  // Below a table of three or more columns, each label runs over the empty cells to its right
  // and the value sits under the table's last column: the table's own widths stay as they are.
  // Below one or two columns, the first column is widened to hold the labels.
  const width = Math.max(2, g.columns.length);
  const wrap = width > 2 ? Math.max(40, width * 9) : REVIEW_LABEL_WIDTH + REVIEW_VALUE_WIDTH;
  const row = (label: BlockCell, value: BlockCell): (BlockCell | null)[] => [label, ...new Array<null>(width - 2).fill(null), value];
  const body: (BlockCell | null)[][] = [row(text('Figure', 'header'), text('Value', 'header'))];
  for (const label of REVIEW_LABELS) body.push(row(text(label, 'label'), formula(indexFormula('QC.REVIEW', r, label), REVIEW_FORMATS[label] ?? '0')));
  const review: BlockArea = {
    row: g.bottom + 2,
    col: g.columns[0].col,
    cells: [...headRows(p, width, wrap), ...body, ...cautionRows(width, wrap)],
    ...(width > 2 ? {} : { widths: [REVIEW_LABEL_WIDTH, REVIEW_VALUE_WIDTH] }),
  };
  return [flags, review];
}

/** "F2" for the flags' first formula cell (where Excel spills from). */
export function flagsAnchor(g: StudyGrid): string {
  return a1({ row: g.top, col: g.columns[g.columns.length - 1].col + 1 });
}
