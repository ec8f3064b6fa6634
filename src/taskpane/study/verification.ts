/**
 * A replication study verified against the manufacturer's claims, one material per column of
 * results beside one column of run or day labels: per material the CVs with their confidence
 * limits (DATA.PRECISION, DATA.CVLIMITS), the claims, the verification limits and verdicts
 * (VERIFY.PRECISION), trueness against an assigned value (VERIFY.TRUENESS) and sigma with its
 * limits (PERF.SIGMALIMITS) against the allowable total error of the analyte in use.
 *
 * One list of rows is the single description of both what the pane shows and what it writes:
 * each row gives its figure (the registry's evaluate on the selection's cells) and its cell in
 * the written block (the same function as a live formula on the selection's ranges, reading
 * the block's own cells for the figures it depends on).
 */
import type { BlockArea, BlockCell, CellGrid } from '../host';
import type { GridCell } from '../../engine/table';
import { a1 } from '../../engine/fill';
import type { Arg } from '../../registry';
import { asColumnGrid, columnRef, counts, refuseNumbersAsText, SelectionProblem, studyGrid } from './columns';
import type { StudyColumn, StudyGrid } from './columns';
import { cautionRows, formula, headRows, indexFormula, isError, labelledFigures, number, numberText, padRow, singleFigure, text } from './figures';
import type { Figure, Provenance } from './figures';

/** A figure the user gives: typed, or read from a cell (then the written block refers to it). */
export type Given =
  | { readonly kind: 'number'; readonly value: number }
  | { readonly kind: 'cell'; readonly ref: string; readonly value: GridCell };

export interface MaterialInput {
  readonly claimRepeatability: Given | null;
  readonly claimWithinLab: Given | null;
  readonly assigned: Given | null;
  readonly uAssigned: Given | null;
}

/** The allowable total error in use and where it came from. */
export interface SpecInUse {
  readonly value: Figure;
  /** The formula argument that gives it (a SPEC.TOTAL call on the table's numbers, or a number). */
  readonly formulaText: string;
  /** "Analyte X (serum): desirable tier (the pane's choice), z 1.65; table "…", source …". */
  readonly from: string;
}

/** A bias taken from elsewhere when a material has no assigned value (the pane's observed bias). */
export interface BiasInUse {
  readonly value: number;
  readonly from: string;
}

export interface ReplicationStudy {
  readonly grid: StudyGrid;
  readonly labels: StudyColumn;
  readonly materials: readonly StudyColumn[];
}

export type Section = 'study' | 'repeatability' | 'withinlab' | 'trueness' | 'sigma';

interface Ctx {
  readonly study: ReplicationStudy;
  readonly m: StudyColumn;
  readonly input: MaterialInput;
  readonly samples: number;
  readonly spec: SpecInUse | null;
  readonly bias: BiasInUse | null;
}

/** One row of the verification: its figure per material and its cell in the written block. */
interface Row {
  readonly key: string;
  readonly label: string;
  readonly section: Section;
  readonly format: string;
  readonly applies: (c: Ctx) => boolean;
  readonly value: (c: Ctx, get: (key: string) => Figure) => Figure;
  /** Null: nothing to write (the cell stays empty). */
  readonly cell: (c: Ctx, ref: (key: string) => string) => BlockCell | null;
}

/** Reads a selection: the first column holds the run or day labels, each further column one material's results. */
export function readReplication(grid: CellGrid): ReplicationStudy {
  const g = studyGrid(grid);
  if (g.columns.length < 2) {
    throw new SelectionProblem('Select the run or day labels and, beside them, one column of results per material (labels in the first column).');
  }
  const [labels, ...materials] = g.columns;
  if (g.bottom - g.top + 1 < 3) throw new SelectionProblem('The selection has fewer than 3 rows of results: select the whole replication study.');
  refuseNumbersAsText(g, materials);
  for (const m of materials) {
    if (counts(m).numbers < 2) throw new SelectionProblem(`${m.name} has fewer than 2 numbers: each column after the labels must hold one material's results.`);
  }
  return { grid: g, labels, materials };
}

const gridOf = (c: Ctx): { v: Arg; g: Arg } => ({ v: asColumnGrid(c.m), g: asColumnGrid(c.study.labels) });
const refsOf = (c: Ctx): { v: string; g: string } => ({ v: columnRef(c.study.grid, c.m), g: columnRef(c.study.grid, c.study.labels) });
const givenValue = (g: Given | null): Arg => (g === null ? null : g.kind === 'number' ? g.value : g.value ?? null);
const givenCell = (g: Given | null, format: string): BlockCell | null => (g === null ? null : g.kind === 'number' ? number(g.value, format) : formula(`=${g.ref}`, format));

/** A figure that needs others: the first error among them, else the call. */
function chain(inputs: readonly Figure[], f: () => Figure): Figure {
  const e = inputs.find(isError);
  return e !== undefined ? e : f();
}

function precisionArgs(c: Ctx, get: (k: string) => Figure): Arg[] {
  const { v, g } = gridOf(c);
  return [v, g, get('claimR') as Arg, get('claimWl') as Arg, c.samples];
}

function precisionRefs(c: Ctx, ref: (k: string) => string): string[] {
  const { v, g } = refsOf(c);
  return [v, g, ref('claimR'), ref('claimWl'), numberText(c.samples)];
}

function truenessArgs(c: Ctx, get: (k: string) => Figure): Arg[] {
  const { v, g } = gridOf(c);
  return [v, g, get('assigned') as Arg, get('uAssigned') as Arg, c.samples];
}

function truenessRefs(c: Ctx, ref: (k: string) => string): string[] {
  const { v, g } = refsOf(c);
  return [v, g, ref('assigned'), ref('uAssigned'), numberText(c.samples)];
}

const always = (): boolean => true;
const hasTrueness = (c: Ctx): boolean => c.input.assigned !== null;
const hasSigma = (c: Ctx): boolean => c.spec !== null && (hasTrueness(c) || c.bias !== null);

function precisionRow(key: string, label: string, section: Section, figure: string, format: string): Row {
  return {
    key,
    label,
    section,
    format,
    applies: always,
    value: (c, get) => chain([get('claimR'), get('claimWl')], () => labelledFigures('VERIFY.PRECISION', precisionArgs(c, get))[figure]),
    cell: (c, ref) => formula(indexFormula('VERIFY.PRECISION', precisionRefs(c, ref), figure), format),
  };
}

function limitsRow(key: string, label: string, section: Section, cv: string, df: string, bound: 'Low' | 'High'): Row {
  return {
    key,
    label,
    section,
    format: '0.00',
    applies: always,
    value: (_c, get) => chain([get(cv), get(df)], () => labelledFigures('DATA.CVLIMITS', [get(cv) as Arg, get(df) as Arg])[bound]),
    cell: (_c, ref) => formula(indexFormula('DATA.CVLIMITS', [ref(cv), ref(df)], bound), '0.00'),
  };
}

function claimRow(key: 'claimR' | 'claimWl', label: string, section: Section): Row {
  const pick = (c: Ctx): Given | null => (key === 'claimR' ? c.input.claimRepeatability : c.input.claimWithinLab);
  return {
    key,
    label,
    section,
    format: '0.00',
    applies: always,
    value: (c) => {
      const g = pick(c);
      return g === null ? { error: '#N/A', message: `${label} is missing: type it or give the cell that holds it` } : (givenValue(g) as Figure);
    },
    cell: (c) => givenCell(pick(c), '0.00'),
  };
}

function precisionFigure(key: string, label: string, figure: string, format: string, section: Section = 'study'): Row {
  return {
    key,
    label,
    section,
    format,
    applies: always,
    value: (c) => {
      const { v, g } = gridOf(c);
      return labelledFigures('DATA.PRECISION', [v, g])[figure];
    },
    cell: (c) => {
      const { v, g } = refsOf(c);
      return formula(indexFormula('DATA.PRECISION', [v, g], figure), format);
    },
  };
}

function truenessRow(key: string, label: string, figure: string, format: string): Row {
  return {
    key,
    label,
    section: 'trueness',
    format,
    applies: hasTrueness,
    value: (c, get) => labelledFigures('VERIFY.TRUENESS', truenessArgs(c, get))[figure],
    cell: (c, ref) => formula(indexFormula('VERIFY.TRUENESS', truenessRefs(c, ref), figure), format),
  };
}

function givenRow(key: 'assigned' | 'uAssigned', label: string): Row {
  const pick = (c: Ctx): Given | null => (key === 'assigned' ? c.input.assigned : c.input.uAssigned);
  return {
    key,
    label,
    section: 'trueness',
    format: '0.000',
    applies: hasTrueness,
    value: (c) => (pick(c) === null ? 0 : (givenValue(pick(c)) as Figure)),
    cell: (c) => (pick(c) === null ? number(0, '0.000') : givenCell(pick(c), '0.000')),
  };
}

/** The bias sigma uses: the trueness bias when there is one, else the pane's observed bias. */
const biasRow: Row = {
  key: 'sigmaBias',
  label: 'Bias % used',
  section: 'sigma',
  format: '0.00',
  applies: hasSigma,
  value: (c, get) => (hasTrueness(c) ? get('biasPct') : (c.bias as BiasInUse).value),
  cell: (c, ref) => (hasTrueness(c) ? formula(`=${ref('biasPct')}`, '0.00') : number((c.bias as BiasInUse).value, '0.00')),
};

/** u(bias) % = √(SE² + u_assigned²) / |assigned| · 100 (MU.COMBINE with k = 1); 0 for a bias from elsewhere. */
const uBiasRow: Row = {
  key: 'uBias',
  label: 'u(bias) %',
  section: 'sigma',
  format: '0.00',
  applies: hasSigma,
  value: (c, get) =>
    hasTrueness(c)
      ? chain([get('se'), get('uAssigned'), get('assigned')], () => {
          const u = singleFigure('MU.COMBINE', [get('se') as Arg, get('uAssigned') as Arg, 1]);
          const a = get('assigned') as number;
          if (isError(u)) return u;
          return a === 0 ? { error: '#DIV/0!', message: 'the assigned value is 0: u(bias) in % is not defined' } : ((u as number) / Math.abs(a)) * 100;
        })
      : 0,
  cell: (c, ref) => (hasTrueness(c) ? formula(`=LEEWAY.MU.COMBINE(${ref('se')},${ref('uAssigned')},1)/ABS(${ref('assigned')})*100`, '0.00') : number(0, '0.00')),
};

const allowRow: Row = {
  key: 'allowable',
  label: 'Allowable total error %',
  section: 'sigma',
  format: '0.00',
  applies: hasSigma,
  value: (c) => (c.spec as SpecInUse).value,
  cell: (c) => formula(`=${(c.spec as SpecInUse).formulaText}`, '0.00'),
};

function sigmaRow(key: string, label: string, figure: 'Sigma' | 'Low' | 'High'): Row {
  const deps = ['allowable', 'sigmaBias', 'wlCv', 'wlDf', 'uBias'];
  return {
    key,
    label,
    section: 'sigma',
    format: '0.00',
    applies: hasSigma,
    value: (_c, get) => chain(deps.map(get), () => labelledFigures('PERF.SIGMALIMITS', deps.map((k) => get(k) as Arg))[figure]),
    cell: (_c, ref) => formula(indexFormula('PERF.SIGMALIMITS', deps.map(ref), figure), '0.00'),
  };
}

/** ν_r = N − k: results less runs (the repeatability df of the one-way ANOVA). */
const repeatabilityDf: Row = {
  key: 'rDf',
  label: 'Repeatability df',
  section: 'repeatability',
  format: '0',
  applies: always,
  value: (_c, get) => chain([get('results'), get('groups')], () => (get('results') as number) - (get('groups') as number)),
  cell: (_c, ref) => formula(`=${ref('results')}-${ref('groups')}`, '0'),
};

/** Every row, in the order shown and written. */
export const ROWS: readonly Row[] = [
  precisionFigure('results', 'Results', 'Results', '0'),
  precisionFigure('groups', 'Runs or days', 'Groups', '0'),
  precisionFigure('mean', 'Mean', 'Mean', '0.000'),
  claimRow('claimR', 'Repeatability claim %', 'repeatability'),
  precisionFigure('rCv', 'Repeatability CV %', 'Repeatability CV %', '0.00', 'repeatability'),
  repeatabilityDf,
  limitsRow('rLow', 'Repeatability CV 95 % low', 'repeatability', 'rCv', 'rDf', 'Low'),
  limitsRow('rHigh', 'Repeatability CV 95 % high', 'repeatability', 'rCv', 'rDf', 'High'),
  precisionRow('rLimit', 'Repeatability limit %', 'repeatability', 'Repeatability limit %', '0.00'),
  precisionRow('rOk', 'Repeatability verified', 'repeatability', 'Repeatability verified', 'General'),
  claimRow('claimWl', 'Within-lab claim %', 'withinlab'),
  precisionFigure('wlCv', 'Within-lab CV %', 'Within-lab CV %', '0.00', 'withinlab'),
  precisionFigure('wlDf', 'Within-lab df', 'Within-lab df', '0.0', 'withinlab'),
  limitsRow('wlLow', 'Within-lab CV 95 % low', 'withinlab', 'wlCv', 'wlDf', 'Low'),
  limitsRow('wlHigh', 'Within-lab CV 95 % high', 'withinlab', 'wlCv', 'wlDf', 'High'),
  precisionRow('wlLimit', 'Within-lab limit %', 'withinlab', 'Within-lab limit %', '0.00'),
  precisionRow('wlOk', 'Within-lab verified', 'withinlab', 'Within-lab verified', 'General'),
  givenRow('assigned', 'Assigned value'),
  givenRow('uAssigned', 'u(assigned)'),
  truenessRow('tMean', 'Mean of results', 'Mean', '0.000'),
  truenessRow('bias', 'Bias', 'Bias', '0.000'),
  truenessRow('biasPct', 'Bias %', 'Bias %', '0.00'),
  truenessRow('se', 'Standard error', 'Standard error', '0.0000'),
  truenessRow('tLow', 'Verification low', 'Verification low', '0.000'),
  truenessRow('tHigh', 'Verification high', 'Verification high', '0.000'),
  truenessRow('tOk', 'Trueness verified', 'Verified', 'General'),
  truenessRow('tDf', 'Trueness df', 'df', '0.0'),
  allowRow,
  biasRow,
  uBiasRow,
  sigmaRow('sigma', 'Sigma', 'Sigma'),
  sigmaRow('sigmaLow', 'Sigma 95 % low', 'Low'),
  sigmaRow('sigmaHigh', 'Sigma 95 % high', 'High'),
];

const BY_KEY = new Map(ROWS.map((r) => [r.key, r]));

export interface VerificationInput {
  readonly study: ReplicationStudy;
  /** One per material, in the study's order. */
  readonly inputs: readonly MaterialInput[];
  readonly spec: SpecInUse | null;
  readonly bias: BiasInUse | null;
}

/** One material's figures by row key; a row that does not apply to it is absent. */
export interface MaterialFigures {
  readonly name: string;
  readonly figures: ReadonlyMap<string, Figure>;
}

function contexts(v: VerificationInput): Ctx[] {
  if (v.inputs.length !== v.study.materials.length) throw new Error('one input per material is needed');
  const samples = v.study.materials.length;
  return v.study.materials.map((m, i) => ({ study: v.study, m, input: v.inputs[i], samples, spec: v.spec, bias: v.bias }));
}

/** The rows that apply to at least one material. */
function rowsIn(ctxs: readonly Ctx[]): Row[] {
  return ROWS.filter((r) => ctxs.some((c) => r.applies(c)));
}

/** Every figure of every material, through the registry. */
export function verificationFigures(v: VerificationInput): MaterialFigures[] {
  return contexts(v).map((c) => {
    // Rows are computed when first read (a row may read one listed after it).
    const figures = new Map<string, Figure>();
    const get = (k: string): Figure => {
      let f = figures.get(k);
      if (f === undefined) {
        const r = BY_KEY.get(k);
        if (!r || !r.applies(c)) throw new Error(`row ${k} does not apply to ${c.m.name}`);
        f = r.value(c, get);
        figures.set(k, f);
      }
      return f;
    };
    for (const r of ROWS) if (r.applies(c)) get(r.key);
    return { name: c.m.name, figures };
  });
}

export interface RowInfo {
  readonly key: string;
  readonly label: string;
  readonly section: Section;
  readonly format: string;
}

/** The rows shown for a study (those that apply to some material). */
export function shownRows(v: VerificationInput): RowInfo[] {
  return rowsIn(contexts(v)).map(({ key, label, section, format }) => ({ key, label, section, format }));
}

/** Characters of the block's label column and of each material's column. */
export const LABEL_WIDTH = 28;
export const FIGURE_WIDTH = 14;

/**
 * The block written beside the study: from the selection's top row, one empty column right of
 * it; label column, then one column per material.
 */
export function verificationBlock(v: VerificationInput, p: Provenance): BlockArea {
  const ctxs = contexts(v);
  const rows = rowsIn(ctxs);
  const width = 1 + ctxs.length;
  const wrap = LABEL_WIDTH + FIGURE_WIDTH * ctxs.length;
  const g = v.study.grid;
  const at = { row: g.headerRow ?? g.top, col: g.columns[g.columns.length - 1].col + 2 };
  const head = headRows(p, width, wrap);
  const first = at.row + head.length + 1;
  const rowOf = new Map(rows.map((r, i) => [r.key, first + i]));
  const body: (BlockCell | null)[][] = [padRow([text('Figure', 'header'), ...ctxs.map((c) => text(c.m.name, 'header'))], width)];
  for (const r of rows) {
    const cells: (BlockCell | null)[] = [text(r.label, 'label')];
    ctxs.forEach((c, j) => {
      const ref = (k: string): string => {
        const row = rowOf.get(k);
        if (row === undefined) throw new Error(`row ${k} is not in the block`);
        return a1({ row, col: at.col + 1 + j });
      };
      cells.push(r.applies(c) ? r.cell(c, ref) : null);
    });
    body.push(cells);
  }
  const cells = [...head, ...body, ...cautionRows(width, wrap)];
  return { row: at.row, col: at.col, cells, widths: [LABEL_WIDTH, ...ctxs.map(() => FIGURE_WIDTH)] };
}
