/**
 * Every figure of a review workbook, computed before anything is written: per analyte the rule
 * in use and why, the flags of all its materials read together (the rule's across-material
 * terms), and the review of all its materials; per analyte and material the review of that
 * material alone, its observed CV and bias against the control targets and, with a variation
 * table, the allowances at the tier, sigma and the run size of the rule in use.
 *
 * Figures come from the registry (the worksheet functions the sheets' formulas call), so a
 * cached value is what the formula computes.
 */
import { evaluate, evaluateLabelled } from '../../registry';
import type { Arg, OutCell } from '../../registry/types';
import type { ControlAnalyteResults, ControlLevelResults, ControlResult, ControlResultsFile } from '../../engine/import';
import type { VariationRow, VariationTable } from '../../engine/table';
import { labelKey } from '../../engine/labels';
import { assess } from '../../engine/assess';
import type { Assessment } from '../../engine/assess';
import type { Tier } from '../../engine/tiers';
import { evaluateControls } from '../../engine/qc/flags';
import type { ControlEvaluation } from '../../engine/qc/flags';
import { parseRule } from '../../engine/qc/rules';
import { Z_TOTAL_ERROR } from '../../engine/coverage';

/** The rule read when neither --rule nor a variation table gives one. */
export const DEFAULT_REVIEW_RULE = '1-3s/2-2s/R-4s';

/** QC.REVIEW's figures, label → value. */
export type ReviewFigures = ReadonlyMap<string, OutCell>;

export interface MaterialReview {
  readonly level: ControlLevelResults;
  /** Each result's position (1-based) in its analyte's block of results. */
  readonly positions: readonly number[];
  /** Each result's flags, from all materials of the analyte read together. */
  readonly flags: readonly string[];
  /** Each result's z. */
  readonly z: readonly number[];
  /** QC.REVIEW of this material alone. */
  readonly review: ReviewFigures;
  /** DATA.CV of the values, %. */
  readonly cv: OutCell;
  /** DATA.BIAS of the values against their targets, %. */
  readonly bias: OutCell;
  /** With a table row: the chain at the tier with this material's CV and bias. */
  readonly assessment?: Assessment;
  /** QC.RUNSIZE of the rule in use, or why not. */
  readonly runSize: OutCell | string;
  /** Said when the laboratory's run size (--run-size) exceeds the computed one; "" otherwise. */
  readonly runSizeStatement: string;
}

export interface AnalyteReview {
  readonly analyte: string;
  /** The analyte's results, all materials, in file order (the Results sheet's block). */
  readonly results: readonly ControlResult[];
  readonly rule: string;
  /** Why this rule: "--rule", "QC plan of Level 2 (lowest sigma)", "default". */
  readonly ruleFrom: string;
  /** Controls per QC event used for the run size. */
  readonly n: number;
  readonly nFrom: string;
  readonly evaluation: ControlEvaluation;
  /** QC.FLAGS over the block (all materials). */
  readonly flags: readonly string[];
  /** QC.REVIEW over the block (all materials). */
  readonly review: ReviewFigures;
  readonly tableRow?: VariationRow;
  /** Why the table gives nothing for this analyte ("" when it does or no table was given). */
  readonly tableNote: string;
  readonly materials: readonly MaterialReview[];
}

export interface ReviewRequest {
  readonly file: ControlResultsFile;
  readonly table?: VariationTable;
  readonly tier: Tier;
  /** --rule: one rule for every analyte. */
  readonly rule?: string;
  /** --run-size: the laboratory's patient results between QC events. */
  readonly labRunSize?: number;
}

const col = <T extends string | number>(xs: readonly T[]): T[][] => xs.map((x) => [x]);

/** A figure of a labelled spill (the error that replaced the whole spill, when one did, stands under every label). */
export function figure(m: ReviewFigures, label: string): OutCell {
  return m.get(label) ?? { error: '#N/A', message: `no figure "${label}"` };
}

function scalar(name: string, args: readonly Arg[]): OutCell {
  return evaluate(name, args)[0][0];
}

const num = (v: OutCell | undefined): number | undefined => (typeof v === 'number' ? v : undefined);

/** The table row of an analyte: by name, or by "name (specimen)" when the table lists it for several specimens. */
export function tableRowOf(table: VariationTable, analyte: string): { row?: VariationRow; note: string } {
  const key = labelKey(analyte);
  const byName = table.rows.filter((r) => labelKey(r.analyte) === key);
  if (byName.length === 1) return { row: byName[0], note: '' };
  const bySpecimen = table.rows.find((r) => labelKey(`${r.analyte} (${r.specimen})`) === key);
  if (bySpecimen) return { row: bySpecimen, note: '' };
  if (byName.length > 1) return { note: `the table lists ${analyte} for ${byName.length} specimens: name the results' analyte "${analyte} (${byName[0].specimen})"` };
  return { note: `the table ${table.name} has no analyte ${analyte}` };
}

/** The number of results per run that most runs of the analyte hold (the smaller on a tie). */
function usualRunSize(ev: ControlEvaluation): number {
  const counts = new Map<number, number>();
  for (const n of ev.runSizes) counts.set(n, (counts.get(n) ?? 0) + 1);
  let best = 1;
  let most = 0;
  for (const [n, c] of counts) if (c > most || (c === most && n < best)) [best, most] = [n, c];
  return Math.min(best, 100);
}

interface MaterialInput {
  readonly level: ControlLevelResults;
  readonly values: number[];
  readonly cv: OutCell;
  readonly bias: OutCell;
  readonly assessment?: Assessment;
}

function materialInputs(a: ControlAnalyteResults, row: VariationRow | undefined, tier: Tier): MaterialInput[] {
  return a.levels.map((level) => {
    const values = level.results.map((r) => r.value);
    const cv = scalar('DATA.CV', [col(values)]);
    const bias = scalar('DATA.BIAS', [col(values), col(level.results.map((r) => r.target))]);
    const c = num(cv);
    const b = num(bias);
    const assessment = row ? assess({ spec: row, tier, z: Z_TOTAL_ERROR, observed: c !== undefined && b !== undefined ? { cv: c, bias: b } : null, plan: true }) : undefined;
    return { level, values, cv, bias, assessment };
  });
}

/** The rule of an analyte: --rule, else the QC plan of its material with the lowest sigma, else the default. */
function chooseRule(request: ReviewRequest, inputs: readonly MaterialInput[], hasRow: boolean): { rule: string; from: string; n?: number } {
  if (request.rule) return { rule: request.rule, from: 'given with --rule' };
  let pick: { rule: string; from: string; n: number; sigma: number } | undefined;
  for (const m of inputs) {
    const a = m.assessment;
    if (!a || !a.plan.ok || !a.inUse.sigma.ok) continue;
    const sigma = a.inUse.sigma.value;
    if (!pick || sigma < pick.sigma) pick = { rule: a.plan.value.rule, n: a.plan.value.n, sigma, from: `QC plan of ${m.level.level}, the material with the lowest sigma` };
  }
  if (pick) return pick;
  return { rule: DEFAULT_REVIEW_RULE, from: hasRow ? 'default (no QC plan could be computed from the table)' : 'default' };
}

function runSizeOf(m: MaterialInput, rule: string, n: number, labRunSize: number | undefined): { runSize: OutCell | string; statement: string } {
  const a = m.assessment;
  if (!a) return { runSize: 'needs --table', statement: '' };
  const total = a.inUse.total;
  if (!total.ok) return { runSize: total.absent ? total.why : { error: total.code, message: total.message }, statement: '' };
  const cv = num(m.cv);
  const bias = num(m.bias);
  if (cv === undefined || bias === undefined) return { runSize: 'needs the observed CV and bias', statement: '' };
  const runSize = scalar('QC.RUNSIZE', [total.value, bias, cv, rule, n]);
  const exceeds = labRunSize !== undefined && typeof runSize === 'number' && labRunSize > runSize;
  const statement = exceeds ? `the laboratory's ${labRunSize} patient results between QC events exceed the computed run size of ${runSize}` : '';
  return { runSize, statement };
}

/** Reviews one analyte: flags of all its materials together, then each material. */
export function reviewAnalyte(a: ControlAnalyteResults, results: readonly ControlResult[], request: ReviewRequest): AnalyteReview {
  const found = request.table ? tableRowOf(request.table, a.analyte) : { note: '' };
  const inputs = materialInputs(a, found.row, request.tier);
  const chosen = chooseRule(request, inputs, found.row !== undefined);
  const values = col(results.map((r) => r.value));
  const targets = col(results.map((r) => r.target));
  const sds = col(results.map((r) => r.sd));
  const runs = col(results.map((r) => r.run));
  const levels = col(results.map((r) => r.level));
  const flags = evaluate('QC.FLAGS', [values, targets, sds, chosen.rule, runs, levels]).map((r) => String(r[0]));
  const review = evaluateLabelled('QC.REVIEW', [values, targets, sds, chosen.rule, runs, levels]);
  const evaluation = evaluateControls({ values: results.map((r) => r.value), target: results.map((r) => r.target), sd: results.map((r) => r.sd), rule: parseRule(chosen.rule), runs: results.map((r) => r.run), levels: results.map((r) => r.level) });
  const n = chosen.n ?? usualRunSize(evaluation);
  const nFrom = chosen.n !== undefined ? 'controls per run of the QC plan' : 'the number of results most runs hold';
  const index = new Map<ControlResult, number>();
  results.forEach((r, i) => index.set(r, i));
  const materials = inputs.map((m): MaterialReview => {
    const positions = m.level.results.map((r) => (index.get(r) as number) + 1);
    const own = m.level.results;
    const materialReview = evaluateLabelled('QC.REVIEW', [col(m.values), col(own.map((r) => r.target)), col(own.map((r) => r.sd)), chosen.rule, col(own.map((r) => r.run))]);
    const { runSize, statement } = runSizeOf(m, chosen.rule, n, request.labRunSize);
    return {
      level: m.level,
      positions,
      flags: positions.map((p) => flags[p - 1]),
      z: own.map((r) => (r.value - r.target) / r.sd),
      review: materialReview,
      cv: m.cv,
      bias: m.bias,
      assessment: m.assessment,
      runSize,
      runSizeStatement: statement,
    };
  });
  return { analyte: a.analyte, results, rule: chosen.rule, ruleFrom: chosen.from, n, nFrom, evaluation, flags, review, tableRow: found.row, tableNote: found.note, materials };
}

/** The analyte's results of every material, in file order. */
export function analyteBlock(a: ControlAnalyteResults): ControlResult[] {
  return a.levels.flatMap((l) => l.results).sort((x, y) => x.line - y.line);
}
