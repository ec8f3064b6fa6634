/**
 * Review view, the pure renders: the choice of columns (results, run, material, target, SD), the
 * control chart with the list of flagged results beside it (each item focusable: focusing it
 * marks its point on the chart, so the chart can be read by keyboard), and the QC.REVIEW figures.
 */
import { h, field, uid, svgFromString } from '../dom';
import type { Child } from '../dom';
import { fmt } from '../format';
import { readDecimal } from '../../engine/table';
import { controlChartSvg } from '../../charts/controlChart';
import type { StudyGrid } from '../study/columns';
import type { FlagLine, ReviewChoice, ReviewOutcome, Setting } from '../study/review';
import { REVIEW_LABELS } from '../study/review';
import { isError } from '../study/figures';
import type { Figure } from '../study/figures';

export interface RolesForm {
  readonly grid: StudyGrid;
  readonly choice: ReviewChoice;
  readonly onChoice: (patch: Partial<ReviewChoice>) => void;
}

function columnSelect(id: string, g: StudyGrid, chosen: number | null, none: string | null, on: (i: number | null) => void): HTMLSelectElement {
  const select = h('select', { id });
  if (none !== null) select.appendChild(h('option', { value: '', selected: chosen === null }, none));
  g.columns.forEach((c, i) => select.appendChild(h('option', { value: String(i), selected: chosen === i }, c.name)));
  select.addEventListener('change', () => on(select.value === '' ? null : Number(select.value)));
  return select;
}

/** A target or SD: "a number" and an input, or one of the columns. */
function settingField(label: string, key: 'target' | 'sd', form: RolesForm): HTMLElement {
  const s = form.choice[key];
  const select = columnSelect(`review-${key}-column`, form.grid, s.kind === 'column' ? s.index : null, 'one number:', (i) =>
    form.onChoice({ [key]: i === null ? { kind: 'number', value: NaN } : { kind: 'column', index: i } } as Partial<ReviewChoice>),
  );
  const box = field(label, select);
  if (s.kind === 'number') {
    const input = h('input', { type: 'text', inputmode: 'decimal', autocomplete: 'off', id: `review-${key}`, value: Number.isFinite(s.value) ? String(s.value) : '', 'aria-label': `${label}, one number for every result` });
    input.addEventListener('change', () => {
      // A text that is not a number leaves the setting unset (the view says what is missing).
      form.onChoice({ [key]: { kind: 'number', value: readDecimal(input.value) ?? NaN } as Setting } as Partial<ReviewChoice>);
    });
    box.appendChild(input);
  }
  return box;
}

/** Which column is which. */
export function renderRoles(form: RolesForm): HTMLElement {
  const c = form.choice;
  return h(
    'div',
    { class: 'review-roles' },
    field('Results', columnSelect('review-values', form.grid, c.values, null, (i) => form.onChoice({ values: i ?? 0 }))),
    field('Run', columnSelect('review-runs', form.grid, c.runs, '(each result its own run)', (i) => form.onChoice({ runs: i }))),
    field('Material', columnSelect('review-levels', form.grid, c.levels, '(one material)', (i) => form.onChoice({ levels: i }))),
    h('span', {}),
    settingField('Target', 'target', form),
    settingField('SD', 'sd', form),
  );
}

const zText = (z: number): string => `${z > 0 ? '+' : z < 0 ? '−' : ''}${fmt(Math.abs(z))}`;

function flagItem(f: FlagLine, pointOf: Map<number, Element>): HTMLElement {
  const where = [f.run && `run ${f.run}`, f.level].filter(Boolean).join(', ');
  const li = h('li', { tabindex: 0, 'data-row': f.row }, `Row ${f.row}${where ? ` (${where})` : ''}: z ${zText(f.z)} — ${f.flags}`);
  const mark = (on: boolean): void => {
    const p = pointOf.get(f.row);
    if (p) p.classList.toggle('current', on);
  };
  li.addEventListener('focus', () => mark(true));
  li.addEventListener('blur', () => mark(false));
  return li;
}

/** The chart, and beside it the flagged results as a list (what a screen reader reads). */
export function renderChart(out: ReviewOutcome, width: number): HTMLElement[] {
  const id = uid('review-chart');
  const svg = svgFromString(controlChartSvg({ title: 'Control results in SD units', series: out.series, width, id }));
  const pointOf = new Map<number, Element>();
  svg.querySelectorAll('path.point').forEach((p) => {
    const row = out.rowOfPoint.get(`${p.getAttribute('data-material') ?? ''}|${p.getAttribute('data-index') ?? ''}`);
    if (row !== undefined) pointOf.set(row, p);
  });
  const chart = h('figure', { class: 'study-chart', id: 'review-chart' });
  chart.appendChild(svg);
  const list = out.flagged.length
    ? h('ol', { class: 'flag-list', id: 'review-flags', 'aria-label': 'Flagged results' }, ...out.flagged.map((f) => flagItem(f, pointOf)))
    : h('p', { class: 'hint', id: 'review-flags' }, 'No result completes a term of the rule.');
  return [chart, h('h3', {}, `Flagged results (${out.flagged.length})`), list];
}

function show(f: Figure | undefined, label: string): string {
  if (f === undefined) return '—';
  if (isError(f)) return `${f.error} ${f.message}`;
  if (typeof f !== 'number') return String(f);
  if (label.startsWith('Share') || label.startsWith('Expected')) return fmt(f, 3);
  return Number.isInteger(f) ? String(f) : fmt(f);
}

/** The QC.REVIEW figures. */
export function renderFigures(figures: Record<string, Figure>): HTMLElement {
  const kids: Child[] = REVIEW_LABELS.flatMap((l) => [h('dt', {}, l), h('dd', { 'data-key': l }, show(figures[l], l))]);
  return h('dl', { class: 'facts', id: 'review-figures' }, ...kids);
}
