/**
 * A method comparison read from two columns of the selection (x: the comparative method, y: the
 * candidate), its limits of agreement (DATA.AGREEMENT through the registry), the points of its
 * difference plot and the block of live formulas written beside it.
 */
import type { BlockArea, BlockCell, CellGrid } from '../host';
import type { DifferencePair, DifferencePlotInput } from '../../charts/differencePlot';
import { asColumnGrid, columnRef, refuseNumbersAsText, SelectionProblem, studyGrid } from './columns';
import type { StudyColumn, StudyGrid } from './columns';
import { cautionRows, formula, headRows, indexFormula, isError, labelledFigures, padRow, text, wordText } from './figures';
import type { Figure, Provenance } from './figures';
import { DATA_AGREEMENT } from '../../registry/catalogue/verify';

export type Scale = 'absolute' | 'percent';

export interface ComparisonStudy {
  readonly grid: StudyGrid;
  readonly x: StudyColumn;
  readonly y: StudyColumn;
}

/** Two columns: the comparative method's results, then the candidate's. */
export function readComparison(grid: CellGrid): ComparisonStudy {
  const g = studyGrid(grid);
  if (g.columns.length !== 2) {
    throw new SelectionProblem(`Select two columns side by side: the comparative method (x), then the candidate method (y). The selection has ${g.columns.length}.`);
  }
  refuseNumbersAsText(g, g.columns);
  return { grid: g, x: g.columns[0], y: g.columns[1] };
}

/** The labels of DATA.AGREEMENT's spill: the catalogue's own. */
export const AGREEMENT_FIGURES = DATA_AGREEMENT.labels;

export function agreementFigures(s: ComparisonStudy, scale: Scale): Record<string, Figure> {
  return labelledFigures('DATA.AGREEMENT', [asColumnGrid(s.x), asColumnGrid(s.y), scale]);
}

/**
 * The pairs drawn: every row where both cells are numbers (as DATA.AGREEMENT pairs them), labelled
 * by their sheet row. A pair with x + y = 0 on the percent scale is left out (DATA.AGREEMENT
 * itself refuses it, so the plot is not drawn then).
 */
export function agreementPairs(s: ComparisonStudy, scale: Scale): DifferencePair[] {
  const out: DifferencePair[] = [];
  s.x.cells.forEach((x, i) => {
    const y = s.y.cells[i];
    if (typeof x !== 'number' || typeof y !== 'number' || !Number.isFinite(x) || !Number.isFinite(y)) return;
    if (scale === 'percent' && x + y === 0) return;
    out.push({ x, y, label: `row ${s.grid.top + i}` });
  });
  return out;
}

/** The plot's input (the same difference plot the demo workbook prints), or why there is none (an error among the figures). */
export function plotInput(s: ComparisonStudy, scale: Scale, figures: Record<string, Figure>, width: number): DifferencePlotInput | string {
  const bad = AGREEMENT_FIGURES.map((k) => figures[k]).find(isError);
  if (bad) return `${bad.error} ${bad.message}`;
  const n = (k: string): number => figures[k] as number;
  return {
    title: `Difference plot: ${s.y.name} against ${s.x.name}`,
    pairs: agreementPairs(s, scale),
    agreement: {
      meanDifference: n('Mean difference'),
      meanDifferenceLow: n('Mean difference low'),
      meanDifferenceHigh: n('Mean difference high'),
      lowerLimit: n('Lower limit'),
      lowerLimitLow: n('Lower limit low'),
      lowerLimitHigh: n('Lower limit high'),
      upperLimit: n('Upper limit'),
      upperLimitLow: n('Upper limit low'),
      upperLimitHigh: n('Upper limit high'),
    },
    scale,
    width,
  };
}

export const AGREEMENT_LABEL_WIDTH = 26;
export const AGREEMENT_VALUE_WIDTH = 14;

/** The block beside the two columns: a label and a live DATA.AGREEMENT figure per row. */
export function agreementBlock(s: ComparisonStudy, scale: Scale, p: Provenance): BlockArea {
  const width = 2;
  const wrap = AGREEMENT_LABEL_WIDTH + AGREEMENT_VALUE_WIDTH;
  const at = { row: s.grid.headerRow ?? s.grid.top, col: s.y.col + 2 };
  const args = [columnRef(s.grid, s.x), columnRef(s.grid, s.y), wordText(scale)];
  const head = headRows(p, width, wrap);
  const body: (BlockCell | null)[][] = [padRow([text('Figure', 'header'), text(scale === 'percent' ? 'Value, %' : 'Value', 'header')], width)];
  for (const label of AGREEMENT_FIGURES) {
    body.push([text(label, 'label'), formula(indexFormula('DATA.AGREEMENT', args, label), label === 'Pairs' ? '0' : '0.000')]);
  }
  return { row: at.row, col: at.col, cells: [...head, ...body, ...cautionRows(width, wrap)], widths: [AGREEMENT_LABEL_WIDTH, AGREEMENT_VALUE_WIDTH] };
}
