/**
 * The What-if detail for one analyte: the three tiers (and a fixed limit) side by side, with the
 * observed figures when there are some, the most stringent tier met and the allowance chart.
 * Pure: everything comes from the pane's state and the analyte's key.
 */
import { h, keepTableRoles } from '../../dom';
import type { PaneState } from '../../state';
import { keyOf, displayName } from '../../analytes';
import { fmt, showFigure, tierLabel } from '../../format';
import { allowanceChart } from '../../charts';
import { whatIf } from '../../whatif';
import type { WhatIfResult } from '../../whatif';
import { DEMO_MARKER } from '../../../engine/caution';
import { inputOf, zOrNull } from './common';

function tierTable(res: WhatIfResult, withObserved: boolean): HTMLTableElement {
  const head = ['Tier', 'CV', 'Bias', 'Total'];
  if (withObserved) head.push('Sigma', 'Share', 'Met');
  const tbody = h('tbody', {});
  for (const r of res.rows) {
    const cells: HTMLElement[] = [
      h('th', { scope: 'row' }, tierLabel(r.tier)),
      h('td', { 'data-col': 'cv', 'data-label': 'CV' }, showFigure(r.cv)),
      h('td', { 'data-col': 'bias', 'data-label': 'Bias' }, showFigure(r.bias)),
      h('td', { 'data-col': 'total', 'data-label': 'Total' }, showFigure(r.total)),
    ];
    if (withObserved) {
      cells.push(h('td', { 'data-col': 'sigma', 'data-label': 'Sigma' }, showFigure(r.sigma)));
      cells.push(h('td', { 'data-col': 'share', 'data-label': 'Share' }, showFigure(r.share, 'pct')));
      cells.push(h('td', { 'data-col': 'met', 'data-label': 'Met', class: r.met ? 'yes' : 'no' }, r.met === undefined ? '—' : r.met ? 'yes' : 'no'));
    }
    tbody.appendChild(h('tr', { 'data-tier': r.tier }, ...cells));
  }
  const table = h(
    'table',
    { class: `grid-table numbers${withObserved ? ' stack-narrow' : ''}`, id: 'whatif-tiers' },
    h('caption', {}, 'Allowable, % (total error at the z in use)'),
    h('thead', {}, h('tr', {}, ...head.map((t) => h('th', { scope: 'col' }, t)))),
    tbody,
  );
  return withObserved ? keepTableRoles(table) : table;
}

function metText(res: WhatIfResult): string | null {
  if (res.tierMet === undefined) return null;
  if (typeof res.tierMet !== 'string') return `not known (${res.tierMet.why})`;
  return res.tierMet === 'none' ? 'none of the three tiers' : tierLabel(res.tierMet);
}

function resultFacts(res: WhatIfResult): HTMLElement | null {
  if (!res.observedTotal) return null;
  const t = res.observedTotal;
  return h(
    'dl',
    { class: 'facts result', id: 'whatif-result' },
    h('dt', {}, 'Observed total error'),
    h('dd', { 'data-value': t.ok ? String(t.value) : '' }, t.ok ? `${fmt(t.value)} %` : t.why),
    h('dt', {}, 'Most stringent tier met'),
    h('dd', { id: 'tier-met', 'data-value': typeof res.tierMet === 'string' ? res.tierMet : '' }, metText(res) ?? '—'),
  );
}

/** The detail of the analyte with this key, or a hint saying what is missing. */
export function renderDetail(state: PaneState, key: string): Node[] {
  const r = state.rows().find((x) => keyOf(x) === key);
  const z = zOrNull(state);
  if (!r) return [h('p', { class: 'hint' }, 'Pick a table with analytes first (Tables).')];
  if (z === null) return [h('p', { class: 'error' }, 'The coverage in Fill is not valid: set a z or a probability there.')];
  const o = state.observed.get(key) ?? null;
  const res = whatIf(inputOf(r, z, o));
  const bars = res.rows.filter((x) => x.total.ok).map((x) => ({ label: tierLabel(x.tier), allowable: (x.total as { value: number }).value, met: x.met }));
  const observedTotal = o && res.observedTotal?.ok ? res.observedTotal.value : null;
  const out: Array<Node | null> = [
    h('p', { class: 'context' }, `${displayName(r)} · CVI ${fmt(r.cvi)} %${r.cvg === null ? ', no CVG' : ` · CVG ${fmt(r.cvg)} %`} · z ${fmt(z, 3)}`),
    h('p', { class: 'hint', id: 'whatif-tier-origin' }, `In use elsewhere: ${tierLabel(state.tierFor(r))}, from ${state.tierOriginOf(r)}.`),
    state.table?.demo ? h('p', { class: 'badge demo' }, DEMO_MARKER) : null,
    tierTable(res, o !== null),
    o ? resultFacts(res) : null,
    bars.length ? allowanceChart(bars, observedTotal, `${displayName(r)}: observed error against each allowance`) : null,
  ];
  return out.filter((n): n is Node => n !== null);
}
