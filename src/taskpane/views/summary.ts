/**
 * Summary view: one row per picked analyte (tier met, sigma, QC plan) from the observed bias and
 * CV typed or read in What-if, previewed in the pane and written to a new sheet with an Excel
 * chart of sigma by analyte. The sheet carries the provenance and the caution.
 */
import { h, replace, field } from '../dom';
import type { PaneContext, View } from '../app';
import type { SummaryRow } from '../host';
import { zOf } from '../state';
import { keyOf } from '../analytes';
import { summaryHeader, summaryRow } from '../summaryRows';
import { fmt, tierLabel } from '../format';
import { today } from './fill';
import { DEMO_MARKER } from '../../engine/caution';

const PREVIEW = 30;

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

export function summaryView(ctx: PaneContext): View {
  const { state } = ctx;
  const root = h('div', { class: 'view summary' });
  const info = h('div', { class: 'summary-info' });
  const preview = h('div', { class: 'preview', id: 'summary-preview' });
  const nameInput = h('input', { type: 'text', id: 'summary-sheet-name', value: 'Summary' });
  const write = h('button', { type: 'button', class: 'primary', id: 'write-summary' }, 'Write the summary sheet');
  write.addEventListener('click', () => void doWrite());

  function rows(): SummaryRow[] | string {
    const q = zOf(state.coverage);
    if (!q.ok) return `The coverage in Fill is not valid: ${q.why}.`;
    return state.selectedRows().map((r) => summaryRow(r, state.tierFor(r), q.z, state.observed.get(keyOf(r))));
  }

  function render(): void {
    const picked = state.selectedRows();
    const withObs = picked.filter((r) => state.observed.has(keyOf(r))).length;
    replace(
      info,
      h('h2', {}, 'Summary sheet'),
      h('p', {}, `One row per picked analyte: the tier met, the sigma metric at its tier and the QC plan (QC.PLAN), with a chart of sigma by analyte.`),
      h('p', { class: 'hint', id: 'summary-counts' }, `${picked.length} analyte${picked.length === 1 ? '' : 's'} picked; ${withObs} with observed bias and CV (enter them in What-if). Analytes without them are listed as “no observed data”.`),
      state.table?.demo ? h('p', { class: 'badge demo' }, DEMO_MARKER) : null,
      field('New sheet name', nameInput, 'A number is added if the name is taken.'),
      h('div', { class: 'actions' }, write),
    );
    const rs = rows();
    if (typeof rs === 'string') {
      replace(preview, h('p', { class: 'error' }, rs));
      return;
    }
    const shown = rs.filter((r) => typeof r.sigma === 'number').slice(0, PREVIEW);
    if (shown.length === 0) {
      replace(preview);
      return;
    }
    const tbody = h('tbody', {});
    for (const r of shown) {
      tbody.appendChild(
        h(
          'tr',
          {},
          h('th', { scope: 'row' }, r.analyte),
          h('td', {}, typeof r.sigma === 'number' ? fmt(r.sigma) : '—'),
          h('td', {}, r.tierMet === 'none' || !['optimum', 'desirable', 'minimum'].includes(r.tierMet) ? r.tierMet : tierLabel(r.tierMet)),
          h('td', { class: 'rule' }, ...planCell(r)),
        ),
      );
    }
    replace(
      preview,
      h(
        'div',
        { class: 'scroll-x' },
        h(
          'table',
          { class: 'grid-table numbers compact', id: 'summary-table' },
          h('caption', {}, `Preview (analytes with observed data${shown.length === PREVIEW ? `, first ${PREVIEW}` : ''})`),
          h('thead', {}, h('tr', {}, ...['Analyte', 'Sigma', 'Tier met', 'Plan'].map((t) => h('th', { scope: 'col' }, t)))),
          tbody,
        ),
      ),
    );
  }

  async function doWrite(): Promise<void> {
    const q = zOf(state.coverage);
    if (!state.table || !q.ok) {
      ctx.status(!state.table ? 'Choose a table first (Tables).' : `The coverage in Fill is not valid: ${q.ok ? '' : q.why}.`, 'error');
      return;
    }
    const rs = rows();
    if (typeof rs === 'string' || rs.length === 0) {
      ctx.status(typeof rs === 'string' ? rs : 'Pick at least one analyte (Fill).', 'error');
      return;
    }
    try {
      ctx.status(`Writing the summary of ${rs.length} analytes…`, 'busy');
      const out = await ctx.host.writeSummary({
        sheetName: nameInput.value.trim() || 'Summary',
        rows: rs,
        header: summaryHeader(state.table, state.sheetTier, q.z, today()),
      });
      ctx.status(`Wrote ${out.sheet}: ${rs.length} rows in ${out.tableAddress}, chart of sigma from ${out.chartSeriesAddress}.`, 'ok');
    } catch (e) {
      ctx.status(`The summary was not written: ${e instanceof Error ? e.message : String(e)}`, 'error');
    }
  }

  root.append(info, preview);
  return { root, refresh: render };
}
