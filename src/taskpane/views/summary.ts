/**
 * Summary view: one row per picked analyte (tier met, sigma, QC plan) from the observed bias and
 * CV typed or read in What-if, previewed in the pane and written to a new sheet with an Excel
 * chart of sigma by analyte. The sheet carries the provenance and the caution.
 *
 * Shape of a view: the rows come from the pane's state by a pure function (`summaryOf`), the
 * preview is a pure render of them, and the one handler writes the sheet through `ctx.run`.
 */
import { h, replace, field } from '../dom';
import type { PaneContext, View } from '../view';
import { PaneError } from '../view';
import type { SummaryRow } from '../host';
import type { PaneState } from '../state';
import { zOf } from '../state';
import { keyOf } from '../analytes';
import { summaryHeader, summaryRow } from '../summaryRows';
import { fmt, tierLabel, today } from '../format';
import { DEMO_MARKER } from '../../engine/caution';

const PREVIEW = 30;

/** What the view shows, computed from the pane's state alone. */
export interface SummaryModel {
  readonly picked: number;
  readonly withObserved: number;
  readonly demo: boolean;
  /** The rows, or why there are none. */
  readonly rows: SummaryRow[] | string;
}

export function summaryOf(state: PaneState): SummaryModel {
  const picked = state.selectedRows();
  const q = zOf(state.coverage);
  return {
    picked: picked.length,
    withObserved: picked.filter((r) => state.observed.has(keyOf(r))).length,
    demo: Boolean(state.table?.demo),
    rows: q.ok ? picked.map((r) => summaryRow(r, state.tierFor(r), q.z, state.observed.get(keyOf(r)))) : `The coverage in Fill is not valid: ${q.why}.`,
  };
}

/** The plan as text with break opportunities after each "/" (long multirules in a narrow pane). */
function planCell(r: SummaryRow): Array<Node | string> {
  if (r.rule === '') return ['—'];
  const notMet = r.rule.endsWith(' (target not met)');
  const rule = notMet ? r.rule.slice(0, -' (target not met)'.length) : r.rule;
  const out: Array<Node | string> = [];
  rule.split('/').forEach((part, i, all) => {
    out.push(i < all.length - 1 ? `${part}/` : part);
    if (i < all.length - 1) out.push(h('wbr', {}));
  });
  out.push(`, n=${r.controls}${r.runs !== 1 && r.runs !== '' ? `, ${r.runs} runs` : ''}`);
  if (notMet) out.push(h('span', { class: 'not-met' }, ' · target not met'));
  return out;
}

function tierMetText(t: string): string {
  return ['optimum', 'desirable', 'minimum'].includes(t) ? tierLabel(t) : t;
}

/** Pure: the counts line above the preview. */
export function renderCounts(m: SummaryModel): Node[] {
  const line = h('p', { class: 'hint', id: 'summary-counts' }, `${m.picked} analyte${m.picked === 1 ? '' : 's'} picked; ${m.withObserved} with observed bias and CV (enter them in What-if). Analytes without them are listed as “no observed data”.`);
  return m.demo ? [line, h('p', { class: 'badge demo' }, DEMO_MARKER)] : [line];
}

/** Pure: the preview table of the rows with a sigma (or the reason there are none). */
export function renderPreview(m: SummaryModel): Node | null {
  if (typeof m.rows === 'string') return h('p', { class: 'error' }, m.rows);
  const shown = m.rows.filter((r) => typeof r.sigma === 'number').slice(0, PREVIEW);
  if (shown.length === 0) return null;
  const tbody = h('tbody', {});
  for (const r of shown) {
    tbody.appendChild(
      h(
        'tr',
        {},
        h('th', { scope: 'row' }, r.analyte),
        h('td', {}, typeof r.sigma === 'number' ? fmt(r.sigma) : '—'),
        h('td', {}, tierMetText(r.tierMet)),
        h('td', { class: 'rule' }, ...planCell(r)),
      ),
    );
  }
  const caption = `Preview (analytes with observed data${shown.length === PREVIEW ? `, first ${PREVIEW}` : ''})`;
  const head = h('thead', {}, h('tr', {}, ...['Analyte', 'Sigma', 'Tier met', 'Plan'].map((t) => h('th', { scope: 'col' }, t))));
  return h('div', { class: 'scroll-x' }, h('table', { class: 'grid-table numbers compact', id: 'summary-table' }, h('caption', {}, caption), head, tbody));
}

/** Handler: writes the summary sheet; resolves to the message for the status line. */
async function writeSummary(ctx: PaneContext, sheetName: string): Promise<string> {
  const { state } = ctx;
  const q = zOf(state.coverage);
  if (!state.table) throw new PaneError('Choose a table first (Tables).');
  if (!q.ok) throw new PaneError(`The coverage in Fill is not valid: ${q.why}.`);
  const rows = summaryOf(state).rows;
  if (typeof rows === 'string') throw new PaneError(rows);
  if (rows.length === 0) throw new PaneError('Pick at least one analyte (Fill).');
  try {
    const out = await ctx.host.writeSummary({ sheetName, rows, header: summaryHeader(state.table, state.sheetTier, q.z, today()) });
    return `Wrote ${out.sheet}: ${rows.length} rows in ${out.tableAddress}, chart of sigma from ${out.chartSeriesAddress}.`;
  } catch (e) {
    throw new PaneError(`The summary was not written: ${e instanceof Error ? e.message : String(e)}`);
  }
}

export function summaryView(ctx: PaneContext): View {
  const counts = h('div', { class: 'summary-counts' });
  const preview = h('div', { class: 'preview', id: 'summary-preview' });
  const nameInput = h('input', { type: 'text', id: 'summary-sheet-name', value: 'Summary' });
  const write = h('button', { type: 'button', class: 'primary', id: 'write-summary' }, 'Write the summary sheet');
  write.addEventListener('click', () => {
    const rows = summaryOf(ctx.state).rows;
    void ctx.run(`Writing the summary of ${typeof rows === 'string' ? 0 : rows.length} analytes…`, () => writeSummary(ctx, nameInput.value.trim() || 'Summary'));
  });
  const root = h(
    'div',
    { class: 'view summary' },
    h('h2', {}, 'Summary sheet'),
    h('p', {}, 'One row per picked analyte: the tier met, the sigma metric at its tier and the QC plan (QC.PLAN), with a chart of sigma by analyte.'),
    counts,
    field('New sheet name', nameInput, 'A number is added if the name is taken.'),
    h('div', { class: 'actions' }, write),
    preview,
  );

  function render(): void {
    const m = summaryOf(ctx.state);
    replace(counts, ...renderCounts(m));
    replace(preview, renderPreview(m));
  }

  return { root, refresh: render };
}
