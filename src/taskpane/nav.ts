/**
 * The pane's navigation: two rows of tabs. The first names the steps of the job (Specify,
 * Verify, Control, Report); the second the views of the step chosen. Each row is an ARIA tab
 * list with one tab in the Tab order: arrow keys move and select within a row, Home and End go
 * to its ends, Down or Enter on a step goes to its views, Up on a view goes back to the steps,
 * and Enter on a view moves into its panel. A step remembers the view last shown in it.
 */
import { h } from './dom';
import type { Step, StepId, ViewEntry } from './views';

export interface Nav {
  readonly root: HTMLElement;
  /** The tab of each view, by view id. */
  readonly viewTabs: ReadonlyMap<string, HTMLButtonElement>;
  /** Marks `viewId` (and its step) selected; the panels are the caller's. */
  mark(viewId: string): void;
}

export interface NavEvents {
  /** A view was chosen (by click or key); `focus` is true when the choice came from the keyboard. */
  choose(viewId: string, focus: boolean): void;
  /** Enter on a view tab: move into the panel. */
  enter(viewId: string): void;
}

/** The index an arrow, Home or End key leads to in a row of `n` tabs, or null for other keys. */
export function keyTarget(key: string, i: number, n: number): number | null {
  if (key === 'ArrowRight') return (i + 1) % n;
  if (key === 'ArrowLeft') return (i - 1 + n) % n;
  if (key === 'Home') return 0;
  if (key === 'End') return n - 1;
  return null;
}

function tab(id: string, controls: string, label: string, extra: Record<string, string> = {}): HTMLButtonElement {
  return h('button', { type: 'button', role: 'tab', id, 'aria-controls': controls, 'aria-selected': 'false', tabindex: -1, class: 'tab', ...extra }, label);
}

function stepRow(steps: readonly Step[], views: readonly ViewEntry[]): { row: HTMLElement; tabs: Map<StepId, HTMLButtonElement> } {
  const row = h('div', { class: 'tabs steps', role: 'tablist', 'aria-label': 'Steps' });
  const tabs = new Map<StepId, HTMLButtonElement>();
  for (const s of steps) {
    if (!views.some((v) => v.step === s.id)) continue;
    const t = tab(`step-${s.id}`, 'step-views', s.label, { 'aria-description': s.description, 'data-step': s.id });
    tabs.set(s.id, t);
    row.appendChild(t);
  }
  return { row, tabs };
}

function viewRow(views: readonly ViewEntry[]): { row: HTMLElement; tabs: Map<string, HTMLButtonElement> } {
  const row = h('div', { class: 'tabs views', role: 'tablist', id: 'view-tabs' });
  const tabs = new Map<string, HTMLButtonElement>();
  for (const v of views) {
    const t = tab(`tab-${v.id}`, `panel-${v.id}`, v.label, { 'data-step': v.step });
    if (!v.make) {
      t.classList.add('coming');
      t.setAttribute('aria-description', 'not in the pane yet');
    }
    tabs.set(v.id, t);
    row.appendChild(t);
  }
  return { row, tabs };
}

export function buildNav(steps: readonly Step[], views: readonly ViewEntry[], on: NavEvents): Nav {
  const stepTabs = stepRow(steps, views);
  const viewTabs = viewRow(views);
  const lastIn = new Map<StepId, string>();
  const stepPanel = h('div', { id: 'step-views', role: 'tabpanel', class: 'step-views' }, viewTabs.row);
  let current = views[0].id;

  const stepOf = (viewId: string): StepId => (views.find((v) => v.id === viewId) as ViewEntry).step;
  const inStep = (s: StepId): ViewEntry[] => views.filter((v) => v.step === s);
  const viewForStep = (s: StepId): string => lastIn.get(s) ?? inStep(s)[0].id;

  function mark(viewId: string): void {
    current = viewId;
    const step = stepOf(viewId);
    lastIn.set(step, viewId);
    for (const [s, t] of stepTabs.tabs) {
      t.setAttribute('aria-selected', String(s === step));
      t.tabIndex = s === step ? 0 : -1;
    }
    for (const v of views) {
      const t = viewTabs.tabs.get(v.id) as HTMLButtonElement;
      t.hidden = v.step !== step;
      t.setAttribute('aria-selected', String(v.id === viewId));
      t.tabIndex = v.id === viewId ? 0 : -1;
    }
    const stepLabel = steps.find((s) => s.id === step)?.label ?? step;
    stepPanel.setAttribute('aria-labelledby', `step-${step}`);
    viewTabs.row.setAttribute('aria-label', `${stepLabel} views`);
  }

  wireSteps(stepTabs.tabs, { choose: (s, focus) => on.choose(viewForStep(s), focus), current: () => stepOf(current), down: () => viewTabs.tabs.get(current)?.focus() });
  wireViews(viewTabs.tabs, views, { on, current: () => current, inStep, stepOf, up: () => stepTabs.tabs.get(stepOf(current))?.focus() });

  const root = h('nav', { class: 'nav', 'aria-label': 'Leeway' }, stepTabs.row, stepPanel);
  return { root, viewTabs: viewTabs.tabs, mark };
}

function wireSteps(
  tabs: Map<StepId, HTMLButtonElement>,
  o: { choose: (s: StepId, focus: boolean) => void; current: () => StepId; down: () => void },
): void {
  const ids = [...tabs.keys()];
  for (const [s, t] of tabs) {
    t.addEventListener('click', () => o.choose(s, false));
    t.addEventListener('keydown', (e) => {
      if (e.key === 'ArrowDown' || e.key === 'Enter' || e.key === ' ') {
        e.preventDefault();
        if (o.current() !== s) o.choose(s, false);
        o.down();
        return;
      }
      const next = keyTarget(e.key, ids.indexOf(s), ids.length);
      if (next === null) return;
      e.preventDefault();
      o.choose(ids[next], false);
      tabs.get(ids[next])?.focus();
    });
  }
}

function wireViews(
  tabs: Map<string, HTMLButtonElement>,
  views: readonly ViewEntry[],
  o: { on: NavEvents; current: () => string; inStep: (s: StepId) => ViewEntry[]; stepOf: (id: string) => StepId; up: () => void },
): void {
  for (const v of views) {
    const t = tabs.get(v.id) as HTMLButtonElement;
    t.addEventListener('click', () => o.on.choose(v.id, false));
    t.addEventListener('keydown', (e) => {
      if (e.key === 'ArrowUp') {
        e.preventDefault();
        o.up();
        return;
      }
      if (e.key === 'Enter' || e.key === ' ') {
        e.preventDefault();
        if (o.current() !== v.id) o.on.choose(v.id, true);
        o.on.enter(v.id);
        return;
      }
      const row = o.inStep(v.step).map((x) => x.id);
      const next = keyTarget(e.key, row.indexOf(v.id), row.length);
      if (next === null) return;
      e.preventDefault();
      o.on.choose(row[next], true);
    });
  }
}
