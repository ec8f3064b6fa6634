/**
 * Every analyte in scope at its own tier: total allowance, sigma, share and tier met, with the
 * counts per tier met; and the action that reads bias and CV for all rows of the active sheet.
 */
import { h, replace, keepTableRoles } from '../../dom';
import type { PaneContext } from '../../view';
import { PaneError } from '../../view';
import type { PaneState, Observed } from '../../state';
import { keyOf, displayName, attrKey } from '../../analytes';
import { showFigure, tierLabel } from '../../format';
import { readAllRows } from '../../sheetRows';
import { whatIf } from '../../whatif';
import { TIERS } from '../../../engine/tiers';
import { inputOf, rowsInScope, zOrNull } from './common';

type Counts = Record<'optimum' | 'desirable' | 'minimum' | 'none' | 'unknown', number>;

function menuRows(state: PaneState, z: number): { rows: HTMLTableRowElement[]; counts: Counts } {
  const counts: Counts = { optimum: 0, desirable: 0, minimum: 0, none: 0, unknown: 0 };
  const rows = rowsInScope(state).map((r) => {
    const k = keyOf(r);
    const o = state.observed.get(k) ?? null;
    const tier = state.tierFor(r);
    const res = whatIf(inputOf(r, z, o));
    const at = res.rows[TIERS.indexOf(tier)];
    const met = typeof res.tierMet === 'string' ? res.tierMet : null;
    counts[met ?? 'unknown'] += 1;
    return h(
      'tr',
      { 'data-key': attrKey(k) },
      h('th', { scope: 'row' }, displayName(r)),
      h('td', { 'data-label': 'Tier' }, tierLabel(tier).slice(0, 3)),
      h('td', { 'data-col': 'total', 'data-label': 'Total' }, showFigure(at.total)),
      h('td', { 'data-col': 'sigma', 'data-label': 'Sigma' }, o ? showFigure(at.sigma) : '—'),
      h('td', { 'data-col': 'share', 'data-label': 'Share' }, o ? showFigure(at.share, 'pct') : '—'),
      h('td', { 'data-col': 'met', 'data-label': 'Met' }, met === null ? '—' : met === 'none' ? 'none' : tierLabel(met).slice(0, 3)),
    );
  });
  return { rows, counts };
}

function countsText(n: number, c: Counts): string {
  const observed = n - c.unknown;
  return observed
    ? `With observed data: ${observed}. Meet optimum ${c.optimum}, desirable ${c.desirable}, minimum ${c.minimum}, none ${c.none}.`
    : 'No observed data yet: type them above or read them from the sheet.';
}

/** Pure: the menu of every analyte in scope (empty when there is none or the coverage is bad). */
export function renderMenu(state: PaneState, readAll: HTMLButtonElement): Node[] {
  const z = zOrNull(state);
  if (z === null || rowsInScope(state).length === 0) return [];
  const { rows, counts } = menuRows(state, z);
  const head = h('thead', {}, h('tr', {}, ...['Analyte', 'Tier', 'Total', 'Sigma', 'Share', 'Met'].map((t) => h('th', { scope: 'col' }, t))));
  const caption = h('caption', {}, 'At each analyte’s own tier; total error %, sigma, share of the allowance, tier met');
  return [
    h('h2', {}, `All picked analytes (${rows.length})`),
    h('p', { class: 'hint', id: 'menu-counts' }, countsText(rows.length, counts)),
    h('div', { class: 'actions' }, readAll),
    h('div', { class: 'scroll-x' }, keepTableRoles(h('table', { class: 'grid-table numbers compact stack-narrow', id: 'menu-table' }, caption, head, h('tbody', {}, ...rows)))),
  ];
}

/** Reads bias and CV for every row of the active sheet; resolves to the status message. */
async function readWholeSheet(ctx: PaneContext): Promise<string> {
  const { state } = ctx;
  const sheet = await ctx.host.readActiveSheet();
  const got = readAllRows(sheet);
  if (!got.ok) throw new PaneError(`Nothing read: ${got.why}.`);
  const byKey = new Map(state.rows().map((r) => [keyOf(r), r] as const));
  const found: Array<[string, Observed]> = [];
  let unknown = 0;
  for (const r of got.rows) {
    if (r.bias === null || r.cv === null) continue;
    const row = byKey.get(keyOf(r));
    if (row) found.push([keyOf(row), { bias: r.bias, cv: r.cv, from: `${sheet.grid.sheet} ${r.biasCell}, ${r.cvCell}` }]);
    else unknown++;
  }
  state.pick(found.map(([k]) => k), true);
  state.setObserved(found);
  const n = found.length;
  if (!n) throw new PaneError(`No rows with both bias and CV on ${sheet.grid.sheet}: add columns headed “Bias %” and “CV %”.`);
  return `Read observed bias and CV for ${n} analyte${n === 1 ? '' : 's'} from ${sheet.grid.sheet}${unknown ? ` (${unknown} row${unknown === 1 ? '' : 's'} not in the table)` : ''}.`;
}

export function menuPart(ctx: PaneContext): { root: HTMLElement; render(): void } {
  const root = h('div', { class: 'menu', id: 'whatif-menu' });
  const readAll = h('button', { type: 'button', id: 'read-sheet-observed' }, 'Read bias and CV for all rows of the active sheet');
  readAll.addEventListener('click', () => void ctx.run('Reading the active sheet…', () => readWholeSheet(ctx)));
  return { root, render: () => replace(root, ...renderMenu(ctx.state, readAll)) };
}
